using CourseSim.Experiments;
using CourseSim.Settings;
using CourseSim.Simulation;
using CourseSim.Tests.Settings;
using CourseSim.Tests.Engine;
using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Tests.Wind;

/// <summary>Scenarios driven by a measured log ([wind] log = "file.csv"; docs/wind-fit.md).</summary>
public class LogDrivenWindTests
{
    static string Demo(string name) => Path.Combine(RepoRoot.Path, "scenarios", name);

    static string LogFolder(string windExtra)
    {
        string dir = Directory.CreateTempSubdirectory("cs-log-").FullName;
        // A hand-written log: 1-min rows, speed rising 10 -> 16 kn over an hour, direction veering 200 -> 230 deg.
        var sb = new System.Text.StringBuilder("time,speed_kn,direction_deg\n");
        for (int i = 0; i <= 120; i++) sb.Append($"{1781438400 + 60 * i},{10 + 6.0 * Math.Min(i, 60) / 60:0.000},{200 + 30.0 * Math.Min(i, 60) / 60:0.000}\n");
        File.WriteAllText(Path.Combine(dir, "log.csv"), sb.ToString());
        File.WriteAllText(Path.Combine(dir, "race.toml"), $"[wind]\nlog = \"log.csv\"\ngust_intensity = 0\nshadows = false\n{windExtra}" +
            "[race]\ntime_limit_s = 600\ncountdown_s = 30\nseed = 3\n[course]\nkind = \"windward-leeward\"\nbeat_m = 250\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n");
        return dir;
    }

    [Fact]
    public void TheFieldFollowsTheLogAtTheOriginAndCarriesItDownwind()
    {
        string dir = LogFolder("log_offset_s = 600\n");
        var setup = ScenarioFile.LoadRace(Path.Combine(dir, "race.toml"));
        var field = new WindField(setup.Wind, 3);
        // At the origin, race time 300 s is 900 s into the log: 10 + 6 * 15/60 = 11.5 kn from 200 + 30 * 15/60 = 207.5 deg.
        var w = field.Sample(0, 0, 300);
        Assert.Equal(11.5, w.SpeedKn, 6);
        Assert.Equal(207.5, w.FromDeg, 6);
        // Taylor's hypothesis: d metres downwind sees at t what the origin saw d/U earlier (U the window's mean speed).
        double u = Unit.KnotsToMs(setup.Wind.SpeedKn), d = 500;
        double dirRad = Unit.DegToRad(setup.Wind.DirectionDeg);
        var down = field.Sample(-Math.Sin(dirRad) * d, -Math.Cos(dirRad) * d, 300 + d / u);
        Assert.Equal(w.SpeedKn, down.SpeedKn, 6);
        Assert.Equal(w.FromDeg, down.FromDeg, 6);
        // The race's mean wind is the window's (race time -30 .. 600 s: log 570 .. 1200 s).
        Assert.InRange(setup.Wind.SpeedKn, 11.4, 12.0);
    }

    [Fact]
    public void ALogDrivenRaceIsDeterministic()
    {
        var setup = ScenarioFile.LoadRace(Demo("korrin-bay-log.toml"), ["race.time_limit_s=120", "race.countdown_s=20"]);
        var a = new Race(setup); a.Run();
        var b = new Race(ScenarioFile.LoadRace(Demo("korrin-bay-log.toml"), ["race.time_limit_s=120", "race.countdown_s=20"])); b.Run();
        Assert.Equal(a.StateHash(), b.StateHash());
    }

    [Fact]
    public void RandomWindowsAreDrawnPerRaceAndABatchIsThreadCountIndependent()
    {
        string dir = LogFolder("log_windows = \"random\"\n");
        File.WriteAllText(Path.Combine(dir, "exp.toml"), "scenario = \"race.toml\"\nraces = 4\nseed = 11\n[variants.x]\nset = \"\"\n");
        string exp = Path.Combine(dir, "exp.toml");
        var spec = ExperimentFile.Load(exp);
        var winds = Enumerable.Range(0, 4).Select(r => spec.SetupFor(0, r).Wind).ToList();
        Assert.True(winds.Select(w => w.Log!.OffsetS).Distinct().Count() == 4, "each race draws its own window");
        Assert.All(winds, w => Assert.InRange(w.Log!.OffsetS, 30, 7200 - 630 + 30 + 1e-9));
        Assert.Equal(winds[2].Log!.OffsetS, ExperimentFile.Load(exp).SetupFor(0, 2).Wind.Log!.OffsetS);
        string o1 = Path.Combine(dir, "t1"), o2 = Path.Combine(dir, "t2");
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", exp, "--out", o1, "--threads", "1"], new StringWriter(), new StringWriter()));
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", exp, "--out", o2, "--threads", "2"], new StringWriter(), new StringWriter()));
        for (int r = 0; r < 4; r++)
            Assert.Equal(File.ReadAllText(BatchRunner.RunFile(o1, "x", r)), File.ReadAllText(BatchRunner.RunFile(o2, "x", r)));
    }

    [Fact]
    public void AnExperimentsWindRangeOnALogDrivenScenarioIsALocatedError()
    {
        string dir = LogFolder("");
        File.WriteAllText(Path.Combine(dir, "exp.toml"), "scenario = \"race.toml\"\nraces = 2\nwind_min_kn = 8\nwind_max_kn = 12\n[variants.x]\nset = \"\"\n");
        var e = Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "exp.toml")));
        Assert.Equal(3, e.Line);
        Assert.Contains("log_windows", e.Message);
    }

    [Fact]
    public void KeysTheLogReplacesAreLocatedErrors()
    {
        string dir = LogFolder("speed_kn = 12\n");
        var e = Assert.Throws<SettingsException>(() => ScenarioFile.LoadRace(Path.Combine(dir, "race.toml")));
        Assert.Equal(5, e.Line);
        Assert.Contains("wind.speed_kn", e.Message);
        string dir2 = LogFolder("log_offset_s = 99999\n");
        Assert.Contains("beyond the end of the log", Assert.Throws<SettingsException>(() => ScenarioFile.LoadRace(Path.Combine(dir2, "race.toml"))).Message);
    }
}
