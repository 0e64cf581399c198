using CourseSim.Units;

namespace CourseSim.Engine;

public sealed partial class Race
{
    /// <summary>System 8, record: one sample of every board into the recorder (finished boards keep their last state).</summary>
    void Record()
    {
        var row = Recorder.NewFrame();
        foreach (var chunk in _all)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>(); var sw = chunk.Span<SensedWind>();
            var trim = chunk.Span<Trim>(); var rider = chunk.Span<RiderState>(); var man = chunk.Span<ManoeuvreState>(); var st = chunk.Span<RaceStatus>();
            for (int i = 0; i < chunk.Count; i++)
            {
                int b = ids[i].Value;
                ref readonly var t = ref trim[i];
                byte flags = 0;
                if (t.Planing) flags |= 1;
                if (t.Pumping) flags |= 2;
                if (man[i].Kind == Manoeuvre.Tack) flags |= 4;
                if (man[i].Kind == Manoeuvre.Gybe) flags |= 8;
                if (man[i].Kind == Manoeuvre.Fallen) flags |= 16;
                if (st[i].State == RaceState.Finished) flags |= 32;
                if (st[i].State == RaceState.Returning) flags |= 64;
                row[b] = new BoardSample
                {
                    X = (float)pose[i].X,
                    Y = (float)pose[i].Y,
                    HeadingDeg = (float)Unit.WrapDeg360(Unit.RadToDeg(pose[i].Heading)),
                    SpeedMs = (float)mo[i].Speed,
                    LeewayDeg = (float)Unit.RadToDeg(mo[i].Leeway),
                    AttackDeg = (float)Unit.RadToDeg(_rig[b].AttackAngle(t.BetaRad, t.Sheet)),
                    HeelUse = (float)t.HeelUse,
                    TwaDeg = (float)Unit.RadToDeg(t.TrueAngleRad),
                    AwaDeg = (float)Unit.RadToDeg(t.ApparentAngleRad),
                    TwsMs = (float)sw[i].TrueSpeed,
                    TwdDeg = (float)sw[i].TrueFromDeg,
                    Sheet = (float)t.Sheet,
                    ReserveShare = (float)(rider[i].ReserveJ / Math.Max(1, _rigs[b].Rig.Physics.Rider.ReserveJ)),
                    Flags = flags,
                    NextStep = (byte)Math.Min(255, st[i].NextStep),
                };
            }
        }
    }
}
