using System.CommandLine;
using System.Globalization;
using System.Text;
using CourseSim.Cli.Output;
using CourseSim.Storage;
using CourseSim.Wind;
using CourseSim.Wind.Fit;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary><c>coursesim wind-fit LOG.csv</c>: fits the wind field's parameters to a measured wind log (docs/wind-fit.md).</summary>
public static class WindFitCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("log") { Description = "wind log in CSV: time (ISO 8601 or epoch), mean speed, direction, optional gust" };
        var from = new Option<string?>("--from") { Description = "start of the window: ISO 8601 time, or seconds after the log's first row" };
        var to = new Option<string?>("--to") { Description = "end of the window: ISO 8601 time, or seconds after the log's first row" };
        var outDir = new Option<string?>("--out") { Description = "folder for wind-fit.toml, wind-fit.json and wind-fit.png (default out/wind-fit-NAME)" };
        var format = new Option<string>("--format") { Description = "table or json", DefaultValueFactory = _ => "table" };
        format.AcceptOnlyFromAmong("table", "json");
        var columns = new Option<string?>("--columns") { Description = "column mapping, e.g. time=Zeit,speed=V,dir=R,gust=Vmax,unit=m/s (default: found by header; unit from the header, else kn)" };
        var averaging = new Option<double?>("--averaging-s") { Description = "interval each logged value is a mean over, s (default: the interval between rows)" };
        var reps = new Option<int>("--replicates") { Description = "bootstrap replicates for the intervals", DefaultValueFactory = _ => 100 };
        var cmd = new Command("wind-fit", "Fit the wind field's parameters (mean, ramp, shifts, trend, gusts) to a measured wind log, with intervals.")
            { file, from, to, outDir, format, columns, averaging, reps };
        cmd.SetAction(pr => Run(pr.GetValue(file)!, pr.GetValue(from), pr.GetValue(to), pr.GetValue(outDir), pr.GetValue(format)!,
            pr.GetValue(columns), pr.GetValue(averaging), pr.GetValue(reps), stdout, stderr));
        return cmd;
    }

    /// <summary>A window bound: ISO 8601, else seconds after the log's first row.</summary>
    internal static double Bound(string? text, WindLog log, string option, double fallback)
    {
        if (text is null) return fallback;
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double s) && double.IsFinite(s)) return s;
        if (DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out var t))
            return (t - log.Start).TotalSeconds;
        throw new UsageException($"{option}: '{text}' is neither an ISO 8601 time nor a number of seconds after the log's first row");
    }

    static int Run(string path, string? fromText, string? toText, string? outDir, string format, string? columns, double? averaging, int reps,
        TextWriter stdout, TextWriter stderr)
    {
        if (reps is < 20 or > 2000) throw new UsageException($"--replicates: {reps} is out of range (accepted 20 to 2000)");
        if (averaging is double a && !(a >= 0 && a <= 3600)) throw new UsageException($"--averaging-s: {a} is out of range (accepted 0 to 3600 s)");
        var log = WindLog.Load(path, WindLogFormat.Parse(columns, "--columns"));
        double lo = Bound(fromText, log, "--from", 0), hi = Bound(toText, log, "--to", log.T[^1]);
        string span = $"the log runs {log.Start:yyyy-MM-ddTHH:mm:ssZ} to {log.Start.AddSeconds(log.T[^1]):yyyy-MM-ddTHH:mm:ssZ}, 0 to {log.T[^1]:0} s";
        if (lo > log.T[^1] || hi < 0) throw new UsageException($"the window {lo:0} s to {hi:0} s lies outside the log ({span})");
        if (hi <= lo) throw new UsageException($"--to ({hi:0} s) must be after --from ({lo:0} s)");
        var win = log.Window(lo, hi);
        if (win.Count < 30) throw new UsageException($"the window {lo:0} s to {hi:0} s holds {win.Count} rows of {path}; at least 30 are needed ({span})");
        if (win.Problems.Count > 0)
        {
            stderr.WriteLine($"warning: {win.Problems.Count} row(s) of {path} set aside:");
            foreach (var p in win.Problems.Take(8)) stderr.WriteLine($"  {path}:{p.Line}: {p.Problem}");
            if (win.Problems.Count > 8) stderr.WriteLine($"  ... and {win.Problems.Count - 8} more");
        }
        int last = -1;
        var r = WindFitter.Fit(win, averaging, reps, 1, (i, n) =>
        {
            int pct = 100 * i / n;
            if (format == "table" && pct / 25 != last / 25) { stderr.WriteLine($"bootstrap: {i}/{n}"); last = pct; }
        });
        string name = Path.GetFileNameWithoutExtension(path);
        string dir = outDir ?? Path.Combine("out", $"wind-fit-{PolarCommand.Slug(name)}");
        Directory.CreateDirectory(dir);
        string toml = Path.Combine(dir, "wind-fit.toml"), json = Path.Combine(dir, "wind-fit.json"), png = Path.Combine(dir, "wind-fit.png");
        string table = WindTable(r, path);
        DurableFile.WriteText(toml, table);
        string jsonText = Json.Serialize(JsonOf(r, path, new[] { toml, json, png }));
        DurableFile.WriteText(json, jsonText + "\n");
        WindFitCharts.Draw(r, $"{name}: log against the fitted field ({win.Start:yyyy-MM-dd HH:mm}Z, {win.DurationS / 3600:0.0} h, rows every {r.Series.Dt:0.#} s)", png);
        if (format == "json") { stdout.WriteLine(jsonText); return ExitCodes.Ok; }
        var console = Terminal.For(stdout);
        var t = new Table().Border(TableBorder.Simple).Title($"[bold]{Markup.Escape(name)}[/]: {win.Count} rows over {win.DurationS / 3600:0.0} h, every {r.Series.Dt:0.#} s ({Markup.Escape(log.Mapping)})");
        t.AddColumn("key"); t.AddColumn(new TableColumn("fitted").RightAligned()); t.AddColumn(new TableColumn("95 % interval").RightAligned()); t.AddColumn("how");
        foreach (var v in r.Values)
            t.AddRow(v.Key, v.Resolved ? F(v.Value) : "[grey]not resolved[/]", v.Resolved && double.IsFinite(v.Low) ? $"{F(v.Low)} .. {F(v.High)}" : "",
                Markup.Escape(v.Resolved ? v.Method : "the log's rows are too far apart for this"));
        console.Write(t);
        console.MarkupLine($"Gust factor: log [bold]{F(r.GustFactorLog, "0.000")}[/], fitted field sampled the same way [bold]{F(r.GustFactorModel, "0.000")}[/] ({(r.Log.HasGust ? "gust over mean of each row" : "peak 3-s over 10-min mean")})");
        foreach (var n in r.Notes) console.MarkupLine("[yellow]note:[/] " + Markup.Escape(n));
        console.WriteLine();
        console.WriteLine(table);
        console.MarkupLine("[grey]" + Markup.Escape($"Wrote {toml}, {json}, {png}") + "[/]");
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return ExitCodes.Ok;
    }

    static string F(double v, string fmt = "0.###") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";

    /// <summary>The [wind] table to paste into a scenario: fitted keys with their intervals; unresolved ones commented out.</summary>
    internal static string WindTable(WindFitResult r, string path)
    {
        var sb = new StringBuilder();
        sb.AppendLine($"# Fitted by coursesim wind-fit from {Path.GetFileName(path)}: {r.Log.Start:yyyy-MM-ddTHH:mm:ssZ}, {r.Log.DurationS / 3600:0.0} h, rows every {r.Series.Dt:0.#} s.");
        sb.AppendLine("# 95 % intervals in the comments (docs/wind-fit.md). Keys the log cannot resolve are left at the defaults, commented out.");
        sb.AppendLine("[wind]");
        foreach (var v in r.Values)
        {
            string fmt = v.Key switch { "gust_intensity" or "shift_irregularity" => "0.000", "persistent_deg_per_min" => "0.0000", _ => "0.0#" };
            if (v.Resolved && double.IsFinite(v.Value))
            {
                double val = v.Key == "direction_deg" ? Units.Unit.WrapDeg360(v.Value) : v.Value;
                string ci = double.IsFinite(v.Low) ? $"  # 95 %: {F(v.Low, fmt)} .. {F(v.High, fmt)}" : "";
                sb.AppendLine($"{v.Key} = {F(val, fmt)}{ci}");
            }
            else sb.AppendLine($"# {v.Key}: not resolved by this log");
        }
        return sb.ToString();
    }

    static object JsonOf(WindFitResult r, string path, string[] files) => new
    {
        log = path, start_utc = r.Log.Start.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture), duration_s = r.Log.DurationS,
        rows = r.Log.Count, step_s = r.Series.Dt, averaging_s = r.AveragingS, gap_share = r.Series.GapShare, mapping = r.Log.Mapping,
        problems = r.Log.Problems.Select(p => new { line = p.Line, problem = p.Problem }).ToArray(),
        parameters = r.Values.ToDictionary(v => v.Key, v => new { value = v.Value, low = v.Low, high = v.High, resolved = v.Resolved, method = v.Method }),
        gust_factor_log = r.GustFactorLog, gust_factor_model = r.GustFactorModel, replicates = r.Replicates, notes = r.Notes, files, caution = Caution.Text,
    };
}
