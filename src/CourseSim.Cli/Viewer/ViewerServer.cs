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

    /// <summary>The page for a server (data from /replay.json, or /live).</summary>
    public static string Page(bool live) =>
        Text("index.html").Replace("<!--SOURCE-->", $"<script>window.COURSESIM_SOURCE = {{\"mode\": \"{(live ? "live" : "server")}\"}};</script>")
            .Replace("<!--STYLE-->", "<link rel=\"stylesheet\" href=\"viewer.css\">").Replace("<!--SCRIPT-->", "<script src=\"viewer.js\"></script>");

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
        if (!IPAddress.TryParse(host, out var address)) throw new UsageException($"--host '{host}' is not an IP address (such as 127.0.0.1 or 0.0.0.0)");
        var builder = WebApplication.CreateSlimBuilder();
        builder.Logging.ClearProviders();
        builder.WebHost.ConfigureKestrel(k => k.Listen(address, port));
        var app = builder.Build();
        var replay = replayPath is null ? null : new ReplayCache(replayPath);
        string page = ViewerAssets.Page(live is not null), js = ViewerAssets.Text("viewer.js"), css = ViewerAssets.Text("viewer.css");
        app.Use(async (ctx, next) =>
        {
            // Only GET (and HEAD) of the few names below; nothing else exists here.
            ctx.Response.Headers["X-Content-Type-Options"] = "nosniff";
            ctx.Response.Headers["Cache-Control"] = "no-store";
            if (!HttpMethods.IsGet(ctx.Request.Method) && !HttpMethods.IsHead(ctx.Request.Method)) { ctx.Response.StatusCode = 405; return; }
            await next();
        });
        app.MapGet("/", () => Results.Content(page, "text/html; charset=utf-8"));
        app.MapGet("/viewer.js", () => Results.Content(js, "text/javascript; charset=utf-8"));
        app.MapGet("/viewer.css", () => Results.Content(css, "text/css; charset=utf-8"));
        if (replay is not null)
            app.MapGet("/replay.json", () =>
            {
                var (json, error) = replay.Get();
                return error is null ? Results.Content(json, "application/json; charset=utf-8") : Results.Content(Json.Serialize(new { error }), "application/json; charset=utf-8", statusCode: 422);
            });
        if (live is not null)
            app.MapGet("/live", async (HttpContext ctx) =>
            {
                ctx.Response.Headers.ContentType = "text/event-stream";
                await ctx.Response.WriteAsync($"event: setup\ndata: {live.Setup}\n\n", ctx.RequestAborted);
                int sent = 0;
                while (!ctx.RequestAborted.IsCancellationRequested)
                {
                    var (msgs, ended) = live.From(sent);
                    foreach (var m in msgs) await ctx.Response.WriteAsync($"data: {m}\n\n", ctx.RequestAborted);
                    sent += msgs.Count;
                    await ctx.Response.Body.FlushAsync(ctx.RequestAborted);
                    if (ended && msgs.Count == 0) break;
                    await Task.Delay(200, ctx.RequestAborted);
                }
            });
        app.MapFallback((HttpContext ctx) => Results.Text("not found: this server serves only the viewer and its replay\n", "text/plain", statusCode: 404));
        await app.StartAsync();
        var bound = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First();
        var uri = new Uri(bound.Replace("[::]", "127.0.0.1").Replace("0.0.0.0", "127.0.0.1"));
        return new ViewerServer(app, new Uri($"http://{(address.Equals(IPAddress.Any) ? "127.0.0.1" : address.ToString())}:{uri.Port}/"), address);
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
                    try { _json = ViewerData.Json(ReplayFile.Read(File.ReadAllBytes(path), path)); _error = ""; }
                    catch (Exception e) when (e is ReplayException or IOException) { _error = e.Message; _json = ""; }
                }
                return _error.Length > 0 ? ("", _error) : (_json, null);
            }
        }
    }
}
