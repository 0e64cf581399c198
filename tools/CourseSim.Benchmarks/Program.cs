using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Running;
using CourseSim.Equilibrium;
using CourseSim.Sail;
using CourseSim.Units;

namespace CourseSim.Benchmarks;

/// <summary>
/// Benchmarks. Run all: dotnet run -c Release --project tools/CourseSim.Benchmarks -- --filter '*'
/// Figures are printed, never asserted in tests (see DEVELOPERS.md).
/// </summary>
public static class Program
{
    public static void Main(string[] args) => BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
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
