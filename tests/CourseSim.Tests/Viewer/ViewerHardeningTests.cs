using System.Diagnostics;
using System.Net;
using System.Net.Sockets;
using System.Runtime.InteropServices;
using System.Security.Cryptography;
using System.Text;
using CourseSim.Cli.Viewer;

namespace CourseSim.Tests.Viewer;

/// <summary>
/// The viewer against pages of other sites and against the machine: Host header checked (DNS rebinding), a strict
/// Content-Security-Policy, HEAD answered, IPv6 addresses, and SIGTERM stopping the server.
/// </summary>
[Collection(ViewerCollection.Name)]
public partial class ViewerHardeningTests(ViewerFixture fx) : IClassFixture<ViewerFixture>
{
    static async Task<(int Status, string Head, string Body)> Raw(IPAddress at, int port, string request)
    {
        using var tcp = new TcpClient(at.AddressFamily);
        await tcp.ConnectAsync(at, port);
        var stream = tcp.GetStream();
        await stream.WriteAsync(Encoding.ASCII.GetBytes(request));
        using var reader = new StreamReader(stream, Encoding.UTF8);
        string text = await reader.ReadToEndAsync();
        int split = text.IndexOf("\r\n\r\n", StringComparison.Ordinal);
        return (int.Parse(text.Split("\r\n")[0].Split(' ')[1]), text[..split], text[(split + 4)..]);
    }

    static string Get(string path, string? host, string method = "GET", string version = "HTTP/1.1") =>
        $"{method} {path} {version}\r\n{(host is null ? "" : $"Host: {host}\r\n")}Connection: close\r\n\r\n";

    [Fact]
    public async Task AForeignHostHeaderIsRefusedAndTheReplayNotSent()
    {
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        int port = server.Url.Port;
        foreach (var path in new[] { "/", "/replay.json", "/viewer.js" })
        {
            var (status, _, body) = await Raw(IPAddress.Loopback, port, Get(path, $"evil.example:{port}"));
            Assert.Equal(421, status);
            Assert.DoesNotContain("\"columns\"", body);
        }
        // HTTP/1.0 may omit Host: refused as a bad request.
        Assert.Equal(400, (await Raw(IPAddress.Loopback, port, Get("/replay.json", null, version: "HTTP/1.0"))).Status);
        foreach (var ok in new[] { $"127.0.0.1:{port}", $"localhost:{port}", "localhost", $"LOCALHOST:{port}" })
            Assert.Equal(200, (await Raw(IPAddress.Loopback, port, Get("/replay.json", ok))).Status);
    }

