using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CourseSim.Courses;
using CourseSim.Entities;
using CourseSim.Random;
using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Engine;

/// <summary>Time spent in each system (Stopwatch ticks), for benchmarks.</summary>
public sealed class SystemTimings
{
    public static readonly string[] Names = ["sense wind", "decide", "trim and forces", "integrate", "manoeuvres", "course progress", "rules"];
    public long[] Ticks { get; } = new long[Names.Length];
    public long Steps { get; private set; }
    internal void Add(params ReadOnlySpan<long> t) { for (int i = 0; i < t.Length; i++) Ticks[i] += t[i]; Steps++; }
    /// <summary>Nanoseconds per board-step in system i.</summary>
    public double NsPerBoardStep(int i, int boards) => Ticks[i] * 1e9 / System.Diagnostics.Stopwatch.Frequency / Math.Max(1, Steps * (long)boards);
}

/// <summary>Tag: a board that has finished or is out of the race; the step's systems skip it.</summary>
public struct Done { }

/// <summary>
/// One race: a world of board entities stepped at a fixed rate through an explicit, ordered list of systems
/// (docs/engine.md): sense wind -> decide -> trim -> forces -> integrate -> manoeuvres -> course progress -> record.
/// Single-threaded and deterministic: the same setup and seed give bit-identical results on any machine load.
/// </summary>
public sealed partial class Race
{
    public const string EngineVersion = "coursesim-engine/1";

    public RaceSetup Setup { get; }
    public World World { get; } = new();
    public WindField Wind { get; }
    public WindShadow Shadow { get; }
    public Course Course => Setup.Course;
    public RaceSettings Settings => Setup.Race;
    public ulong Seed => Settings.Seed;
    /// <summary>Time from the starting signal, s (negative before it).</summary>
    public double Time { get; private set; }
    public long StepIndex { get; private set; }
    public double Dt { get; }
    public bool IsOver { get; private set; }
    public Recorder Recorder { get; }
    public IReadOnlyList<RaceEvent> Events => _events;
    public int BoardCount => _entities.Length;
    /// <summary>When set, each system's time is added up here (benchmarks; off by default).</summary>
    public SystemTimings? Timings { get; set; }

    readonly Entity[] _entities;
    readonly RigPolar[] _rigs;
    readonly double[] _skill, _sheetGain, _crossYaw, _invCarveRadius, _restDecay, _dtOverMass;
    readonly double _stepHz;
    readonly List<double>[] _splits;
    readonly Vec2[] _spot, _wait;
    readonly double[] _goMargin;
    readonly List<RaceEvent> _events = new();
    readonly ShadowSource[] _sources;
    readonly CommandBuffer _commands = new();
    readonly Query _active, _all;
    readonly CounterRng _fallRng, _tacticRng;
    int _finished;
    readonly int _senseEvery;
    int _sensePhase;
    readonly int[] _senseSlot;
    readonly RigDynamics[] _rig;
    readonly bool _pumping, _falls;
    readonly double _fallsFromS, _decisionS;
    double _nextRecord;

