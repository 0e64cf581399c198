using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Text;
using CourseSim.Cli.Viewer;
using CourseSim.Engine;
using CourseSim.Replay;
using CourseSim.Tests.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Viewer;

/// <summary>A short demo race and its replay, shared by the viewer tests (written once per test run).</summary>
public sealed class ViewerFixture : IDisposable
{
    public string Folder { get; } = Directory.CreateTempSubdirectory("coursesim-viewer-").FullName;
    public string ReplayPath { get; }
    public ReplayData Replay { get; }
    public byte[] Bytes { get; }

    public ViewerFixture()
    {
        var race = new Race(EngineTestKit.Demo(["race.time_limit_s=240"]));
        var res = race.Run();
        Bytes = ReplayFile.Write(race, res);
        ReplayPath = Path.Combine(Folder, "replay.msgpack");
        File.WriteAllBytes(ReplayPath, Bytes);
        Replay = ReplayFile.Read(Bytes, ReplayPath);
    }

    public void Dispose() { try { Directory.Delete(Folder, true); } catch (IOException) { } }
}

/// <summary>
/// The viewer tests run alone, after the parallel ones: the server they start lives in this process, and on a 2-core
/// machine the thread pool busy with other tests' races could leave a page request waiting past the browser's timeout.
/// </summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class ViewerCollection { public const string Name = "viewer (alone)"; }

/// <summary>The viewer's server: loopback only by default, its own files and the named replay only, clear errors.</summary>
[Collection(ViewerCollection.Name)]
public class ViewerServerTests(ViewerFixture fx) : IClassFixture<ViewerFixture>
{
    static readonly HttpClient Http = new() { Timeout = TimeSpan.FromSeconds(20) };

    [Fact]
    public async Task BindsToLoopbackUnlessAHostIsGiven()
    {
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        Assert.True(IPAddress.IsLoopback(server.Address));
        Assert.Equal("127.0.0.1", server.Url.Host);
        Assert.True(server.Url.Port > 0);
        Assert.Equal(HttpStatusCode.OK, (await Http.GetAsync(server.Url)).StatusCode);
        // From another address of this machine (if it has one), nothing answers.
        var other = System.Net.NetworkInformation.NetworkInterface.GetAllNetworkInterfaces()
            .SelectMany(n => n.GetIPProperties().UnicastAddresses).Select(a => a.Address)
            .FirstOrDefault(a => a.AddressFamily == AddressFamily.InterNetwork && !IPAddress.IsLoopback(a));
        if (other is not null)
        {
            using var tcp = new TcpClient();
            var refused = await Assert.ThrowsAnyAsync<SocketException>(() => tcp.ConnectAsync(other, server.Url.Port));
            Assert.NotNull(refused);
        }
        var bad = await Assert.ThrowsAsync<CourseSim.Cli.UsageException>(() => ViewerServer.StartAsync("not-an-address", 0, fx.ReplayPath, null));
        Assert.Contains("not an IP address", bad.Message);
    }

    [Fact]
    public async Task ServesOnlyItsOwnFilesAndTheReplayNoPathTraversal()
    {
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        foreach (var ok in new[] { "", "viewer.js", "viewer.css", "replay.json" })
            Assert.Equal(HttpStatusCode.OK, (await Http.GetAsync(new Uri(server.Url, ok))).StatusCode);
        // Raw requests, so no client tidies the path first.
        foreach (var path in new[] { "/../../../../etc/passwd", "/..%2f..%2f..%2fetc%2fpasswd", "/%2e%2e/%2e%2e/etc/passwd", "/viewer.js/../../replay.msgpack",
                                     "/replay.msgpack", "/" + Path.GetFileName(fx.ReplayPath), "/C:/Windows/win.ini", "//etc/passwd", "/.git/config" })
        {
            var (status, body) = await Raw(server.Url.Port, $"GET {path} HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n");
            Assert.True(status is 404 or 400, $"{path}: {status}");
            Assert.DoesNotContain("root:", body);
            Assert.DoesNotContain("[core]", body);
        }
        var (post, _) = await Raw(server.Url.Port, "POST /replay.json HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Length: 0\r\nConnection: close\r\n\r\n");
        Assert.Equal(405, post);
    }

    static async Task<(int Status, string Body)> Raw(int port, string request)
    {
        using var tcp = new TcpClient();
        await tcp.ConnectAsync(IPAddress.Loopback, port);
        var stream = tcp.GetStream();
        await stream.WriteAsync(Encoding.ASCII.GetBytes(request));
        using var reader = new StreamReader(stream, Encoding.UTF8);
        string text = await reader.ReadToEndAsync();
        var first = text.Split("\r\n")[0].Split(' ');
        return (int.Parse(first[1]), text);
    }

