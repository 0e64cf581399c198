using System.Globalization;
using CourseSim.Agents;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Settings;
using CourseSim.Wind;

namespace CourseSim.Simulation;

/// <summary>Scenario files (docs/scenario.md): name, venue, wind, race, course and fleet.</summary>
public static class ScenarioFile
{
    /// <summary>Start plans: the spot on the line a rider lines up for.</summary>
    public static readonly string[] StartPlans = ["line-position", "favoured-end", "pin-end", "boat-end"];

    public static readonly SettingsSchema Schema = new("scenario",
    [
        KeySpec.Text("name", "", "the scenario's name"),
        KeySpec.Text("description", "", "what the scenario is for"),
        KeySpec.Text("venue.name", "", "the venue's name"),
        KeySpec.Number("venue.lat_deg", -90, 90, 0, "latitude of the course origin (middle of the start line), deg"),
        KeySpec.Number("venue.lon_deg", -180, 180, 0, "longitude of the course origin, deg"),
        .. WindFile.Keys,
        KeySpec.Number("race.step_hz", 5, 100, 20, "fixed steps per second"),
        KeySpec.Number("race.wind_hz", 1, 100, 5, "rate each board samples the wind field and shadows, per second"),
        KeySpec.Number("race.countdown_s", 20, 600, 90, "seconds simulated before the starting signal"),
        KeySpec.Number("race.time_limit_s", 60, 36000, 3600, "time limit after the signal, s"),
        KeySpec.Number("race.record_interval_s", 0.05, 10, 0.5, "interval between recorded samples, s"),
        KeySpec.Number("race.decision_interval_s", 0.2, 5, 0.5, "interval between a rider's decisions, s"),
        KeySpec.Flag("race.falls", true, "riders can fall when overpowered or in a failed gybe"),
        KeySpec.Flag("race.pumping", true, "riders pump below planing while their reserve lasts"),
        KeySpec.Text("race.start_time_utc", "2026-06-14T13:00:00Z", "clock time of the starting signal (ISO 8601, UTC), used in GPX"),
        KeySpec.Number("race.seed", 0, 9007199254740991, 1, "seed used when --seed is not given"),
        .. CourseBuilder.Keys,
        KeySpec.Text("tactics.assemblies", "", "compiled class libraries with tactics of your own, relative to the scenario file, separated by ';' (docs/tactics.md)"),
        KeySpec.Text("boards.*.equipment", "", "equipment file of this board, relative to the scenario file"),
        KeySpec.Text("boards.*.name", "", "name shown in results (default: the equipment's name)"),
        KeySpec.Text("boards.*.set", "", "equipment overrides for this board, 'table.key=value' separated by ';'"),
        KeySpec.Text("boards.*.tactic", "vmg-layline", "the board's tactic (docs/tactics.md lists them and their parameters)"),
        KeySpec.Derived("boards.*.params.*", -1e6, 1e6, "a parameter of the board's tactic (docs/tactics.md lists each tactic's)"),
        KeySpec.Text("boards.*.rival", "", "for tactics that watch a rival (cover): the rival's board id ([boards.ID])"),
        KeySpec.Text("boards.*.start", "line-position", "start plan: line-position (line_position, or spread), favoured-end (the upwind end as the rider reads the wind), pin-end, boat-end", StartPlans),
        KeySpec.Derived("boards.*.line_position", 0, 1, "where on the start line the rider aims: 0 pin (left) end .. 1 right end, kept at least 5 m inside the ends and 15 m inside the end the start tack sails to (docs/tactics.md); default: spread"),
        KeySpec.Derived("boards.*.start_margin_s", -5, 30, "when after the signal the rider plans to reach the line on time-on-distance, s (default: 1.5 s with the rider's misjudgement)"),
        KeySpec.Flag("rules.give_way", true, "riders look out and keep clear as the right-of-way rules ask (false: contacts are only judged)"),
        KeySpec.Flag("rules.penalties", true, "a board at fault in a contact takes a one-turn penalty"),
        KeySpec.Flag("rules.give_room", true, "right-of-way riders changing course give the other room to keep clear (RRS 16.1)"),
        KeySpec.Flag("rules.judge_room", true, "the judge applies RRS 16.1 to right-of-way boards changing course and the exoneration of 43.1(a)"),
        KeySpec.Number("rules.lookout_hz", 1, 20, 5, "rate of each rider's lookout for conflicts, per second"),
        KeySpec.Number("rules.contact_m", 0.2, 3, 1.0, "hulls closer than this are in contact, m"),
        KeySpec.Number("rules.mark_room_m", 5, 60, 15, "boards this close to the mark they are about to round are rounding or passing (mark-room), m"),
    ]);

