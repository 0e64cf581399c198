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
    readonly List<SeenBoard> _seen = new();
    readonly Comparison<SeenBoard> _byDistance;
    readonly int[] _rank;

    public Lookabout(Fleet fleet)
    {
        _rank = fleet.Rank;
        _byDistance = (x, y) => x.DistanceM != y.DistanceM ? x.DistanceM.CompareTo(y.DistanceM) : _rank[x.Board].CompareTo(_rank[y.Board]);
    }

    /// <summary>Boards within sight of board b, nearest first, with the wind each seems to have (the rider's reading error added).</summary>
    public IReadOnlyList<SeenBoard> From(RaceContext c, int b, Courses.Vec2 p)
    {
        _seen.Clear();
        var s = c.Snapshot; var f = c.Fleet;
        double sd = Tuning.Lerp(Tuning.ReadingErrorExpertShare, Tuning.ReadingErrorNoviceShare, f.Skill[b]) * 2;
        var rng = f.Stream(c.TacticRng, b, 4).For((ulong)c.StepIndex);
        for (int j = 0; j < s.Count; j++)
        {
            if (j == b || !s.Live[j]) continue;
            double dx = s.X[j] - p.X, dy = s.Y[j] - p.Y;
            double d = Math.Sqrt(dx * dx + dy * dy);
            if (d > SightRangeM) continue;
            double seen = Math.Max(0, s.Tws[j] * (1 + sd * rng.Normal(f.Keys[j] >> 2)));
            _seen.Add(new SeenBoard(j, f.Names[j], new Courses.Vec2(s.X[j], s.Y[j]), Unit.WrapDeg360(Unit.RadToDeg(s.Heading[j])), s.Speed[j], seen, d, s.NextStep[j]));
        }
        _seen.Sort(_byDistance);
        return _seen;
    }
}
