using System.CommandLine;
using CourseSim.Cli.Commands;

namespace CourseSim.Cli;

/// <summary>Entry point. Exit codes: 0 ok, 1 the run failed, 2 bad input (file, line, key and what was expected).</summary>
public static class Program
{
    public static int Main(string[] args) => Run(args, Console.Out, Console.Error);

    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        var root = new RootCommand("CourseSim: windsurf race-course simulation. Polars, wind fields and races from board physics.");
        root.Subcommands.Add(PolarCommand.Build(stdout, stderr));
        root.Subcommands.Add(WindCommand.Build(stdout, stderr));
        root.Subcommands.Add(WindFitCommand.Build(stdout, stderr));
        root.Subcommands.Add(RigFitCommand.Build(stdout, stderr));
        root.Subcommands.Add(RaceCommand.Build(stdout, stderr));
        root.Subcommands.Add(BatchCommand.Build(stdout, stderr));
        root.Subcommands.Add(ViewCommand.Build(stdout, stderr));
        root.Subcommands.Add(TacticsCommand.Build(stdout, stderr));
        root.Subcommands.Add(KeysCommand.Build(stdout, stderr));
        root.Subcommands.Add(InitCommand.Build(stdout, stderr));
        // Alone, the command prints its help (and exits 0) rather than an error.
        if (args.Length == 0) args = ["--help"];
        var parse = root.Parse(args);
        if (parse.Errors.Count > 0)
        {
            foreach (var e in parse.Errors) stderr.WriteLine($"error: {e.Message}");
            stderr.WriteLine("Run 'coursesim --help' for usage.");
            return ExitCodes.BadInput;
        }
        try
        {
            return parse.Invoke(new InvocationConfiguration { Output = stdout, Error = stderr, EnableDefaultExceptionHandler = false });
        }
        catch (CourseSim.Settings.SettingsException e)
        {
            stderr.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (UsageException e)
        {
            stderr.WriteLine($"error: {e.Message}");
            return ExitCodes.BadInput;
        }
        catch (IOException e)
        {
            stderr.WriteLine($"error: {e.Message}");
            return ExitCodes.Failure;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            stderr.WriteLine($"error: the run failed: {e.GetType().Name}: {e.Message}");
            stderr.WriteLine("This is a bug in CourseSim; please report it with the command line and input files.");
            return ExitCodes.Failure;
        }
    }
}

public static class ExitCodes
{
    public const int Ok = 0, Failure = 1, BadInput = 2;
}

/// <summary>A bad command-line value (exit code 2).</summary>
public sealed class UsageException(string message) : Exception(message);

/// <summary>The caution printed wherever output might be read as advice about going on the water.</summary>
public static class Caution
{
    public const string Text = "Caution: these figures come from a physics model. They are not a judgement of safe conditions; " +
        "defer to the race officer, local rules and qualified instruction before going on the water.";
}
