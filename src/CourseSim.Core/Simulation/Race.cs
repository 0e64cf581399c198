using CourseSim.Agents;
using CourseSim.Engine;
using CourseSim.Engine.Systems;
using CourseSim.Entities;
using CourseSim.Equilibrium;
using CourseSim.Rules;
using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Simulation;

/// <summary>
/// One race: a world of board entities stepped at a fixed rate through one ordered pipeline of systems (docs/engine.md):
/// sense wind -> snapshot -> observe -> decide -> trim -> forces -> integrate -> manoeuvres -> course progress -> rules
/// (lookout, contacts) -> record. Single-threaded and deterministic: the same setup and seed give bit-identical results
/// on any machine load and in any order of the boards in the scenario (docs/engine.md, "Determinism").
/// </summary>
public sealed class Race
{
    public const string EngineVersion = "coursesim-engine/2";

    readonly RaceContext _c;
    readonly DecideSystem _decide;

    public RaceSetup Setup { get; }
    public World World { get; } = new();
    public Pipeline Pipeline { get; }
    public RaceContext Context => _c;
    public WindField Wind => _c.Wind;
    public WindShadow Shadow => _c.Shadow;
    public Courses.Course Course => Setup.Course;
    public RaceSettings Settings => Setup.Race;
    public ulong Seed => Settings.Seed;
    /// <summary>Time from the starting signal, s (negative before it).</summary>
    public double Time => _c.Time;
    public long StepIndex => _c.StepIndex;
    public double Dt => _c.Dt;
    public bool IsOver { get; private set; }
    public Recorder Recorder => _c.Recorder;
    public IReadOnlyList<RaceEvent> Events => _c.Log.Events;
    public IReadOnlyList<RaceIncident> Incidents => _c.Log.Incidents;
    public int BoardCount => _c.Fleet.Count;
    public Fleet Fleet => _c.Fleet;
    /// <summary>When set, each system's time is added up here (benchmarks; off by default). Results do not change.</summary>
    public SystemTimings? Timings
    {
        get => _timings;
        // Bound to the systems when set (its arrays made here), so a timed step allocates no more than an untimed one.
        set { _timings = value; value?.Bind(Pipeline.Systems); }
    }
    SystemTimings? _timings;

    /// <summary>
    /// Builds the race. <paramref name="rigFor"/> resolves a set-up to its tables (default: a cache of this race's own;
    /// a batch passes one cache for all its races). <paramref name="tactics"/>: the tactic registry (default: the built-in
    /// tactics and those of the scenario's assemblies).
    /// </summary>
    public Race(RaceSetup setup, Func<Equipment, RigPolar>? rigFor = null, TacticRegistry? tactics = null)
    {
        Setup = setup;
        rigFor ??= new RigCache().For;
        var fleet = new Fleet(setup.Boards, rigFor, 1.0 / setup.Race.StepHz, RaceContext.EveryOf(setup.Race.StepHz, setup.Race.WindHz));
        _c = new RaceContext(setup, fleet, World);
        for (int b = 0; b < fleet.Count; b++)
        {
            var e = World.Create(new BoardId { Value = b }, new Pose(), new Motion());
            World.Add(e, new SensedWind());
            World.Add(e, new Trim { AppDownX = double.NaN, AppDownY = double.NaN });
            World.Add(e, new RiderState { ReserveJ = fleet.Rigs[b].Physics.Rider.ReserveJ });
            // Decisions staggered over half a second by identity.
            World.Add(e, new Intent { Power = 0.5, NextDecisionS = Time + (fleet.Keys[b] % 10) * 0.05 });
            World.Add(e, new ManoeuvreState());
            World.Add(e, new RaceStatus { State = RaceState.PreStart });
            World.Add(e, new Helm { WantP = 0.5, PendAt = double.PositiveInfinity, HoldTwaDeg = double.NaN });
            World.Add(e, new Perception { LastTurnS = double.NegativeInfinity });
            World.Add(e, new StartPlan());
            World.Add(e, new GiveWay { DeferS = double.NaN });
            World.Add(e, new Penalty());
            World.Add(e, new Wake { TurnStartS = double.NegativeInfinity });
            fleet.Entities[b] = e;
        }
        // Room up front in the archetype finished boards move to (tagged Done), so finishing allocates nothing in the step.
        if (fleet.Count > 0) World.Reserve<Done>(fleet.Entities[0], fleet.Count);
        StartPlanner.PlaceFleet(_c);
        _decide = new DecideSystem(_c, tactics ?? TacticRegistry.With(setup.TacticAssemblies));
        Pipeline = new Pipeline(
        [
            new SenseWindSystem(), new SnapshotSystem(), new Lookout(), new ObserveSystem(), _decide, new TrimSystem(), new ForcesSystem(),
            new IntegrateSystem(), new ManoeuvreSystem(), new CourseProgressSystem(), new ContactSystem(), new RecordSystem(),
        ]);
        _c.Snapshot.Capture(_c.All, Time);
        // The racing boards' query lists its archetypes on first use: done here, not in the first step.
        foreach (var _ in _c.Active) { }
        // Room for the whole race's samples up front (no growing in the step): the estimated duration with a margin.
        double roomS = Settings.CountdownS + Math.Min(Settings.TimeLimitS, 2.5 * EstimatedDurationS + 300);
        _c.Recorder = new Recorder(fleet.Count, Settings.RecordIntervalS, Time, (int)Math.Min(1 << 20, roomS / Settings.RecordIntervalS) + 2);
        // The same for the events: the 40-board demo logs about 0.08 a board a second (3,100 events and incidents in its
        // 958 s, countdown included); over the recorder's margin that is room for 168 a board there, against 78 logged.
        _c.Log.Reserve((int)Math.Min(1 << 24, fleet.Count * (32 + EventsPerBoardS * roomS)));
    }

