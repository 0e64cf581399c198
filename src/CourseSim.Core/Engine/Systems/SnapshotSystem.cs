namespace CourseSim.Engine.Systems;

/// <summary>
/// The step snapshot: right after the wind is sensed, what every board can see of every other is copied into one
/// structure of arrays (<see cref="StepSnapshot"/>). At the lookout rate the neighbour grid is rebuilt from it (pairs in
/// lookout range, pairs close enough to touch before the next rebuild, nearest neighbours) and the acceleration each
/// rider reads of the others is updated.
/// </summary>
public sealed class SnapshotSystem : RaceSystem
{
    /// <summary>Centre distance beyond which two hulls cannot be in contact, m (two board lengths and the clearance, with room).</summary>
    public const double ContactCheckM = 8;
    /// <summary>Fastest two boards close on each other, m/s (model value: two boards at 25 m/s head on).</summary>
    public const double MaxClosingMs = 50;

    public override string Name => "snapshot";
    public override SystemScope Scope => SystemScope.Fleet;
    public override string Reads => "Pose, Motion, SensedWind, Trim, ManoeuvreState, RaceStatus, GiveWay, Penalty (all boards)";
    public override string Writes => "snapshot; neighbour grid; lookout accelerations";

    public override void RunFleet(RaceContext c)
    {
        var s = c.Snapshot;
        s.Capture(c.All, c.Time);
        if (!c.IsLookoutStep) return;
        s.PrepareLookout();
        double interval = c.LookoutEvery * c.Dt;
        for (int b = 0; b < s.Count; b++)
        {
            // The acceleration a rider reads from the other's speed since the last look (clamped: a board gathers or
            // loses speed at a few m/s per second at most).
            c.LookoutAccel[b] = Math.Clamp((s.Speed[b] - c.LookoutSpeed[b]) / interval, -2, 2);
            c.LookoutSpeed[b] = s.Speed[b];
        }
        c.Grid.Build(s, c.Fleet.ByRank, ContactCheckM + MaxClosingMs * interval);
        c.Work.GridCandidates += c.Grid.CandidatesExamined;
    }
}
