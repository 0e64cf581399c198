using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// Observe: when a rider's decision is due, their reading of the wind for it: the wind as sensed at the rig (lagged)
/// with the rider's reading error, slowly varying (an Ornstein-Uhlenbeck process with a <see cref="Tuning.ReadingErrorTauS"/>
/// time constant) and larger for the less skilled (model values: 1 deg and 3 % at skill 1, 3 deg and 8 % at skill 0).
/// Draws come from the board's own stream (keyed by its id) at the step's counter.
/// </summary>
public sealed class ObserveSystem : RaceSystem
{
    public override string Name => "observe";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "SensedWind, Intent (decision time)";
    public override string Writes => "Perception";

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        var f = c.Fleet;
        double keep = Math.Exp(-c.Settings.DecisionIntervalS / Tuning.ReadingErrorTauS), fresh = Math.Sqrt(1 - keep * keep);
        ulong draw = (ulong)c.StepIndex * 2;
        for (int i = 0; i < blk.Count; i++)
        {
            if (c.Time < blk.Intent[i].NextDecisionS) continue;
            int b = blk.Id[i].Value;
            ref var o = ref blk.Perception[i]; ref readonly var sw = ref blk.Wind[i];
            var rng = f.Stream(c.TacticRng, b, 3);
            o.NoiseDir = keep * o.NoiseDir + fresh * rng.Normal(draw);
            o.NoiseSpeed = keep * o.NoiseSpeed + fresh * rng.Normal(draw + 1);
            double sdDir = Tuning.Lerp(Tuning.ReadingErrorExpertDeg, Tuning.ReadingErrorNoviceDeg, f.Skill[b]);
            double sdSpd = Tuning.Lerp(Tuning.ReadingErrorExpertShare, Tuning.ReadingErrorNoviceShare, f.Skill[b]);
            o.ReadFromDeg = Unit.WrapDeg360(sw.PerceivedFromDeg + sdDir * o.NoiseDir);
            o.ReadSpeed = Math.Max(0, sw.PerceivedSpeed * (1 + sdSpd * o.NoiseSpeed));
        }
    }
}

/// <summary>What a rider sees of the other boards: read from the step snapshot, never from live state.</summary>
public sealed class Lookabout
{
    /// <summary>How far a rider can see other boards and read the wind on the water, m (model value).</summary>
    public const double SightRangeM = 1000;
    readonly List<SeenBoard> _seen;
    readonly int[] _rank;
    // The boards in sight come from a hash of sight-range cells built from the step snapshot (the 3 x 3 cells round a
    // rider hold everything within sight; cells a little larger than the range so no rounding of a cell index can leave
    // a board at the very edge out): O(boards in sight) a decision, not a scan of the fleet.
    readonly CellHash _sight;
    bool _stale = true;
    // The boards in sight, sorted by (distance, rank): a total order, so any correct sort gives the same list. The
    // distances' bits (non-negative doubles order as their bits do) are sorted with the ranks alongside, then runs of
    // equal distances put in rank order.
    readonly long[] _key;
    readonly int[] _nearRank;

    public Lookabout(Fleet fleet)
    {
        _rank = fleet.Rank;
        _sight = new(SightRangeM * 1.01, fleet.Count); // sized now: no look allocates
        _seen = new List<SeenBoard>(Math.Max(4, fleet.Count)); // room for the whole fleet: a look never grows it
        _key = new long[Math.Max(1, fleet.Count)]; _nearRank = new int[Math.Max(1, fleet.Count)];
    }

    /// <summary>Marks the sight hash out of date: the decide system's preparation, once a step before any rider decides; the first look of the step rebuilds it from the snapshot.</summary>
    public void Prepare() => _stale = true;

    /// <summary>Boards within sight of board b, nearest first, with the wind each seems to have (the rider's reading error added).</summary>
    public IReadOnlyList<SeenBoard> From(RaceContext c, int b, Courses.Vec2 p)
    {
        _seen.Clear();
        if (_stale) { _sight.Build(c.Snapshot, c.Fleet.ByRank); _stale = false; }
        var s = c.Snapshot; var f = c.Fleet;
        int n = 0;
        int ci = _sight.Cell(p.X), cj = _sight.Cell(p.Y);
        for (int dj = -1; dj <= 1; dj++)
            for (int di = -1; di <= 1; di++)
                foreach (var e in _sight.Bucket(ci + di, cj + dj))
                {
                    int j = e.Board;
                    if (e.Ci != ci + di || e.Cj != cj + dj || j == b) continue;
                    double dx = s.X[j] - p.X, dy = s.Y[j] - p.Y;
                    double d = Math.Sqrt(dx * dx + dy * dy);
                    if (d > SightRangeM) continue;
                    _key[n] = BitConverter.DoubleToInt64Bits(d); _nearRank[n++] = _rank[j];
                }
        Array.Sort(_key, _nearRank, 0, n);
        for (int q = 1; q < n; q++)
        {
            // Equal distances (rare): insertion by rank within the run.
            if (_key[q] != _key[q - 1]) continue;
            for (int z = q; z > 0 && _key[z] == _key[z - 1] && _nearRank[z] < _nearRank[z - 1]; z--)
                (_nearRank[z], _nearRank[z - 1]) = (_nearRank[z - 1], _nearRank[z]);
        }
        double sd = Tuning.Lerp(Tuning.ReadingErrorExpertShare, Tuning.ReadingErrorNoviceShare, f.Skill[b]) * 2;
        var rng = f.Stream(c.TacticRng, b, 4).For((ulong)c.StepIndex);
        for (int q = 0; q < n; q++)
        {
            int j = f.ByRank[_nearRank[q]]; double d = BitConverter.Int64BitsToDouble(_key[q]);
            _seen.Add(new SeenBoard(j, f.Names[j], new Courses.Vec2(s.X[j], s.Y[j]), Unit.WrapDeg360(Unit.RadToDeg(s.Heading[j])), s.Speed[j], d,
                s.NextStep[j], s.Tws[j], sd, rng, f.Keys[j] >> 2));
        }
        return _seen;
    }
}