    /// <summary>Events a board is given room for per second of the race's length (model value: the 40-board demo's rate).</summary>
    const double EventsPerBoardS = 0.08;

    public RigPolar RigOf(int board) => _c.Fleet.Polars[board];
    public Entity EntityOf(int board) => _c.Fleet.Entities[board];
    public IReadOnlyList<double> SplitsOf(int board) => _c.Log.Splits[board];
    /// <summary>Penalty turns taken by a board (served in full), and those it still owes.</summary>
    public int PenaltiesOf(int board) => World.Get<Penalty>(EntityOf(board)).Taken;
    public int PenaltiesOwedBy(int board) => World.Get<Penalty>(EntityOf(board)).Owed;

    /// <summary>One fixed step: the pipeline, then structural changes, then the clock; the race ends when all have finished or at the time limit.</summary>
    public void Step()
    {
        if (IsOver) return;
        Pipeline.Step(_c, Timings);
        _c.Commands.Playback(World);
        _c.Time += _c.Dt;
        _c.StepIndex++;
        if (_c.Finished == BoardCount || _c.Time >= Settings.TimeLimitS) EndRace();
    }

    /// <summary>Runs to the end; <paramref name="progress"/> gets the share of the race done.</summary>
    public RaceResult Run(Action<double>? progress = null, CancellationToken cancel = default)
    {
        long every = Math.Max(1, (long)(Settings.StepHz * 5));
        while (!IsOver)
        {
            cancel.ThrowIfCancellationRequested();
            Step();
            if (progress is not null && StepIndex % every == 0) progress(ProgressShare);
        }
        progress?.Invoke(1);
        return Result();
    }

    /// <summary>
    /// Pins a board to a true wind angle (deg, positive = starboard tack) at full power, whatever its tactic: the engine's
    /// own polar check. Before the first step the board is placed on that heading; under way it turns. NaN releases it.
    /// </summary>
    public void HoldTrueWindAngle(int board, double twaDeg)
    {
        var e = EntityOf(board);
        World.Get<Helm>(e).HoldTwaDeg = twaDeg;
        if (StepIndex > 0 || double.IsNaN(twaDeg)) return;
        double h = Unit.WrapRadPi(Unit.DegToRad(Setup.Wind.DirectionDeg - twaDeg));
        World.Get<Pose>(e).Heading = h;
        World.Get<Intent>(e).Heading = h;
        ref var helm = ref World.Get<Helm>(e);
        helm.WantH = h; helm.PlannedH = h;
        ref var m = ref World.Get<Motion>(e);
        m.TrackSin = Math.Sin(h); m.TrackCos = Math.Cos(h);
    }

