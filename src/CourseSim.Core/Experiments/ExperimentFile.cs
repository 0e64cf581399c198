using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Random;
using CourseSim.Settings;

namespace CourseSim.Experiments;

/// <summary>One variant of an experiment: a name, the scenario overrides that make it (as --set takes them, in order)
/// and the race set-up they give.</summary>
public sealed record Variant(string Name, IReadOnlyList<string> Sets, RaceSetup Setup);

/// <summary>
/// An experiment: a base scenario, its variants, the number of races and the master seed. <see cref="Board"/> is the
/// board compared; <see cref="Focus"/> the user the headline speaks to (rider, organiser, coach or all).
/// </summary>
public sealed record ExperimentSpec(string Name, string Description, string ScenarioPath, string Board, IReadOnlyList<Variant> Variants,
    int Races, ulong MasterSeed, string SourcePath, bool CommonSeeds = true, double WindMinKn = double.NaN, double WindMaxKn = double.NaN,
    double TargetDurationS = double.NaN, string Focus = "all")
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

    /// <summary>The race set-up of race i of variant v: the variant's set-up with the race's seed and wind. Running it
    /// gives race i of the batch exactly (what <c>coursesim race --from-batch</c> does).</summary>
    public RaceSetup SetupFor(int variant, int race)
    {
        var v = Variants[variant];
        ulong seed = SeedFor(variant, race);
        // A log-driven wind with random windows: each race's window is drawn by its own seed (so the thread count and
        // the order races run in change nothing).
        var setup = v.Setup with { Race = v.Setup.Race with { Seed = seed }, Wind = Wind.WindLogDrive.ForSeed(v.Setup.Wind, seed) };
        double wind = WindFor(race);
        return double.IsNaN(wind) ? setup : setup with { Wind = setup.Wind with { SpeedKn = wind } };
    }
}

