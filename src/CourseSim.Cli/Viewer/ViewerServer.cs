using System.Net;
using System.Reflection;
using System.Text;
using CourseSim.Cli.Output;
using CourseSim.Replay;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace CourseSim.Cli.Viewer;

/// <summary>The page's own files, embedded in the program (no file of the disk is ever served).</summary>
public static class ViewerAssets
{
    public static string Text(string name)
    {
        using var s = Assembly.GetExecutingAssembly().GetManifestResourceStream($"CourseSim.Cli.Viewer.Assets.{name}")
            ?? throw new InvalidOperationException($"viewer asset {name} is missing from the build");
        using var r = new StreamReader(s, Encoding.UTF8);
        return r.ReadToEnd();
    }

    /// <summary>The one inline script of the served page (its mode), allowed by hash in the page's CSP.</summary>
    public static string SourceScript(bool live) => $"window.COURSESIM_SOURCE = {{\"mode\": \"{(live ? "live" : "server")}\"}};";

    /// <summary>The page for a server (data from /replay.json, or /live).</summary>
    public static string Page(bool live) =>
        Text("index.html").Replace("<!--SOURCE-->", $"<script>{SourceScript(live)}</script>")
            .Replace("<!--STYLE-->", "<link rel=\"stylesheet\" href=\"viewer.css\">").Replace("<!--SCRIPT-->", "<script src=\"viewer.js\"></script>");

    /// <summary>
    /// The served page's Content-Security-Policy: its own script, style and data only (the inline mode script by hash);
    /// no other origin, no frames, no forms, no plug-ins.
    /// </summary>
    public static string ContentSecurityPolicy(bool live) =>
        "default-src 'none'; script-src 'self' 'sha256-" + Convert.ToBase64String(System.Security.Cryptography.SHA256.HashData(Encoding.UTF8.GetBytes(SourceScript(live)))) +
        "'; style-src 'self'; img-src 'self' data:; connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

    /// <summary>One self-contained file: style, script and the replay inside, opening from disk with no server.</summary>
    public static string Export(string json) =>
        Text("index.html").Replace("<!--SOURCE-->", "<script>window.COURSESIM_SOURCE = {\"mode\": \"embedded\"};</script>\n<script id=\"coursesim-data\" type=\"application/json\">" + json + "</script>")
            .Replace("<!--STYLE-->", "<style>\n" + Text("viewer.css") + "\n</style>").Replace("<!--SCRIPT-->", "<script>\n" + Text("viewer.js").Replace("</script", "<\\/script") + "\n</script>");
}

/// <summary>
/// Serves the viewer on one address (loopback unless a host is given): the page, its script and style, and the named
/// replay (or the live race). Every other path is 404: the server maps no folder, so no path reaches the disk.
/// </summary>
public sealed class ViewerServer : IAsyncDisposable
{
    readonly WebApplication _app;
    public Uri Url { get; }
    public IPAddress Address { get; }

    ViewerServer(WebApplication app, Uri url, IPAddress address) { _app = app; Url = url; Address = address; }

