using System.Diagnostics;
using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Wind;

namespace CourseSim.Benchmarks;

/// <summary>
/// The batch figure: N races of 20 boards (the demo's first 20) on a shortened windward-leeward course, one seed each,
/// on T threads with one shared rig cache (Parallel.For over races, `new Race(setup, cache.For)`), as races/s and the
/// time 1,000 such races would take; and how much of a race's CPU goes into building its wind field.
/// </summary>
public static class BatchReport
{
    /// <summary>Beat length that makes the 20-board race about ten minutes from the signal (checked: the mean is printed).</summary>
    public const double BeatM = 650;

    public static RaceSetup Setup() => Demo.Subset(Demo.Fleet40($"course.beat_m={BeatM}"), 20);

    public static void Run(int races, int threads)
    {
        var setup = Setup();
        Console.WriteLine();
        Console.WriteLine($"== 6. batch: {races} races of 20 boards (the demo's first 20, beat {BeatM:F0} m, one lap), seeds 1..{races}, {threads} threads, " +
                          "one shared rig cache (Parallel.For over races)");
        var cache = new RigCache();
        double c0 = Machine.ThreadCpuS();
        foreach (var b in setup.Boards) cache.For(b.Equipment);
        Console.WriteLine($"  rig tables for the {cache.Count} distinct rigs, built once for the batch: {(Machine.ThreadCpuS() - c0) * 1e3:F0} ms CPU (not in the batch time)");

        // Warm-up: two races per thread not counted (tiering), seeds outside the batch's.
        Parallel.For(0, 2 * threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, i =>
            new Race(setup with { Race = setup.Race with { Seed = 1_000_000UL + (ulong)i } }, cache.For).Run());

        var durations = new double[races];
        long boardSteps = 0;
        var proc = Process.GetCurrentProcess();
        proc.Refresh();
        var cpu0 = proc.TotalProcessorTime;
        var jit0 = System.Runtime.JitInfo.GetCompilationTime();
        int gc0 = GC.CollectionCount(0), gc2 = GC.CollectionCount(2);
        var pause0 = GC.GetTotalPauseDuration();
        int done = 0, reportEvery = Math.Max(1, races / 10);
        var sw = Stopwatch.StartNew();
        Parallel.For(0, races, new ParallelOptions { MaxDegreeOfParallelism = threads }, i =>
        {
            var race = new Race(setup with { Race = setup.Race with { Seed = 1 + (ulong)i } }, cache.For);
            long bs = 0;
            var active = race.Context.Active;
            while (!race.IsOver) { bs += active.Count(); race.Step(); }
            durations[i] = race.Time;
            Interlocked.Add(ref boardSteps, bs);
            int d = Interlocked.Increment(ref done);
            if (races >= 50 && d % reportEvery == 0) Console.Error.WriteLine($"  batch progress: {d}/{races} races, {sw.Elapsed.TotalSeconds:F0} s");
        });
        double wall = sw.Elapsed.TotalSeconds;
        proc.Refresh();
        double cpu = (proc.TotalProcessorTime - cpu0).TotalSeconds;
        double jit = (System.Runtime.JitInfo.GetCompilationTime() - jit0).TotalSeconds;
        double perSec = races / wall;
        Console.WriteLine($"  race length from the signal: mean {durations.Average() / 60:F1} min (min {durations.Min() / 60:F1}, max {durations.Max() / 60:F1}); " +
                          $"countdown {setup.Race.CountdownS:F0} s on top; {boardSteps} board-steps in all");
        Console.WriteLine($"  {races} races in {wall:F2} s wall = {perSec:F2} races/s; process CPU {cpu:F2} s = {cpu / races * 1e3:F0} ms CPU per race " +
                          $"({boardSteps / cpu / 1e6:F2} M board-steps per CPU-s); JIT in the batch {jit * 1e3:F0} ms; GCs gen0 {GC.CollectionCount(0) - gc0}, gen2 {GC.CollectionCount(2) - gc2}, " +
                          $"paused {(GC.GetTotalPauseDuration() - pause0).TotalMilliseconds:F0} ms");
        double for1000 = 1000 / perSec;
        double cpuFor1000 = cpu / races * 1000 / threads;
        Console.WriteLine($"  1,000 races: {(races == 1000 ? "measured" : "extrapolated")} {for1000:F1} s wall on {threads} threads (target < 30 s: {Stats.Verdict(for1000 < 30)})" +
                          (races < 1000 ? "; run them all: report-batch --races 1000" : ""));
        Console.WriteLine($"  1,000 races if the {threads} threads had their cores to themselves (process CPU per race x 1,000 / {threads}): {cpuFor1000:F1} s (target < 30 s: {Stats.Verdict(cpuFor1000 < 30)})");

        // The wind field alone, and the whole construction, on this thread.
        var wind = new List<double>(); var build = new List<double>();
        for (int k = 0; k < 5; k++)
        {
            double t0 = Machine.ThreadCpuS();
            var f = new WindField(setup.Wind, 500 + (ulong)k);
            wind.Add((Machine.ThreadCpuS() - t0) * 1e3);
            GC.KeepAlive(f);
            t0 = Machine.ThreadCpuS();
            var r = new Race(setup with { Race = setup.Race with { Seed = 600 + (ulong)k } }, cache.For);
            build.Add((Machine.ThreadCpuS() - t0) * 1e3);
            GC.KeepAlive(r);
        }
        double perRaceMs = cpu / races * 1e3;
        Console.WriteLine($"  new WindField(settings, seed) alone: {Stats.Cost(wind, "F1")} ms CPU (best / median of 5 seeds) = {100 * Stats.Median(wind) / perRaceMs:F0} % of a race's CPU in the batch; " +
                          $"whole new Race(...) {Stats.Cost(build, "F1")} ms = {100 * Stats.Median(build) / perRaceMs:F0} %");
    }
}