/// <summary>
/// Experiment files (TOML): <c>scenario</c> (relative to the experiment), <c>races</c>, <c>seed</c>, <c>board</c> (the
/// board whose result is compared), <c>focus</c> (the user the headline speaks to), <c>[scenario_set]</c> (scenario
/// overrides for every variant, as a TOML table) and <c>[variants.NAME]</c> tables with <c>set</c> (overrides as
/// <c>--set</c> takes them, separated by ';'), <c>[variants.NAME.scenario_set]</c> (overrides as a table) and
/// <c>[variants.NAME.board_set.BOARD]</c> (equipment overrides of one board, merged over the scenario's own
/// <c>boards.BOARD.set</c>). Race i of every variant has the same seed (common random numbers), so every variant sails
/// race i in the same wind and the differences are paired.
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
        KeySpec.Text("board", "", "the board (its [boards.NAME] name) whose result the variants are compared on; default the first"),
        KeySpec.Text("focus", "all", "the user the headline speaks to: rider, organiser, coach or all (a board's name here is read as board, as in older files)"),
        KeySpec.Text("seeds", "common", "common: race i of every variant has the same wind (paired); independent: each variant its own", ["common", "independent"]),
        KeySpec.Derived("target_duration_s", 60, 36000, "the race duration organisers aim at (winner's time), s: the report says how the variants meet it"),
        KeySpec.Derived("wind_min_kn", 0, 45, "with wind_max_kn: race i's mean wind is drawn from this range (the same for every variant), kn"),
        KeySpec.Derived("wind_max_kn", 0, 45, "upper end of the range of mean winds, kn"),
        KeySpec.Text("variants.*.set", "", "scenario overrides for this variant, 'table.key=value' separated by ';'"),
        KeySpec.Text("variants.*.description", "", "what this variant changes"),
    ]);

    /// <summary>The users a headline can speak to.</summary>
    public static readonly string[] Foci = ["rider", "organiser", "coach", "all"];

    /// <summary>Seeds are kept below 2^53: they fit race.seed's range, a signed 64-bit integer and a double exactly, so
    /// every data tool reads them back as the same integer.</summary>
    public const ulong SeedMask = (1UL << 53) - 1;

    /// <summary>The seed of race i (the same for every variant), below 2^53.</summary>
    public static ulong RaceSeed(ulong master, int race) => CounterRng.Mix(CounterRng.Mix(master) ^ (0x9E3779B97F4A7C15UL * (ulong)(race + 1))) & SeedMask;

    /// <summary>Keys under these prefixes are scenario or equipment keys, checked when the scenario is loaded with them.</summary>
    static bool ScenarioKey(string key)
    {
        if (key.StartsWith("scenario_set.", StringComparison.Ordinal)) return true;
        var p = key.Split('.');
        return p.Length >= 4 && p[0] == "variants" && (p[2] == "scenario_set" || p.Length >= 5 && p[2] == "board_set");
    }

    /// <summary>A TOML value as --set writes it (strings quoted, so they come back as strings).</summary>
    static string Literal(object v) => v switch
    {
        string s => "\"" + s.Replace("\\", "\\\\").Replace("\"", "\\\"") + "\"",
        bool b => b ? "true" : "false",
        double d => d.ToString("R", System.Globalization.CultureInfo.InvariantCulture),
        long l => l.ToString(System.Globalization.CultureInfo.InvariantCulture),
        Tomlyn.Model.TomlArray a => "[" + string.Join(", ", a.Select(x => Literal(x!))) + "]",
        _ => System.Convert.ToString(v, System.Globalization.CultureInfo.InvariantCulture) ?? "",
    };

    /// <summary>The overrides given as a table under <paramref name="prefix"/>, as key=value, in the file's order.</summary>
    static List<(string Set, string Key)> TableSets(SettingsFile f, string prefix) =>
        f.KeysGiven.Where(k => k.StartsWith(prefix, StringComparison.Ordinal)).Select(k => (Raw: f.Raw(k)!.Value, Key: k))
            .OrderBy(x => x.Raw.Line == 0 ? int.MaxValue : x.Raw.Line)
            .Select(x => ($"{x.Key[prefix.Length..]}={Literal(x.Raw.Value)}", x.Key)).ToList();

    public static ExperimentSpec Load(string path, IEnumerable<string>? overrides = null, int? races = null)
    {
        var f = SettingsFile.Load(path, Schema, overrides, ScenarioKey);
        string scen = f.Text("scenario");
        if (scen.Length == 0) throw new SettingsException(f.Path, 0, "scenario", "an experiment needs a base scenario (scenario = \"file.toml\")");
        string full = Path.GetFullPath(Path.Combine(f.Directory, scen));
        if (!File.Exists(full)) throw f.ErrorAt("scenario", $"scenario file '{scen}' not found (looked for {full})");
        var names = f.Names("variants");
        if (names.Count == 0) throw new SettingsException(f.Path, 0, "variants", "an experiment needs at least one [variants.NAME] table");
        if (names.Count > Storage.Limits.MaxVariants)
            throw new SettingsException(f.Path, 0, "variants", $"{names.Count} variants, over the limit of {Storage.Limits.MaxVariants} {Storage.Limits.Override("COURSESIM_MAX_VARIANTS")}");
        string focus = f.Text("focus"), board = f.Text("board");
        var common = TableSets(f, "scenario_set.");
        var variants = new List<Variant>();
        foreach (var v in names)
        {
            // In order: [scenario_set] for every variant, the variant's set string, its [scenario_set] table, then its
            // per-board equipment tables merged over the board's own set (the scenario's, with the overrides above).
            var given = new List<(string Set, string Key)>(common);
            string key = $"variants.{v}.set";
            given.AddRange(f.Text(key).Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).Select(x => (x, key)));
            given.AddRange(TableSets(f, $"variants.{v}.scenario_set."));
            var boardSets = TableSets(f, $"variants.{v}.board_set.");
            foreach (var g in boardSets.GroupBy(x => x.Set[..x.Set.IndexOf('.')]))
            {
                SettingsFile scenario;
                try { scenario = ScenarioFile.Load(full, given.Select(x => x.Set)); }
                catch (SettingsException e) when (e.Origin == "--set") { throw Located(f, given, e); }
                string id = g.Key, own = scenario.Has($"boards.{id}.equipment") ? scenario.Text($"boards.{id}.set") : throw f.ErrorAt(g.First().Key,
                    $"no board '{id}' in the scenario; boards: {string.Join(", ", scenario.Names("boards"))}");
                var parts = g.Select(x => x.Set[(id.Length + 1)..]).ToList();
                if (parts.FirstOrDefault(x => x.Contains(';')) is string bad) throw f.ErrorAt(g.First(x => x.Set.EndsWith(bad, StringComparison.Ordinal)).Key, "an equipment value cannot hold ';'");
                string merged = string.Join("; ", new[] { own }.Where(x => x.Trim().Length > 0).Concat(parts));
                given.Add(($"boards.{id}.set={Literal(merged)}", g.First().Key));
            }
            RaceSetup setup;
            try { setup = ScenarioFile.LoadRace(full, given.Select(x => x.Set)); }
            catch (SettingsException e) when (e.Origin == "--set") { throw Located(f, given, e); }
            variants.Add(new Variant(v, given.Select(x => x.Set).ToList(), setup));
        }
        // Older files named the board in focus.
        if (!Foci.Contains(focus))
        {
            if (board.Length > 0 || !variants[0].Setup.Boards.Any(b => b.Id == focus))
                throw f.ErrorAt("focus", $"'{focus}' is not accepted: one of {string.Join(", ", Foci)} (the board compared goes in board = \"NAME\")");
            board = focus; focus = "all";
        }
        foreach (var v in variants)
            if (board.Length > 0 && !v.Setup.Boards.Any(b => b.Id == board))
                throw f.ErrorAt(f.Has("board") ? "board" : "focus", $"no board '{board}' in variant '{v.Name}'; boards: {string.Join(", ", v.Setup.Boards.Select(b => b.Id))}");
        if (board.Length == 0) board = variants[0].Setup.Boards[0].Id;
        double wMin = f.Number("wind_min_kn"), wMax = f.Number("wind_max_kn");
        if (double.IsNaN(wMin) != double.IsNaN(wMax)) throw f.ErrorAt(double.IsNaN(wMin) ? "wind_max_kn" : "wind_min_kn", "give both wind_min_kn and wind_max_kn, or neither");
        if (wMin > wMax) throw f.ErrorAt("wind_max_kn", $"must be at least wind_min_kn ({wMin})");
        if (!double.IsNaN(wMin) && variants.Any(v => v.Setup.Wind.Log is not null))
            throw f.ErrorAt("wind_min_kn", "the scenario's wind comes from a log (wind.log): draw each race's wind from it with wind.log_windows = \"random\" instead of a wind range");
        int n = races ?? (int)f.Number("races");
        return new ExperimentSpec(f.Text("name") is { Length: > 0 } nm ? nm : Path.GetFileNameWithoutExtension(path), f.Text("description"),
            full, board, variants, n, (ulong)f.Number("seed"), f.Path, f.Text("seeds") == "common", wMin, wMax, f.Number("target_duration_s"), focus);
    }

    /// <summary>A scenario error from an override, located at the experiment key that gave it.</summary>
    static SettingsException Located(SettingsFile f, List<(string Set, string Key)> given, SettingsException e)
    {
        var src = e.Key is null ? given.LastOrDefault() : given.LastOrDefault(x => x.Set.StartsWith(e.Key + "=", StringComparison.Ordinal));
        string at = src.Key ?? given.LastOrDefault().Key ?? "variants";
        return f.ErrorAt(at, $"{e.Problem}{(e.Key is null ? "" : $" (key '{e.Key}')")}");
    }
}
