using CourseSim.Courses;
using CourseSim.Equilibrium;

namespace CourseSim.Agents;

/// <summary>What the board is doing on the present leg, judged from the wind as the rider perceives it.</summary>
public enum LegKind { Beat, Reach, Run }

/// <summary>
/// Another board as a rider sees it: where it is, where it points, how fast it goes, and how much wind it seems to
/// have (read from the water around it and how it is sailing: the wind at its rig plus the rider's reading error).
/// </summary>
public readonly struct SeenBoard
{
    readonly double _tws, _sd;
    readonly Random.CounterRng _rng;
    readonly ulong _key;

    /// <summary>A board seen with the given wind (no reading error): for tactics' own tests.</summary>
    public SeenBoard(int board, string name, Vec2 position, double headingDeg, double speedMs, double windSpeedMs, double distanceM, int nextStep)
        : this(board, name, position, headingDeg, speedMs, distanceM, nextStep, windSpeedMs, 0, default, 0) { }

    /// <summary>A board seen by a rider whose reading of its wind is off by a share drawn at <paramref name="key"/> from
    /// <paramref name="rng"/> with standard deviation <paramref name="sd"/>.</summary>
    internal SeenBoard(int board, string name, Vec2 position, double headingDeg, double speedMs, double distanceM, int nextStep,
        double trueWindMs, double sd, Random.CounterRng rng, ulong key)
    {
        Board = board; Name = name; Position = position; HeadingDeg = headingDeg; SpeedMs = speedMs; DistanceM = distanceM; NextStep = nextStep;
        _tws = trueWindMs; _sd = sd; _rng = rng; _key = key;
    }

    public int Board { get; }
    public string Name { get; }
    public Vec2 Position { get; }
    public double HeadingDeg { get; }
    public double SpeedMs { get; }
    public double DistanceM { get; }
    public int NextStep { get; }

    /// <summary>
    /// The wind it seems to have, m/s: the wind at its rig times one plus the rider's reading error. Worked out when read,
    /// from the rider's own random stream at this step and the other board's key (a pure function: the same value however
    /// often it is read, and nothing drawn for boards a tactic never asks about; a crowd of 200 boards in sight drew 200
    /// normals a decision before).
    /// </summary>
    public double WindSpeedMs => _sd == 0 ? Math.Max(0, _tws) : Math.Max(0, _tws * (1 + _sd * _rng.Normal(_key)));
}

/// <summary>
/// What a rider can know when deciding (docs/tactics.md): their own position, speed and heading; the wind as sensed at
/// the rig (lagged by the rider's perception and noisy, never the true field or its future); boards within sight range
/// (only for tactics that ask for them); the course and the next step; their own rig's polar. One instance per race,
/// refilled for each decision: read it inside <see cref="ITactic.Decide"/>, do not keep it.
/// </summary>
public sealed class Observation
{
    /// <summary>Time from the starting signal, s.</summary>
    public double TimeS { get; internal set; }
    public int Board { get; internal set; }
    public string Name { get; internal set; } = "";
    public Vec2 Position { get; internal set; }
    /// <summary>Compass heading, deg (0..360).</summary>
    public double HeadingDeg { get; internal set; }
    public double SpeedMs { get; internal set; }
    /// <summary>+1 on starboard tack (wind over the starboard side), -1 on port.</summary>
    public int Tack { get; internal set; }
    /// <summary>True wind speed (10 m) as the rider perceives it at the rig, m/s.</summary>
    public double WindSpeedMs { get; internal set; }
    /// <summary>Direction the wind comes from as the rider perceives it, deg.</summary>
    public double WindFromDeg { get; internal set; }
    /// <summary>Signed true wind angle of the present heading, deg (positive = starboard tack).</summary>
    public double TrueWindAngleDeg { get; internal set; }
    public Course Course { get; internal set; } = null!;
    /// <summary>Index of the next course step (mark, gate or finish) in <see cref="Course"/>.Steps.</summary>
    public int NextStep { get; internal set; }
    /// <summary>Where the rider aims for the next step (beside a mark on the side it is left), m.</summary>
    public Vec2 AimPoint { get; internal set; }
    public LegKind Leg { get; internal set; }
    /// <summary>The rider's own rig polar: steady speed and best VMG angles (what a rider knows of their kit).</summary>
    public RigPolar Polar { get; internal set; } = null!;
    /// <summary>Time of the rider's last tack or gybe, s (negative infinity before the first).</summary>
    public double LastTurnS { get; internal set; }
    /// <summary>Boards within sight range, nearest first; empty unless the tactic's <see cref="ITactic.WantsNearby"/> is true.</summary>
    /// <remarks>Worked out on first read in a decision (a tactic that returns before looking costs nothing).</remarks>
    public IReadOnlyList<SeenBoard> Nearby
    {
        get
        {
            if (_look is { } look) { _look = null; _nearby = look.From(_lookRace!, Board, Position); }
            return _nearby;
        }
    }
    IReadOnlyList<SeenBoard> _nearby = [];
    Lookabout? _look;
    Engine.RaceContext? _lookRace;

