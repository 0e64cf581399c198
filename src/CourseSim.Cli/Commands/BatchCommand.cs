using System.CommandLine;
using System.Diagnostics;
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
        var noCache = TableCacheOption.Create();
        var cmd = new Command("batch", "Race every variant of an experiment many times, paired by seed, and compare them.") { file, races, threads, outDir, resume, set, noCache };
        cmd.SetAction(pr => Run(pr.GetValue(file)!, pr.GetValue(races), pr.GetValue(threads), pr.GetValue(outDir), pr.GetValue(resume), pr.GetValue(set) ?? [], stdout, stderr,
            TableCacheOption.Rigs(pr.GetValue(noCache), stderr)));
        return cmd;
    }

    static int Run(string path, int? races, int threads, string? outDir, bool resume, string[] sets, TextWriter stdout, TextWriter stderr,
        Equilibrium.RigCache rigs)
    {
        if (races is < 1 or > 100000) throw new UsageException($"--races: {races} is out of range (accepted 1 to 100000)");
        if (threads is < 1 or > 256) throw new UsageException($"--threads: {threads} is out of range (accepted 1 to 256)");
        var spec = ExperimentFile.Load(path, sets, races);
        string dir = outDir ?? Path.Combine("out", $"batch-{PolarCommand.Slug(spec.Name)}");
        Directory.CreateDirectory(dir);
        // Looks: how many summaries were written on this folder's races before (a resumed or extended batch was looked at).
        var (looks, previousRaces) = resume ? Peeking.Previous(Path.Combine(dir, "summary.json")) : (0, 0);
        int resumed = 0;
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
                            resumed = p.Resumed;
                            double rate = (p.Done - p.Resumed) / Math.Max(clock.Elapsed.TotalSeconds, 1e-9);
                            task.Description = $"{p.Done}/{p.Total} races, {rate:0.0}/s";
                            task.Value = p.Done;
                        }, cts.Token, warn, rigs: rigs);
                    });
            }
            else
            {
                int lastShown = -1;
                // Redirected output: a plain line every 10 % on the error stream (the bar would print nothing).
                rows = BatchRunner.Run(spec, dir, threads, resume, p =>
                {
                    resumed = p.Resumed;
                    int tenth = p.Total == 0 ? 10 : p.Done * 10 / p.Total;
                    if (tenth == lastShown) return;
                    lastShown = tenth;
                    double rate = (p.Done - p.Resumed) / Math.Max(clock.Elapsed.TotalSeconds, 1e-9);
                    double left = rate > 0 ? (p.Total - p.Done) / rate : double.NaN;
                    lock (stderr) stderr.WriteLine($"batch: {p.Done}/{p.Total} races ({rate:0.0} races/s{(double.IsNaN(left) ? "" : $", about {left:0} s left")})");
                }, cts.Token, warn, rigs: rigs);
            }
        }
        finally
        {
            Console.CancelKeyPress -= onCancel;
            rigs.Save(); // once for the whole batch: the rig tables its races built, for the next run
        }
        var metrics = BatchRunner.ReadMetrics(spec, dir);
        int raceCount = rows.Select(r => (r.Variant, r.Race)).Distinct().Count();
        var findings = BatchFindings.Of(spec, rows, metrics, !cts.IsCancellationRequested, Peeking.Warning(looks, previousRaces, resumed, raceCount));
        AtomicFile.WriteAllText(Path.Combine(dir, "results.csv"), BatchRunner.ResultsCsv(rows));
        ParquetResults.Write(rows, Path.Combine(dir, "results.parquet"));
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.json"), BatchSummary.Json(findings, path, sets, looks + 1) + "\n");
        var md = ExperimentReport.Markdown(findings);
        AtomicFile.WriteAllText(Path.Combine(dir, "report.md"), md);
        AtomicFile.WriteAllText(Path.Combine(dir, "report.html"), ReportHtml.Of(spec.Name, md, BatchSummary.Charts(findings)));
        BatchSummary.Print(findings, Terminal.For(stdout));
        var console = Terminal.For(stdout);
        console.MarkupLine("[grey]" + Markup.Escape($"{raceCount} races in {clock.Elapsed.TotalSeconds:0.0} s; wrote results.csv, results.parquet, summary.json, report.md, report.html and runs/ in {dir}") + "[/]");
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return ExitCodes.Ok;
    }

}
