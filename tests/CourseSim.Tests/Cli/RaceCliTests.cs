using System.Text.Json;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Cli;

public class RaceCliTests
{
    static (int code, string stdout, string stderr) Run(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    static string Demo => Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-race.toml");
    static string TempDir() => Directory.CreateTempSubdirectory("cs-race-").FullName;

    [Fact]
    public void RaceWritesTheDocumentedFilesAndFields()
    {
        string dir = TempDir();
        var (code, stdout, stderr) = Run("race", Demo, "--seed", "11", "--set", "race.time_limit_s=900", "--out", dir);
        Assert.True(code == 0, stderr);
        Assert.Contains("place", stdout);
        Assert.Contains("Maren Holt", stdout);
        Assert.Contains("Caution", stdout);
        Assert.Contains("race: 100%", stderr); // plain progress when output is redirected
        foreach (var f in new[] { "results.csv", "summary.json", "replay.msgpack" }) Assert.True(File.Exists(Path.Combine(dir, f)), f);
        Assert.Equal(12, Directory.GetFiles(Path.Combine(dir, "tracks"), "*.gpx").Length);
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "summary.json")));
        Assert.Equal(11UL, doc.RootElement.GetProperty("seed").GetUInt64());
        var boards = doc.RootElement.GetProperty("boards");
        Assert.Equal(12, boards.GetArrayLength());
        foreach (var name in new[] { "name", "place", "elapsed_s", "finished", "distance_m", "tacks", "gybes" })
            Assert.True(boards[0].TryGetProperty(name, out _), name);
        var csv = File.ReadAllLines(Path.Combine(dir, "results.csv"));
        Assert.Equal(13, csv.Length);
        Assert.StartsWith("place,board,name,equipment,finished,elapsed_s", csv[0]);
    }

    [Fact]
    public void TwoRunsWithTheSameSeedWriteIdenticalFiles()
    {
        string a = TempDir(), b = TempDir();
        Assert.Equal(0, Run("race", Demo, "--set", "race.time_limit_s=300", "--out", a).code);
        Assert.Equal(0, Run("race", Demo, "--set", "race.time_limit_s=300", "--out", b).code);
        foreach (var f in new[] { "results.csv", "summary.json", "replay.msgpack" })
            Assert.Equal(File.ReadAllBytes(Path.Combine(a, f)), File.ReadAllBytes(Path.Combine(b, f)));
    }

    [Fact]
    public void BadScenarioInputExitsWithCodeTwoNamingFileLineAndKey()
    {
        string dir = TempDir();
        string bad = Path.Combine(dir, "bad.toml");
        File.WriteAllText(bad, File.ReadAllText(Demo).Replace("beat_m = 900", "beat_m = 90000"));
        var (code, _, stderr) = Run("race", bad, "--out", dir);
        Assert.Equal(2, code);
        Assert.Contains("bad.toml:", stderr);
        Assert.Contains("course.beat_m", stderr);
        Assert.Contains("100 to 5000", stderr);
        var (code2, _, stderr2) = Run("race", Demo, "--set", "course.kind=figure-eight", "--out", dir);
        Assert.Equal(2, code2);
        Assert.Contains("windward-leeward", stderr2);
        Assert.Equal(2, Run("race", Path.Combine(dir, "missing.toml")).code);
    }
}

