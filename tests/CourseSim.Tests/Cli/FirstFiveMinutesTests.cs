using CourseSim.Cli.Commands;
using CourseSim.Cli.Output;
using CourseSim.Engine;
using CourseSim.Experiments;

namespace CourseSim.Tests.Cli;

/// <summary>The commands a newcomer meets first: help, tactics, keys, init, and tables that fit the terminal.</summary>
public class FirstFiveMinutesTests
{
    static (int Code, string Out, string Err) Cli(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void AloneItPrintsHelpListingEveryCommand()
    {
        var r = Cli();
        Assert.Equal(0, r.Code);
        Assert.Equal("", r.Err);
        foreach (var c in new[] { "polar", "wind", "race", "batch", "view", "tactics", "keys", "init" }) Assert.Contains(c, r.Out);
    }

    [Fact]
    public void TacticsListsEveryBuiltInTacticWithItsParametersAndRanges()
    {
        var r = Cli("tactics");
        Assert.Equal(0, r.Code);
        foreach (var t in CourseSim.Agents.BuiltInTactics.All)
        {
            Assert.Contains(t.Name, r.Out);
            foreach (var p in t.Params) Assert.Contains("params." + p.Name, r.Out);
        }
        var one = Cli("tactics", "header-tack");
        Assert.Contains("params.header_deg = 5   (1 to 45)", one.Out);
        Assert.Equal(2, Cli("tactics", "no-such").Code);
    }

    [Fact]
    public void KeysComeFromTheSchemasThatValidate()
    {
        var all = Cli("keys", "equipment");
        Assert.Equal(0, all.Code);
        foreach (var k in CourseSim.Equilibrium.EquipmentFile.Schema.Keys.Keys) Assert.Contains(k, all.Out);
        var one = Cli("keys", "equipment", "sail.area_m2");
        Assert.Contains("unit:    m2", one.Out);
        Assert.Contains("range:   2 to 13", one.Out);
        Assert.Contains("default: 7", one.Out);
        Assert.Contains("boards.*.tactic", Cli("keys", "scenario", "boards.maren.tactic").Out);
        Assert.Contains("wind.speed_kn", Cli("keys", "wind").Out);
        var bad = Cli("keys", "equipment", "sail.area");
        Assert.Equal(2, bad.Code);
        Assert.Contains("sail.area_m2", bad.Err);
        Assert.Equal(2, Cli("keys", "boat").Code);
        Assert.Equal("kn/h", KeysCommand.Unit("wind.ramp_kn_per_hour"));
        Assert.Equal("-", KeysCommand.Unit("rider.skill"));
    }

    [Fact]
    public void InitWritesFilesThatLoadAsTheyAreAndNeverOverwrites()
    {
        string dir = Path.Combine(Directory.CreateTempSubdirectory("cs-init-").FullName, "mine");
        var r = Cli("init", "experiment", dir);
        Assert.True(r.Code == 0, r.Err);
        var spec = ExperimentFile.Load(Path.Combine(dir, "experiment.toml"));
        Assert.Equal(2, spec.Variants.Count);
        Assert.Equal("header-tack", spec.Variants[1].Setup.Boards.Single(b => b.Id == "jonna").Tactic);
        var setup = ScenarioFile.LoadRace(Path.Combine(dir, "scenario.toml"));
        Assert.Equal("Ostrin Sound", setup.VenueName);
        Assert.Equal(2, setup.Boards.Count);
        string text = File.ReadAllText(Path.Combine(dir, "scenario.toml"));
        Assert.Contains("# mean true wind speed at 10 m, kn (0 to 45; default 14)\nspeed_kn = 13", text);
        var again = Cli("init", "scenario", dir);
        Assert.Equal(2, again.Code);
        Assert.Contains("already exist", again.Err);
        Assert.Equal(text, File.ReadAllText(Path.Combine(dir, "scenario.toml")));
        string eq = Path.Combine(Directory.CreateTempSubdirectory("cs-init-").FullName, "rig");
        Assert.Equal(0, Cli("init", "equipment", eq).Code);
        Assert.Equal("My rig: 7.0 m2 freeride", CourseSim.Equilibrium.EquipmentFile.Load(Path.Combine(eq, "my-rig.toml")).Name);
        Assert.Equal(2, Cli("init", "boat", eq).Code);
    }

    [Fact]
    public void ATooWideTableLeavesOutWholeColumnsNeverDigits()
    {
        // Forty rows like the 40-board race's: at 120 columns the legs column goes, every elapsed time stays whole.
        var rows = Enumerable.Range(1, 40).Select(i => new[] { i.ToString(), $"Rider Number {i}", $"11:{i % 60:00}.{i % 10}", $"+1:{i % 60:00}.0",
            "3:47 0:36 2:45 0:56 0:15 3:47 0:36 2:45 0:56 0:15", "3.68", "14.3", $"{i}/11/{i % 3}", i % 7 == 0 ? "penalty turn x1" : "" }).ToList();
        FitColumn[] cols = [new("place", true, 0), new("board", false, 0), new("elapsed", true, 0), new("gap", true, 3), new("legs (m:ss)", false, 5),
            new("km", true, 4), new("avg kn", true, 2), new("T/G/F", true, 1), new("notes", false, 0, Wraps: true)];
        foreach (int width in new[] { 200, 120, 80, 60 })
        {
            var console = Spectre.Console.AnsiConsole.Create(new Spectre.Console.AnsiConsoleSettings
                { Out = new Spectre.Console.AnsiConsoleOutput(new StringWriter()), Ansi = Spectre.Console.AnsiSupport.No });
            console.Profile.Width = width;
            var table = TableFit.Build("t", cols, rows, width, out var dropped);
            var w = new StringWriter();
            var c2 = Spectre.Console.AnsiConsole.Create(new Spectre.Console.AnsiConsoleSettings { Out = new Spectre.Console.AnsiConsoleOutput(w), Ansi = Spectre.Console.AnsiSupport.No });
            c2.Profile.Width = width;
            c2.Write(table);
            string text = w.ToString();
            Assert.All(text.Split('\n'), l => Assert.True(l.TrimEnd().Length <= width, $"{width}: '{l}'"));
            foreach (var r in rows)
            {
                Assert.Contains(r[2], text); // elapsed, whole
                if (!dropped.Contains("T/G/F")) Assert.Contains(r[7], text);
            }
            if (width >= 200) Assert.Empty(dropped);
            if (width == 120) Assert.Contains("legs (m:ss)", dropped);
        }
    }
}
