using System.Globalization;
using System.Text;
using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Storage;

namespace CourseSim.Experiments;

/// <summary>One board in one race of one variant: a row of results.csv.</summary>
public sealed record RaceRow(string Variant, int Race, ulong Seed, string BoardId, string Name, int? Place, bool Finished, double? ElapsedS,
    double DistanceM, int Tacks, int Gybes, int Falls, bool Ocs, double DurationS, string FirstBeatSide = "", string SplitsS = "")
{
    public const string Header = "variant,race,seed,board,name,place,finished,elapsed_s,distance_m,tacks,gybes,falls,ocs,race_duration_s,first_beat_side,splits_s";

    /// <summary>Time that counts for this board: its elapsed time if it finished, else the race's whole duration
    /// (a DNF is scored as having sailed until the time limit).</summary>
    public double TimeOrLimitS => Finished && ElapsedS is double e ? e : DurationS;

    /// <summary>Split times (s from the signal) at each course step passed.</summary>
    public double[] Splits => SplitsS.Length == 0 ? [] : SplitsS.Split(';').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();

    public string ToCsv() => string.Join(',', Csv(Variant), Race.ToString(CultureInfo.InvariantCulture), Seed.ToString(CultureInfo.InvariantCulture),
        Csv(BoardId), Csv(Name), Place?.ToString(CultureInfo.InvariantCulture) ?? "", Finished ? "true" : "false", N(ElapsedS), N(DistanceM),
        Tacks.ToString(CultureInfo.InvariantCulture), Gybes.ToString(CultureInfo.InvariantCulture), Falls.ToString(CultureInfo.InvariantCulture),
        Ocs ? "true" : "false", N(DurationS), FirstBeatSide, SplitsS);

    public static RaceRow Parse(string line, string source, int lineNo)
    {
        var p = SplitCsv(line);
        if (p.Count != 16) throw new InvalidDataException($"{source}:{lineNo}: expected 16 fields, found {p.Count}");
        static double? D(string s) => s.Length == 0 ? null : double.Parse(s, CultureInfo.InvariantCulture);
        return new RaceRow(p[0], int.Parse(p[1], CultureInfo.InvariantCulture), ulong.Parse(p[2], CultureInfo.InvariantCulture), p[3], p[4],
            p[5].Length == 0 ? null : int.Parse(p[5], CultureInfo.InvariantCulture), p[6] == "true", D(p[7]), D(p[8]) ?? 0,
            int.Parse(p[9], CultureInfo.InvariantCulture), int.Parse(p[10], CultureInfo.InvariantCulture), int.Parse(p[11], CultureInfo.InvariantCulture),
            p[12] == "true", D(p[13]) ?? 0, p[14], p[15]);
    }

    static string N(double? v) => v is double d ? Math.Round(d, 3).ToString("0.###", CultureInfo.InvariantCulture) : "";
    static string Csv(string s) => s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;

    static List<string> SplitCsv(string line)
    {
        var parts = new List<string>();
        var sb = new StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            char c = line[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else sb.Append(c);
            }
            else if (c == '"') quoted = true;
            else if (c == ',') { parts.Add(sb.ToString()); sb.Clear(); }
            else sb.Append(c);
        }
        parts.Add(sb.ToString());
        return parts;
    }
}

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
    public static IReadOnlyList<(string Variant, int Race, string Line)> ReadMetrics(ExperimentSpec spec, string outDir)
    {
        var list = new List<(string, int, string)>();
        foreach (var v in spec.Variants)
            for (int i = 0; i < spec.Races; i++)
            {
                if (DurableFile.TryReadSealed(MetricsFile(outDir, v.Name, i), out var m, out _) && DurableFile.TryReadSealed(RunFile(outDir, v.Name, i), out _, out _))
                    list.Add((v.Name, i, m.Trim()));
            }
        return list;
    }

    /// <summary>Runs what is missing; returns the rows of every finished race, in order. Cancelling stops after the races under way.</summary>
    /// <remarks>
    /// The resume contract (docs/experiments.md): with <paramref name="resume"/> the folder's manifest must match the
    /// experiment (else a <see cref="Settings.SettingsException"/> naming what differs); a run file is kept only if its
    /// checksum holds, and an empty or damaged one is reported through <paramref name="warn"/> and raced again. A write
    /// that fails (a full disk) stops the batch with an <see cref="IOException"/> saying so; no temporary file is left.
    /// </remarks>
    public static IReadOnlyList<RaceRow> Run(ExperimentSpec spec, string outDir, int threads, bool resume, Action<BatchProgress>? progress = null,
        CancellationToken cancel = default, Action<string>? warn = null, DurableFile.Opener? open = null)
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
        // One cache of rig tables for the whole batch: a set-up's tables do not depend on the seed.
        var rigs = new Equilibrium.RigCache();
        try
        {
            Parallel.ForEach(todo, options, job =>
            {
                ulong seed = spec.SeedFor(job.Index, job.Race);
                var setup = job.V.Setup with { Race = job.V.Setup.Race with { Seed = seed } };
                double wind = spec.WindFor(job.Race);
                if (!double.IsNaN(wind)) setup = setup with { Wind = setup.Wind with { SpeedKn = wind } };
                var race = new Race(setup, rigs.For);
                var result = race.Run();
                var metrics = RaceMetrics.Of(race, result);
                var sb = new StringBuilder();
                foreach (var b in result.Boards)
                {
                    string splits = string.Join(';', b.SplitsS.Select(x => Math.Round(x, 2).ToString("0.##", CultureInfo.InvariantCulture)));
                    var row = new RaceRow(job.V.Name, job.Race, seed, setup.Boards[b.Board].Id, b.Name, b.Place, b.Finished, b.ElapsedS, b.DistanceM,
                        b.Tacks, b.Gybes, b.Falls, b.Ocs, result.DurationS, metrics.FirstBeatSide.TryGetValue(b.Board, out var side) ? side : "", splits);
                    sb.Append(row.ToCsv()).Append('\n');
                }
                var file = RunFile(outDir, job.V.Name, job.Race);
                // The race's own figures first; the board rows last, as the mark that the race is complete.
                DurableFile.WriteText(MetricsFile(outDir, job.V.Name, job.Race), DurableFile.Seal(metrics.ToCsv(job.V.Name, job.Race) + "\n"), open);
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
            int n = 0;
            foreach (var line in text.Split('\n', StringSplitOptions.RemoveEmptyEntries)) rows.Add(RaceRow.Parse(line, file, ++n));
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