    /// <summary>
    /// Builds the race. <paramref name="rigFor"/> resolves a set-up to its tables (default: the process-wide cache).
    /// </summary>
    public Race(RaceSetup setup, Func<Equilibrium.Equipment, RigPolar>? rigFor = null)
    {
        Setup = setup;
        Dt = 1.0 / setup.Race.StepHz;
        _stepHz = setup.Race.StepHz;
        _senseEvery = Math.Max(1, (int)Math.Round(setup.Race.StepHz / Math.Min(setup.Race.WindHz, setup.Race.StepHz)));
        Wind = new WindField(setup.Wind, setup.Race.Seed);
        Shadow = new WindShadow(setup.Wind);
        int n = setup.Boards.Count;
        _entities = new Entity[n];
        _rigs = new RigPolar[n];
        _rig = new RigDynamics[n];
        _senseSlot = new int[n];
        _pumping = setup.Race.Pumping;
        _falls = setup.Race.Falls;
        _fallsFromS = -setup.Race.CountdownS + 5; // no falls in the first seconds, while the fleet gets going
        _decisionS = setup.Race.DecisionIntervalS;
        _skill = new double[n]; _sheetGain = new double[n]; _crossYaw = new double[n]; _invCarveRadius = new double[n]; _restDecay = new double[n]; _dtOverMass = new double[n];
        _splits = new List<double>[n];
        _spot = new Vec2[n]; _wait = new Vec2[n]; _goMargin = new double[n];
        _sources = new ShadowSource[n];
        _fallRng = new CounterRng(Seed, CounterRng.Streams.Falls);
        _tacticRng = new CounterRng(Seed, CounterRng.Streams.Tactics);
        rigFor ??= RigPolar.For;
        // Set-ups are resolved in parallel (each is a pure function of its equipment, so the result does not depend on
        // the thread count); the race itself is single-threaded.
        var distinct = setup.Boards.Select(b => b.Equipment).Distinct().ToArray();
        var resolved = new RigPolar[distinct.Length];
        var build = rigFor;
        Parallel.For(0, distinct.Length, k => resolved[k] = build(distinct[k]));
        var byEquipment = new Dictionary<Equilibrium.Equipment, RigPolar>();
        for (int k = 0; k < distinct.Length; k++) byEquipment[distinct[k]] = resolved[k];
        Time = -setup.Race.CountdownS;
        for (int i = 0; i < n; i++)
        {
            var b = setup.Boards[i];
            _rigs[i] = byEquipment[b.Equipment];
            _rig[i] = _rigs[i].Rig;
            _senseSlot[i] = (_senseEvery - i % _senseEvery) % _senseEvery; // board i samples when (i + phase) % every == 0
            _skill[i] = b.Equipment.Rider.Skill;
            _sheetGain[i] = Math.Min(1, Dt / Tuning.Lerp(Tuning.SheetLagExpertS, Tuning.SheetLagNoviceS, _skill[i]));
            // Stepping round the mast the board swings through twice the cross-over angle in the crossing time.
            _crossYaw[i] = Units.Unit.DegToRad(2 * Tuning.TackCrossStartDeg) / Tuning.Lerp(Tuning.TackCrossExpertS, Tuning.TackCrossNoviceS, _skill[i]);
            _invCarveRadius[i] = 1 / Tuning.Lerp(Tuning.CarveRadiusExpertM, Tuning.CarveRadiusNoviceM, _skill[i]);
            _restDecay[i] = _rig[i].Rider.RestingDecay(Dt);
            _dtOverMass[i] = Dt / _rig[i].MassKg;
            _splits[i] = new List<double>();
            var e = World.Create(new BoardId { Value = i }, new Pose(), new Motion());
            World.Add(e, new RigRef { Index = i });
            World.Add(e, new SensedWind());
            World.Add(e, new Trim { AppDownX = double.NaN, AppDownY = double.NaN });
            World.Add(e, new RiderState { ReserveJ = _rigs[i].Rig.Physics.Rider.ReserveJ });
            World.Add(e, new Intent { Power = 0.5, NextDecisionS = Time + (i % 10) * 0.05 });
            World.Add(e, new ManoeuvreState());
            World.Add(e, new RaceStatus { State = RaceState.PreStart });
            _entities[i] = e;
        }
        _active = World.Query().With<BoardId>().With<Pose>().With<Motion>().Without<Done>();
        _all = World.Query().With<BoardId>().With<Pose>();
        PlaceFleet();
        Recorder = new Recorder(n, setup.Race.RecordIntervalS, Time);
        _nextRecord = Time;
    }

    public RigPolar RigOf(int board) => _rigs[board];
    public Entity EntityOf(int board) => _entities[board];
    public IReadOnlyList<double> SplitsOf(int board) => _splits[board];

    /// <summary>One fixed step: the systems in order, then structural changes, then the clock.</summary>
    public void Step()
    {
        if (IsOver) return;
        EnsureTacticArrays();
        if (Timings is { } tm)
        {
            long r0 = System.Diagnostics.Stopwatch.GetTimestamp();
            RulesLookout();
            long t0 = System.Diagnostics.Stopwatch.GetTimestamp();
            SenseWind(); long t1 = System.Diagnostics.Stopwatch.GetTimestamp();
            Decide(); long t2 = System.Diagnostics.Stopwatch.GetTimestamp();
            TrimAndForces(); long t3 = System.Diagnostics.Stopwatch.GetTimestamp();
            Integrate(); long t4 = System.Diagnostics.Stopwatch.GetTimestamp();
            Manoeuvres(); long t5 = System.Diagnostics.Stopwatch.GetTimestamp();
            CourseProgress(); long t6 = System.Diagnostics.Stopwatch.GetTimestamp();
            CheckContacts(); long t7 = System.Diagnostics.Stopwatch.GetTimestamp();
            tm.Add(t1 - t0, t2 - t1, t3 - t2, t4 - t3, t5 - t4, t6 - t5, t0 - r0 + t7 - t6);
        }
        else
        {
            RulesLookout();
            StepFused();
            CheckContacts();
        }
        _commands.Playback(World);
        Time += Dt;
        StepIndex++;
        if (Time >= _nextRecord - 1e-9) { Record(); _nextRecord += Settings.RecordIntervalS; }
        if (_finished == BoardCount || Time >= Settings.TimeLimitS) EndRace();
    }