    /// <summary>
    /// Puts a board somewhere under way, racing towards its next course step: for scripted encounters (the rules' tests,
    /// docs/tactics.md) and studies that start mid-race. Heading in compass degrees, speed in m/s. Call between steps.
    /// </summary>
    public void Place(int board, double x, double y, double headingDeg, double speedMs, int nextStep = 0)
    {
        var e = EntityOf(board);
        double h = Unit.WrapRadPi(Unit.DegToRad(headingDeg));
        World.Get<Pose>(e) = new Pose { X = x, Y = y, Heading = h };
        ref var m = ref World.Get<Motion>(e);
        m.Speed = speedMs; m.Leeway = 0; m.YawRate = 0; m.TrackSin = Math.Sin(h); m.TrackCos = Math.Cos(h);
        ref var it = ref World.Get<Intent>(e);
        it.Heading = h; it.Power = 1;
        ref var helm = ref World.Get<Helm>(e);
        helm.WantH = h; helm.WantP = 1; helm.PlannedH = h; helm.PendAt = double.PositiveInfinity;
        World.Get<ManoeuvreState>(e) = new ManoeuvreState();
        ref var st = ref World.Get<RaceStatus>(e);
        st.State = RaceState.Racing; st.Ocs = false; st.NextStep = nextStep; st.StartedS = Time;
        ref var wake = ref World.Get<Wake>(e);
        wake.PrevX = x; wake.PrevY = y; wake.HistN = 0;
        _c.Snapshot.Capture(_c.All, Time);
    }

    /// <summary>Share of the race done (0..1): by the clock against an estimate, or by boards finished.</summary>
    public double ProgressShare
    {
        get
        {
            double total = Settings.CountdownS + Math.Min(Settings.TimeLimitS, EstimatedDurationS * 1.3);
            double byTime = (Time + Settings.CountdownS) / total;
            return Math.Clamp(Math.Max(byTime * (_c.Finished > 0 ? 1 : 0.98), (double)_c.Finished / BoardCount), 0, IsOver ? 1 : 0.99);
        }
    }

    double? _estimate;
    /// <summary>Estimated race duration for the first board's rig at the mean wind, s (for progress and the recorder's size).</summary>
    public double EstimatedDurationS => _estimate ??= RaceResults.Estimate(Setup, _c.Fleet.Polars[0]);

    void EndRace()
    {
        foreach (var chunk in _c.Active)
        {
            var ids = chunk.Span<BoardId>(); var st = chunk.Span<RaceStatus>(); var pose = chunk.Span<Pose>();
            for (int i = 0; i < chunk.Count; i++)
            {
                if (st[i].State == RaceState.Finished) continue;
                st[i].State = RaceState.NotFinished;
                _c.Log.Add(Time, ids[i].Value, RaceEventKind.NotFinished, pose[i].X, pose[i].Y, Time >= Settings.TimeLimitS ? "time limit" : "");
            }
        }
        RecordSystem.Sample(_c);
        IsOver = true;
    }

    /// <summary>The race's result so far (final once <see cref="IsOver"/>).</summary>
    public RaceResult Result() => RaceResults.Build(this, _c);

    /// <summary>Saves the whole state of the race now (between steps): restore it into this race or another race of the same setup.</summary>
    public RaceCheckpoint Save() => RaceCheckpoint.Take(_c, _decide, IsOver);

    /// <summary>Puts the race back to a saved state; stepping on gives exactly what stepping on from the save gave.</summary>
    public void Restore(RaceCheckpoint cp) => IsOver = cp.Restore(_c, _decide);

    /// <summary>SHA-256 of the race's whole state: every board component, clock, log and recorder (docs/engine.md, "Golden hashes").</summary>
    public string StateHash() => RaceCheckpoint.Hash(_c);
}
