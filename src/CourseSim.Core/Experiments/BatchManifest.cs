using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Settings;
using CourseSim.Storage;

namespace CourseSim.Experiments;

/// <summary>
/// manifest.json in a batch's output folder: what the races in runs/ were made from (the experiment and scenario files'
/// hashes, the fleet's resolved equipment, the master seed and seed mode, the wind range, every variant's overrides,
/// the engine and the run-file schema). <c>--resume</c> keeps the runs only if the manifest matches the experiment
/// being run, field by field; the number of races and the report's settings may change.
/// </summary>
public static class BatchManifest
{
    /// <summary>Version of the run files' layout (sealed CSV, one row per board).</summary>
    public const int SchemaVersion = 2;
    public const string FileName = "manifest.json";

    public static string PathIn(string outDir) => Path.Combine(outDir, FileName);

    /// <summary>The fields, in a fixed order.</summary>
    public static IReadOnlyList<(string Key, string Value)> For(ExperimentSpec spec)
    {
        static string Hash(string s) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(s)));
        static string FileHash(string path) => File.Exists(path) ? Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(path))) : "";
        static string N(double d) => double.IsNaN(d) ? "" : d.ToString("R", CultureInfo.InvariantCulture);
        return
        [
            ("schema", SchemaVersion.ToString(CultureInfo.InvariantCulture)),
            ("engine", Race.EngineVersion),
            ("experiment_sha256", FileHash(spec.SourcePath)),
            ("scenario_sha256", FileHash(spec.ScenarioPath)),
            ("seed", spec.MasterSeed.ToString(CultureInfo.InvariantCulture)),
            ("seeds", spec.CommonSeeds ? "common" : "independent"),
            ("wind_min_kn", N(spec.WindMinKn)),
            ("wind_max_kn", N(spec.WindMaxKn)),
            ("variants", string.Join(" | ", spec.Variants.Select(v => v.Name + ": " + string.Join("; ", v.Sets)))),
            ("fleet_sha256", Hash(string.Join("\n", spec.Variants.SelectMany(v => v.Setup.Boards.Select(b => v.Name + "/" + b.Id + "/" + b.Tactic + "/" + b.Equipment))))),
        ];
    }

    public static void Write(ExperimentSpec spec, string outDir, DurableFile.Opener? open = null)
    {
        var map = For(spec).ToDictionary(p => p.Key, p => p.Value);
        DurableFile.WriteText(PathIn(outDir), JsonSerializer.Serialize(map, new JsonSerializerOptions { WriteIndented = true }) + "\n", open);
    }

    /// <summary>
    /// Checks that the runs in <paramref name="outDir"/> were made by this experiment. A folder with no manifest and no
    /// runs is fine (nothing to keep); a mismatch, an unreadable manifest, or runs without one, is a bad input naming
    /// every field that differs.
    /// </summary>
    public static void CheckForResume(ExperimentSpec spec, string outDir)
    {
        string path = PathIn(outDir);
        if (!File.Exists(path))
        {
            bool anyRuns = Directory.Exists(Path.Combine(outDir, "runs")) &&
                Directory.EnumerateFiles(Path.Combine(outDir, "runs"), "*.csv", SearchOption.AllDirectories).Any();
            if (anyRuns)
                throw new SettingsException(path, 0, null, "--resume: the runs in this folder have no manifest, so nothing says which experiment, " +
                    "seed and engine made them; run without --resume to start afresh, or choose another --out");
            return;
        }
        Dictionary<string, string>? old;
        try { old = JsonSerializer.Deserialize<Dictionary<string, string>>(File.ReadAllText(path)); }
        catch (JsonException e) { throw new SettingsException(path, 0, null, $"--resume: the manifest is damaged ({e.Message}); run without --resume to start afresh"); }
        var diffs = new List<string>();
        foreach (var (key, value) in For(spec))
        {
            string was = old is not null && old.TryGetValue(key, out var w) ? w : "(none)";
            if (was != value) diffs.Add($"{key}: the runs here have {Show(was)}, this run asks for {Show(value)}");
        }
        if (diffs.Count > 0)
            throw new SettingsException(path, 0, null, "--resume: the races in this folder were made by a different experiment set-up, so they cannot be " +
                "kept:\n  " + string.Join("\n  ", diffs) + "\nRun without --resume to start afresh, or choose another --out.");
    }

    static string Show(string s) => s.Length == 0 ? "(none)" : s.Length > 80 ? $"'{s[..77]}...'" : $"'{s}'";
}
