using CourseSim.Experiments;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Experiments;

/// <summary>Experiment files that say what users mean, per-race files with headers, race i reproduced from a batch,
/// and the sequential-peeking warning.</summary>
public class BatchFilesTests
{
    static string Folder(string experiment, string boardSet = "")
    {
        string dir = Directory.CreateTempSubdirectory("cs-bf13-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), EngineTestKit.SteadyWind(12).Replace("shift_amplitude_deg = 0", "shift_amplitude_deg = 6") +
            "[race]\ntime_limit_s = 900\ncountdown_s = 30\n[course]\nkind = \"windward-leeward\"\nbeat_m = 250\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n{boardSet}[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n");
        File.WriteAllText(Path.Combine(dir, "exp.toml"), experiment);
        return Path.Combine(dir, "exp.toml");
    }

    [Fact]
    public void ScenarioSetAppliesToEveryVariantAndBoardSetMergesOverTheBoardsOwnSet()
    {
        var path = Folder("scenario = \"race.toml\"\nboard = \"a\"\nfocus = \"rider\"\n[scenario_set]\ncourse.beat_m = 300\nwind.speed_kn = 10\n" +
            "[variants.x]\nset = \"\"\n[variants.y.board_set.a]\nsail.area_m2 = 7.4\nrider.mass_kg = 81\n" +
            "[variants.z.scenario_set]\nboards.b.tactic = \"header-tack\"\n", boardSet: "set = \"rider.mass_kg=70; fin.depth_cm=44\"\n");
        var spec = ExperimentFile.Load(path);
        Assert.Equal(("rider", "a"), (spec.Focus, spec.Board));
        Assert.All(spec.Variants, v => Assert.Equal(10, v.Setup.Wind.SpeedKn));
        var x = spec.Variants[0].Setup.Boards[0].Equipment; var y = spec.Variants[1].Setup.Boards[0].Equipment;
        Assert.Equal(70, x.Rider.MassKg);
        // y: the table's two keys over the scenario's own set; the fin depth the scenario set stays.
        Assert.Equal(7.4, y.Sail.AreaM2);
        Assert.Equal(81, y.Rider.MassKg);
        Assert.Equal(x.Fin, y.Fin);
        Assert.Equal(44, y.Fin.DepthCm, 9);
        Assert.Equal("header-tack", spec.Variants[2].Setup.Boards[1].Tactic);
        Assert.Equal("vmg-layline", spec.Variants[0].Setup.Boards[1].Tactic);
        // A bad key in a table is reported at its line in the experiment file.
        var bad = Folder("scenario = \"race.toml\"\n[variants.x]\nset = \"\"\n[variants.y.board_set.a]\nsail.area_m2 = 99\n");
        var e = Assert.Throws<SettingsException>(() => ExperimentFile.Load(bad));
        Assert.Contains("exp.toml:5", e.Message);
        Assert.Contains("sail.area_m2", e.Message);
        var noBoard = Folder("scenario = \"race.toml\"\n[variants.x]\nset = \"\"\n[variants.y.board_set.q]\nsail.area_m2 = 7\n");
        Assert.Contains("no board 'q'", Assert.Throws<SettingsException>(() => ExperimentFile.Load(noBoard)).Message);
    }

    [Fact]
    public void PerRaceFilesHaveHeadersAndResultsCarryWindAndDuration()
    {
        var path = Folder("scenario = \"race.toml\"\nraces = 2\nwind_min_kn = 9\nwind_max_kn = 15\n[variants.x]\nset = \"\"\n");
        var spec = ExperimentFile.Load(path);
        string dir = Path.Combine(Path.GetDirectoryName(path)!, "out");
        var rows = BatchRunner.Run(spec, dir, 2, false);
        Assert.Equal(RaceRow.Header, File.ReadLines(BatchRunner.RunFile(dir, "x", 0)).First());
        Assert.Equal(RaceMetrics.Header, File.ReadLines(BatchRunner.MetricsFile(dir, "x", 0)).First());
        foreach (var r in rows)
        {
            Assert.Equal(spec.WindFor(r.Race), r.WindKn, 3);
            var same = rows.Where(o => o.Race == r.Race && o.Finished).Select(o => o.ElapsedS!.Value).ToList();
            Assert.Equal(same.Min(), r.FirstFinisherS, 3);
            Assert.Equal(same.Max(), r.LastFinisherS, 3);
        }
        Assert.StartsWith(RaceRow.Header + "\n", BatchRunner.ResultsCsv(rows));
    }

    [Fact]
    public void RaceFromBatchReproducesRaceIAndAResumedBatchWarnsOfPeeking()
    {
        var path = Folder("scenario = \"race.toml\"\nraces = 3\nseed = 4\nwind_min_kn = 9\nwind_max_kn = 15\n[variants.x]\nset = \"\"\n[variants.y]\nset = \"boards.a.tactic=header-tack\"\n");
        string dir = Path.Combine(Path.GetDirectoryName(path)!, "out");
        var o = new StringWriter(); var e = new StringWriter();
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", path, "--out", dir, "--threads", "2"], o, e));
        Assert.DoesNotContain("Warning", File.ReadAllText(Path.Combine(dir, "report.md")));
        o = new StringWriter(); e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(["race", path, "--from-batch", dir, "--race", "2", "--variant", "y", "--out", Path.Combine(dir, "again")], o, e);
        Assert.True(code == 0, e.ToString() + o);
        Assert.Contains("matches the batch's", o.ToString());
        // The same race set up from the scenario with the wrong seed is not the batch's race.
        Assert.Equal(2, CourseSim.Cli.Program.Run(["race", path, "--from-batch", dir, "--race", "3", "--variant", "y"], new StringWriter(), new StringWriter()));
        Assert.Equal(2, CourseSim.Cli.Program.Run(["race", path, "--from-batch", dir, "--race", "0", "--variant", "nope"], new StringWriter(), new StringWriter()));
        // Extended after its summary was written: the report and the summary say so.
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", path, "--out", dir, "--races", "5", "--resume", "--threads", "2"], new StringWriter(), new StringWriter()));
        var md = File.ReadAllText(Path.Combine(dir, "report.md"));
        Assert.Contains("**Warning:** this batch was resumed after a summary of 6 races", md);
        using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "summary.json")));
        Assert.Equal(2, doc.RootElement.GetProperty("looks").GetInt32());
    }
}
