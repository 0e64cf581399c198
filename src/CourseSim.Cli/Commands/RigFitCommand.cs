using System.CommandLine;
using System.Globalization;
using CourseSim.Cli.Output;
using CourseSim.Equilibrium;
using CourseSim.Replay;
using CourseSim.RigFit;
using CourseSim.Storage;
using CourseSim.Units;
using CourseSim.Wind;
using CourseSim.Wind.Fit;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary><c>coursesim rig-fit EQUIPMENT TRACK.gpx...</c>: calibrates the board model to a rider's own GPS tracks (docs/rig-fit.md).</summary>
public static class RigFitCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var equip = new Argument<string>("equipment") { Description = "the rider's equipment file (TOML)" };
        var tracks = new Argument<string[]>("tracks") { Description = "GPX tracks (1.0 or 1.1), one or more", Arity = ArgumentArity.OneOrMore };
        var windLog = new Option<string?>("--wind") { Description = "wind log (CSV) covering the tracks' times: speed and direction at each stretch" };
        var windKn = new Option<double?>("--wind-kn") { Description = "steady true wind speed at 10 m, kn (instead of --wind)" };
        var windFrom = new Option<double?>("--wind-from-deg") { Description = "direction the wind came from, deg true (with --wind-kn; default: from the tacking angles)" };
        var columns = new Option<string?>("--columns") { Description = "column mapping of the wind log (as in wind-fit)" };
        var outDir = new Option<string?>("--out") { Description = "folder for the calibrated equipment file, rig-fit.json and rig-fit.png (default out/rig-fit-NAME)" };
        var format = new Option<string>("--format") { Description = "table or json", DefaultValueFactory = _ => "table" };
        format.AcceptOnlyFromAmong("table", "json");
        var cmd = new Command("rig-fit", "Fit the rider and rig parameters of an equipment file to the rider's own GPS tracks.")
            { equip, tracks, windLog, windKn, windFrom, columns, outDir, format };
        cmd.SetAction(pr => Run(pr.GetValue(equip)!, pr.GetValue(tracks)!, pr.GetValue(windLog), pr.GetValue(windKn), pr.GetValue(windFrom),
            pr.GetValue(columns), pr.GetValue(outDir), pr.GetValue(format)!, stdout, stderr));
        return cmd;
    }

    static int Run(string equipPath, string[] files, string? logPath, double? kn, double? fromDeg, string? columns, string? outDir, string format,
        TextWriter stdout, TextWriter stderr)
    {
        if ((logPath is null) == (kn is null)) throw new UsageException("give the wind either as --wind LOG.csv or as --wind-kn S (with --wind-from-deg D, or the direction is found from the tacking angles)");
        if (logPath is not null && fromDeg is not null) throw new UsageException("--wind-from-deg goes with --wind-kn; the log gives the direction");
        if (kn is double kk && !(kk is >= 3 and <= 45)) throw new UsageException($"--wind-kn: {kk} is out of range (accepted 3 to 45 kn)");
        if (fromDeg is double fd && !(fd is >= 0 and <= 360)) throw new UsageException($"--wind-from-deg: {fd} is out of range (accepted 0 to 360)");
        var eq = EquipmentFile.Load(equipPath);
        var segs = files.SelectMany(GpxReader.Load).ToList();
        var (pts, untimed, start) = TrackAnalysis.Smooth(segs);
        if (pts.Count == 0)
            throw new UsageException($"no usable points with times in {string.Join(", ", files)} ({segs.Sum(s => s.Points.Count)} points, {untimed} without a time): rig-fit needs timed track points");
        double moving = pts.Count(p => p.SpeedMs > TrackAnalysis.MinSpeedMs) / (double)pts.Count;
        if (moving < 0.1)
            throw new UsageException($"the tracks hardly move: {moving:P0} of the time faster than {Unit.MsToKnots(TrackAnalysis.MinSpeedMs):0.#} kn (median {Unit.MsToKnots(pts.Select(p => p.SpeedMs).Order().ElementAt(pts.Count / 2)):0.0} kn). A walk on the beach? rig-fit needs sailing");
        var stretches = TrackAnalysis.Steady(pts);
        Func<double, (double, double)> wind;
        string windText;
        if (logPath is not null)
        {
            var log = WindLog.Load(logPath, WindLogFormat.Parse(columns, "--columns"));
            double off = (start - log.Start).TotalSeconds;
            double t0 = pts.Min(p => p.T) + off, t1 = pts.Max(p => p.T) + off;
            if (t1 < 0 || t0 > log.DurationS)
                throw new UsageException($"the wind log {logPath} runs {log.Start:yyyy-MM-ddTHH:mm}Z to {log.Start.AddSeconds(log.DurationS):HH:mm}Z; the tracks {start.AddSeconds(pts.Min(p => p.T)):yyyy-MM-ddTHH:mm}Z to {start.AddSeconds(pts.Max(p => p.T)):HH:mm}Z: they do not overlap");
            var drive = WindLogDrive.From(log, 0, false, 0, 0);
            wind = t => (drive.SpeedAt(t + off), drive.DirectionAt(t + off));
            windText = $"logged ({Path.GetFileName(logPath)})";
        }
        else
        {
            double from;
            if (fromDeg is double given) { from = given; windText = $"{kn:0.#} kn from {from:0} deg (given)"; }
            else
            {
                var est = TrackAnalysis.WindFromTacks(stretches)
                    ?? throw new UsageException($"the wind direction cannot be found from tacking angles: the {stretches.Count} steady stretches show no pair of tacks 60 to 130 deg apart (one tack only, or no beat). Give --wind-from-deg");
                from = est.FromDeg;
                windText = $"{kn:0.#} kn from {from:0} deg (from tacking angles: tacks {est.TackAngleDeg:0} deg apart)";
            }
            double ms = Unit.KnotsToMs(kn!.Value);
            wind = _ => (ms, from);
        }
        RigFitResult r;
        try { r = RigFitter.Fit(eq, stretches, t => wind(t), progress: format == "table" ? (i, n) => stderr.WriteLine($"model grid: {i}/{n}") : null); }
        catch (ThinDataException e) { throw new UsageException(e.Message); }
        string name = Path.GetFileNameWithoutExtension(equipPath);
        string dir = outDir ?? Path.Combine("out", $"rig-fit-{PolarCommand.Slug(name)}");
        Directory.CreateDirectory(dir);
        string eqOut = Path.Combine(dir, $"{name}-fitted.toml"), json = Path.Combine(dir, "rig-fit.json"), png = Path.Combine(dir, "rig-fit.png");
        string source = $"{files.Length} track file(s), {r.Stretches.Count} steady stretches, {start:yyyy-MM-dd}, wind {windText}";
        DurableFile.WriteText(eqOut, CalibratedFile.Write(File.ReadAllText(equipPath), r.Keys, source));
        EquipmentFile.Load(eqOut); // the written file must load: a check, not a formality
        RigFitCharts.Draw(r, eq, $"{r.Fitted.Name}: steady stretches over the fitted polar", png);
        string jsonText = Json.Serialize(new
        {
            equipment = equipPath, tracks = files, points = pts.Count, untimed_points = untimed, stretches = r.Stretches.Count, wind = windText,
            parameters = r.Keys.ToDictionary(k => k.Key, k => new { original = k.Original, value = k.Value, low = k.Low, high = k.High, sets = k.Note }),
            correlation = r.Correlation, rms_before_pct = r.RmsBeforePct, rms_after_pct = r.RmsAfterPct,
            bins = r.Bins.Select(b => new { twa_deg = b.TwaDeg, tws_kn = Unit.MsToKnots(b.TwsMs), count = b.Count, observed_kn = Unit.MsToKnots(b.ObservedMs), model_before_kn = Unit.MsToKnots(b.ModelBeforeMs), model_fitted_kn = Unit.MsToKnots(b.ModelFittedMs), used = b.Used }).ToArray(),
            notes = r.Notes, files = new[] { eqOut, json, png }, caution = Caution.Text,
        });
        DurableFile.WriteText(json, jsonText + "\n");
        if (format == "json") { stdout.WriteLine(jsonText); return ExitCodes.Ok; }
        var console = Terminal.For(stdout);
        console.MarkupLine($"[bold]{Markup.Escape(r.Fitted.Name)}[/]: {pts.Count} points ({untimed} without time), {r.Stretches.Count} steady stretches of {TrackAnalysis.StretchS:0} s; wind {Markup.Escape(windText)}");
        var t = new Table().Border(TableBorder.Simple);
        t.AddColumn("key"); t.AddColumn(new TableColumn("was").RightAligned()); t.AddColumn(new TableColumn("fitted").RightAligned()); t.AddColumn(new TableColumn("95 % interval").RightAligned()); t.AddColumn("what it sets");
        foreach (var k in r.Keys) t.AddRow(k.Key, F(k.Original), F(k.Value), double.IsFinite(k.Low) ? $"{F(k.Low)} .. {F(k.High)}" : "-", k.Note);
        console.Write(t);
        var b = new Table().Border(TableBorder.Simple).Title("steady speeds against the model (kn)");
        foreach (var c in new[] { "TWA (deg)", "TWS (kn)", "stretches", "observed", "model before", "fitted", "residual" }) b.AddColumn(new TableColumn(c).RightAligned());
        foreach (var x in r.Bins)
            b.AddRow(F(x.TwaDeg, "0"), F(Unit.MsToKnots(x.TwsMs), "0.0"), x.Count.ToString(CultureInfo.InvariantCulture), F(Unit.MsToKnots(x.ObservedMs), "0.0"),
                F(Unit.MsToKnots(x.ModelBeforeMs), "0.0"), F(Unit.MsToKnots(x.ModelFittedMs), "0.0"), F(100 * (x.ObservedMs - x.ModelFittedMs) / x.ObservedMs, "+0.0;-0.0") + " %" + (x.Used ? "" : " (set aside)"));
        console.Write(b);
        console.MarkupLine($"RMS residual of the bins used: {F(r.RmsBeforePct, "0.0")} % before, [bold]{F(r.RmsAfterPct, "0.0")} %[/] fitted; bootstrap correlation of the two keys {F(r.Correlation, "0.00")}. " +
            "Not fitted (the tracks cannot tell them): rider mass, sail and board sizes, fin (take them from the gear), skill (sets manoeuvres and reading the wind, not straight-line speed).");
        foreach (var n in r.Notes) console.MarkupLine("[yellow]note:[/] " + Markup.Escape(n));
        console.MarkupLine("[grey]" + Markup.Escape($"Wrote {eqOut}, {json}, {png}") + "[/]");
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return ExitCodes.Ok;
    }

    static string F(double v, string fmt = "0.###") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";
}
