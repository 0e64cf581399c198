using System.Text.Json;
using CourseSim.Engine;
using CourseSim.Experiments;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim race SCENARIO --from-batch DIR --race I --variant V</c>: race i of variant v of the batch in DIR, set up
/// as the batch set it up (the experiment file and its --set overrides recorded in DIR/summary.json, the race's seed
/// and wind from the master seed), and checked against the batch's own row of it (DIR/runs/V/NNNNNN.csv).
/// </summary>
public sealed class FromBatch
{
    public required RaceSetup Setup { get; init; }
    public required string Variant { get; init; }
    public required int Race { get; init; }
    public required string RunFile { get; init; }

    public static FromBatch Load(string scenario, string dir, int? race, string? variant, ulong? seed, string[] sets)
    {
        if (race is null || variant is null) throw new UsageException("--from-batch needs --race I and --variant NAME");
        if (seed is not null || sets.Length > 0) throw new UsageException("--from-batch sets the race up as the batch did: leave out --seed and --set");
        string summary = Path.Combine(dir, "summary.json");
        if (!File.Exists(summary)) throw new UsageException($"--from-batch {dir}: no summary.json there (the folder a batch wrote, with --out)");
        string expFile;
        string[] expSet;
        int races;
        try
        {
            using var doc = JsonDocument.Parse(File.ReadAllText(summary));
            var root = doc.RootElement;
            expFile = root.GetProperty("experiment_file").GetString() ?? "";
            expSet = root.GetProperty("experiment_set").EnumerateArray().Select(x => x.GetString() ?? "").ToArray();
            races = root.GetProperty("races_per_variant").GetInt32();
        }
        catch (Exception e) when (e is JsonException or KeyNotFoundException or InvalidOperationException)
        {
            throw new UsageException($"{summary}: not a batch summary with experiment_file, experiment_set and races_per_variant ({e.Message}); written by an older coursesim? run the batch again");
        }
        var spec = ExperimentFile.Load(expFile, expSet);
        string given = Path.GetFullPath(scenario);
        if (given != Path.GetFullPath(expFile) && given != spec.ScenarioPath)
            throw new UsageException($"{scenario}: the batch in {dir} raced experiment {expFile} on scenario {spec.ScenarioPath}; give one of those");
        int vi = spec.Variants.ToList().FindIndex(v => v.Name == variant);
        if (vi < 0) throw new UsageException($"--variant {variant}: no such variant in {expFile}; variants: {string.Join(", ", spec.Variants.Select(v => v.Name))}");
        if (race < 0 || race >= races) throw new UsageException($"--race {race}: out of range, the batch ran races 0 to {races - 1}");
        return new FromBatch { Setup = spec.SetupFor(vi, race.Value), Variant = variant, Race = race.Value, RunFile = BatchRunner.RunFile(dir, variant, race.Value) };
    }

    /// <summary>Whether this race gives the batch's rows of it exactly, and a line saying so.</summary>
    public (bool Same, string Message) Check(Race race, RaceResult result)
    {
        if (!File.Exists(RunFile)) return (true, $"Race {Race} of {Variant} (seed {Setup.Race.Seed}): the batch has no file of it yet ({RunFile}) to check against.");
        var rows = BatchRunner.RowsOf(Variant, Race, Setup, result, RaceMetrics.Of(race, result)).Select(r => r.ToCsv()).ToList();
        // Run files are sealed (their SHA-256 on a last line): a damaged one cannot be checked against.
        if (!CourseSim.Storage.DurableFile.TryReadSealed(RunFile, out var text, out var problem))
            return (false, $"Race {Race} of {Variant} (seed {Setup.Race.Seed}): the batch's {RunFile} cannot be checked against: {problem}.");
        var batch = RaceRow.ParseFile(text.Split('\n', StringSplitOptions.RemoveEmptyEntries), RunFile).Select(r => r.ToCsv()).ToList();
        return rows.SequenceEqual(batch)
            ? (true, $"Race {Race} of {Variant} (seed {Setup.Race.Seed}): every board's result matches the batch's {RunFile} exactly.")
            : (false, $"Race {Race} of {Variant} (seed {Setup.Race.Seed}) differs from the batch's {RunFile}: the engine or the files changed since the batch ran.");
    }
}
