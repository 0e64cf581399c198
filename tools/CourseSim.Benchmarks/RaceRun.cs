using CourseSim.Engine;

namespace CourseSim.Benchmarks;

/// <summary>One timed race: thread CPU time, board-steps and bytes allocated in each phase between time bounds.</summary>
public sealed class RaceRun
{
    public required string[] Phases { get; init; }
    public required double[] CpuS { get; init; }
    public required long[] BoardSteps { get; init; }
    public required long[] Steps { get; init; }
    public required long[] Bytes { get; init; }
    public double BuildS { get; init; }
    public double EndTimeS { get; init; }
    public bool Finished { get; init; }
    public string Hash { get; init; } = "";
    /// <summary>Events and incidents logged in each phase.</summary>
    public long[] Events { get; init; } = [];
    /// <summary>The recorder's room after construction and at the end, bytes; the engine's estimate of the race's length, s.</summary>
    public long RecorderStartBytes { get; init; }
    public long RecorderEndBytes { get; init; }
    public double EstimatedS { get; init; }
    /// <summary>The rules' work counted over the whole run (<see cref="WorkCounts"/>).</summary>
    public WorkCounts Work { get; init; } = new();

    public double NsPerBoardStep(int p) => BoardSteps[p] == 0 ? double.NaN : CpuS[p] * 1e9 / BoardSteps[p];
    public double BytesPerBoardStep(int p) => BoardSteps[p] == 0 ? double.NaN : Bytes[p] / (double)BoardSteps[p];
    public double TotalCpuS => CpuS.Sum();
    public long TotalBoardSteps => BoardSteps.Sum();
    public double TotalNsPerBoardStep => TotalCpuS * 1e9 / Math.Max(1, TotalBoardSteps);
    public double TotalBytesPerBoardStep => Bytes.Sum() / (double)Math.Max(1, TotalBoardSteps);

    /// <summary>
    /// Builds the race (timed apart: <see cref="BuildS"/>) and steps it phase by phase: phase p runs while the race time
    /// is below bounds[p] (s from the signal; +inf: to the end). Board-steps count the boards still in the race at each
    /// step. <paramref name="timings"/> turns the engine's per-system clock on.
    /// </summary>
    public static RaceRun Time(RaceSetup setup, Func<CourseSim.Equilibrium.Equipment, CourseSim.Equilibrium.RigPolar> rigs,
        string[] names, double[] bounds, SystemTimings? timings = null, bool hash = false)
    {
        double b0 = Machine.ThreadCpuS();
        var race = new Race(setup, rigs);
        double build = Machine.ThreadCpuS() - b0;
        race.Timings = timings;
        int n = bounds.Length;
        var cpu = new double[n]; var bs = new long[n]; var steps = new long[n]; var bytes = new long[n]; var events = new long[n];
        long recStart = race.Recorder.MemoryBytes;
        var active = race.Context.Active;
        for (int p = 0; p < n; p++)
        {
            double bound = bounds[p] - 1e-9;
            int e0 = race.Events.Count + race.Incidents.Count;
            long a0 = GC.GetAllocatedBytesForCurrentThread();
            double t0 = Machine.ThreadCpuS();
            long boardSteps = 0, k = 0;
            while (!race.IsOver && race.Time < bound) { boardSteps += active.Count(); race.Step(); k++; }
            cpu[p] = Machine.ThreadCpuS() - t0;
            bytes[p] = GC.GetAllocatedBytesForCurrentThread() - a0;
            bs[p] = boardSteps; steps[p] = k; events[p] = race.Events.Count + race.Incidents.Count - e0;
        }
        return new RaceRun
        {
            Phases = names, CpuS = cpu, BoardSteps = bs, Steps = steps, Bytes = bytes, BuildS = build, EndTimeS = race.Time,
            Finished = race.IsOver, Hash = hash ? race.StateHash() : "", Events = events,
            RecorderStartBytes = recStart, RecorderEndBytes = race.Recorder.MemoryBytes, EstimatedS = race.EstimatedDurationS,
            Work = race.Context.Work,
        };
    }
}
