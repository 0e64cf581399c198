using CourseSim.Courses;
using CourseSim.Entities;
using CourseSim.Random;
using CourseSim.Wind;

namespace CourseSim.Engine;

/// <summary>
/// Everything the systems of one race share: the world of board entities, the fleet's cold data, the wind, the course,
/// the settings, the step snapshot and the neighbour grid, the log, and the clock. One per race (no process-wide
/// state): many races run in parallel, each single-threaded. Every mutable field here is saved by a checkpoint.
/// </summary>
public sealed class RaceContext
{
    public RaceSetup Setup { get; }
    public RaceSettings Settings => Setup.Race;
    public RuleSettings Rules => Setup.Rules;
    public Course Course => Setup.Course;
    public World World { get; }
    public Fleet Fleet { get; }
    public WindField Wind { get; }
    public WindShadow Shadow { get; }
    public StepSnapshot Snapshot { get; }
    public NeighbourGrid Grid { get; }
    /// <summary>Counts of the rules' costliest calls (for the benchmark; no system reads them).</summary>
    public WorkCounts Work { get; } = new();
    public RaceLog Log { get; internal set; }
    public CommandBuffer Commands { get; } = new();
    public Recorder Recorder { get; internal set; }
    /// <summary>Boards racing or waiting (not finished, not out), and every board.</summary>
    public Query Active { get; }
    public Query All { get; }

    public double Dt { get; }
    public double StepHz { get; }
    /// <summary>Time from the starting signal at the start of this step, s (negative before it).</summary>
    public double Time { get; internal set; }
    public long StepIndex { get; internal set; }
    public int Finished { get; internal set; }
    /// <summary>Time of the next recorded sample, s.</summary>
    public double NextRecordS { get; internal set; }
    /// <summary>Every board samples the wind once in this many steps (its <see cref="Fleet.SenseSlot"/> says when).</summary>
    public int SenseEvery { get; }
    public int LookoutEvery { get; }

    public CounterRng FallRng { get; }
    public CounterRng TacticRng { get; }

    /// <summary>The rules' memory of conflicts a rider has seen as theirs to keep clear of: key (keep-clear board, other).</summary>
    public ForeseenConflicts Foreseen { get; internal set; }
    /// <summary>Pairs in contact now, row the board of the lower index (a contact is judged once, when it begins).</summary>
    public PairRows<bool> Touching { get; internal set; }
    /// <summary>Each board's speed at the last lookout (for the acceleration a rider reads), m/s.</summary>
    public double[] LookoutSpeed { get; }
    /// <summary>Each board's acceleration as read at the last lookout, m/s2.</summary>
    public double[] LookoutAccel { get; }
    /// <summary>The shadow sources at the last rebuild, in canonical order (a checkpoint rebuilds the shadows from them).</summary>
    public ShadowSource[] ShadowSources { get; }

    public RaceContext(RaceSetup setup, Fleet fleet, World world)
    {
        Setup = setup; Fleet = fleet; World = world;
        Dt = 1.0 / setup.Race.StepHz; StepHz = setup.Race.StepHz;
        SenseEvery = EveryOf(setup.Race.StepHz, setup.Race.WindHz);
        LookoutEvery = EveryOf(setup.Race.StepHz, setup.Rules.LookoutHz);
        Wind = new WindField(setup.Wind, setup.Race.Seed);
        int n = fleet.Count;
        Shadow = new WindShadow(setup.Wind);
        Shadow.Reserve(n);
        Snapshot = new StepSnapshot(n);
        Grid = new NeighbourGrid(n, RulesRangeM);
        // Room up front (capacity changes no order: entries are kept in insertion order), so the step does not grow them.
        Foreseen = new(n);
        Touching = new(n, 4);
        Log = new RaceLog(n);
        Recorder = new Recorder(n, setup.Race.RecordIntervalS, -setup.Race.CountdownS);
        FallRng = new CounterRng(setup.Race.Seed, CounterRng.Streams.Falls);
        TacticRng = new CounterRng(setup.Race.Seed, CounterRng.Streams.Tactics);
        LookoutSpeed = new double[n]; LookoutAccel = new double[n];
        ShadowSources = new ShadowSource[n];
        Time = -setup.Race.CountdownS;
        NextRecordS = Time;
        Active = world.Query().With<BoardId>().With<Pose>().With<Motion>().Without<Done>();
        All = world.Query().With<BoardId>().With<Pose>();
    }

    /// <summary>How far the rules' lookout scans for other boards, m (model value: 6 s at the closing speed of two planing boards).</summary>
    public const double RulesRangeM = 100;

    /// <summary>Steps per occurrence of something done at <paramref name="hz"/> (at least 1).</summary>
    public static int EveryOf(double stepHz, double hz) => Math.Max(1, (int)Math.Round(stepHz / Math.Min(hz, stepHz)));

    /// <summary>Whether this step is a lookout step (the rules' neighbour pairs are rebuilt and riders look out).</summary>
    public bool IsLookoutStep => StepIndex % LookoutEvery == 0;
    /// <summary>The phase of this step in the wind sampling cycle (0 rebuilds the shadows).</summary>
    public int SensePhase => (int)(StepIndex % SenseEvery);

    public void AddEvent(int board, RaceEventKind kind, in Pose p, string detail = "") => Log.Add(Time, board, kind, p.X, p.Y, detail);
    /// <summary>An event whose text is made when read: <c>string.Format(format, a, b, value)</c> (<see cref="RaceEvent"/>).</summary>
    public void AddEvent(int board, RaceEventKind kind, in Pose p, string format, string? a, string? b, double value) =>
        Log.Add(Time, board, kind, p.X, p.Y, format, a, b, value);

    /// <summary>A key for an ordered pair of boards (a's view of b).</summary>
    public static long PairKey(int a, int b) => ((long)a << 32) | (uint)b;
}

/// <summary>A conflict a rider has seen as theirs to keep clear of: since when (s), under which rule, the other's heading then (rad).</summary>
public readonly record struct Foreseen(double SinceS, byte Rule, double OtherHeading);

/// <summary>Tag: a board that has finished or is out of the race; the step's systems skip it.</summary>
public struct Done { }
