using System.CommandLine;
using System.Globalization;
using CourseSim.Cli.Output;
using CourseSim.Settings;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim keys [equipment|scenario|experiment|wind] [KEY]</c>: every key a file accepts, with unit, range,
/// default and help, read from the same schemas that validate the files (so the list cannot drift from the checks).
/// </summary>
public static class KeysCommand
{
    public static IReadOnlyDictionary<string, SettingsSchema> Schemas { get; } = new Dictionary<string, SettingsSchema>(StringComparer.Ordinal)
    {
        ["equipment"] = CourseSim.Equilibrium.EquipmentFile.Schema,
        ["scenario"] = CourseSim.Simulation.ScenarioFile.Schema,
        ["experiment"] = CourseSim.Experiments.ExperimentFile.Schema,
        ["wind"] = new SettingsSchema("wind", CourseSim.Wind.WindFile.Keys),
    };

    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var kind = new Argument<string?>("kind") { Description = "equipment, scenario, experiment or wind (the [wind] table of a scenario); default: list the kinds", Arity = ArgumentArity.ZeroOrOne };
        kind.CompletionSources.Add(Schemas.Keys.ToArray());
        var key = new Argument<string?>("key") { Description = "one key (such as sail.area_m2 or boards.maren.tactic) for its full entry", Arity = ArgumentArity.ZeroOrOne };
        var cmd = new Command("keys", "List the keys a file accepts, with unit, range, default and help (the same lists that check the files).") { kind, key };
        cmd.SetAction(pr => Run(pr.GetValue(kind), pr.GetValue(key), stdout));
        return cmd;
    }

    static int Run(string? kind, string? key, TextWriter stdout)
    {
        if (kind is null)
        {
            stdout.WriteLine("Kinds of file: " + string.Join(", ", Schemas.Keys) + ". Run 'coursesim keys KIND' for the keys of one, 'coursesim keys KIND KEY' for one key.");
            foreach (var (k, s) in Schemas) stdout.WriteLine($"  {k,-11} {s.Keys.Count} keys");
            return ExitCodes.Ok;
        }
        if (!Schemas.TryGetValue(kind, out var schema))
            throw new UsageException($"no kind of file '{kind}'; kinds: {string.Join(", ", Schemas.Keys)}");
        if (key is not null)
        {
            if (!schema.TryFind(key, out var spec) && !schema.Keys.TryGetValue(key, out spec!))
                throw new UsageException($"no key '{key}' in {kind} files; keys near it: {string.Join(", ", schema.KnownKeysNear(key).Take(12))}");
            stdout.WriteLine(spec.Key);
            stdout.WriteLine($"  {spec.Help}");
            stdout.WriteLine($"  kind:    {KindText(spec)}");
            stdout.WriteLine($"  unit:    {Unit(spec.Key)}");
            stdout.WriteLine($"  range:   {spec.RangeText}");
            stdout.WriteLine($"  default: {DefaultText(spec)}");
            if (spec.Key.Contains('*')) stdout.WriteLine("  '*' stands for a name you choose (such as a board's name); write the name in its place.");
            return ExitCodes.Ok;
        }
        var rows = schema.Keys.Values.OrderBy(k => k.Key, StringComparer.Ordinal)
            .Select(k => new[] { k.Key, Unit(k.Key), k.Kind == KeyKind.Text && k.Choices is null ? "text" : k.RangeText, DefaultText(k), k.Help }).ToList();
        var console = Terminal.For(stdout);
        console.Write(TableFit.Build($"[bold]{Markup.Escape(kind)}[/] keys ({rows.Count}; '*' stands for a name you choose)",
            [new("key", false, 0), new("unit", false, 3), new("accepted", false, 2), new("default", false, 1), new("help", false, 4, Wraps: true)], rows, console.Profile.Width));
        return ExitCodes.Ok;
    }

    static string KindText(KeySpec k) => k.Kind switch
    {
        KeyKind.Number => "number", KeyKind.NumberList => "list of numbers", KeyKind.Boolean => "true or false", _ => "text",
    };

    static string DefaultText(KeySpec k) => k.Kind switch
    {
        KeyKind.Text => k.TextDefault is { Length: > 0 } t ? t : "(none)",
        KeyKind.Boolean => k.Default != 0 ? "true" : "false",
        _ => double.IsNaN(k.Default) ? "(derived)" : k.Default.ToString("G", CultureInfo.InvariantCulture),
    };

    /// <summary>The unit a key carries in its name (docs/DEVELOPERS.md: keys carry their unit).</summary>
    public static string Unit(string key)
    {
        string last = key[(key.LastIndexOf('.') + 1)..];
        foreach (var (suffix, unit) in Units) if (last.EndsWith(suffix, StringComparison.Ordinal)) return unit;
        return "-";
    }

    static readonly (string, string)[] Units =
    [
        ("_temp_c", "C"), ("_g_per_kg", "g/kg"), ("_kn_per_hour", "kn/h"), ("_kn_per_km", "kn/km"), ("_deg_per_min", "deg/min"), ("_kn", "kn"), ("_deg", "deg"), ("_m2", "m2"), ("_cm2", "cm2"),
        ("_cm", "cm"), ("_mm", "mm"), ("_kg", "kg"), ("_kj", "kJ"), ("_w", "W"), ("_hz", "Hz"), ("_ms", "m/s"), ("_s", "s"), ("_l", "l"), ("_m", "m"),
    ];
}