public class BatchCliTests
{
    [Fact, Trait("Category", Slow.Category)]
    public void BatchWritesResultsAndTheDocumentedSummaryFields()
    {
        string dir = Directory.CreateTempSubdirectory("cs-batchcli-").FullName;
        var o = new StringWriter(); var e = new StringWriter();
        string exp = Path.Combine(RepoRoot.Path, "scenarios", "experiments", "maren-sail-size.toml");
        int code = CourseSim.Cli.Program.Run(["batch", exp, "--races", "3", "--threads", "2", "--out", dir], o, e);
        Assert.True(code == 0, e.ToString());
        Assert.Contains("batch: 6/6 races", e.ToString());
        using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "summary.json")));
        var v = doc.RootElement.GetProperty("variants");
        Assert.Equal(2, v.GetArrayLength());
        foreach (var name in new[] { "name", "races", "mean_elapsed_s", "win_share" }) Assert.True(v[0].TryGetProperty(name, out _), name);
        var p = doc.RootElement.GetProperty("pairs")[0];
        foreach (var name in new[] { "a", "b", "mean_diff_s", "ci_low_s", "ci_high_s", "significant" }) Assert.True(p.TryGetProperty(name, out _), name);
        Assert.Equal(1 + 2 * 3 * 12, File.ReadAllLines(Path.Combine(dir, "results.csv")).Length);
        var pq = CourseSim.Cli.Output.ParquetResults.Read(Path.Combine(dir, "results.parquet"));
        Assert.Equal(2 * 3 * 12, pq.Count);
        Assert.Equal(File.ReadAllLines(Path.Combine(dir, "results.csv"))[1].Split(',')[0], pq[0].variant);
        var md = File.ReadAllText(Path.Combine(dir, "report.md"));
        Assert.Contains("| sail-66 - sail-78 |", md);
        Assert.Contains("Caution", md);
        var html = File.ReadAllText(Path.Combine(dir, "report.html"));
        // Paired differences, durations and side fairness; no chart by wind from 3 races (the spline needs 8).
        Assert.Equal(3, System.Text.RegularExpressions.Regex.Matches(html, "data:image/png;base64,").Count);
        Assert.DoesNotContain("src=\"http", html); // self-contained
        Assert.Equal(2, CourseSim.Cli.Program.Run(["batch", exp, "--races", "0"], new StringWriter(), new StringWriter()));
    }
}

public class BatchKillTests
{
    /// <summary>
    /// A batch process killed part way (not cancelled: killed) and then resumed ends with the same results as an
    /// uninterrupted batch: each race is written whole, through a temporary file and a rename, as it ends.
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void AKilledBatchResumesToTheSameResults()
    {
        string exp = Path.Combine(RepoRoot.Path, "scenarios", "experiments", "korrin-bay-beat-length.toml");
        string cli = Path.Combine(AppContext.BaseDirectory, "coursesim.dll");
        string killed = Directory.CreateTempSubdirectory("cs-kill-").FullName, whole = Directory.CreateTempSubdirectory("cs-whole-").FullName;
        var psi = new System.Diagnostics.ProcessStartInfo("dotnet", $"\"{cli}\" batch \"{exp}\" --races 8 --threads 1 --out \"{killed}\"")
        { RedirectStandardOutput = true, RedirectStandardError = true };
        using (var p = System.Diagnostics.Process.Start(psi)!)
        {
            var runs = Path.Combine(killed, "runs");
            var deadline = DateTime.UtcNow.AddSeconds(120);
            while (DateTime.UtcNow < deadline && !p.HasExited &&
                   (!Directory.Exists(runs) || Directory.GetFiles(runs, "??????.csv", SearchOption.AllDirectories).Length < 3))
                Thread.Sleep(50);
            Assert.False(p.HasExited, "the batch ended before it could be killed");
            p.Kill(entireProcessTree: true);
            p.WaitForExit();
        }
        int done = Directory.GetFiles(Path.Combine(killed, "runs"), "??????.csv", SearchOption.AllDirectories).Length;
        Assert.InRange(done, 3, 15);
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", exp, "--races", "8", "--threads", "2", "--out", killed, "--resume"], new StringWriter(), new StringWriter()));
        Assert.Equal(0, CourseSim.Cli.Program.Run(["batch", exp, "--races", "8", "--threads", "2", "--out", whole], new StringWriter(), new StringWriter()));
        Assert.Equal(File.ReadAllText(Path.Combine(whole, "results.csv")), File.ReadAllText(Path.Combine(killed, "results.csv")));
        Assert.Equal(File.ReadAllText(Path.Combine(whole, "report.md")), File.ReadAllText(Path.Combine(killed, "report.md")));
    }
}