    [Fact]
    public async Task TheLiveStreamRefusesAForeignHostToo()
    {
        var race = new CourseSim.Simulation.Race(CourseSim.Tests.Engine.EngineTestKit.Demo(["race.time_limit_s=60"]));
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, null, new LiveFeed(race));
        var (status, _, body) = await Raw(IPAddress.Loopback, server.Url.Port, Get("/live", "rebind.example"));
        Assert.Equal(421, status);
        Assert.DoesNotContain("event: setup", body);
    }

    [Fact]
    public async Task HeadAnswers200WithTheHeadersAndNoBody()
    {
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        foreach (var path in new[] { "/", "/viewer.js", "/viewer.css", "/replay.json" })
        {
            var (status, head, body) = await Raw(IPAddress.Loopback, server.Url.Port, Get(path, "127.0.0.1", "HEAD"));
            Assert.True(status == 200, $"HEAD {path}: {status}");
            Assert.Equal("", body);
            Assert.Contains("X-Content-Type-Options: nosniff", head);
        }
    }

    [Fact]
    public async Task ThePageCarriesAStrictPolicyThatAllowsItsOwnInlineScriptOnly()
    {
        await using var server = await ViewerServer.StartAsync("127.0.0.1", 0, fx.ReplayPath, null);
        var (status, head, page) = await Raw(IPAddress.Loopback, server.Url.Port, Get("/", "127.0.0.1"));
        Assert.Equal(200, status);
        string csp = head.Split("\r\n").Single(l => l.StartsWith("Content-Security-Policy:", StringComparison.OrdinalIgnoreCase));
        Assert.Contains("default-src 'none'", csp);
        Assert.Contains("frame-ancestors 'none'", csp);
        Assert.DoesNotContain("unsafe-inline", csp);
        Assert.DoesNotContain("unsafe-eval", csp);
        // Every inline script of the page is allowed by its SHA-256 (CSP level 2, section 4.2.4: base64 of the digest of the UTF-8 text).
        var inline = InlineScript().Matches(page).Select(m => m.Groups[1].Value).ToList();
        Assert.NotEmpty(inline);
        foreach (var script in inline)
            Assert.Contains("'sha256-" + Convert.ToBase64String(SHA256.HashData(Encoding.UTF8.GetBytes(script))) + "'", csp);
    }

    [System.Text.RegularExpressions.GeneratedRegex("<script>(.*?)</script>", System.Text.RegularExpressions.RegexOptions.Singleline)]
    private static partial System.Text.RegularExpressions.Regex InlineScript();

    [Theory]
    [InlineData("::1")]
    [InlineData("[::1]")]
    public async Task IPv6HostsAreAccepted(string host)
    {
        if (!Socket.OSSupportsIPv6) return; // nothing to test on a machine without IPv6 (the parse is covered below)
        await using var server = await ViewerServer.StartAsync(host, 0, fx.ReplayPath, null);
        Assert.Equal("[::1]", server.Url.Host);
        Assert.Equal(200, (await Raw(IPAddress.IPv6Loopback, server.Url.Port, Get("/replay.json", $"[::1]:{server.Url.Port}"))).Status);
        Assert.Equal(421, (await Raw(IPAddress.IPv6Loopback, server.Url.Port, Get("/replay.json", "evil.example"))).Status);
    }

    [Theory]
    [InlineData("::1", true)]
    [InlineData("[::]", true)]
    [InlineData("localhost", true)]
    [InlineData("127.0.0.1", true)]
    [InlineData("not-an-address", false)]
    [InlineData("[127.0.0.1]", false)]
    [InlineData("::1::2", false)]
    public void HostParsing(string host, bool ok)
    {
        if (ok) Assert.NotNull(HostCheck.Parse(host));
        else Assert.Contains("not an IP address", Assert.Throws<CourseSim.Cli.UsageException>(() => HostCheck.Parse(host)).Message);
    }

    [Theory]
    [InlineData("70000")]
    [InlineData("-1")]
    public void APortOutOfRangeIsABadInput(string port)
    {
        var e = new StringWriter();
        Assert.Equal(2, CourseSim.Cli.Program.Run(["view", fx.ReplayPath, "--port", port], new StringWriter(), e));
        Assert.Contains("not a port", e.ToString());
        e = new StringWriter();
        Assert.Equal(2, CourseSim.Cli.Program.Run(["race", Path.Combine(Settings.RepoRoot.Path, "scenarios", "korrin-bay-race.toml"), "--view", "--port", port], new StringWriter(), e));
        Assert.Contains("not a port", e.ToString());
    }

    [DllImport("libc", SetLastError = true)]
    static extern int kill(int pid, int sig);

    [Fact]
    public async Task SigtermStopsTheViewerWithinTwoSeconds()
    {
        if (!OperatingSystem.IsLinux()) return;
        var psi = new ProcessStartInfo("dotnet", $"\"{Path.Combine(AppContext.BaseDirectory, "coursesim.dll")}\" view \"{fx.ReplayPath}\"")
            { RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi)!;
        try
        {
            var err = p.StandardError.ReadToEndAsync();
            string? line = null;
            using (var wait = new CancellationTokenSource(TimeSpan.FromSeconds(60)))
                while (!wait.IsCancellationRequested && (line = await p.StandardOutput.ReadLineAsync(wait.Token)) is not null && !line.StartsWith("Viewer at", StringComparison.Ordinal)) { }
            Assert.True(line?.StartsWith("Viewer at", StringComparison.Ordinal) == true, $"the viewer did not start: {line} {(p.HasExited ? await err : "")}");
            var url = new Uri(line!.Split(' ', StringSplitOptions.RemoveEmptyEntries)[2]);
            Assert.Equal(200, (await Raw(IPAddress.Loopback, url.Port, Get("/", "127.0.0.1"))).Status);
            var clock = Stopwatch.StartNew();
            Assert.Equal(0, kill(p.Id, 15));
            using (var limit = new CancellationTokenSource(TimeSpan.FromSeconds(2)))
                await p.WaitForExitAsync(limit.Token);
            Assert.True(clock.Elapsed < TimeSpan.FromSeconds(2), $"stopped after {clock.Elapsed.TotalSeconds:0.0} s");
            Assert.Equal(0, p.ExitCode);
            Assert.Contains("Viewer stopped.", await p.StandardOutput.ReadToEndAsync());
        }
        finally { if (!p.HasExited) p.Kill(); }
    }
}

/// <summary>An open live stream does not hold the server up when it stops (a browser tab left open, then SIGTERM).</summary>
[Collection(ViewerCollection.Name)]
public class ViewerStopTests
{
    [Fact]
    public async Task StoppingWithALiveStreamOpenTakesUnderTwoSeconds()
    {
        var race = new CourseSim.Simulation.Race(CourseSim.Tests.Engine.EngineTestKit.Demo(["race.time_limit_s=600"]));
        var feed = new LiveFeed(race);
        var server = await ViewerServer.StartAsync("127.0.0.1", 0, null, feed);
        using var stop = new CancellationTokenSource();
        var run = Task.Run(() => feed.Run(1, stop.Token)); // paced: the stream stays open
        using var http = new HttpClient { Timeout = TimeSpan.FromSeconds(30) };
        using var stream = await http.GetStreamAsync(new Uri(server.Url, "live"));
        using var reader = new StreamReader(stream);
        Assert.StartsWith("event: setup", await reader.ReadLineAsync());
        var clock = Stopwatch.StartNew();
        await server.DisposeAsync();
        Assert.True(clock.Elapsed < TimeSpan.FromSeconds(2), $"stopped after {clock.Elapsed.TotalSeconds:0.0} s");
        stop.Cancel();
        await run;
    }
}
