using System.Text.Json;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Cli;

public class PolarCliTests
{
    static (int code, string stdout, string stderr) Run(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    static string Equip(string name) => Path.Combine(RepoRoot.Path, "scenarios", "equipment", name);
    static string TempDir() => Directory.CreateTempSubdirectory("cs-test-").FullName;

    [Fact]
    public void JsonHasTheDocumentedFields()
    {
        string dir = TempDir();
        var (code, stdout, _) = Run("polar", Equip("heavy-86.toml"), "--wind", "8,14", "--angles", "40:180:20", "--format", "json", "--out", dir);
        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(stdout);
        var root = doc.RootElement;
        var points = root.GetProperty("points");
        Assert.Equal(2 * 8, points.GetArrayLength());
        foreach (var name in new[] { "tws_kn", "twa_deg", "speed_kn", "vmg_kn", "leeway_deg", "aoa_deg", "heel_use", "planing" })
            Assert.True(points[0].TryGetProperty(name, out _), name);
        foreach (var side in new[] { "upwind", "downwind" })
        {
            var first = root.GetProperty(side)[0];
            foreach (var name in new[] { "tws_kn", "twa_deg", "vmg_kn", "speed_kn" }) Assert.True(first.TryGetProperty(name, out _), name);
        }
        var thr = root.GetProperty("planing_threshold_kn");
        Assert.Equal(JsonValueKind.Number, thr.GetProperty("without_pumping").ValueKind);
        Assert.Equal(JsonValueKind.Number, thr.GetProperty("with_pumping").ValueKind);
        Assert.True(File.Exists(Path.Combine(dir, "polar.csv")));
        Assert.True(new FileInfo(Path.Combine(dir, "polar.png")).Length > 10_000);
        Assert.Equal(17, File.ReadAllLines(Path.Combine(dir, "polar.csv")).Length);
    }

    [Fact]
    public void TableCarriesCaution()
    {
        var (code, stdout, _) = Run("polar", Equip("light-66.toml"), "--wind", "10", "--angles", "90", "--out", TempDir());
        Assert.Equal(0, code);
        Assert.Contains("not a judgement of safe conditions", stdout);
        Assert.Contains("Planing threshold", stdout);
    }

    [Fact]
    public void ComparisonFindsCrossoverAndWritesChart()
    {
        string dir = TempDir();
        var (code, stdout, _) = Run("polar", Equip("light-66.toml"), Equip("light-78.toml"), "--wind", "6:24:2", "--angles", "30:180:5", "--format", "json", "--out", dir);
        Assert.Equal(0, code);
        using var doc = JsonDocument.Parse(stdout);
        Assert.True(doc.RootElement.GetProperty("crossovers").GetArrayLength() >= 1);
        Assert.True(File.Exists(Path.Combine(dir, "comparison.png")));
    }

    [Fact]
    public void SetOverrideChangesResult()
    {
        var (_, a, _) = Run("polar", Equip("heavy-86.toml"), "--wind", "12", "--angles", "90", "--format", "json", "--out", TempDir());
        var (_, b, _) = Run("polar", Equip("heavy-86.toml"), "--wind", "12", "--angles", "90", "--format", "json", "--out", TempDir(), "--set", "sail.area_m2=5.0");
        double Speed(string s) => JsonDocument.Parse(s).RootElement.GetProperty("points")[0].GetProperty("speed_kn").GetDouble();
        Assert.True(Speed(b) < Speed(a));
    }

    [Theory]
    [InlineData("--set", "sail.aera_m2=7")]
    [InlineData("--set", "rider.mass_kg=900")]
    [InlineData("--wind", "abc")]
    [InlineData("--angles", "180:30:5")]
    [InlineData("--format", "xml")]
    public void BadInputExitsTwo(string opt, string value)
    {
        var (code, _, err) = Run("polar", Equip("heavy-86.toml"), opt, value, "--out", TempDir());
        Assert.Equal(2, code);
        Assert.StartsWith("error:", err);
        Assert.DoesNotContain("   at ", err);
    }

    [Fact]
    public void BadFileNamesFileAndLine()
    {
        string f = Path.Combine(TempDir(), "bad.toml");
        File.WriteAllText(f, "[fin]\narea_cm2 = 450\ndepth = 40\n");
        var (code, _, err) = Run("polar", f, "--out", TempDir());
        Assert.Equal(2, code);
        Assert.Contains("bad.toml:3", err);
        Assert.Contains("fin.depth_cm", err);
    }
}