    [Fact]
    public void BadAndTruncatedReplaysGiveAClearErrorInTheCli()
    {
        string garbage = Path.Combine(fx.Folder, "garbage.msgpack"), cut = Path.Combine(fx.Folder, "cut.msgpack");
        File.WriteAllText(garbage, "this is not a replay");
        File.WriteAllBytes(cut, fx.Bytes.AsSpan(0, fx.Bytes.Length / 2).ToArray());
        foreach (var (file, words) in new[] { (garbage, "garbage.msgpack"), (cut, "cut.msgpack"), (Path.Combine(fx.Folder, "missing.msgpack"), "not found") })
        {
            var o = new StringWriter(); var e = new StringWriter();
            Assert.Equal(2, CourseSim.Cli.Program.Run(["view", file], o, e));
            Assert.Contains(words, e.ToString());
        }
    }

    [Fact]
    public async Task AReplayBrokenWhileServedGivesItsErrorToThePage()
    {
        string copy = Path.Combine(fx.Folder, "served.msgpack");
        File.WriteAllBytes(copy, fx.Bytes);
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, copy, null);
        Assert.Equal(HttpStatusCode.OK, (await Http.GetAsync(new Uri(server.Url, "replay.json"))).StatusCode);
        File.WriteAllBytes(copy, fx.Bytes.AsSpan(0, 1000).ToArray());
        File.SetLastWriteTimeUtc(copy, DateTime.UtcNow.AddSeconds(5));
        var r = await Http.GetAsync(new Uri(server.Url, "replay.json"));
        Assert.Equal((HttpStatusCode)422, r.StatusCode);
        Assert.Contains("served.msgpack", await r.Content.ReadAsStringAsync());
    }

    [Fact]
    public void TheExportIsOneFileWithTheReplayInsideAndNoOtherReference()
    {
        string html = Path.Combine(fx.Folder, "race.html");
        var o = new StringWriter(); var e = new StringWriter();
        Assert.Equal(0, CourseSim.Cli.Program.Run(["view", fx.ReplayPath, "--export", html], o, e));
        string text = File.ReadAllText(html);
        Assert.Contains("id=\"coursesim-data\"", text);
        Assert.Contains("\"format\":\"coursesim-viewer/1\"", text);
        Assert.DoesNotContain("src=\"viewer.js\"", text);
        Assert.DoesNotContain("href=\"viewer.css\"", text);
        Assert.DoesNotContain("http://", text.Replace("http://www.w3.org", ""));
        // Every recorded value is in it: x of the last board in the last frame, to its rounding.
        const string marker = "id=\"coursesim-data\" type=\"application/json\">";
        var json = text[(text.IndexOf(marker, StringComparison.Ordinal) + marker.Length)..];
        json = json[..json.IndexOf("</script>", StringComparison.Ordinal)];
        using var doc = System.Text.Json.JsonDocument.Parse(json);
        var xs = doc.RootElement.GetProperty("columns").GetProperty("x_m");
        Assert.Equal(fx.Replay.Frames * fx.Replay.Boards.Count, xs.GetArrayLength());
        Assert.Equal(fx.Replay.Columns["x_m"][^1], xs[xs.GetArrayLength() - 1].GetDouble(), 2);
    }

    [Fact]
    public async Task TheLiveRaceStreamsEveryFrameThenTheResults()
    {
        var race = new Race(EngineTestKit.Demo(["race.time_limit_s=60"]));
        var feed = new LiveFeed(race);
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, null, feed);
        var run = Task.Run(() => feed.Run(0, CancellationToken.None));
        using var stream = await Http.GetStreamAsync(new Uri(server.Url, "live"));
        using var reader = new StreamReader(stream);
        int frames = 0; bool setup = false, end = false;
        for (string? line; !end && (line = await reader.ReadLineAsync()) is not null;)
        {
            if (line.StartsWith("event: setup", StringComparison.Ordinal)) setup = true;
            if (!line.StartsWith("data: {\"type\"", StringComparison.Ordinal)) continue;
            using var doc = System.Text.Json.JsonDocument.Parse(line[6..]);
            var m = doc.RootElement;
            Assert.Equal(frames, m.GetProperty("from").GetInt32());
            frames = m.GetProperty("to").GetInt32();
            end = m.GetProperty("type").GetString() == "end";
        }
        await run;
        Assert.True(setup && end);
        Assert.Equal(race.Recorder.Frames, frames);
    }
}

/// <summary>
/// End to end in headless Chromium (Debian's chromium package; playwright-core from tests/e2e, installed there by
/// npm): the page loads a demo replay, the canvas is not blank, play moves the boards, selecting a board fills the
/// panel; a screenshot is kept as a test artefact (and, with COURSESIM_UPDATE_SCREENSHOT=1, as docs/img/viewer.png).
/// The same checks run on the exported file opened from disk, and a broken replay shows its error on the page.
/// </summary>
[Collection(ViewerCollection.Name)]
public class ViewerBrowserTests(ViewerFixture fx, Xunit.Abstractions.ITestOutputHelper output) : IClassFixture<ViewerFixture>
{
    static readonly string E2e = Path.Combine(RepoRoot.Path, "tests", "e2e");

