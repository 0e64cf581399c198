using System.Diagnostics;
using CourseSim.Engine;
using CourseSim.Equilibrium;

namespace CourseSim.Benchmarks;

/// <summary>Options of the report commands (defaults keep `report` to a few minutes on a loaded 2-core machine).</summary>
public sealed record ReportOptions
{
    public int Repeats { get; init; } = 3;
    public int BigBoards { get; init; } = 2000;
    public double AfterStartS { get; init; } = 120;
    public bool BigTimings { get; init; }
    public int BatchRaces { get; init; } = 12;
    public int Threads { get; init; } = 2;
}

/// <summary>
/// The issue-17 figures for one core: a whole race of the 40-board demo, 2,000 boards against 40, bytes allocated per
/// board-step and time per system, each beside the bare double-precision integrator measured in the same run.
/// </summary>
public static class RaceReport
{
    const long BaselineAgentSteps = 2_000_000;

    /// <summary>The rules' work counts, labelled, as `report` and `race-loop` print them.</summary>
    internal static readonly (string Name, Func<WorkCounts, long> Of)[] WorkRows =
    [
        ("neighbours checked in threat scans", w => w.NeighbourChecks), ("give-way searches", w => w.GiveWaySearches),
        ("candidate courses vetted in them", w => w.CandidatesVetted),
        ("hull-gap predictions", w => w.HullGapProbes), ("boards the grid looked at", w => w.GridCandidates),
    ];

    public static void Run(ReportOptions o)
    {
        double sink = 0;
        var demo = Demo.Fleet40();
        double countdown = demo.Race.CountdownS;

        // Warm-up: the bare loop, then a throw-away short race (countdown and a minute) so the JIT has tiered up the
        // engine (dynamic PGO recompiles hot methods after their first calls) before anything is timed.
        BareIntegrator.MeasureNs(40, BaselineAgentSteps / 4, ref sink);
        BareIntegrator.MeasureNs(2000, BaselineAgentSteps / 4, ref sink);
        var jit0 = System.Runtime.JitInfo.GetCompilationTime();
        var sw = Stopwatch.StartNew();
        var warm = new Race(Demo.Fleet40("race.time_limit_s=60"));
        warm.Run();
        Console.WriteLine($"warm-up race (40 boards, countdown + 60 s, rig tables built): {sw.Elapsed.TotalSeconds:F2} s wall, " +
                          $"JIT {(System.Runtime.JitInfo.GetCompilationTime() - jit0).TotalMilliseconds:F0} ms, {System.Runtime.JitInfo.GetCompiledMethodCount()} methods compiled so far");
        Thread.Sleep(300); // let the background tier-1 compiles land
        RunScaledWindow(demo, 40, 60, o.AfterStartS, new RigCache()); // second warm-up, through the start and after it

        // Construction, timed apart from the race.
        var cache = new RigCache();
        double c0 = Machine.ThreadCpuS();
        foreach (var b in demo.Boards) cache.For(b.Equipment);
        double rigS = Machine.ThreadCpuS() - c0;
        Console.WriteLine();
        Console.WriteLine($"construction (not in any race timing below): rig tables for the demo's {cache.Count} distinct rigs {rigS * 1e3:F0} ms CPU; " +
                          $"the race itself (wind field, fleet, recorder) is timed per repeat below");

        WholeRace(demo, countdown, cache, o, ref sink);
        Scaling(demo, cache, o, ref sink);
        Allocation(demo, cache);
        Systems(demo, cache, o);
        if (sink == 42) Console.WriteLine(); // keeps the baseline's work alive
    }

