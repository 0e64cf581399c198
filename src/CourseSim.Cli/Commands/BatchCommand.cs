using System.CommandLine;
using System.Diagnostics;
using System.Globalization;
using CourseSim.Cli.Output;
using CourseSim.Experiments;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim batch EXPERIMENT [--races N] [--threads K] [--out DIR] [--resume]</c>: many races of each variant, in
/// parallel, paired by seed; results.csv, results.parquet, summary.json and the report (Markdown and HTML) with its
/// sections for organisers, coaches and riders (docs/experiments.md).
/// </summary>
public static class BatchCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("experiment") { Description = "experiment file (TOML): scenario, races, seed, focus and [variants.NAME] tables" };
        var races = new Option<int?>("--races") { Description = "races per variant (default: races in the file)" };
        var threads = new Option<int>("--threads") { Description = "races run at once (default: one per core)", DefaultValueFactory = _ => System.Environment.ProcessorCount };
        var outDir = new Option<string?>("--out") { Description = "folder for results.csv, summary.json and runs/ (default out/batch-NAME)" };
        var resume = new Option<bool>("--resume") { Description = "keep the races already in DIR/runs and run only the rest" };
        var set = new Option<string[]>("--set") { Description = "override an experiment key, key=value (repeatable)" };
        var cmd = new Command("batch", "Race every variant of an experiment many times, paired by seed, and compare them.") { file, races, threads, outDir, resume, set };
        cmd.SetAction(pr => Run(pr.GetValue(file)!, pr.GetValue(races), pr.GetValue(threads), pr.GetValue(outDir), pr.GetValue(resume), pr.GetValue(set) ?? [], stdout, stderr));
        return cmd;
    }

    static int Run(string path, int? races, int threads, string? outDir, bool resume, string[] sets, TextWriter stdout, TextWriter stderr)
    {
        if (races is < 1 or > 100000) throw new UsageException($"--races: {races} is out of range (accepted 1 to 100000)");
        if (threads is < 1 or > 256) throw new UsageException($"--threads: {threads} is out of range (accepted 1 to 256)");
        var spec = ExperimentFile.Load(path, sets, races);
        string dir = outDir ?? Path.Combine("out", $"batch-{PolarCommand.Slug(spec.Name)}");
        Directory.CreateDirectory(dir);
        using var cts = new CancellationTokenSource();
        ConsoleCancelEventHandler onCancel = (_, e) => { e.Cancel = true; cts.Cancel(); stderr.WriteLine("batch: stopping after the races under way; the report covers what finished"); };
        Console.CancelKeyPress += onCancel;
        var clock = Stopwatch.StartNew();
        IReadOnlyList<RaceRow> rows = [];
        Action<string> warn = m => { lock (stderr) stderr.WriteLine("batch: " + m); };
        try
        {
            bool interactive = stdout == Console.Out && !Console.IsOutputRedirected && !Console.IsErrorRedirected;
            if (interactive)
            {
                // A live bar: races done, races per second, time left.
                AnsiConsole.Progress().AutoClear(true)
                    .Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new RemainingTimeColumn())
                    .Start(ctx =>
                    {
                        var task = ctx.AddTask("racing", maxValue: Math.Max(1, spec.Races * spec.Variants.Count));
                        rows = BatchRunner.Run(spec, dir, threads, resume, p =>
                        {
                            double rate = (p.Done - p.Resumed) / Math.Max(clock.Elapsed.TotalSeconds, 1e-9);
                            task.Description = $"{p.Done}/{p.Total} races, {rate:0.0}/s";
                            task.Value = p.Done;
                        }, cts.Token, warn);
                    });
            }
            else
            {
                int lastShown = -1;
                // Redirected output: a plain line every 10 % on the error stream (the bar would print nothing).
                rows = BatchRunner.Run(spec, dir, threads, resume, p =>
                {
                    int tenth = p.Total == 0 ? 10 : p.Done * 10 / p.Total;
                    if (tenth == lastShown) return;
                    lastShown = tenth;
                    double rate = (p.Done - p.Resumed) / Math.Max(clock.Elapsed.TotalSeconds, 1e-9);
                    double left = rate > 0 ? (p.Total - p.Done) / rate : double.NaN;
                    lock (stderr) stderr.WriteLine($"batch: {p.Done}/{p.Total} races ({rate:0.0} races/s{(double.IsNaN(left) ? "" : $", about {left:0} s left")})");
                }, cts.Token, warn);
            }
        }
        finally { Console.CancelKeyPress -= onCancel; }
        var (variants, pairs) = Comparison.Of(spec, rows, spec.MasterSeed);
        AtomicFile.WriteAllText(Path.Combine(dir, "results.csv"), BatchRunner.ResultsCsv(rows));
        ParquetResults.Write(rows, Path.Combine(dir, "results.parquet"));
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.json"), Json.Serialize(new
        {
            experiment = spec.Name,
            seed = spec.MasterSeed,
            focus = spec.Focus,
            races_per_variant = spec.Races,
            complete = !cts.IsCancellationRequested,
            variants = variants.Select(v => new { name = v.Name, races = v.Races, mean_elapsed_s = v.MeanElapsedS, win_share = v.WinShare.Estimate,
                win_share_low = v.WinShare.Low, win_share_high = v.WinShare.High, mean_place = v.MeanPlace }),
            pairs = pairs.Select(p => new { a = p.A, b = p.B, races = p.Pairs, mean_diff_s = p.MeanDiffT.Estimate, ci_low_s = p.MeanDiffT.Low, ci_high_s = p.MeanDiffT.High,
                bootstrap_low_s = p.MeanDiffBootstrap.Low, bootstrap_high_s = p.MeanDiffBootstrap.High, p_a_beats_b = p.WinProbability.Estimate,
                significant = p.Significant, races_needed = p.PairsNeeded,
                mean_place_diff = p.PlaceDiffT?.Estimate, place_ci_low = p.PlaceDiffT?.Low, place_ci_high = p.PlaceDiffT?.High,
                place_bootstrap_low = p.PlaceDiffBootstrap?.Low, place_bootstrap_high = p.PlaceDiffBootstrap?.High }),
            caution = Caution.Text,
        }) + "\n");
        var metrics = BatchRunner.ReadMetrics(spec, dir);
        var md = ExperimentReport.Markdown(spec, variants, pairs, rows, !cts.IsCancellationRequested, metrics);
        AtomicFile.WriteAllText(Path.Combine(dir, "report.md"), md);
        AtomicFile.WriteAllText(Path.Combine(dir, "report.html"), ExperimentReport.Html(spec, md, ExperimentReport.DurationChart(spec, rows),
            ExperimentReport.IntervalChart(pairs), ExperimentReport.SideChart(spec, rows), ExperimentReport.CrossoverChart(spec, rows, metrics, pairs)));
        var console = Terminal.For(stdout);
        var t = new Table().Border(TableBorder.Simple).Title($"[bold]{Markup.Escape(spec.Name)}[/]: {spec.Races} races per variant, focus {Markup.Escape(spec.Focus)}");
        t.AddColumn("variant"); t.AddColumn(new TableColumn("races").RightAligned()); t.AddColumn(new TableColumn("mean time").RightAligned());
        t.AddColumn(new TableColumn("win share (95 %)").RightAligned()); t.AddColumn(new TableColumn("mean place").RightAligned());
        foreach (var v in variants)
            t.AddRow(Markup.Escape(v.Name), v.Races.ToString(CultureInfo.InvariantCulture), F(v.MeanElapsedS, "0.0") + " s",
                $"{F(v.WinShare.Estimate * 100, "0")} % ({F(v.WinShare.Low * 100, "0")}-{F(v.WinShare.High * 100, "0")})", F(v.MeanPlace, "0.0"));
        console.Write(t);
        foreach (var p in pairs)
            console.MarkupLine(Markup.Escape($"{p.A} - {p.B}: {F(p.MeanDiffT.Estimate, "0.0")} s (95 % {F(p.MeanDiffT.Low, "0.0")} to {F(p.MeanDiffT.High, "0.0")}; bootstrap " +
                $"{F(p.MeanDiffBootstrap.Low, "0.0")} to {F(p.MeanDiffBootstrap.High, "0.0")}), {p.A} faster in {F(p.WinProbability.Estimate * 100, "0")} % of races: " +
                (p.Significant ? "resolved" : $"not resolved (about {p.PairsNeeded} races would resolve a difference this size)")));
        console.MarkupLine("[grey]" + Markup.Escape($"{rows.Select(r => (r.Variant, r.Race)).Distinct().Count()} races in {clock.Elapsed.TotalSeconds:0.0} s; wrote results.csv, results.parquet, summary.json, report.md, report.html and runs/ in {dir}") + "[/]");
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return ExitCodes.Ok;
    }

    static string F(double v, string fmt) => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";
}
