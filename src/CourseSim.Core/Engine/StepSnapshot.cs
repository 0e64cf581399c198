using CourseSim.Entities;

namespace CourseSim.Engine;

/// <summary>
/// What every board can see of every other, taken once per step right after the wind is sensed (docs/engine.md,
/// "Everyone reads the same instant"): position, heading, track, speed, the true wind at the rig, the direction its
/// apparent wind blows (its wake), whether it is tacking, capsized or busy, keeping clear or waiting to take a penalty,
/// and its next course step.
/// Tactics (boards in sight), the rules' lookout and contact checks, and the shadows read this, never live components,
/// so the order the step walks the boards in cannot change a result. Structure of arrays indexed by board.
/// </summary>
public sealed class StepSnapshot
{
    public readonly int Count;
    public readonly double[] X, Y, Heading, Track, Speed, FromDeg, Tws, AppFromDeg, AppDownX, AppDownY;
    /// <summary>The track angle (rad), its sine and cosine, and the unit vector of the heading as a compass bearing: filled at lookout steps by <see cref="PrepareLookout"/> for the rules' predictions.</summary>
    public readonly double[] TrackSin, TrackCos, HeadX, HeadY;
    // The track's sine and cosine as the integrator keeps them (Motion), copied every step; the track angle is worked
    // out from them only at lookout steps, when the rules need it.
    readonly double[] _rawSin, _rawCos;
    public readonly int[] NextStep;
    /// <summary>Racing or before the start (not finished, not out of the race).</summary>
    public readonly bool[] Live;
    public readonly bool[] Finished, Tacking, Capsized, Busy, KeepingClear;
    /// <summary>Owes a penalty and is in a stage where it waits for clear water before its tack or gybe (PenaltyTurn).</summary>
    public readonly bool[] PenaltyWait;
    /// <summary>Time the snapshot was taken, s from the signal.</summary>
    public double TimeS;
    /// <summary>Whether <see cref="HeadX"/>, <see cref="HeadY"/> (and the track's angle) are this capture's (set by <see cref="PrepareLookout"/>).</summary>
    public bool HeadsReady;

    public StepSnapshot(int n)
    {
        Count = n;
        X = new double[n]; Y = new double[n]; Heading = new double[n]; Track = new double[n]; Speed = new double[n];
        FromDeg = new double[n]; Tws = new double[n]; AppFromDeg = new double[n]; AppDownX = new double[n]; AppDownY = new double[n];
        TrackSin = new double[n]; TrackCos = new double[n]; _rawSin = new double[n]; _rawCos = new double[n]; HeadX = new double[n]; HeadY = new double[n];
        NextStep = new int[n];
        Live = new bool[n]; Finished = new bool[n]; Tacking = new bool[n]; Capsized = new bool[n]; Busy = new bool[n]; KeepingClear = new bool[n]; PenaltyWait = new bool[n];
    }

    /// <summary>Copies every board's visible state from the world (finished boards included: they are seen as not live).</summary>
    public void Capture(Query all, double timeS)
    {
        TimeS = timeS;
        HeadsReady = false;
        foreach (var chunk in all)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>(); var sw = chunk.Span<SensedWind>();
            var trim = chunk.Span<Trim>(); var man = chunk.Span<ManoeuvreState>(); var st = chunk.Span<RaceStatus>(); var gw = chunk.Span<GiveWay>(); var pen = chunk.Span<Penalty>();
            for (int i = 0; i < ids.Length; i++)
            {
                int b = ids[i].Value;
                Live[b] = st[i].State is not (RaceState.Finished or RaceState.NotFinished);
                Finished[b] = st[i].State == RaceState.Finished;
                X[b] = pose[i].X; Y[b] = pose[i].Y; Heading[b] = pose[i].Heading;
                _rawSin[b] = mo[i].TrackSin; _rawCos[b] = mo[i].TrackCos; Speed[b] = mo[i].Speed;
                FromDeg[b] = sw[i].TrueFromDeg; Tws[b] = sw[i].TrueSpeed;
                AppFromDeg[b] = Units.Unit.WrapDeg360(Units.Unit.RadToDeg(pose[i].Heading + trim[i].ApparentAngleRad));
                AppDownX[b] = trim[i].AppDownX; AppDownY[b] = trim[i].AppDownY;
                ref readonly var m = ref man[i];
                // Appendix B, rule 13 as changed: from passing head to wind until the sail has filled (the crossing,
                // and the first second of sheeting in on the new tack).
                Tacking[b] = m.Kind == Manoeuvre.Tack && (m.Phase == 1 || m.Phase == 2 && m.Timer < 1.0);
                Capsized[b] = m.Kind == Manoeuvre.Fallen;
                Busy[b] = m.Kind != Manoeuvre.None;
                KeepingClear[b] = gw[i].On && timeS >= gw[i].AtS;
                NextStep[b] = st[i].NextStep;
                PenaltyWait[b] = pen[i].InWaitStage;
            }
        }
    }

    /// <summary>
    /// The trigonometry the rules' predictions need for every pair and every candidate course, computed once per board
    /// (exactly the expressions the predictions would otherwise compute again and again).
    /// </summary>
    public void PrepareLookout()
    {
        for (int b = 0; b < Count; b++)
        {
            Track[b] = Math.Atan2(_rawSin[b], _rawCos[b]);
            (TrackSin[b], TrackCos[b]) = Math.SinCos(Track[b]);
            var f = Courses.Vec2.FromBearing(Units.Unit.RadToDeg(Heading[b]));
            HeadX[b] = f.X; HeadY[b] = f.Y;
        }
        HeadsReady = true;
    }

    public void CopyFrom(StepSnapshot o)
    {
        TimeS = o.TimeS; HeadsReady = o.HeadsReady;
        foreach (var (dst, src) in new[] { (X, o.X), (Y, o.Y), (Heading, o.Heading), (Track, o.Track), (Speed, o.Speed), (FromDeg, o.FromDeg),
                     (Tws, o.Tws), (AppFromDeg, o.AppFromDeg), (AppDownX, o.AppDownX), (AppDownY, o.AppDownY),
                     (TrackSin, o.TrackSin), (TrackCos, o.TrackCos), (HeadX, o.HeadX), (HeadY, o.HeadY), (_rawSin, o._rawSin), (_rawCos, o._rawCos) }) Array.Copy(src, dst, Count);
        Array.Copy(o.NextStep, NextStep, Count);
        foreach (var (dst, src) in new[] { (Live, o.Live), (Finished, o.Finished), (Tacking, o.Tacking), (Capsized, o.Capsized), (Busy, o.Busy), (KeepingClear, o.KeepingClear), (PenaltyWait, o.PenaltyWait) })
            Array.Copy(src, dst, Count);
    }
}
