using CourseSim.Experiments;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Experiments;

public class BatchTests
{
    /// <summary>A small experiment in a temporary folder: a three-board windward-leeward and two variants.</summary>
    static string MakeExperiment(string extra = "", string variantB = "boards.a.equipment=" + "\"LIGHT78\"")
    {
        string dir = Directory.CreateTempSubdirectory("cs-batch-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), EngineTestKit.SteadyWind(13).Replace("gust_intensity = 0", "gust_intensity = 0.1")
            .Replace("shift_amplitude_deg = 0", "shift_amplitude_deg = 6") +
            "[race]\ntime_limit_s = 1500\ncountdown_s = 40\n[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 400\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n" +
            $"[boards.c]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n");
        string b = variantB.Replace("\"LIGHT78\"", EngineTestKit.Equip("light-78.toml"));
        File.WriteAllText(Path.Combine(dir, "exp.toml"),
            $"name = \"test\"\nscenario = \"race.toml\"\nraces = 6\nseed = 9\nfocus = \"a\"\n{extra}[variants.base]\nset = \"\"\n[variants.other]\nset = \"{b}\"\n");
        return Path.Combine(dir, "exp.toml");
    }

    [Fact]
    public void ResultsAreTheSameWhateverTheThreadCountAndRacesArePaired()
    {
        var path = MakeExperiment();
        var spec = ExperimentFile.Load(path);
        string one = Directory.CreateTempSubdirectory("cs-b1-").FullName, two = Directory.CreateTempSubdirectory("cs-b2-").FullName;
        var a = BatchRunner.ResultsCsv(BatchRunner.Run(spec, one, 1, false));
        var b = BatchRunner.ResultsCsv(BatchRunner.Run(spec, two, 2, false));
        Assert.Equal(a, b);
        var rows = BatchRunner.Run(spec, two, 2, true);
        Assert.Equal(2 * 6 * 3, rows.Count);
        // Race i has the same seed in every variant (common random numbers), and different races differ.
        foreach (var g in rows.GroupBy(r => r.Race)) Assert.Single(g.Select(r => r.Seed).Distinct());
        Assert.Equal(6, rows.Select(r => r.Seed).Distinct().Count());
    }

    [Fact]
    public void AResumedBatchEndsWithWhatAnUninterruptedOneGives()
    {
        var spec = ExperimentFile.Load(MakeExperiment());
        string full = Directory.CreateTempSubdirectory("cs-bf-").FullName, cut = Directory.CreateTempSubdirectory("cs-bc-").FullName;
        var expected = BatchRunner.ResultsCsv(BatchRunner.Run(spec, full, 2, false));
        // A run stopped part way: cancel after the first races finish.
        using var cts = new CancellationTokenSource();
        int seen = 0;
        var partial = BatchRunner.Run(spec, cut, 1, false, p => { if (p.Done - p.Resumed >= 3 && Interlocked.Increment(ref seen) == 1) cts.Cancel(); }, cts.Token);
        int partialRaces = partial.Select(r => (r.Variant, r.Race)).Distinct().Count();
        Assert.InRange(partialRaces, 3, 11);
        // A crash can leave a half-written temporary file: it is not a finished race.
        File.WriteAllText(BatchRunner.RunFile(cut, "other", 5) + ".tmp", "half a line");
        int resumedFrom = -1;
        var rows = BatchRunner.Run(spec, cut, 2, true, p => { if (resumedFrom < 0) resumedFrom = p.Resumed; });
        Assert.Equal(partialRaces, resumedFrom);
        Assert.Equal(expected, BatchRunner.ResultsCsv(rows));
    }

    [Fact]
    public void ComparisonPairsTheVariantsRaceByRace()
    {
        var spec = ExperimentFile.Load(MakeExperiment());
        var rows = BatchRunner.Run(spec, Directory.CreateTempSubdirectory("cs-bp-").FullName, 2, false);
        var (variants, pairs) = Comparison.Of(spec, rows, 1);
        Assert.Equal(2, variants.Count);
        Assert.All(variants, v => Assert.Equal(6, v.Races));
        var p = Assert.Single(pairs);
        Assert.Equal(("base", "other"), (p.A, p.B));
        // The mean of the paired differences is the difference of the means.
        Assert.Equal(variants[0].MeanElapsedS - variants[1].MeanElapsedS, p.MeanDiffT.Estimate, 6);
        Assert.True(p.MeanDiffT.Low <= p.MeanDiffT.Estimate && p.MeanDiffT.Estimate <= p.MeanDiffT.High);
    }

    [Fact]
    public void BadExperimentFilesNameTheFileLineAndProblem()
    {
        var typo = Assert.Throws<SettingsException>(() => ExperimentFile.Load(MakeExperiment("rces = 4\n")));
        Assert.Contains("exp.toml:6", typo.Message);
        Assert.Contains("rces", typo.Message);
        var badSet = Assert.Throws<SettingsException>(() => ExperimentFile.Load(MakeExperiment(variantB: "course.beat_m=99999")));
        Assert.Contains("variants.other.set", badSet.Message);
        Assert.Contains("course.beat_m", badSet.Message);
        string dir = Path.GetDirectoryName(MakeExperiment())!;
        File.WriteAllText(Path.Combine(dir, "e2.toml"), "scenario = \"race.toml\"\nfocus = \"zz\"\n[variants.x]\nset = \"\"\n");
        var noBoard = Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "e2.toml")));
        Assert.Contains("no board 'zz'", noBoard.Message);
        Assert.Contains("a, b, c", noBoard.Message);
        File.WriteAllText(Path.Combine(dir, "e3.toml"), "scenario = \"missing.toml\"\n[variants.x]\nset = \"\"\n");
        Assert.Contains("not found", Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "e3.toml"))).Message);
    }
}