    static void WholeRace(RaceSetup demo, double countdown, RigCache cache, ReportOptions o, ref double sink)
    {
        Console.WriteLine();
        Console.WriteLine($"== 1-2. whole race of {Path.GetFileName(Demo.Fleet40Path)} ({demo.Boards.Count} boards, seed {demo.Race.Seed}, shadows {(demo.Wind.Shadows ? "on" : "off")}, " +
                          $"tactics and rules on, single thread), {o.Repeats} repeats, each beside a bare-integrator stretch");
        string[] names = ["countdown's first minute", "later (to the end)"];
        var runs = new List<RaceRun>();
        var bare40 = new List<double>(); var bare2000 = new List<double>(); var ratio = new List<double>();
        // A throw-away race first on the same cache: the polar rows are built on first use, one wind speed at a time,
        // and the race meets winds the warm-up's first minutes did not; without it the first repeat timed table
        // building (a single repeat then read about 9,000 ns a board-step).
        double t0 = Machine.ThreadCpuS();
        new Race(demo, cache.For).Run();
        Console.WriteLine($"  (a throw-away race first on the same rig cache, {Machine.ThreadCpuS() - t0:F1} s CPU, builds the polar rows its winds need)");
        for (int r = 0; r < o.Repeats; r++)
        {
            double b40 = BareIntegrator.MeasureNs(40, BaselineAgentSteps, ref sink);
            bare40.Add(b40);
            bare2000.Add(BareIntegrator.MeasureNs(2000, BaselineAgentSteps, ref sink));
            var run = RaceRun.Time(demo, cache.For, names, [-countdown + 60, double.PositiveInfinity], hash: true);
            runs.Add(run);
            ratio.Add(run.TotalNsPerBoardStep / b40);
        }
        var total = runs.Select(x => x.TotalNsPerBoardStep).ToList();
        Console.WriteLine($"  bare integrator, 40 agents:    {Stats.Cost(bare40, "F1")} ns/agent-step (best / median)  = {Stats.Rate(bare40.Select(x => 1e3 / x).ToList(), "F1")} M agent-steps/s");
        Console.WriteLine($"  bare integrator, 2,000 agents: {Stats.Cost(bare2000, "F1")} ns/agent-step               = {Stats.Rate(bare2000.Select(x => 1e3 / x).ToList(), "F1")} M agent-steps/s");
        var r0 = runs[0];
        Console.WriteLine($"  race: {r0.Steps.Sum()} steps, ends at {r0.EndTimeS:F1} s after the signal, {r0.TotalBoardSteps} board-steps (boards still racing at each step); " +
                          $"final state identical in all repeats: {(runs.All(x => x.Hash == r0.Hash) ? "yes" : "NO")}");
        Console.WriteLine($"  race construction (new Race with the rig tables cached): {Stats.Cost(runs.Select(x => x.BuildS * 1e3).ToList(), "F1")} ms CPU");
        Console.WriteLine($"  whole race:                  {Stats.Cost(total)} ns/board-step = {Stats.Rate(total.Select(x => 1e3 / x).ToList())} M board-steps/s " +
                          $"(target >= 10 M: {Stats.Verdict(Stats.Max(total.Select(x => 1e3 / x).ToList()) >= 10)})");
        for (int p = 0; p < names.Length; p++)
            Console.WriteLine($"    {names[p],-26} {Stats.Cost(runs.Select(x => x.NsPerBoardStep(p)).ToList())} ns/board-step ({r0.BoardSteps[p]} board-steps)");
        Console.WriteLine($"  race / bare integrator (40): {Stats.Cost(ratio, "F2")} x (per repeat, against the stretch beside it; target <= 2.5 x: {Stats.Verdict(Stats.Min(ratio) <= 2.5)})");
    }

    /// <summary>A scaled fleet from the countdown to <paramref name="after"/> s after the signal; phases: countdown, first minute, after.</summary>
    public static RaceRun RunScaledWindow(RaceSetup demo, int boards, double mPerBoard, double after, RigCache cache, SystemTimings? timings = null)
    {
        double line = Math.Clamp(mPerBoard * boards, 20, 10000);
        // The time limit only bounds the recorder's up-front room (it is sized to the race's length).
        var baseSetup = ScenarioFile.LoadRace(Demo.Fleet40Path, [$"course.start_line_m={line.ToString(System.Globalization.CultureInfo.InvariantCulture)}",
            $"race.time_limit_s={(after + 60).ToString(System.Globalization.CultureInfo.InvariantCulture)}"]);
        var setup = Demo.Scaled(baseSetup, boards);
        return RaceRun.Time(setup, cache.For, ["countdown", "first minute", "after"], [0, 60, after], timings);
    }

