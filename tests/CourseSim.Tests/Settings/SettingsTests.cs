using CourseSim.Equilibrium;
using CourseSim.Settings;

namespace CourseSim.Tests.Settings;

public class SettingsTests
{
    static string Write(string text)
    {
        string path = Path.Combine(Path.GetTempPath(), $"cs-{Guid.NewGuid():N}.toml");
        File.WriteAllText(path, text);
        return path;
    }

    [Fact]
    public void ReadsKeysAndDefaults()
    {
        var eq = EquipmentFile.Load(Write("name = \"x\"\n[sail]\narea_m2 = 6.2\n[rider]\nmass_kg = 70\n"));
        Assert.Equal(6.2, eq.Sail.AreaM2);
        Assert.Equal(70, eq.Rider.MassKg);
        Assert.Equal(450, eq.Fin.AreaCm2);
        Assert.Equal("x", eq.Name);
    }

    [Fact]
    public void UnknownKeyNamesFileLineAndKnownKeys()
    {
        string p = Write("[sail]\narea_m2 = 6\naera_m2 = 7\n");
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(p));
        Assert.Equal(3, e.Line);
        Assert.Equal("sail.aera_m2", e.Key);
        Assert.Contains(p + ":3", e.Message);
        Assert.Contains("sail.area_m2", e.Message);
    }

    [Fact]
    public void OutOfRangeNamesTheAcceptedRange()
    {
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(Write("[rider]\n\nmass_kg = 400\n")));
        Assert.Equal(3, e.Line);
        Assert.Contains("35 to 130", e.Message);
    }

    [Fact]
    public void WrongTypeIsAnError()
    {
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(Write("[sail]\narea_m2 = \"big\"\n")));
        Assert.Contains("expected a number", e.Message);
    }

    [Fact]
    public void BrokenTomlGivesLine()
    {
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(Write("[sail]\narea_m2 = = 6\n")));
        Assert.Equal(2, e.Line);
    }

    [Fact]
    public void OverridesApplyAndAreChecked()
    {
        string p = Write("[sail]\narea_m2 = 6\n");
        Assert.Equal(8.1, EquipmentFile.Load(p, ["sail.area_m2=8.1"]).Sail.AreaM2);
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(p, ["sail.area=8"]));
        Assert.Equal("--set", e.Origin);
        Assert.Throws<SettingsException>(() => EquipmentFile.Load(p, ["fin.depth_cm=500"]));
        Assert.Throws<SettingsException>(() => EquipmentFile.Load(p, ["nonsense"]));
    }

    [Fact]
    public void CrossFieldChecks()
    {
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load(Write("[sail]\ndepth_loose = 0.08\ndepth_tight = 0.1\n")));
        Assert.Equal("sail.depth_tight", e.Key);
        Assert.Equal(3, e.Line);
    }

    [Fact]
    public void MissingFile()
    {
        var e = Assert.Throws<SettingsException>(() => EquipmentFile.Load("/nonexistent/x.toml"));
        Assert.Contains("not found", e.Message);
    }

    // Every bundled demo set-up loads.
    [Fact]
    public void DemoSetupsLoad()
    {
        var dir = Path.Combine(RepoRoot.Path, "scenarios", "equipment");
        var files = Directory.GetFiles(dir, "*.toml");
        Assert.True(files.Length >= 4);
        foreach (var f in files) Assert.NotNull(EquipmentFile.Load(f));
    }
}

public static class RepoRoot
{
    public static string Path
    {
        get
        {
            var d = new DirectoryInfo(AppContext.BaseDirectory);
            while (d is not null && !File.Exists(System.IO.Path.Combine(d.FullName, "CourseSim.sln"))) d = d.Parent;
            return d?.FullName ?? throw new InvalidOperationException("repository root not found");
        }
    }
}
