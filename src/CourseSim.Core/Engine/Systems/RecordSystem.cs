using CourseSim.Units;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Record: at the record interval, one sample of every board (finished boards keep their last state) into the
/// recorder: the state at the end of this step.
/// </summary>
public sealed class RecordSystem : RaceSystem
{
    public override string Name => "record";
    public override SystemScope Scope => SystemScope.Fleet;
    public override string Reads => "Pose, Motion, SensedWind, Trim, RiderState, ManoeuvreState, RaceStatus (all boards)";
    public override string Writes => "recorder";

    public override void RunFleet(RaceContext c)
    {
        if (c.Time + c.Dt < c.NextRecordS - 1e-9) return;
        Sample(c);
        c.NextRecordS += c.Settings.RecordIntervalS;
    }

    /// <summary>Writes one frame now (also at the end of the race).</summary>
    public static void Sample(RaceContext c)
    {
        var row = c.Recorder.NewFrame();
        var f = c.Fleet;
        foreach (var chunk in c.All)
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
                    X = (float)pose[i].X, Y = (float)pose[i].Y,
                    HeadingDeg = (float)Unit.WrapDeg360(Unit.RadToDeg(pose[i].Heading)),
                    SpeedMs = (float)mo[i].Speed, LeewayDeg = (float)Unit.RadToDeg(mo[i].Leeway),
                    AttackDeg = (float)Unit.RadToDeg(f.Rigs[b].AttackAngle(t.BetaRad, t.Sheet)),
                    HeelUse = (float)t.HeelUse, TwaDeg = (float)Unit.RadToDeg(t.TrueAngleRad), AwaDeg = (float)Unit.RadToDeg(t.ApparentAngleRad),
                    TwsMs = (float)sw[i].TrueSpeed, TwdDeg = (float)sw[i].TrueFromDeg, Sheet = (float)t.Sheet,
                    ReserveShare = (float)(rider[i].ReserveJ / Math.Max(1, f.Rigs[b].Physics.Rider.ReserveJ)),
                    Flags = flags, NextStep = (byte)Math.Min(255, st[i].NextStep),
                };
            }
        }
    }
}