    static void Scaling(RaceSetup demo, RigCache cache, ReportOptions o, ref double sink)
    {
        int big = o.BigBoards;
        double bigLine = Math.Clamp(9.0 * big, 20, 10000);
        Console.WriteLine();
        Console.WriteLine($"== 3. cost per board-step at {big} boards against 40 (the demo's rigs and tactics, line-position starts spread evenly; countdown to +{o.AfterStartS:F0} s)");
        Console.WriteLine($"  40 boards on the demo's 360 m line (9 m a board); {big} boards on a {bigLine:F0} m line ({bigLine / big:F1} m a board: the line is at most 10 km)");
        var small = new List<RaceRun>(); var bare40 = new List<double>();
        // As for the big fleet below: a throw-away run of the window first, so no timed 40-board repeat builds polar rows
        // (with one repeat the ratio would otherwise compare the big fleet's step with the small one's table building).
        double s0 = Machine.ThreadCpuS();
        RunScaledWindow(demo, 40, 9, o.AfterStartS, cache);
        Console.WriteLine($"  (40 boards: a throw-away run of the same window first, {Machine.ThreadCpuS() - s0:F1} s CPU)");
        for (int r = 0; r < o.Repeats; r++)
        {
            bare40.Add(BareIntegrator.MeasureNs(40, BaselineAgentSteps, ref sink));
            small.Add(RunScaledWindow(demo, 40, 9, o.AfterStartS, cache));
        }
        // The rig polars build their rows on demand, one wind speed at a time (seconds of CPU a row for 40 rigs): the
        // big fleet spreads over a 10 km line across the course's pressure gradient and meets wind speeds the 40 boards
        // never did. A throw-away run of the same window builds those rows first (a batch's races share them the same
        // way), so the timed run measures the step, not the one-off tables.
        double w0 = Machine.ThreadCpuS();
        RunScaledWindow(demo, big, 9, o.AfterStartS, cache);
        Console.WriteLine($"  ({big} boards: a throw-away run of the same window first, {Machine.ThreadCpuS() - w0:F1} s CPU, builds the polar rows its winds need)");
        var bare2000 = BareIntegrator.MeasureNs(2000, BaselineAgentSteps, ref sink);
        var bigRun = RunScaledWindow(demo, big, 9, o.AfterStartS, cache);
        var bare2000b = BareIntegrator.MeasureNs(2000, BaselineAgentSteps, ref sink);
        double bareBig = Math.Min(bare2000, bare2000b);
        Console.WriteLine("  fleet        construction   ns/board-step: countdown   first minute   after    whole window   B/board-step   vs bare integrator (same N)");
        void Row(string label, IReadOnlyList<RaceRun> rs, double bare)
        {
            string C(Func<RaceRun, double> f) => rs.Count == 1 ? f(rs[0]).ToString("F0") : Stats.Cost(rs.Select(f).ToList());
            Console.WriteLine($"  {label,-12} {Stats.Cost(rs.Select(x => x.BuildS * 1e3).ToList(), "F0"),7} ms   {C(x => x.NsPerBoardStep(0)),20}  {C(x => x.NsPerBoardStep(1)),13}  {C(x => x.NsPerBoardStep(2)),11}  " +
                              $"{C(x => x.TotalNsPerBoardStep),13}  {rs.Select(x => x.TotalBytesPerBoardStep).Max(),13:F2}   {Stats.Min(rs.Select(x => x.TotalNsPerBoardStep).ToList()) / bare:F1} x (bare {bare:F1} ns)");
        }
        Row("40", small, Stats.Min(bare40));
        Row($"{big}", [bigRun], bareBig);
        double ratioBest = bigRun.TotalNsPerBoardStep / Stats.Min(small.Select(x => x.TotalNsPerBoardStep).ToList());
        double ratioMed = bigRun.TotalNsPerBoardStep / Stats.Median(small.Select(x => x.TotalNsPerBoardStep).ToList());
        Console.WriteLine($"  cost per board-step, {big} / 40: {ratioBest:F2} x against the best 40-board repeat, {ratioMed:F2} x against the median (target <= 1.5 x: {Stats.Verdict(ratioMed <= 1.5)})");
        Console.WriteLine($"  ({big} boards: {bigRun.TotalBoardSteps} board-steps in {bigRun.TotalCpuS:F1} s CPU; first minute / countdown {bigRun.NsPerBoardStep(1) / bigRun.NsPerBoardStep(0):F2} x)");
        // The rules' work, counted: the same in every repeat and on any machine load, so a change's effect on the work
        // shows even where the times swing.
        static double Per(long n, RaceRun r) => n / (double)Math.Max(1, r.TotalBoardSteps);
        var first = small[0];
        Console.WriteLine($"  the rules' work per board-step, counted (does not swing with the machine's load): {"40",6} {big,8} {"ratio",7}");
        foreach (var (name, f) in WorkRows)
        {
            double a = Per(f(first.Work), first), b = Per(f(bigRun.Work), bigRun);
            Console.WriteLine($"    {name,-44} {a,33:F3} {b,8:F3} {b / a,6:F2} x");
        }
    }

    /// <summary>
    /// Section 4 of the report alone (`report-alloc`): a whole race of the demo first on the same rig cache, as the
    /// report's earlier sections are (the JIT's tiers, the polar rows and run-up curves the race meets), then the bytes.
    /// </summary>
    public static void AllocationOnly()
    {
        var demo = Demo.Fleet40();
        var cache = new RigCache();
        var warm = RaceRun.Time(demo, cache.For, ["warm-up race"], [double.PositiveInfinity]);
        Console.WriteLine($"warm-up race on the same rig cache: {warm.TotalCpuS:F1} s CPU, ended at {warm.EndTimeS:F0} s");
        Allocation(demo, cache);
    }