    /// <summary>
    /// Starts serving. <paramref name="replayPath"/> is re-read when it changes (a broken file then shows as an error on
    /// the page); <paramref name="live"/> streams a race instead.
    /// </summary>
    public static async Task<ViewerServer> StartAsync(string host, int port, string? replayPath, LiveFeed? live)
    {
        var address = HostCheck.Parse(host);
        if (port is < 0 or > 65535) throw new UsageException($"--port {port} is not a port (0 for a free one, or 1-65535)");
        var hosts = new HostCheck(host, address);
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.ClearProviders();
        // The command owns the signals (SIGINT, SIGTERM): the host's console lifetime must not take them.
        builder.Services.AddSingleton<Microsoft.Extensions.Hosting.IHostLifetime, QuietLifetime>();
        // Stopping waits at most a second for requests under way (an open live stream ends at once, below).
        builder.Services.Configure<Microsoft.Extensions.Hosting.HostOptions>(o => o.ShutdownTimeout = TimeSpan.FromSeconds(1));
        builder.WebHost.ConfigureKestrel(k => k.Listen(address, port));
        var app = builder.Build();
        var replay = replayPath is null ? null : new ReplayCache(replayPath);
        string page = ViewerAssets.Page(live is not null), js = ViewerAssets.Text("viewer.js"), css = ViewerAssets.Text("viewer.css");
        string csp = ViewerAssets.ContentSecurityPolicy(live is not null);
        app.Use(async (ctx, next) =>
        {
            // Only GET (and HEAD) of the few names below, asked for by this server's own name; nothing else exists here.
            ctx.Response.Headers["X-Content-Type-Options"] = "nosniff";
            ctx.Response.Headers["Cache-Control"] = "no-store";
            ctx.Response.Headers["Content-Security-Policy"] = csp;
            ctx.Response.Headers["Referrer-Policy"] = "no-referrer";
            ctx.Response.Headers["Cross-Origin-Resource-Policy"] = "same-origin";
            if (!hosts.Accepts(ctx.Request.Headers.Host.ToString(), out int status))
            {
                // A page of another site reaching this port through its own DNS name (DNS rebinding) is refused here.
                ctx.Response.StatusCode = status;
                ctx.Response.ContentType = "text/plain";
                await ctx.Response.WriteAsync(status == 400 ? "bad request: no Host header\n" : "misdirected request: this viewer answers only to " + hosts.Describe() + "\n");
                return;
            }
            if (!HttpMethods.IsGet(ctx.Request.Method) && !HttpMethods.IsHead(ctx.Request.Method)) { ctx.Response.StatusCode = 405; return; }
            await next();
        });
        string[] getHead = [HttpMethods.Get, HttpMethods.Head];
        app.MapMethods("/", getHead, () => Results.Content(page, "text/html; charset=utf-8"));
        app.MapMethods("/viewer.js", getHead, () => Results.Content(js, "text/javascript; charset=utf-8"));
        app.MapMethods("/viewer.css", getHead, () => Results.Content(css, "text/css; charset=utf-8"));
        if (replay is not null)
            app.MapMethods("/replay.json", getHead, () =>
            {
                var (json, error) = replay.Get();
                return error is null ? Results.Content(json, "application/json; charset=utf-8") : Results.Content(Json.Serialize(new { error }), "application/json; charset=utf-8", statusCode: 422);
            });
        if (live is not null)
            app.MapMethods("/live", getHead, async (HttpContext ctx) =>
            {
                ctx.Response.Headers.ContentType = "text/event-stream";
                if (HttpMethods.IsHead(ctx.Request.Method)) return;
                // The stream ends when the page goes away or the server stops.
                using var gone = CancellationTokenSource.CreateLinkedTokenSource(ctx.RequestAborted, app.Lifetime.ApplicationStopping);
                var token = gone.Token;
                try
                {
                    await ctx.Response.WriteAsync($"event: setup\ndata: {live.Setup}\n\n", token);
                    int sent = 0;
                    while (!token.IsCancellationRequested)
                    {
                        var (msgs, ended) = live.From(sent);
                        foreach (var m in msgs) await ctx.Response.WriteAsync($"data: {m}\n\n", token);
                        sent += msgs.Count;
                        await ctx.Response.Body.FlushAsync(token);
                        if (ended && msgs.Count == 0) break;
                        await Task.Delay(200, token);
                    }
                }
                catch (OperationCanceledException) { /* the page went away or the server is stopping */ }
            });
        app.MapFallback((HttpContext ctx) => Results.Text("not found: this server serves only the viewer and its replay\n", "text/plain", statusCode: 404));
        await app.StartAsync();
        var bound = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First();
        int boundPort = new Uri(bound.Replace("[::]", "127.0.0.1").Replace("0.0.0.0", "127.0.0.1")).Port;
        string shown = address.Equals(IPAddress.Any) ? "127.0.0.1" : address.Equals(IPAddress.IPv6Any) ? "[::1]"
            : address.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6 ? $"[{address}]" : address.ToString();
        return new ViewerServer(app, new Uri($"http://{shown}:{boundPort}/"), address);
    }

    public async ValueTask DisposeAsync() { await _app.StopAsync(); await _app.DisposeAsync(); }

    /// <summary>The replay's JSON, re-read when the file changes; a file that cannot be read gives its error instead.</summary>
    sealed class ReplayCache(string path)
    {
        readonly object _gate = new();
        (DateTime, long) _stamp;
        string _json = "", _error = "";

        public (string Json, string? Error) Get()
        {
            lock (_gate)
            {
                // FileInfo reads the file's stamp without throwing (a missing file has none); reading it may throw.
                var info = new FileInfo(path);
                var stamp = (info.LastWriteTimeUtc, info.Exists ? info.Length : -1);
                if (stamp != _stamp)
                {
                    _stamp = stamp;
                    try { _json = ViewerData.Json(ReplayInput.Load(path)); _error = ""; }
                    catch (Exception e) when (e is ReplayException or IOException) { _error = e.Message; _json = ""; }
                }
                return _error.Length > 0 ? ("", _error) : (_json, null);
            }
        }
    }
}
