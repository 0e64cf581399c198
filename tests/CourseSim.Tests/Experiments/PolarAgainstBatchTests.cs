using CourseSim.Equilibrium;
using CourseSim.Experiments;

using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Experiments;

/// <summary>
/// A rider must not get two contradictory answers (issue 16, acceptance): the crossover wind of two sail sizes from
/// `polar A B` (the windward-leeward lap at the best VMGs) and from a paired batch of the same two rigs (the rider's
/// demo experiment: 40 races of the club race, 8-22 kn) agree within the batch's interval: the polar's crossover lies
/// in the batch's crossover band, or, where the batch resolves none, inside the band where its fitted difference holds
/// zero.
/// </summary>
public class PolarAgainstBatchTests(Xunit.Abstractions.ITestOutputHelper output)
{
    [Fact, Trait("Category", Slow.Category)]
    public void PolarAndPairedBatchAgreeOnTheCrossover()
    {
        string root = RepoRoot.Path;
        var spec = ExperimentFile.Load(Path.Combine(root, "scenarios", "experiments", "maren-sail-size.toml"));
        var rows = BatchRunner.Run(spec, Directory.CreateTempSubdirectory("cs-cross-").FullName, 2, false);
        var fig = RiderFigures.Of(spec, rows, "sail-66", "sail-78");
        Assert.NotNull(fig.Fit);
        string eq(string n) => Path.Combine(root, "scenarios", "equipment", n);
        var winds = Enumerable.Range(0, 15).Select(i => 8.0 + i).ToList();
        var angles = Enumerable.Range(0, 31).Select(i => 30.0 + 5 * i).ToList();
        var cmp = PolarComparison.Of(Polar.Compute(EquipmentFile.Load(eq("light-66.toml")), winds, angles),
            Polar.Compute(EquipmentFile.Load(eq("light-78.toml")), winds, angles));
        var lap = cmp.Crossovers.Where(c => c.Measure == "windward-leeward lap").ToList();
        output.WriteLine($"polar lap crossovers: {string.Join(", ", lap.Select(c => $"{c.TwsKn} kn ({c.FasterAbove} faster above)"))}");
        output.WriteLine($"batch crossovers: {string.Join(", ", fig.Fit!.Crossovers.Select(c => $"{c.WindKn:F1} kn [{c.LowKn:F1}, {c.HighKn:F1}] resolved {c.Resolved}"))}");
        foreach (var c in fig.Fit.Crossovers.Where(k => k.Resolved))
            Assert.True(lap.Any(p => p.TwsKn >= c.LowKn && p.TwsKn <= c.HighKn),
                $"the batch resolves a crossover at {c.WindKn:F1} kn ({c.LowKn:F1}-{c.HighKn:F1}) that the polar's lap does not have there");
        foreach (var p in lap)
        {
            // Where the fitted band holds zero at the polar's crossover wind, the batch does not contradict it.
            int g = Array.FindIndex(fig.Fit.Grid, x => x >= p.TwsKn);
            if (g < 0) continue; // beyond the batch's winds
            bool holdsZero = fig.Fit.Low[g] <= 0 && fig.Fit.High[g] >= 0;
            Assert.True(holdsZero || fig.Fit.Crossovers.Any(c => c.Resolved && p.TwsKn >= c.LowKn && p.TwsKn <= c.HighKn),
                $"the polar's lap crossover at {p.TwsKn} kn lies where the batch resolves a difference ({fig.Fit.Low[g]:F0} to {fig.Fit.High[g]:F0} s)");
        }
    }
}