    public static SettingsFile Load(string path, IEnumerable<string>? overrides = null) => SettingsFile.Load(path, Schema, overrides);

    public static RaceSetup LoadRace(string path, IEnumerable<string>? overrides = null, ulong? seed = null, TacticRegistry? tactics = null)
        => FromSettings(Load(path, overrides), seed, tactics);

    /// <summary>The seed a scenario's races sail with (and so their wind field): the one given, else `race.seed`.</summary>
    public static ulong SeedOf(SettingsFile f, ulong? given = null) => given ?? (ulong)f.Number("race.seed");

    /// <summary>
    /// The race a scenario file describes. Tactic names are checked against <paramref name="tactics"/> (default: the
    /// built-in ones) with the scenario's own assemblies loaded into it; a race of the result must be built with the
    /// same registry when it names tactics registered by code.
    /// </summary>
    public static RaceSetup FromSettings(SettingsFile f, ulong? seed = null, TacticRegistry? tactics = null)
    {
        // A log-driven wind takes the window of this race's seed (fixed: wind.log_offset_s; random: drawn by the seed).
        var wind = WindLogDrive.ForSeed(WindFile.From(f), SeedOf(f, seed));
        string startText = f.Text("race.start_time_utc");
        if (!DateTime.TryParse(startText, CultureInfo.InvariantCulture, DateTimeStyles.AdjustToUniversal | DateTimeStyles.AssumeUniversal, out var start))
            throw f.ErrorAt("race.start_time_utc", $"'{startText}' is not an ISO 8601 time such as 2026-06-14T13:00:00Z");
        if (start.Year is < 1900 or > 2199) throw f.ErrorAt("race.start_time_utc", $"'{startText}' is out of range: accepted 1900-01-01 to 2199-12-31 (UTC)");
        var race = new RaceSettings
        {
            StepHz = f.Number("race.step_hz"),
            WindHz = f.Number("race.wind_hz"),
            CountdownS = f.Number("race.countdown_s"),
            TimeLimitS = f.Number("race.time_limit_s"),
            RecordIntervalS = f.Number("race.record_interval_s"),
            DecisionIntervalS = f.Number("race.decision_interval_s"),
            Falls = f.Flag("race.falls"),
            Pumping = f.Flag("race.pumping"),
            StartTimeUtc = DateTime.SpecifyKind(start, DateTimeKind.Utc),
            Seed = SeedOf(f, seed),
        };
        if (race.RecordIntervalS < 1 / race.StepHz) throw f.ErrorAt("race.record_interval_s", $"must be at least one step (1/{race.StepHz} s)");
        // With random log windows the course is laid to the whole log's mean direction: one layout for every race.
        var course = CourseBuilder.Build(f, wind.Log is { Random: true } lw ? lw.MeanDirDeg : wind.DirectionDeg);
        // Tactics of the user's own come first, so the boards can name them. The registry is this scenario's own; the
        // race builds its registry again from the same assemblies (TacticAssemblies).
        var registry = tactics ?? new TacticRegistry();
        var assemblies = new List<string>();
        foreach (var dll in f.Text("tactics.assemblies").Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            string full = Path.GetFullPath(Path.Combine(f.Directory, dll));
            try { registry.LoadAssembly(full, dll); }
            catch (TacticLoadException e) { throw f.ErrorAt("tactics.assemblies", e.Message); }
            assemblies.Add(full);
        }
        var ids = f.Names("boards");
        if (ids.Count == 0) throw new SettingsException(f.Path, 0, "boards", "a race needs at least one board: add a [boards.NAME] table with equipment = \"file.toml\"");
        if (ids.Count > Storage.Limits.MaxBoards)
            throw new SettingsException(f.Path, 0, "boards", $"{ids.Count} boards, over the limit of {Storage.Limits.MaxBoards} {Storage.Limits.Override("COURSESIM_MAX_BOARDS")}");
        var boards = new List<BoardEntry>();
        // Identity, not position: the default spread along the start line follows the boards' ids (their table names)
        // in ordinal order, so reordering the tables of a file changes nothing.
        var rankOf = ids.Order(StringComparer.Ordinal).Select((id, r) => (id, r)).ToDictionary(x => x.id, x => x.r, StringComparer.Ordinal);
        for (int i = 0; i < ids.Count; i++)
        {
            string id = ids[i], key = $"boards.{id}.equipment";
            string file = f.Text(key);
            if (file.Length == 0) throw f.ErrorAt(key, $"board '{id}' needs an equipment file (equipment = \"equipment/NAME.toml\")");
            string full = Path.GetFullPath(Path.Combine(f.Directory, file));
            if (!File.Exists(full)) throw f.ErrorAt(key, $"equipment file '{file}' not found (looked for {full})");
            var sets = f.Text($"boards.{id}.set").Split(';', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            Equipment eq;
            try { eq = EquipmentFile.Load(full, sets); }
            catch (SettingsException e) when (e.Origin != full)
            {
                throw f.ErrorAt(e.Origin == "--set" ? $"boards.{id}.set" : key, e.Problem + (e.Key is null ? "" : $" (key '{e.Key}')"));
            }
            if (sets.Length > 0) eq = eq with { Name = eq.Name + " (adjusted)" };
            string name = f.Text($"boards.{id}.name") is { Length: > 0 } n ? n : eq.Name;
            double pos = f.Has($"boards.{id}.line_position") ? f.Number($"boards.{id}.line_position") : (rankOf[id] + 0.5) / ids.Count;
            string tactic = f.Text($"boards.{id}.tactic");
            if (!registry.TryGet(tactic, out var tspec))
                throw f.Has($"boards.{id}.tactic")
                    ? f.ErrorAt($"boards.{id}.tactic", $"no tactic '{tactic}'; known tactics: {string.Join(", ", registry.Names)}")
                    : new SettingsException(f.Path, 0, $"boards.{id}.tactic", $"the default tactic '{tactic}' is not registered");
            var known = tspec.Params;
            var prm = new Dictionary<string, double>();
            string prefix = $"boards.{id}.params.";
            foreach (var k in f.KeysGiven.Where(k => k.StartsWith(prefix, StringComparison.Ordinal)).Order(StringComparer.Ordinal))
            {
                string pn = k[prefix.Length..];
                var spec = known.FirstOrDefault(q => q.Name == pn);
                if (spec is null)
                    throw f.ErrorAt(k, $"tactic '{tactic}' has no parameter '{pn}'; its parameters: {(known.Count == 0 ? "none" : string.Join(", ", known.Select(q => q.Name)))}");
                double val = f.Number(k);
                if (val < spec.Min || val > spec.Max) throw f.ErrorAt(k, $"{val} is out of range for {pn}: accepted {spec.Min} to {spec.Max} ({spec.Help})");
                prm[pn] = val;
            }
            foreach (var q in known) prm.TryAdd(q.Name, q.Default);
            boards.Add(new BoardEntry(id, name, eq, tactic, pos, f.Raw(key)?.Line ?? 0, prm)
            {
                Start = f.Text($"boards.{id}.start"),
                StartMarginS = f.Has($"boards.{id}.start_margin_s") ? f.Number($"boards.{id}.start_margin_s") : null,
            });
        }
        // Rivals name another board of the fleet; a tactic that needs one must be given one.
        for (int i = 0; i < boards.Count; i++)
        {
            string id = ids[i], rk = $"boards.{id}.rival";
            string rival = f.Text(rk);
            registry.TryGet(boards[i].Tactic, out var tspec);
            if (rival.Length == 0)
            {
                if (tspec!.NeedsRival) throw f.ErrorAt($"boards.{id}.tactic", $"tactic '{tspec.Name}' needs a rival: add rival = \"ID\" naming another [boards.ID]");
                continue;
            }
            int r = ids.ToList().IndexOf(rival);
            if (r < 0) throw f.ErrorAt(rk, $"no board '{rival}' in the fleet; boards: {string.Join(", ", ids)}");
            if (r == i) throw f.ErrorAt(rk, "a board cannot be its own rival");
            boards[i] = boards[i] with { RivalIndex = r };
        }
        var rules = new RuleSettings
        {
            GiveWay = f.Flag("rules.give_way"), Penalties = f.Flag("rules.penalties"), LookoutHz = f.Number("rules.lookout_hz"),
            GiveRoom = f.Flag("rules.give_room"), JudgeRoom = f.Flag("rules.judge_room"),
            ContactM = f.Number("rules.contact_m"), MarkRoomM = f.Number("rules.mark_room_m"),
        };
        return new RaceSetup(f.Text("name"), f.Text("description"), f.Text("venue.name"), f.Number("venue.lat_deg"), f.Number("venue.lon_deg"),
            wind, race, course, boards, f.Path) { Rules = rules, TacticAssemblies = assemblies };
    }
}