    /// <summary>
    /// The same systems in the same order, board by board in one pass. Every system after the shadow rebuild reads and
    /// writes only its own board's components (the shadows were built from the positions at the start of the step, the
    /// wind field is a pure function, structural changes wait in the command buffer), so this gives exactly the results
    /// of running each system over the whole fleet in turn, as the timed path does, with one walk over the data.
    /// </summary>
    void StepFused()
    {
        int phase = BuildShadows();
        double k = Math.Min(1, _senseEvery * Dt / Tuning.PerceptionLagS);
        bool first = StepIndex == 0;
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>(); var sw = chunk.Span<SensedWind>();
            var trim = chunk.Span<Trim>(); var rider = chunk.Span<RiderState>(); var intent = chunk.Span<Intent>();
            var man = chunk.Span<ManoeuvreState>(); var st = chunk.Span<RaceStatus>(); var ents = chunk.Entities;
            // All columns of a chunk have its length: walk them by reference (no per-access bounds checks).
            int count = ids.Length;
            if (pose.Length != count || mo.Length != count || sw.Length != count || trim.Length != count || rider.Length != count
                || intent.Length != count || man.Length != count || st.Length != count || ents.Length != count)
                throw new InvalidOperationException("a chunk's columns differ in length");
            ref var id0 = ref MemoryMarshal.GetReference(ids); ref var pose0 = ref MemoryMarshal.GetReference(pose);
            ref var mo0 = ref MemoryMarshal.GetReference(mo); ref var sw0 = ref MemoryMarshal.GetReference(sw);
            ref var trim0 = ref MemoryMarshal.GetReference(trim); ref var rider0 = ref MemoryMarshal.GetReference(rider);
            ref var intent0 = ref MemoryMarshal.GetReference(intent); ref var man0 = ref MemoryMarshal.GetReference(man);
            ref var st0 = ref MemoryMarshal.GetReference(st);
            for (int i = 0; i < count; i++)
            {
                int b = Unsafe.Add(ref id0, i).Value;
                ref var p = ref Unsafe.Add(ref pose0, i); ref var m = ref Unsafe.Add(ref mo0, i); ref var w = ref Unsafe.Add(ref sw0, i);
                ref var t = ref Unsafe.Add(ref trim0, i); ref var r = ref Unsafe.Add(ref rider0, i); ref var it = ref Unsafe.Add(ref intent0, i);
                ref var mn = ref Unsafe.Add(ref man0, i); ref var s = ref Unsafe.Add(ref st0, i);
                // The guards of SenseOne and DecideOne, here, so the boards not due this step make no call.
                if (first || _senseSlot[b] == phase) SenseOne(b, phase, first, k, in p, ref w);
                if (Time >= it.NextDecisionS) DecideOne(b, in p, in w, ref it, in s, in mn, m.Speed);
                ApplyIntent(b, ref it, in p, in w, in mn, in s);
                TrimOne(b, in p, ref m, in w, ref t, ref r, in it, in mn);
                IntegrateOne(b, ref p, ref m, in t, in it, in mn);
                ManoeuvreOne(b, ref p, ref m, in w, ref t, in it, ref mn, ref s);
                ProgressOne(b, ents[i], in p, ref s);
            }
        }
    }

    /// <summary>Runs to the end; <paramref name="progress"/> gets the share of the time limit done or the share finished, whichever is more.</summary>
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

    /// <summary>Share of the race done (0..1): by the clock against an estimate, or by boards finished.</summary>
    public double ProgressShare
    {
        get
        {
            double total = Settings.CountdownS + Math.Min(Settings.TimeLimitS, EstimatedDurationS * 1.3);
            double byTime = (Time + Settings.CountdownS) / total;
            return Math.Clamp(Math.Max(byTime * (_finished > 0 ? 1 : 0.98), (double)_finished / BoardCount), 0, IsOver ? 1 : 0.99);
        }
    }

    double? _estimate;
    /// <summary>Estimated race duration for the first board's rig at the mean wind, s (for progress only).</summary>
    public double EstimatedDurationS => _estimate ??= Estimate();

    double Estimate()
    {
        double tws = Unit.KnotsToMs(Setup.Wind.SpeedKn), t = 0;
        var prev = Course.Start.Mid;
        var rig = _rigs[0];
        var up = Vec2.FromBearing(Setup.Wind.DirectionDeg);
        foreach (var s in Course.Steps)
        {
            var leg = s.Target - prev;
            double cos = Vec2.Dot(leg.Unit(), up), twa = Math.Acos(Math.Clamp(cos, -1, 1));
            double up0 = rig.BestTwa(tws, true), down0 = rig.BestTwa(tws, false);
            double vmg = twa < up0 ? rig.BestVmg(tws, true) / Math.Max(cos, 0.2) : twa > down0 ? rig.BestVmg(tws, false) / Math.Max(-cos, 0.2) : rig.Speed(tws, twa);
            t += leg.Length / Math.Max(vmg, 0.5);
            prev = s.Target;
        }
        return t;
    }

    void EndRace()
    {
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var st = chunk.Span<RaceStatus>(); var pose = chunk.Span<Pose>();
            for (int i = 0; i < chunk.Count; i++)
            {
                if (st[i].State == RaceState.Finished) continue;
                st[i].State = RaceState.NotFinished;
                _events.Add(new RaceEvent(Time, ids[i].Value, RaceEventKind.NotFinished, pose[i].X, pose[i].Y, Time >= Settings.TimeLimitS ? "time limit" : ""));
            }
        }
        Record();
        IsOver = true;
    }

    void AddEvent(int board, RaceEventKind kind, in Pose p, string detail = "") => _events.Add(new RaceEvent(Time, board, kind, p.X, p.Y, detail));

    /// <summary>The race's result so far (final once <see cref="IsOver"/>).</summary>
    public RaceResult Result()
    {
        var rows = new List<BoardResult>();
        var order = new List<(int Board, double T)>();
        foreach (var chunk in _all)
        {
            var ids = chunk.Span<BoardId>(); var st = chunk.Span<RaceStatus>();
            for (int i = 0; i < chunk.Count; i++)
                if (st[i].State == RaceState.Finished) order.Add((ids[i].Value, st[i].FinishedS));
        }
        order.Sort((a, b) => a.T != b.T ? a.T.CompareTo(b.T) : a.Board.CompareTo(b.Board));
        var place = new Dictionary<int, int>();
        for (int i = 0; i < order.Count; i++) place[order[i].Board] = i + 1;
        double? best = order.Count > 0 ? order[0].T : null;
        for (int b = 0; b < BoardCount; b++)
        {
            var e = _entities[b];
            var st = World.Get<RaceStatus>(e); var m = World.Get<Motion>(e);
            bool fin = st.State == RaceState.Finished;
            double? el = fin ? st.FinishedS : null;
            double sailing = fin ? st.FinishedS : Math.Max(Time, 1e-9);
            rows.Add(new BoardResult(b, Setup.Boards[b].Name, Setup.Boards[b].Equipment.Name, place.TryGetValue(b, out int p) ? p : null, fin, el,
                fin && best is double bt ? st.FinishedS - bt : null, _splits[b].ToArray(), m.Distance,
                m.Distance / Math.Max(sailing, 1e-9), st.Tacks, st.Gybes, st.Falls, st.Ocs, st.WrongSide, PenaltiesOf(b), _giveWays.Length > b ? _giveWays[b] : 0, PenaltiesOwedBy(b)));
        }
        // Events in time order (ties: board, then kind), whichever way the step walked the fleet.
        var events = _events.Select((e, n) => (e, n)).OrderBy(x => x.e.TimeS).ThenBy(x => x.e.Board).ThenBy(x => x.e.Kind).ThenBy(x => x.n)
            .Select(x => x.e).ToArray();
        return new RaceResult(Seed, Setup.Name, Time, rows, events, EngineVersion) { Incidents = _incidents.ToArray() };
    }
}
