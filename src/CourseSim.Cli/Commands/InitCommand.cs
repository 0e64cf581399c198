using System.CommandLine;
using System.Globalization;
using System.Text;
using CourseSim.Settings;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim init scenario|equipment|experiment DIR</c>: starting files to edit, set at the fictional Ostrin Sound
/// and its (invented) riders. Every key is written with its help, range and default from the schema that checks it, so
/// the files explain themselves and load as they are. Existing files are never overwritten.
/// </summary>
public static class InitCommand
{
    public static readonly string[] Kinds = ["scenario", "equipment", "experiment"];

    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var kind = new Argument<string>("kind") { Description = "scenario, equipment or experiment" };
        kind.CompletionSources.Add(Kinds);
        var dir = new Argument<string>("dir") { Description = "folder to write into (made if missing; files already there are kept)" };
        var cmd = new Command("init", "Write commented starting files (a scenario, an equipment set-up or an experiment) to edit.") { kind, dir };
        cmd.SetAction(pr => Run(pr.GetValue(kind)!, pr.GetValue(dir)!, stdout));
        return cmd;
    }

    static int Run(string kind, string dir, TextWriter stdout)
    {
        if (!Kinds.Contains(kind)) throw new UsageException($"init: no kind '{kind}'; kinds: {string.Join(", ", Kinds)}");
        var files = new List<(string Path, string Text)>();
        if (kind == "equipment") files.Add((Path.Combine(dir, "my-rig.toml"), Equipment("My rig: 7.0 m2 freeride", "Jonna Vell", 68, 7.0, 0.7, 120)));
        if (kind is "scenario" or "experiment")
        {
            files.Add((Path.Combine(dir, "equipment", "jonna-70.toml"), Equipment("Jonna 7.0", "Jonna Vell", 68, 7.0, 0.75, 115)));
            files.Add((Path.Combine(dir, "equipment", "bram-84.toml"), Equipment("Bram 8.4", "Bram Kestell", 86, 8.4, 0.6, 140)));
            files.Add((Path.Combine(dir, "scenario.toml"), Scenario()));
        }
        if (kind == "experiment") files.Add((Path.Combine(dir, "experiment.toml"), Experiment()));
        var existing = files.Where(f => File.Exists(f.Path)).Select(f => f.Path).ToList();
        // An experiment beside an existing scenario keeps that scenario (and its equipment).
        if (kind == "experiment" && File.Exists(Path.Combine(dir, "scenario.toml")))
            files.RemoveAll(f => f.Path != Path.Combine(dir, "experiment.toml"));
        else if (existing.Count > 0)
            throw new UsageException($"init: {string.Join(", ", existing)} already exist{(existing.Count == 1 ? "s" : "")}; nothing was written (choose another folder)");
        if (files.Any(f => File.Exists(f.Path))) throw new UsageException($"init: {Path.Combine(dir, "experiment.toml")} already exists; nothing was written");
        foreach (var (path, text) in files)
        {
            Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
            AtomicFile.WriteAllText(path, text);
            stdout.WriteLine($"wrote {path}");
        }
        string main = files[^1].Path;
        stdout.WriteLine(kind switch
        {
            "equipment" => $"Next: coursesim polar {main}",
            "scenario" => $"Next: coursesim race {main}   (and coursesim keys scenario for every key)",
            _ => $"Next: coursesim batch {main}   (and coursesim keys experiment for every key)",
        });
        return ExitCodes.Ok;
    }

    /// <summary>A TOML file of the given keys and values, each under a comment from its schema entry, grouped in tables.</summary>
    static string Write(SettingsSchema schema, string header, IEnumerable<(string Key, string Value)> keys)
    {
        var sb = new StringBuilder(header).Append('\n');
        string table = "";
        foreach (var (key, value) in keys)
        {
            int dot = key.LastIndexOf('.');
            string t = dot < 0 ? "" : key[..dot], leaf = key[(dot + 1)..];
            if (t != table)
            {
                sb.Append('\n').Append('[').Append(t).Append("]\n");
                table = t;
            }
            if (!schema.TryFind(key, out var spec)) throw new InvalidOperationException($"template key {key} is not in the {schema.Kind} schema");
            string def = spec.Kind switch
            {
                KeyKind.Text => spec.TextDefault is { Length: > 0 } d ? $"default \"{d}\"" : "no default",
                KeyKind.Boolean => spec.Default != 0 ? "default true" : "default false",
                _ => double.IsNaN(spec.Default) ? "default derived" : "default " + spec.Default.ToString("G", CultureInfo.InvariantCulture),
            };
            sb.Append($"# {spec.Help} ({(spec.Kind == KeyKind.Text && spec.Choices is null ? "text" : spec.RangeText)}; {def})\n");
            sb.Append(leaf).Append(" = ").Append(value).Append('\n');
        }
        return sb.ToString();
    }

    static string Q(string s) => "\"" + s + "\"";
    static string N(double d) => d.ToString("0.###", CultureInfo.InvariantCulture);

    static string Equipment(string name, string rider, double massKg, double sailM2, double skill, double volumeL) =>
        Write(CourseSim.Equilibrium.EquipmentFile.Schema,
            "# An equipment set-up (docs/equipment.md): rider, sail, fin and board. The people and gear here are invented.\n" +
            "# Every key is optional; 'coursesim keys equipment' lists them all with units and ranges.\n",
        [
            ("name", Q(name)),
            ("rider.name", Q(rider)), ("rider.mass_kg", N(massKg)), ("rider.skill", N(skill)), ("rider.critical_power_w", "200"),
            ("sail.area_m2", N(sailM2)), ("sail.outhaul", "0.5"),
            ("fin.area_cm2", N(sailM2 * 60)), ("fin.depth_cm", N(Math.Round(30 + sailM2 * 1.5))),
            ("board.length_m", "2.4"), ("board.width_cm", "72"), ("board.volume_l", N(volumeL)), ("board.mass_kg", "7.5"),
            ("conditions.water_temp_c", "16"),
        ]);

    static string Scenario() => Write(CourseSim.Simulation.ScenarioFile.Schema,
        "# A race (docs/scenario.md) at Ostrin Sound, a fictional venue: two invented riders of the Ostrin Sound Board Club\n" +
        "# on two laps of a windward-leeward in a 13 kn breeze that swings 6 degrees either way. Add boards with more\n" +
        "# [boards.NAME] tables; 'coursesim keys scenario' lists every key, 'coursesim tactics' every tactic.\n",
    [
        ("name", Q("Ostrin Sound evening race")), ("description", Q("Two boards, two laps, an oscillating breeze")),
        ("venue.name", Q("Ostrin Sound")), ("venue.lat_deg", "46.8"), ("venue.lon_deg", "-4.9"),
        ("wind.speed_kn", "13"), ("wind.direction_deg", "250"), ("wind.shift_amplitude_deg", "6"), ("wind.shift_period_s", "420"),
        ("wind.gust_intensity", "0.1"), ("wind.shadows", "true"),
        ("race.countdown_s", "60"), ("race.time_limit_s", "1800"), ("race.start_time_utc", Q("2026-08-20T17:30:00Z")), ("race.seed", "1"),
        ("course.kind", Q("windward-leeward")), ("course.laps", "2"), ("course.beat_m", "600"), ("course.start_line_m", "150"),
        ("boards.jonna.equipment", Q("equipment/jonna-70.toml")), ("boards.jonna.name", Q("Jonna Vell")), ("boards.jonna.tactic", Q("vmg-layline")),
        ("boards.bram.equipment", Q("equipment/bram-84.toml")), ("boards.bram.name", Q("Bram Kestell")), ("boards.bram.tactic", Q("header-tack")),
        ("boards.bram.params.header_deg", "6"),
    ]);

    static string Experiment() => Write(CourseSim.Experiments.ExperimentFile.Schema,
        "# An experiment (docs/experiments.md): the scenario raced many times per variant, each race in the same wind for\n" +
        "# every variant (paired), and the variants compared. Here: does Jonna gain by tacking on 6-degree headers or by\n" +
        "# sailing to the laylines? 'coursesim keys experiment' lists every key.\n",
    [
        ("name", Q("Jonna: headers or laylines")), ("description", Q("A coach's question on the Ostrin Sound evening race")),
        ("scenario", Q("scenario.toml")), ("races", "20"), ("seed", "11"), ("focus", Q("jonna")),
        ("variants.laylines.description", Q("sail to the laylines (as in the scenario)")), ("variants.laylines.set", Q("")),
        ("variants.headers.description", Q("tack on 6-degree headers")),
        ("variants.headers.set", Q("boards.jonna.tactic=header-tack; boards.jonna.params.header_deg=6")),
    ]);
}
