using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Random;
using CourseSim.Settings;

namespace CourseSim.Experiments;

/// <summary>One variant of an experiment: a name and the scenario overrides that make it.</summary>
public sealed record Variant(string Name, IReadOnlyList<string> Sets, RaceSetup Setup);

/// <summary>An experiment: a base scenario, its variants, the number of races and the master seed.</summary>
public sealed record ExperimentSpec(string Name, string Description, string ScenarioPath, string Focus, IReadOnlyList<Variant> Variants,
    int Races, ulong MasterSeed, string SourcePath, bool CommonSeeds = true, double WindMinKn = double.NaN, double WindMaxKn = double.NaN,
    double TargetDurationS = double.NaN)
{
    /// <summary>
    /// The mean wind of race i (kn) when the experiment spans a range of winds: drawn uniformly from the range with the
    /// race's common seed, so every variant sails race i in the same wind; NaN when the scenario's own wind is used.
    /// </summary>
    public double WindFor(int race) => double.IsNaN(WindMinKn) ? double.NaN
        : WindMinKn + (WindMaxKn - WindMinKn) * new CourseSim.Random.CounterRng(ExperimentFile.RaceSeed(MasterSeed, race), 0x3117D).Uniform(0);

    /// <summary>The seed variant v sails race i with: the same for every variant (common random numbers) unless the
    /// experiment asks for independent seeds (then each variant has its own stream, for A/A checks of the statistics).</summary>
    public ulong SeedFor(int variant, int race) => ExperimentFile.RaceSeed(CommonSeeds ? MasterSeed : MasterSeed ^ (0xA5A5_0000UL + (ulong)variant * 0x9E3779B97F4A7C15UL), race);
}

/// <summary>
/// Experiment files (TOML): <c>scenario</c> (relative to the experiment), <c>races</c>, <c>seed</c>, <c>focus</c> (the
/// board whose result is compared) and <c>[variants.NAME]</c> tables with <c>set</c>, the scenario overrides as
/// <c>--set</c> takes them, separated by ';'. Race i of every variant has the same seed (common random numbers), so
/// every variant sails race i in the same wind and the differences are paired.
/// </summary>
public static class ExperimentFile
{
    public static readonly SettingsSchema Schema = new("experiment",
    [
        KeySpec.Text("name", "", "the experiment's name"),
        KeySpec.Text("description", "", "what the experiment asks"),
        KeySpec.Text("scenario", "", "the base scenario file, relative to the experiment file"),
        KeySpec.Number("races", 1, 100000, 50, "races per variant"),
        KeySpec.Number("seed", 0, 9007199254740991, 1, "master seed: race i of every variant gets the same seed from it"),
        KeySpec.Text("focus", "", "the board (its [boards.NAME] name) whose result the variants are compared on; default the first"),
        KeySpec.Text("seeds", "common", "common: race i of every variant has the same wind (paired); independent: each variant its own", ["common", "independent"]),
        KeySpec.Derived("target_duration_s", 60, 36000, "the race duration organisers aim at (winner's time), s: the report says how the variants meet it"),
        KeySpec.Derived("wind_min_kn", 0, 45, "with wind_max_kn: race i's mean wind is drawn from this range (the same for every variant), kn"),
        KeySpec.Derived("wind_max_kn", 0, 45, "upper end of the range of mean winds, kn"),
        KeySpec.Text("variants.*.set", "", "scenario overrides for this variant, 'table.key=value' separated by ';'"),
        KeySpec.Text("variants.*.description", "", "what this variant changes"),
    ]);

    /// <summary>The seed of race i (the same for every variant).</summary>
    public static ulong RaceSeed(ulong master, int race) => CounterRng.Mix(CounterRng.Mix(master) ^ (0x9E3779B97F4A7C15UL * (ulong)(race + 1)));

    public static ExperimentSpec Load(string path, IEnumerable<string>? overrides = null, int? races = null)
    {
        var f = SettingsFile.Load(path, Schema, overrides);
        string scen = f.Text("scenario");
        if (scen.Length == 0) throw new SettingsException(f.Path, 0, "scenario", "an experiment needs a base scenario (scenario = \"file.toml\")");
        string full = Path.GetFullPath(Path.Combine(f.Directory, scen));
        if (!File.Exists(full)) throw f.ErrorAt("scenario", $"scenario file '{scen}' not found (looked for {full})");
        var names = f.Names("variants");
        if (names.Count == 0) throw new SettingsException(f.Path, 0, "variants", "an experiment needs at least one [variants.NAME] table");
        if (names.Count > Storage.Limits.MaxVariants)
            throw new SettingsException(f.Path, 0, "variants", $"{names.Count} variants, over the limit of {Storage.Limits.MaxVariants} {Storage.Limits.Override("COURSESIM_MAX_VARIANTS")}");
        var variants = new List<Variant>();
        string focus = f.Text("focus");
        foreach (var v in names)
        {
            string key = $"variants.{v}.set";
            var sets = f.Text(key).Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            RaceSetup setup;
            try { setup = ScenarioFile.LoadRace(full, sets); }
            catch (SettingsException e) when (e.Origin == "--set")
            {
                throw f.ErrorAt(key, $"{e.Problem}{(e.Key is null ? "" : $" (key '{e.Key}')")}");
            }
            if (focus.Length > 0 && !setup.Boards.Any(b => b.Id == focus))
                throw f.ErrorAt("focus", $"no board '{focus}' in variant '{v}'; boards: {string.Join(", ", setup.Boards.Select(b => b.Id))}");
            variants.Add(new Variant(v, sets, setup));
        }
        if (focus.Length == 0) focus = variants[0].Setup.Boards[0].Id;
        double wMin = f.Number("wind_min_kn"), wMax = f.Number("wind_max_kn");
        if (double.IsNaN(wMin) != double.IsNaN(wMax)) throw f.ErrorAt(double.IsNaN(wMin) ? "wind_max_kn" : "wind_min_kn", "give both wind_min_kn and wind_max_kn, or neither");
        if (wMin > wMax) throw f.ErrorAt("wind_max_kn", $"must be at least wind_min_kn ({wMin})");
        int n = races ?? (int)f.Number("races");
        return new ExperimentSpec(f.Text("name") is { Length: > 0 } nm ? nm : Path.GetFileNameWithoutExtension(path), f.Text("description"),
            full, focus, variants, n, (ulong)f.Number("seed"), f.Path, f.Text("seeds") == "common", wMin, wMax, f.Number("target_duration_s"));
    }
}
