using System.Diagnostics;
using System.Runtime.InteropServices;

namespace CourseSim.Benchmarks;

/// <summary>The machine and runtime the figures were measured on, and the clocks used.</summary>
public static class Machine
{
    [StructLayout(LayoutKind.Sequential)]
    struct Timespec { public long Sec; public long Nsec; }

    [DllImport("libc", EntryPoint = "clock_gettime")]
    static extern int ClockGetTime(int clock, out Timespec ts);

    const int ClockThreadCpuTime = 3; // CLOCK_THREAD_CPUTIME_ID on Linux (time.h)
    static readonly bool HasThreadClock = Probe();

    static bool Probe()
    {
        try { return OperatingSystem.IsLinux() && ClockGetTime(ClockThreadCpuTime, out _) == 0; }
        catch (Exception e) when (e is DllNotFoundException or EntryPointNotFoundException) { return false; }
    }

    /// <summary>
    /// CPU time this thread has run, s: on a shared machine the wall clock also counts the time other processes held the
    /// core, so the single-thread figures use this clock (falls back to the wall clock off Linux).
    /// </summary>
    public static double ThreadCpuS()
    {
        if (HasThreadClock && ClockGetTime(ClockThreadCpuTime, out var t) == 0) return t.Sec + t.Nsec * 1e-9;
        return Stopwatch.GetTimestamp() / (double)Stopwatch.Frequency;
    }

    public static string ClockName => HasThreadClock ? "thread CPU time (clock_gettime CLOCK_THREAD_CPUTIME_ID)" : "wall clock";

    static string Switch(string appContextKey, string envKey, bool fallback)
    {
        var env = System.Environment.GetEnvironmentVariable(envKey);
        if (env is not null) return env == "0" ? $"off (env {envKey}=0)" : $"on (env {envKey}={env})";
        var data = AppContext.GetData(appContextKey);
        if (data is bool b) return b ? "on (runtimeconfig)" : "off (runtimeconfig)";
        return fallback ? "on (runtime default)" : "off (runtime default)";
    }

    public static void PrintHeader()
    {
        string load = File.Exists("/proc/loadavg") ? File.ReadAllText("/proc/loadavg").Trim() : "n/a";
        bool optimized = !(typeof(Race).Assembly.GetCustomAttributes(typeof(DebuggableAttribute), false)
            .OfType<DebuggableAttribute>().FirstOrDefault()?.IsJITOptimizerDisabled ?? false);
        Console.WriteLine($"machine: {System.Environment.ProcessorCount} logical cores, {RuntimeInformation.OSDescription}, {RuntimeInformation.ProcessArchitecture}");
        Console.WriteLine($"runtime: {RuntimeInformation.FrameworkDescription}; tiered compilation {Switch("System.Runtime.TieredCompilation", "DOTNET_TieredCompilation", true)}; " +
                          $"dynamic PGO {Switch("System.Runtime.TieredPGO", "DOTNET_TieredPGO", true)}; server GC {System.Runtime.GCSettings.IsServerGC}; " +
                          $"CourseSim.Core JIT-optimised {optimized}");
        Console.WriteLine($"SIMD: Vector<double> {System.Numerics.Vector<double>.Count} lanes, hardware-accelerated {System.Numerics.Vector.IsHardwareAccelerated}; " +
                          $"FMA {System.Runtime.Intrinsics.X86.Fma.IsSupported}");
        Console.WriteLine($"load average at start (1, 5, 15 min, runnable/total, last pid): {load}");
        Console.WriteLine($"single-thread figures use {ClockName}; each stretch is repeated, best and median shown");
        Console.WriteLine();
    }
}