    /// <summary>No boards in sight (a tactic that does not ask for them).</summary>
    internal void ClearNearby() { _look = null; _lookRace = null; _nearby = []; }

    /// <summary>The boards in sight of <see cref="Board"/> at <see cref="Position"/>, looked up when first read.</summary>
    internal void NearbyFrom(Lookabout look, Engine.RaceContext c) { _look = look; _lookRace = c; }
    /// <summary>The boards' names in fleet order (for naming a rival).</summary>
    public IReadOnlyList<string> FleetNames { get; internal set; } = [];
}

/// <summary>What a tactic decides: the heading to make good (deg) and the power wanted (0 = luffing .. 1 = full).</summary>
public readonly record struct Decision(double HeadingDeg, double Power = 1);

/// <summary>
/// Navigation the engine offers every tactic (the same arithmetic the built-in tactics use), so a tactic can say what
/// it wants in the rider's terms: "to the mark by the laylines", "close-hauled on the other tack".
/// </summary>
public interface INavigator
{
    /// <summary>
    /// The heading (deg) that sails the rig's best VMG towards <paramref name="target"/>: straight at it on a reach; at
    /// the best VMG angle on a beat or run, turning onto the other tack or gybe at its layline when <paramref name="mayTurn"/>.
    /// </summary>
    double ToTarget(Vec2 target, bool mayTurn = true);
    /// <summary>The heading (deg) at a signed true wind angle (deg, positive = starboard tack) in the perceived wind.</summary>
    double AtTrueWindAngle(double twaDeg);
    /// <summary>Best upwind (true) or downwind (false) VMG angle of the rig in the perceived wind, deg (unsigned).</summary>
    double BestAngle(bool upwind);
}

/// <summary>
/// A tactic: one instance per board, created when the race is built, asked for a decision at the rider's decision rate
/// while racing (after the start, not while returning from an early start: the start is the board's start plan). The
/// decision takes effect after the rider's reaction time. Keep any memory (running means, last tack) in fields.
/// </summary>
public interface ITactic
{
    Decision Decide(Observation o, INavigator nav);
    /// <summary>Whether <see cref="Observation.Nearby"/> should be filled (costs a neighbour search per decision).</summary>
    bool WantsNearby => false;
}

/// <summary>One parameter of a tactic: name, accepted range, default and meaning (docs/tactics.md lists them).</summary>
public sealed record TacticParam(string Name, double Min, double Max, double Default, string Help);

/// <summary>What a tactic is created with: its board, the validated parameters (defaults filled in), the rival (if any).</summary>
public sealed record TacticArgs(int Board, string Name, IReadOnlyDictionary<string, double> Params, int Rival, ulong Seed)
{
    public double this[string name] => Params[name];
}

/// <summary>A tactic the scenario can name: its name, what it does, its parameters, whether it needs a rival, and how to make one.</summary>
public sealed record TacticSpec(string Name, string Summary, IReadOnlyList<TacticParam> Params, Func<TacticArgs, ITactic> Create,
    bool NeedsRival = false);
