using System.CommandLine;
using CourseSim.Cli.Viewer;
using CourseSim.Replay;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim view REPLAY [--port P] [--host H] [--export FILE]</c>: serves the 2D race viewer for a replay on
/// 127.0.0.1 (docs/viewer.md), or writes it as one self-contained HTML file.
/// </summary>
public static class ViewCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("replay") { Description = "replay file (replay.msgpack, written by 'coursesim race')" };
        var port = new Option<int>("--port") { Description = "port to serve on (default: a free port)", DefaultValueFactory = _ => 0 };
        var host = new Option<string>("--host") { Description = "address to listen on: an IPv4 or IPv6 literal or localhost (default 127.0.0.1: this machine only; give 0.0.0.0 or :: explicitly to share on the network)", DefaultValueFactory = _ => "127.0.0.1" };
        var export = new Option<string?>("--export") { Description = "write one self-contained HTML file with the replay inside (opens from disk, no server) and exit" };
        var cmd = new Command("view", "Watch a race in the browser: course, wind, boards, timeline and a panel for the selected board.") { file, port, host, export };
        cmd.SetAction(pr => Run(pr.GetValue(file)!, pr.GetValue(port), pr.GetValue(host)!, pr.GetValue(export), stdout, stderr));
        return cmd;
    }

    /// <summary>Reads and checks a replay for the viewer: a missing, malformed or truncated file is a usage error naming it.</summary>
    public static ReplayData LoadReplay(string path)
    {
        try { return ReplayInput.Load(path); }
        catch (ReplayException e) { throw new UsageException(e.Message); }
    }

    static int Run(string path, int port, string host, string? export, TextWriter stdout, TextWriter stderr)
    {
        if (port is < 0 or > 65535) throw new UsageException($"--port {port} is not a port (0 for a free one, or 1-65535)");
        var replay = LoadReplay(path);
        if (export is not null)
        {
            string html = ViewerAssets.Export(ViewerData.Json(replay));
            var dir = Path.GetDirectoryName(Path.GetFullPath(export));
            if (dir is not null) Directory.CreateDirectory(dir);
            AtomicFile.WriteAllText(export, html);
            stdout.WriteLine($"Wrote {export} ({html.Length / 1024} KiB): open it in a browser, no server needed.");
            return ExitCodes.Ok;
        }
        return Serve(host, port, path, null, stdout, stderr, null);
    }

    /// <summary>Serves until Ctrl+C; <paramref name="whileServing"/> runs alongside (the live race).</summary>
    internal static int Serve(string host, int port, string? path, LiveFeed? live, TextWriter stdout, TextWriter stderr, Action<CancellationToken>? whileServing)
    {
        using var stop = new CancellationTokenSource();
        // Ctrl+C (SIGINT) and SIGTERM (a service manager, `kill`) both stop the server cleanly.
        Action<System.Runtime.InteropServices.PosixSignalContext> onSignal = c => { c.Cancel = true; stop.Cancel(); };
        using var sigint = System.Runtime.InteropServices.PosixSignalRegistration.Create(System.Runtime.InteropServices.PosixSignal.SIGINT, onSignal);
        using var sigterm = System.Runtime.InteropServices.PosixSignalRegistration.Create(System.Runtime.InteropServices.PosixSignal.SIGTERM, onSignal);
        return ServeUntilStopped(host, port, path, live, stdout, stderr, whileServing, stop);
    }

    static int ServeUntilStopped(string host, int port, string? path, LiveFeed? live, TextWriter stdout, TextWriter stderr,
        Action<CancellationToken>? whileServing, CancellationTokenSource stop)
    {
        {
            ViewerServer server;
            try { server = ViewerServer.StartAsync(host, port, path, live).GetAwaiter().GetResult(); }
            catch (IOException e) { throw new UsageException($"cannot listen on {host}:{port}: {e.Message}"); }
            try
            {
                if (!System.Net.IPAddress.IsLoopback(server.Address))
                    stderr.WriteLine($"warning: listening on {host}, reachable from other machines on the network");
                stdout.WriteLine($"Viewer at {server.Url}  (Ctrl+C or SIGTERM to stop)");
                stdout.Flush();
                var work = whileServing is null ? Task.CompletedTask : Task.Run(() => whileServing(stop.Token));
                try { Task.Delay(Timeout.Infinite, stop.Token).Wait(); } catch (AggregateException) { }
                try { work.Wait(TimeSpan.FromSeconds(10)); } catch (AggregateException) { }
                stdout.WriteLine("Viewer stopped.");
            }
            finally { server.DisposeAsync().AsTask().GetAwaiter().GetResult(); }
            return ExitCodes.Ok;
        }
    }
}