    /// <summary>The browser test never installs anything: .ci/run installs chromium and playwright-core
    /// (<see cref="BrowserFactAttribute"/> skips the test outside CI when they are missing, and lets it fail in CI).</summary>
    static void EnsureTools() => Assert.True(BrowserTools.Missing is null, BrowserTools.Missing);

    static async Task<(int Code, string Output)> ExecAsync(string file, string args, string dir, int timeoutS, IDictionary<string, string>? env = null)
    {
        var psi = new ProcessStartInfo(file, args) { WorkingDirectory = dir, RedirectStandardOutput = true, RedirectStandardError = true };
        if (env is not null) foreach (var (k, v) in env) psi.Environment[k] = v;
        using var p = Process.Start(psi)!;
        var so = p.StandardOutput.ReadToEndAsync(); var se = p.StandardError.ReadToEndAsync();
        using var limit = new CancellationTokenSource(TimeSpan.FromSeconds(timeoutS));
        try { await p.WaitForExitAsync(limit.Token); }
        catch (OperationCanceledException) { p.Kill(true); return (-1, $"timed out after {timeoutS} s"); }
        return (p.ExitCode, await so + await se);
    }

    string Artefact(string name)
    {
        var dir = Path.Combine(AppContext.BaseDirectory, "artefacts");
        Directory.CreateDirectory(dir);
        return Path.Combine(dir, name);
    }

    [BrowserFact]
    public async Task ThePageShowsTheRacePlaysAndFillsThePanelForASelectedBoard()
    {
        EnsureTools();
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        string shot = Artefact("viewer.png");
        var (code, text) = await ExecAsync("node", $"viewer.mjs {server.Url} \"{shot}\"", E2e, 120);
        output.WriteLine(text);
        Assert.True(code == 0, text);
        Assert.True(new FileInfo(shot).Length > 20_000, "a screenshot was taken");
        if (System.Environment.GetEnvironmentVariable("COURSESIM_UPDATE_SCREENSHOT") == "1")
            File.Copy(shot, Path.Combine(RepoRoot.Path, "docs", "img", "viewer.png"), true);
    }

    [BrowserFact]
    public async Task TheExportedFileWorksFromDiskWithNoServer()
    {
        EnsureTools();
        string html = Path.Combine(fx.Folder, "export.html");
        Assert.Equal(0, CourseSim.Cli.Program.Run(["view", fx.ReplayPath, "--export", html], new StringWriter(), new StringWriter()));
        var (code, text) = await ExecAsync("node", $"viewer.mjs \"{new Uri(html).AbsoluteUri}\" \"{Artefact("export.png")}\"", E2e, 120);
        output.WriteLine(text);
        Assert.True(code == 0, text);
    }

    [BrowserFact]
    public async Task ABrokenReplayShowsItsErrorOnThePage()
    {
        EnsureTools();
        string broken = Path.Combine(fx.Folder, "broken.msgpack");
        File.WriteAllBytes(broken, fx.Bytes.AsSpan(0, 2000).ToArray());
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, broken, null);
        var (code, text) = await ExecAsync("node", $"viewer.mjs {server.Url}", E2e, 120, new Dictionary<string, string> { ["EXPECT_ERROR"] = "broken.msgpack" });
        output.WriteLine(text);
        Assert.True(code == 0, text);
    }
}

/// <summary>What the headless browser tests need, and whether it is here.</summary>
public static class BrowserTools
{
    public static string Chromium => System.Environment.GetEnvironmentVariable("CHROMIUM") ?? "/usr/bin/chromium";

    /// <summary>CI is where missing tools are a failure (CI=true, as most CI services and .ci/run set it).</summary>
    public static bool InCi => System.Environment.GetEnvironmentVariable("CI") is { } ci && (ci == "1" || ci.Equals("true", StringComparison.OrdinalIgnoreCase));

    /// <summary>Null when chromium and playwright-core are installed, else what is missing and how to get it.</summary>
    public static string? Missing
    {
        get
        {
            var missing = new List<string>();
            if (!File.Exists(Chromium)) missing.Add($"Debian's chromium at {Chromium}");
            if (!Directory.Exists(Path.Combine(RepoRoot.Path, "tests", "e2e", "node_modules", "playwright-core"))) missing.Add("playwright-core in tests/e2e/node_modules");
            return missing.Count == 0 ? null
                : $"headless browser test needs {string.Join(" and ", missing)}: run .ci/run (it installs them), or 'apt-get install -y chromium' and 'npm ci' in tests/e2e";
        }
    }
}

/// <summary>A browser test: skipped, saying what is missing, when the browser is not installed and this is not CI;
/// in CI (CI=true) it runs and fails on the missing tools.</summary>
public sealed class BrowserFactAttribute : FactAttribute
{
    public BrowserFactAttribute()
    {
        if (!BrowserTools.InCi && BrowserTools.Missing is { } why) Skip = why + " (CI=true makes this a failure)";
    }
}
