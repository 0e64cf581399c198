using System.Diagnostics;
using CourseSim.Tests.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Experiments;

/// <summary>
/// The experiment report rendered in headless Chromium (tests/e2e/report.mjs, the viewer test's browser set-up): every
/// chart loads, the headline comes first, no table header is squeezed narrower than its longest word and nothing but a
/// table's own scroll box is wider than the page. The screenshot is kept under the test's artefacts folder. Not in the
/// viewer's collection (which runs alone): it sets no environment variable and serves nothing, and its batch would keep
/// the other core idle for a minute.
/// </summary>
public class ReportBrowserTests(Xunit.Abstractions.ITestOutputHelper output)
{
    [Fact]
    public void TheReportRendersWithItsChartsAndReadableTables()
    {
        const string chromium = "/usr/bin/chromium";
        string exe = System.Environment.GetEnvironmentVariable("CHROMIUM") ?? chromium;
        string e2e = Path.Combine(RepoRoot.Path, "tests", "e2e");
        Assert.True(File.Exists(exe), $"headless browser tests need Debian's chromium at {chromium}: run .ci/run (it installs it) or 'apt-get install -y chromium'");
        Assert.True(Directory.Exists(Path.Combine(e2e, "node_modules", "playwright-core")), "run 'npm ci' in tests/e2e (the viewer browser test does it)");
        string dir = Directory.CreateTempSubdirectory("cs-report13-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), EngineTestKit.SteadyWind(12).Replace("shift_amplitude_deg = 0", "shift_amplitude_deg = 6") +
            "[race]\ntime_limit_s = 900\ncountdown_s = 30\n[course]\nkind = \"windward-leeward\"\nbeat_m = 250\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n" +
            $"[boards.c]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n");
        File.WriteAllText(Path.Combine(dir, "exp.toml"), "name = \"report check\"\nscenario = \"race.toml\"\nraces = 10\nwind_min_kn = 8\nwind_max_kn = 20\n" +
            "target_duration_s = 240\n[variants.small]\nset = \"\"\n[variants.big]\nset = \"boards.a.equipment=" + EngineTestKit.Equip("light-78.toml") + "\"\n");
        string outDir = Path.Combine(dir, "out");
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", Path.Combine(dir, "exp.toml"), "--out", outDir, "--threads", "2"], new StringWriter(), new StringWriter()));
        string shot = Path.Combine(AppContext.BaseDirectory, "artefacts", "report.png");
        Directory.CreateDirectory(Path.GetDirectoryName(shot)!);
        var psi = new ProcessStartInfo("node", $"report.mjs \"{Path.Combine(outDir, "report.html")}\" \"{shot}\"")
        { WorkingDirectory = e2e, RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi)!;
        string so = p.StandardOutput.ReadToEnd(), se = p.StandardError.ReadToEnd();
        Assert.True(p.WaitForExit(120_000), "the browser did not finish in 2 minutes");
        output.WriteLine(so);
        Assert.True(p.ExitCode == 0, so + se);
        Assert.Contains("\"charts\":{\"pass\":true,\"detail\":\"4 images", so); // paired, durations, sides, by wind
        Assert.True(new FileInfo(shot).Length > 10_000);
    }
}
