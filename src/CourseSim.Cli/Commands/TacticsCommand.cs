using System.CommandLine;
using System.Globalization;
using CourseSim.Agents;
using CourseSim.Cli.Output;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim tactics [NAME]</c>: the tactics a board can sail (<c>boards.NAME.tactic</c>), what each does, and its
/// parameters (<c>boards.NAME.params.P</c>) with range, default and help: the same specs the scenario is checked against.
/// </summary>
public static class TacticsCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var name = new Argument<string?>("name") { Description = "one tactic, for its parameters in full", Arity = ArgumentArity.ZeroOrOne };
        name.CompletionSources.Add(BuiltInTactics.All.Select(t => t.Name).ToArray());
        var cmd = new Command("tactics", "List the tactics a board can sail, with their parameters and ranges.") { name };
        cmd.SetAction(pr => Run(pr.GetValue(name), stdout));
        return cmd;
    }

    static string N(double v) => v.ToString("G", CultureInfo.InvariantCulture);

    static int Run(string? name, TextWriter stdout)
    {
        var all = BuiltInTactics.All;
        if (name is not null)
        {
            var t = all.FirstOrDefault(x => x.Name == name)
                ?? throw new UsageException($"no built-in tactic '{name}'; tactics: {string.Join(", ", all.Select(x => x.Name))}");
            stdout.WriteLine($"{t.Name}: {t.Summary}");
            if (t.NeedsRival) stdout.WriteLine("  needs a rival: boards.NAME.rival = \"ID\" naming another board");
            if (t.Params.Count == 0) stdout.WriteLine("  no parameters");
            foreach (var p in t.Params)
                stdout.WriteLine($"  params.{p.Name} = {N(p.Default)}   ({N(p.Min)} to {N(p.Max)}) {p.Help}");
            stdout.WriteLine($"In a scenario: [boards.NAME] tactic = \"{t.Name}\"" + (t.Params.Count > 0 ? $", params.{t.Params[0].Name} = {N(t.Params[0].Default)}" : ""));
            return ExitCodes.Ok;
        }
        var rows = new List<string[]>();
        foreach (var t in all)
        {
            rows.Add([t.Name, t.Summary + (t.NeedsRival ? " (needs a rival)" : ""), "", "", ""]);
            foreach (var p in t.Params) rows.Add(["", "  " + p.Help, "params." + p.Name, $"{N(p.Min)} to {N(p.Max)}", N(p.Default)]);
        }
        var console = Terminal.For(stdout);
        console.Write(TableFit.Build("[bold]Tactics[/] (boards.NAME.tactic; parameters boards.NAME.params.P)",
            [new("tactic", false, 0), new("what it does", false, 0, Wraps: true), new("parameter", false, 0), new("range", false, 1), new("default", false, 2)],
            rows, Terminal.FitWidth(stdout)));
        console.WriteLine($"Default: {all[0].Name}. Tactics of your own: a C# class library named in the scenario's [tactics] assemblies (docs/tactics.md).");
        return ExitCodes.Ok;
    }
}
