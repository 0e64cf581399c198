using System.Text.Json;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Cli;

/// <summary>wind-fit and rig-fit as a user runs them: files written, JSON fields, bad and thin input (exit 2).</summary>
public class FitCliTests
{
    static (int code, string stdout, string stderr) Run(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    static string Data(string name) => Path.Combine(RepoRoot.Path, "scenarios", "data", name);
    static string Equip(string name) => Path.Combine(RepoRoot.Path, "scenarios", "equipment", name);
    static string Temp() => Directory.CreateTempSubdirectory("cs-fit-").FullName;

    [Fact]
    public void WindFitWritesTheTableJsonAndPlotAndReportsTheBadRow()
    {
        string dir = Temp();
        var (code, stdout, stderr) = Run("wind-fit", Data("korrin-point-station.csv"), "--format", "json", "--out", dir, "--replicates", "40");
        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(stdout);
        var p = doc.RootElement.GetProperty("parameters");
        foreach (var k in new[] { "speed_kn", "ramp_kn_per_hour", "direction_deg", "persistent_deg_per_min", "shift_amplitude_deg", "shift_period_s", "shift_irregularity", "gust_intensity", "gust_length_m" })
            Assert.True(p.GetProperty(k).GetProperty("resolved").GetBoolean(), k);
        Assert.Equal(199, doc.RootElement.GetProperty("problems")[0].GetProperty("line").GetInt32());
        Assert.Contains("korrin-point-station.csv:199", stderr);
        var toml = File.ReadAllText(Path.Combine(dir, "wind-fit.toml"));
        Assert.Contains("[wind]", toml);
        // The table loads as a scenario's [wind] (pasted into an otherwise empty scenario file).
        var f = CourseSim.Settings.SettingsFile.Parse(toml, "pasted.toml", CourseSim.Simulation.ScenarioFile.Schema);
        Assert.InRange(f.Number("wind.speed_kn"), 14, 16.5);
        Assert.True(new FileInfo(Path.Combine(dir, "wind-fit.png")).Length > 20_000);
    }

    [Fact]
    public void WindFitWindowOutsideTheLogIsExit2()
    {
        var (code, _, stderr) = Run("wind-fit", Data("korrin-point-station.csv"), "--from", "2026-06-15T10:00:00Z", "--out", Temp());
        Assert.Equal(2, code);
        Assert.Contains("window", stderr);
    }

    [Fact]
    public void RigFitMalformedGpxIsExit2WithTheLine()
    {
        string dir = Temp(), gpx = Path.Combine(dir, "bad.gpx");
        File.WriteAllText(gpx, "<?xml version=\"1.0\"?>\n<gpx version=\"1.1\" xmlns=\"http://www.topografix.com/GPX/1/1\">\n<trk><trkseg>\n<trkpt lat=\"47.2\" lon=\"-3.5\"><time>2026-06-14T13:00:00Z</time>\n</trkseg></trk></gpx>\n");
        var (code, _, stderr) = Run("rig-fit", Equip("light-66.toml"), gpx, "--wind-kn", "15", "--out", dir);
        Assert.Equal(2, code);
        Assert.Contains("bad.gpx:5", stderr);
    }

    [Fact]
    public void RigFitOnTheDemoTracksWritesALoadableCalibratedFile()
    {
        string dir = Temp();
        var (code, stdout, stderr) = Run("rig-fit", Equip("light-66.toml"), Data("maren-session-1.gpx"), Data("maren-session-2.gpx"),
            "--wind", Data("korrin-point-station.csv"), "--format", "json", "--out", dir);
        Assert.True(code == 0, stderr);
        using var doc = JsonDocument.Parse(stdout);
        var lever = doc.RootElement.GetProperty("parameters").GetProperty("rider.lever_m");
        // The demo's invented truth (scenarios/data/README.md): lever 1.3 m, chop 26 cm2, inside the intervals.
        Assert.InRange(1.3, lever.GetProperty("low").GetDouble(), lever.GetProperty("high").GetDouble());
        var chop = doc.RootElement.GetProperty("parameters").GetProperty("conditions.chop_drag_area_cm2");
        Assert.InRange(26.0, chop.GetProperty("low").GetDouble(), chop.GetProperty("high").GetDouble());
        string file = Path.Combine(dir, "light-66-fitted.toml");
        var text = File.ReadAllText(file);
        Assert.Contains("# fitted by coursesim rig-fit from 2 track file(s)", text);
        Assert.Contains("mass_kg = 58", text); // the original's other keys kept as written
        var eq = CourseSim.Equilibrium.EquipmentFile.Load(file);
        Assert.Equal(lever.GetProperty("value").GetDouble(), eq.Rider.LeverM, 3);
        Assert.Equal("Maren 6.6 (fitted)", eq.Name);
        Assert.True(new FileInfo(Path.Combine(dir, "rig-fit.png")).Length > 20_000);
    }

    [Fact]
    public void AWalkOnTheBeachAndASingleTackSayWhatIsMissing()
    {
        string dir = Temp();
        string Track(string name, Func<int, (double X, double Y)> at)
        {
            var pts = Enumerable.Range(0, 600).Select(at).ToList();
            string path = Path.Combine(dir, name);
            File.WriteAllText(path, CourseSim.Tests.RigFit.RigTracks.Gpx([pts], new DateTime(2026, 6, 14, 13, 0, 0, DateTimeKind.Utc), name));
            return path;
        }
        // 1.4 m/s, a brisk walk.
        var walk = Run("rig-fit", Equip("light-66.toml"), Track("walk.gpx", i => (1.4 * i, 0)), "--wind-kn", "15", "--out", dir);
        Assert.Equal(2, walk.code);
        Assert.Contains("walk on the beach", walk.stderr);
        // Ten minutes on one reach at 8 m/s: no pair of tacks for the wind direction.
        var one = Run("rig-fit", Equip("light-66.toml"), Track("reach.gpx", i => (8.0 * i, 0)), "--wind-kn", "15", "--out", dir);
        Assert.Equal(2, one.code);
        Assert.Contains("--wind-from-deg", one.stderr);
        // With the direction given, one angle is still too little to fit.
        var thin = Run("rig-fit", Equip("light-66.toml"), Path.Combine(dir, "reach.gpx"), "--wind-kn", "15", "--wind-from-deg", "0", "--out", dir);
        Assert.Equal(2, thin.code);
        Assert.Contains("three 10-deg ranges", thin.stderr);
    }
}
