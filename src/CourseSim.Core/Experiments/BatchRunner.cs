using System.Globalization;
using System.Text;
using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Storage;

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
                if (DurableFile.TryReadSealed(f, out var m, out _) && DurableFile.TryReadSealed(RunFile(outDir, v.Name, i), out _, out _))
                    list.Add((v.Name, i, RaceMetrics.ParseFile(m.Split('\n', StringSplitOptions.RemoveEmptyEntries), f).Metrics));
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
    /// <remarks>
    /// The resume contract (docs/experiments.md): with <paramref name="resume"/> the folder's manifest must match the
    /// experiment (else a <see cref="Settings.SettingsException"/> naming what differs); a run file is kept only if its
    /// checksum holds, and an empty or damaged one is reported through <paramref name="warn"/> and raced again. A write
    /// that fails (a full disk) stops the batch with an <see cref="IOException"/> saying so; no temporary file is left.
    /// </remarks>
    public static IReadOnlyList<RaceRow> Run(ExperimentSpec spec, string outDir, int threads, bool resume, Action<BatchProgress>? progress = null,
        CancellationToken cancel = default, Action<string>? warn = null, DurableFile.Opener? open = null, Equilibrium.RigCache? rigs = null)
    {
        if (resume) BatchManifest.CheckForResume(spec, outDir);
        var jobs = new List<(Variant V, int Race, int Index)>();
        for (int vi = 0; vi < spec.Variants.Count; vi++)
        {
            var v = spec.Variants[vi];
            Directory.CreateDirectory(Path.Combine(outDir, "runs", v.Name));
            for (int i = 0; i < spec.Races; i++) jobs.Add((v, i, vi));
        }
        // Temporary files are what a crash left mid-write: never a finished race. A fresh batch keeps no old run at all
        // (runs past this batch's race count would otherwise be taken up by a later --resume with more races).
        foreach (var f in Directory.EnumerateFiles(Path.Combine(outDir, "runs"), "*", SearchOption.AllDirectories))
            if (!resume || f.EndsWith(".tmp", StringComparison.Ordinal)) DurableFile.TryDelete(f);
        var todo = new List<(Variant V, int Race, int Index)>();
        foreach (var j in jobs)
        {
            string run = RunFile(outDir, j.V.Name, j.Race), met = MetricsFile(outDir, j.V.Name, j.Race);
            if (resume && File.Exists(run))
            {
                bool runOk = DurableFile.TryReadSealed(run, out _, out var why), metOk = DurableFile.TryReadSealed(met, out _, out var whyM);
                if (runOk && metOk) continue;
                warn?.Invoke($"{(runOk ? met : run)}: {(runOk ? whyM : why)}; racing {j.V.Name} race {j.Race} again");
            }
            todo.Add(j);
            DurableFile.TryDelete(run); DurableFile.TryDelete(met);
        }
        BatchManifest.Write(spec, outDir, open);
        int resumed = jobs.Count - todo.Count, done = resumed;
        progress?.Invoke(new BatchProgress(done, jobs.Count, resumed));
        var options = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, threads), CancellationToken = cancel };
        // One cache of rig tables for the whole batch (the caller's, if given): a set-up's tables do not depend on the seed.
        rigs ??= new Equilibrium.RigCache();
        try
        {
            Parallel.ForEach(todo, options, job =>
            {
                var setup = spec.SetupFor(job.Index, job.Race);
                var race = new Race(setup, rigs.For);
                var result = race.Run();
                var metrics = RaceMetrics.Of(race, result);
                var sb = new StringBuilder(RaceRow.Header).Append('\n');
                foreach (var row in RowsOf(job.V.Name, job.Race, setup, result, metrics)) sb.Append(row.ToCsv()).Append('\n');
                var file = RunFile(outDir, job.V.Name, job.Race);
                // The race's own figures first; the board rows last, as the mark that the race is complete.
                DurableFile.WriteText(MetricsFile(outDir, job.V.Name, job.Race), DurableFile.Seal(RaceMetrics.Header + "\n" + metrics.ToCsv(job.V.Name, job.Race) + "\n"), open);
                DurableFile.WriteText(file, DurableFile.Seal(sb.ToString()), open);
                int d = Interlocked.Increment(ref done);
                progress?.Invoke(new BatchProgress(d, jobs.Count, resumed));
            });
        }
        catch (OperationCanceledException) { /* report what finished */ }
        catch (AggregateException e) when (e.InnerExceptions.OfType<IOException>().FirstOrDefault() is { } io)
        {
            string what = DurableFile.IsDiskFull(io) ? "the disk is full" : io.Message;
            int kept = jobs.Count(j => File.Exists(RunFile(outDir, j.V.Name, j.Race)));
            throw new IOException($"batch: cannot write the races' results in {outDir}: {what}. The {kept} races finished before it are kept in " +
                "runs/; free some space and run the same command with --resume to race the rest.", io);
        }
        var rows = new List<RaceRow>();
        foreach (var j in jobs)
        {
            var file = RunFile(outDir, j.V.Name, j.Race);
            if (!DurableFile.TryReadSealed(file, out var text, out _)) continue;
            rows.AddRange(RaceRow.ParseFile(text.Split('\n', StringSplitOptions.RemoveEmptyEntries), file));
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
