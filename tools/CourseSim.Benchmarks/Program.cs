using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Running;
using CourseSim.Equilibrium;
using CourseSim.Sail;
using CourseSim.Units;

namespace CourseSim.Benchmarks;

/// <summary>
/// Benchmarks. Run all: dotnet run -c Release --project tools/CourseSim.Benchmarks -- --filter '*'
/// Plain figures of the engine (issue 17), each beside a bare integrator measured in the same run:
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- report [--repeats N] [--big-boards N] [--after-start-s S]
///       [--big-timings] [--batch-races N] [--threads T]
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- report-batch [--races N] [--threads T]   (N = 1000: the full batch)
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- race-loop [RACES] [--timings]   (the 40-board demo raced again and
///       again on one thread after a warm-up race, for a profiler: DOTNET_PerfMapEnabled=1 perf record -g -p PID;
///       --timings: each race's wall ns per board-step by system)
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- scale-quick [N] [S]   (N boards and 40 to +S s, per system)
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- alloc-by-system [--cold] [--from S] [--steps N]   (bytes each system allocates from S s (default +60) for N steps (4,000); --cold: no warm-up race)
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- report-alloc   (the report's bytes per board-step alone, after a warm-up race)
///   dotnet run -c Release --project tools/CourseSim.Benchmarks -- ab OTHER/CourseSim.Benchmarks.dll [--rounds N] [--races M] [--this PATH]
///       (this build against another's, race-loop in turn, a paired ratio with its 95 % interval: AbCompare)
/// Figures are printed, never asserted in tests (see DEVELOPERS.md).
/// </summary>
public static class Program
{
    /// <summary>The 40-board demo, whole races one after another on this thread (one shared rig cache), for profiling.</summary>
    static int RaceLoop(string[] args)
    {
        int races = 5;
        bool timings = args.Length == 3 && args[2] == "--timings";
        if (args.Length > 3 || args.Length == 3 && !timings || args.Length >= 2 && (!int.TryParse(args[1], out races) || races < 1))
        {
            Console.Error.WriteLine($"error: race-loop: expected a number of races (a whole number from 1) and optionally --timings, got '{string.Join(' ', args.Skip(1))}'");
            return 2;
        }
        var rigs = new CourseSim.Equilibrium.RigCache();
        new Race(Demo.Fleet40("race.time_limit_s=60"), rigs.For).Run();
        Console.WriteLine($"race-loop: pid {System.Environment.ProcessId}, warm; racing the 40-board demo {races} times");
        for (int i = 0; i < races; i++)
        {
            double t0 = Machine.ThreadCpuS();
            var race = new Race(Demo.Fleet40(), rigs.For);
            var t = timings ? new CourseSim.Engine.SystemTimings() : null;
            race.Timings = t;
            race.Run();
            Console.WriteLine($"  race {i + 1}: {Machine.ThreadCpuS() - t0:F3} s CPU, ends at {race.Time:F1} s");
            if (i == 0)
            {
                var w = race.Context.Work;
                Console.WriteLine("    work (counts, the same every race): " + string.Join(", ", RaceReport.WorkRows.Select(r => $"{r.Name} {r.Of(w)}")));
            }
            if (t is not null)
                Console.WriteLine("    wall ns per board-step (40 boards x steps): " + string.Join(", ", Enumerable.Range(0, t.Names.Length).Select(k => $"{t.Names[k]} {t.NsPerBoardStep(k, 40):F1}")));
        }
        return 0;
    }

    /// <summary>Where the steady stretch's bytes go: the 40-board demo to +60 s, then 4,000 steps with the per-system clock and byte counts on.</summary>
    static int AllocBySystem()
    {
        var rigs = new CourseSim.Equilibrium.RigCache();
        // A warm-up race over the same stretch on the same rig cache (as `report` has run races before its bytes): the
        // polar rows the race meets are built on first use, and that is construction, not the step.
        var argv = System.Environment.GetCommandLineArgs();
        bool cold = argv.Contains("--cold");
        double Opt(string name, double d) { int i = Array.IndexOf(argv, name); return i >= 0 && i + 1 < argv.Length ? double.Parse(argv[i + 1], System.Globalization.CultureInfo.InvariantCulture) : d; }
        double from = Opt("--from", 60); int steps = (int)Opt("--steps", 4000);
        if (!cold) { var warm = new Race(Demo.Fleet40(), rigs.For); warm.Run(); }
        var race = new Race(Demo.Fleet40(), rigs.For);
        while (!race.IsOver && race.Time < from) race.Step();
        var t = new CourseSim.Engine.SystemTimings();
        race.Timings = t;
        long a0 = GC.GetAllocatedBytesForCurrentThread();
        int e0 = race.Events.Count + race.Incidents.Count;
        for (int i = 0; i < steps && !race.IsOver; i++) race.Step();
        long all = GC.GetAllocatedBytesForCurrentThread() - a0;
        Console.WriteLine($"alloc-by-system ({(cold ? "cold rig cache" : "after a warm-up race on the same rig cache")}): {from:+0;-0} s then {steps} steps: {all} B in all = " +
                          $"{all / (40.0 * steps):F4} B/board-step, {race.Events.Count + race.Incidents.Count - e0} events/incidents");
        for (int i = 0; i < t.Names.Length; i++) Console.WriteLine($"  {t.Names[i],-20} {t.Bytes[i],10} B");
        Console.WriteLine($"  {"outside the systems",-20} {all - t.Bytes.Sum(),10} B");
        return 0;
    }

    /// <summary>A quick look at the scaling: N boards (default 2,000) and 40 from the countdown to +S s (default 30), per system, thread CPU.</summary>
    static int ScaleQuick(string[] args)
    {
        int big = args.Length > 1 ? int.Parse(args[1], System.Globalization.CultureInfo.InvariantCulture) : 2000;
        double after = args.Length > 2 ? double.Parse(args[2], System.Globalization.CultureInfo.InvariantCulture) : 30;
        var rigs = new CourseSim.Equilibrium.RigCache();
        var demo = Demo.Fleet40();
        RaceReport.RunScaledWindow(demo, 40, 9, after, rigs); // warm-up (rig rows, JIT)
        foreach (int n in new[] { 40, big })
        {
            if (n != 40) RaceReport.RunScaledWindow(demo, n, 9, after, rigs); // the polar rows the big fleet's winds need
            var t = new CourseSim.Engine.SystemTimings();
            var run = RaceReport.RunScaledWindow(demo, n, 9, after, rigs, t);
            double sum = Enumerable.Range(0, t.Names.Length).Sum(i => t.NsPerBoardStep(i, n));
            Console.WriteLine($"{n} boards, countdown to +{after} s: {run.TotalNsPerBoardStep:F0} ns/board-step CPU (countdown {run.NsPerBoardStep(0):F0}, first minute {run.NsPerBoardStep(1):F0}); by system (share of the wall-clock sum):");
            for (int i = 0; i < t.Names.Length; i++) Console.WriteLine($"  {t.Names[i],-20} {100 * t.NsPerBoardStep(i, n) / sum,5:F1} %  {t.NsPerBoardStep(i, n) / sum * run.TotalNsPerBoardStep,8:F0} ns");
        }
        return 0;
    }

    public static int Main(string[] args)
    {
        if (args.Length >= 1 && args[0] == "scale-quick") return ScaleQuick(args);
        if (args.Length >= 1 && args[0] == "race-loop") return RaceLoop(args);
        if (args.Length >= 1 && args[0] == "ab") return AbCompare.Run(args);
        if (args.Length >= 1 && args[0] == "alloc-by-system") return AllocBySystem();
        if (args.Length >= 1 && args[0] == "report-alloc") { Machine.PrintHeader(); RaceReport.AllocationOnly(); return 0; }
        if (args.Length == 0 || (args[0] != "report" && args[0] != "report-batch"))
        {
            BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
            return 0;
        }
        var opts = new ReportOptions();
        int races = 40;
        for (int i = 1; i < args.Length; i++)
        {
            string a = args[i];
            int Int(int min, int max)
            {
                if (i + 1 >= args.Length || !int.TryParse(args[i + 1], out int v) || v < min || v > max)
                    throw new ArgumentException($"option {a}: expected a whole number from {min} to {max}, got '{(i + 1 < args.Length ? args[i + 1] : "")}'");
                i++;
                return v;
            }
            try
            {
                switch (a)
                {
                    case "--repeats": opts = opts with { Repeats = Int(1, 50) }; break;
                    case "--big-boards": opts = opts with { BigBoards = Int(41, 5000) }; break;
                    case "--after-start-s": opts = opts with { AfterStartS = Int(61, 3000) }; break;
                    case "--big-timings": opts = opts with { BigTimings = true }; break;
                    case "--batch-races": opts = opts with { BatchRaces = Int(1, 100_000) }; break;
                    case "--races": races = Int(1, 100_000); break;
                    case "--threads": opts = opts with { Threads = Int(1, 256) }; break;
                    default: throw new ArgumentException($"unknown option '{a}' for {args[0]} (see the top of tools/CourseSim.Benchmarks/Program.cs)");
                }
            }
            catch (ArgumentException e)
            {
                Console.Error.WriteLine($"error: {e.Message}");
                return 2;
            }
        }
        Machine.PrintHeader();
        if (args[0] == "report-batch") { BatchReport.Run(races, opts.Threads); return 0; }
        RaceReport.Run(opts);
        BatchReport.Run(opts.BatchRaces, opts.Threads);
        MemoryFigures.Run();
        return 0;
    }
}

/// <summary>Cost of one equilibrium point, of the rider's trim, and of a whole 15 x 31 polar, on one core.</summary>
[MemoryDiagnoser]
public class EquilibriumBenchmarks
{
    readonly Equipment _eq = new() { Sail = new SailSpec { AreaM2 = 7.8 } };
    VelocityPrediction _vpp = null!;
    readonly double[] _winds = Enumerable.Range(0, 15).Select(i => 6.0 + 2 * i).ToArray();
    readonly double[] _angles = Enumerable.Range(0, 31).Select(i => 30.0 + 5 * i).ToArray();

    [GlobalSetup]
    public void Setup() => _vpp = new VelocityPrediction(new BoardPhysics(_eq));

    [Benchmark(Description = "one equilibrium point (14 kn, 100 deg)")]
    public double Point() => _vpp.Solve(Unit.KnotsToMs(14), Unit.DegToRad(100)).Sailed.Speed;

    [Benchmark(Description = "best trim at one speed")]
    public double Trim() => _vpp.Board.BestTrim(7.0, Unit.DegToRad(100), 9.0).Thrust;

    [Benchmark(Description = "polar 15 winds x 31 angles, VMG and thresholds")]
    public int FullPolar() => Polar.Compute(_eq, _winds, _angles).Points.Count;
}

/// <summary>
/// Wind sampling cost on one core: nanoseconds per sample without and with the shadows of a 40-board fleet, the time to
/// build a field (every race of a batch builds its own), and the memory of the field (the gust tiles; the same for a 3 km course over an hour, since the tile is periodic and frozen).
/// </summary>
[MemoryDiagnoser]
public class WindBenchmarks
{
    CourseSim.Wind.WindField _field = null!;
    CourseSim.Wind.WindShadow _shadow = null!;
    double[] _x = null!, _y = null!;
    const int N = 1000;

    [GlobalSetup]
    public void Setup()
    {
        var s = new CourseSim.Wind.WindSettings();
        _field = new CourseSim.Wind.WindField(s, 1);
        _shadow = new CourseSim.Wind.WindShadow(s);
        var r = new CourseSim.Random.CounterRng(2, 3);
        _x = Enumerable.Range(0, N).Select(i => r.Uniform((ulong)(2 * i)) * 3000 - 1500).ToArray();
        _y = Enumerable.Range(0, N).Select(i => r.Uniform((ulong)(2 * i + 1)) * 3000 - 1500).ToArray();
        // 40 boards bunched near a mark: the shadow look-ups have neighbours to check.
        var src = Enumerable.Range(0, 40).Select(i => new CourseSim.Wind.ShadowSource(r.Uniform((ulong)(5000 + i)) * 150, r.Uniform((ulong)(6000 + i)) * 150, 225, 5, 7)).ToArray();
        _shadow.Build(src);
        for (int i = 0; i < 40; i++) { _x[i] = src[i].X + 3; _y[i] = src[i].Y - 10; }
        Console.WriteLine($"// wind field memory: {_field.MemoryBytes / 1024.0 / 1024.0:F1} MiB (any course size, any duration)");
    }

    [Benchmark(OperationsPerInvoke = N, Description = "wind sample, no shadows (ns/sample)")]
    public double Sample()
    {
        double s = 0;
        for (int i = 0; i < N; i++) s += _field.Sample(_x[i], _y[i], i * 0.05).SpeedMs;
        return s;
    }

    [Benchmark(Description = "wind field build: shift table and gust tiles (once per race)")]
    public long Build() => new CourseSim.Wind.WindField(new CourseSim.Wind.WindSettings(), 7).MemoryBytes;

    [Benchmark(OperationsPerInvoke = N, Description = "wind sample with 40-board shadows (ns/sample)")]
    public double SampleWithShadows()
    {
        double s = 0;
        for (int i = 0; i < N; i++) s += _shadow.Apply(_field.Sample(_x[i], _y[i], i * 0.05), _x[i], _y[i]).SpeedMs;
        return s;
    }
}
