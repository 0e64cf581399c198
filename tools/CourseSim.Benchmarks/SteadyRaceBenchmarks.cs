using BenchmarkDotNet.Attributes;
using CourseSim.Equilibrium;

namespace CourseSim.Benchmarks;

/// <summary>
/// Steps the 40-board demo in its steady part (from a minute after the signal, every board racing) with the memory
/// diagnoser on: the Allocated column is bytes per board-step (target 0), the Mean nanoseconds per board-step.
/// Run: dotnet run -c Release --project tools/CourseSim.Benchmarks -- --filter '*SteadyRaceBenchmarks*'
/// </summary>
[MemoryDiagnoser]
public class SteadyRaceBenchmarks
{
    const int Boards = 40, Steps = 20;
    Race _race = null!;
    readonly RigCache _rigs = new();

    /// <summary>
    /// A fresh race at +60 s before each iteration (outside the measured and allocation-counted work): an iteration is
    /// 200 invocations of 20 steps, +60 s to +260 s, where every board is racing.
    /// </summary>
    [IterationSetup]
    public void Setup()
    {
        _race = new Race(Demo.Fleet40(), _rigs.For);
        while (_race.Time < 60) _race.Step();
    }

    [Benchmark(OperationsPerInvoke = Boards * Steps, Description = "40-board demo, steady race (per board-step)")]
    [InvocationCount(200, 1)]
    public void Step()
    {
        for (int i = 0; i < Steps; i++) _race.Step();
    }
}
