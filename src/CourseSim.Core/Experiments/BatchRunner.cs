using System.Globalization;
using System.Text;
using CourseSim.Engine;

namespace CourseSim.Experiments;

/// <summary>Progress of a batch: races done of the total, and how many were already on disk when it started.</summary>
public readonly record struct BatchProgress(int Done, int Total, int Resumed);

/// <summary>
/// Runs an experiment's races: every (variant, race) in parallel across
/// <c>threads</c> workers, each race single-threaded and deterministic. Each finished race is written at once to its
/// own file under DIR/runs/ (atomically), so an interrupted batch loses nothing and a resumed one skips what is there;
/// the results are read back in (variant, race) order, so they are the same whatever the thread count.
/// </summary>
public static class BatchRunner
{
    public static string RunFile(string outDir, string variant, int race) => Path.Combine(outDir, "runs", variant, $"{race:D6}.csv");
    public static string MetricsFile(string outDir, string variant, int race) => Path.Combine(outDir, "runs", variant, $"{race:D6}.race.csv");

    /// <summary>The race figures of every finished race, in (variant, race) order.</summary>
    public static IReadOnlyList<(string Variant, int Race, RaceMetrics Metrics)> ReadMetrics(ExperimentSpec spec, string outDir)
    {
        var list = new List<(string, int, RaceMetrics)>();
        foreach (var v in spec.Variants)
            for (int i = 0; i < spec.Races; i++)
            {
                var f = MetricsFile(outDir, v.Name, i);
                if (File.Exists(f) && File.Exists(RunFile(outDir, v.Name, i))) list.Add((v.Name, i, RaceMetrics.ParseFile(File.ReadAllLines(f), f).Metrics));
            }
        return list;
    }

    /// <summary>The rows of one finished race: a row per board, the place that counts for a board that did not finish
    /// being the one after the last finisher.</summary>
    public static IEnumerable<RaceRow> RowsOf(string variant, int raceIndex, RaceSetup setup, RaceResult result, RaceMetrics metrics)
    {
        int finishers = result.Boards.Count(b => b.Finished);
        foreach (var b in result.Boards)
        {
            string splits = string.Join(';', b.SplitsS.Select(x => Math.Round(x, 2).ToString("0.##", CultureInfo.InvariantCulture)));
            yield return new RaceRow(variant, raceIndex, setup.Race.Seed, setup.Boards[b.Board].Id, b.Name, b.Place, b.Place ?? finishers + 1, b.Finished,
                b.ElapsedS, b.DistanceM, b.Tacks, b.Gybes, b.Falls, b.Ocs, metrics.FirstFinisherS, metrics.LastFinisherS, setup.Race.TimeLimitS,
                setup.Wind.SpeedKn, metrics.FirstBeatSide.TryGetValue(b.Board, out var side) ? side : "", splits);
        }
    }

    /// <summary>Runs what is missing; returns the rows of every finished race, in order. Cancelling stops after the races under way.</summary>
    public static IReadOnlyList<RaceRow> Run(ExperimentSpec spec, string outDir, int threads, bool resume, Action<BatchProgress>? progress = null,
        CancellationToken cancel = default)
    {
        var jobs = new List<(Variant V, int Race, int Index)>();
        for (int vi = 0; vi < spec.Variants.Count; vi++)
        {
            var v = spec.Variants[vi];
            Directory.CreateDirectory(Path.Combine(outDir, "runs", v.Name));
            for (int i = 0; i < spec.Races; i++) jobs.Add((v, i, vi));
        }
        var todo = jobs.Where(j => !(resume && File.Exists(RunFile(outDir, j.V.Name, j.Race)))).ToList();
        if (!resume)
            foreach (var j in jobs)
                foreach (var f in new[] { RunFile(outDir, j.V.Name, j.Race), MetricsFile(outDir, j.V.Name, j.Race) })
                    if (File.Exists(f)) File.Delete(f);
        int resumed = jobs.Count - todo.Count, done = resumed;
        progress?.Invoke(new BatchProgress(done, jobs.Count, resumed));
        var options = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, threads), CancellationToken = cancel };
        try
        {
            Parallel.ForEach(todo, options, job =>
            {
                var setup = spec.SetupFor(job.Index, job.Race);
                var race = new Race(setup);
                var result = race.Run();
                var metrics = RaceMetrics.Of(race, result);
                var sb = new StringBuilder(RaceRow.Header).Append('\n');
                foreach (var row in RowsOf(job.V.Name, job.Race, setup, result, metrics)) sb.Append(row.ToCsv()).Append('\n');
                var file = RunFile(outDir, job.V.Name, job.Race);
                // The race's own figures first; the board rows last, as the mark that the race is complete.
                File.WriteAllText(MetricsFile(outDir, job.V.Name, job.Race) + ".tmp", RaceMetrics.Header + "\n" + metrics.ToCsv(job.V.Name, job.Race) + "\n");
                File.Move(MetricsFile(outDir, job.V.Name, job.Race) + ".tmp", MetricsFile(outDir, job.V.Name, job.Race), true);
                File.WriteAllText(file + ".tmp", sb.ToString());
                File.Move(file + ".tmp", file, true);
                int d = Interlocked.Increment(ref done);
                progress?.Invoke(new BatchProgress(d, jobs.Count, resumed));
            });
        }
        catch (OperationCanceledException) { /* report what finished */ }
        var rows = new List<RaceRow>();
        foreach (var j in jobs)
        {
            var file = RunFile(outDir, j.V.Name, j.Race);
            if (!File.Exists(file)) continue;
            rows.AddRange(RaceRow.ParseFile(File.ReadAllLines(file), file));
        }
        return rows;
    }

    /// <summary>results.csv: one row per board per race, in (variant, race, board) order.</summary>
    public static string ResultsCsv(IEnumerable<RaceRow> rows)
    {
        var sb = new StringBuilder(RaceRow.Header).Append('\n');
        foreach (var r in rows) sb.Append(r.ToCsv()).Append('\n');
        return sb.ToString();
    }
}