    static void Allocation(RaceSetup demo, RigCache cache)
    {
        Console.WriteLine();
        Console.WriteLine("== 4. bytes allocated per board-step on the race's thread (GC.GetAllocatedBytesForCurrentThread), the 40-board demo");
        string[] names = ["countdown", "first minute after the signal", "steady: +60 s, 4,000 steps", "rest of the race"];
        double[] bounds = [0, 60, 60 + 4000 / demo.Race.StepHz, double.PositiveInfinity];
        var run = RaceRun.Time(demo, cache.For, names, bounds);
        for (int p = 0; p < names.Length; p++)
            Console.WriteLine($"  {names[p],-32} {run.Bytes[p],12} B over {run.BoardSteps[p],9} board-steps = {run.BytesPerBoardStep(p),8:F3} B/board-step; {run.Events[p],5} events/incidents logged");
        Console.WriteLine($"  steady stretch: {run.BytesPerBoardStep(2):F3} B/board-step (target 0: {Stats.Verdict(run.Bytes[2] == 0)}); whole race {run.TotalBytesPerBoardStep:F3} B/board-step");
        // The baseline in the same run: the bare integrator's stepping, 40 agents (its arrays made before it is counted).
        var bare = new BareIntegrator(40);
        double sink = bare.Run(10);
        long b0 = GC.GetAllocatedBytesForCurrentThread();
        sink += bare.Run(4000);
        long bareBytes = GC.GetAllocatedBytesForCurrentThread() - b0;
        Console.WriteLine($"  baseline, bare integrator (40 agents, 4,000 steps): {bareBytes} B = {bareBytes / (40.0 * 4000):F3} B/agent-step{(sink == 42 ? " " : "")}");
        Console.WriteLine($"  recorder room: {run.RecorderStartBytes / 1024.0:F0} KiB after construction (sized from the engine's estimate of {run.EstimatedS:F0} s), " +
                          $"{run.RecorderEndBytes / 1024.0:F0} KiB at the end (race ended at {run.EndTimeS:F0} s)");
        Console.WriteLine("  (the BenchmarkDotNet view of the same: --filter '*SteadyRaceBenchmarks*', Allocated column = bytes per board-step)");
    }

    static void Systems(RaceSetup demo, RigCache cache, ReportOptions o)
    {
        Console.WriteLine();
        Console.WriteLine($"== 5. time per system (Race.Timings: the wall clock around each system's call), countdown to +{o.AfterStartS:F0} s, every board in the race throughout");
        var t40 = new SystemTimings();
        var r40 = RunScaledWindow(demo, 40, 9, o.AfterStartS, cache, t40);
        SystemTimings? tBig = null; RaceRun? rBig = null;
        if (o.BigTimings) { tBig = new SystemTimings(); rBig = RunScaledWindow(demo, o.BigBoards, 9, o.AfterStartS, cache, tBig); }
        Console.WriteLine($"  system                   40 boards: wall ns/board-step (share)  share x CPU ns/board-step   {(tBig is null ? "" : $"{o.BigBoards} boards: wall (share)  share x CPU")}");
        double sum40 = Enumerable.Range(0, t40.Names.Length).Sum(i => t40.NsPerBoardStep(i, 40));
        double sumBig = tBig is null ? 0 : Enumerable.Range(0, tBig.Names.Length).Sum(i => tBig.NsPerBoardStep(i, o.BigBoards));
        for (int i = 0; i < t40.Names.Length; i++)
        {
            double a = t40.NsPerBoardStep(i, 40);
            string big = tBig is null ? "" : $"{tBig.NsPerBoardStep(i, o.BigBoards),12:F1} ({100 * tBig.NsPerBoardStep(i, o.BigBoards) / sumBig,5:F1} %)  {tBig.NsPerBoardStep(i, o.BigBoards) / sumBig * rBig!.TotalNsPerBoardStep,9:F1}";
            Console.WriteLine($"  {t40.Names[i],-24} {a,12:F1} ({100 * a / sum40,5:F1} %)          {a / sum40 * r40.TotalNsPerBoardStep,12:F1}             {big}");
        }
        Console.WriteLine($"  {"sum of systems",-24} {sum40,12:F1}                    {(tBig is null ? "" : $"{sumBig,12:F1}")}");
        Console.WriteLine($"  same runs on the thread CPU clock (whole step): {r40.TotalNsPerBoardStep:F1} ns/board-step{(rBig is null ? "" : $"; {rBig.TotalNsPerBoardStep:F1}")} " +
                          "(the wall-clock sums include time other processes held the core; the shares are spread over the CPU figure in the third column)");
    }
}
