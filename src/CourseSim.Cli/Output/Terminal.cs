using Spectre.Console;

namespace CourseSim.Cli.Output;

/// <summary>Spectre consoles on a given writer; when output is redirected the width is widened so tables do not wrap.</summary>
public static class Terminal
{
    public static IAnsiConsole For(TextWriter writer, int minWidth = 120)
    {
        bool redirected = writer != Console.Out || Console.IsOutputRedirected;
        var console = AnsiConsole.Create(new AnsiConsoleSettings
        {
            Out = new AnsiConsoleOutput(writer),
            Ansi = redirected ? AnsiSupport.No : AnsiSupport.Detect,
            ColorSystem = redirected ? ColorSystemSupport.NoColors : ColorSystemSupport.Detect,
        });
        if (redirected || console.Profile.Width < minWidth) console.Profile.Width = Math.Max(minWidth, redirected ? FitWidth(writer) : console.Profile.Width);
        return console;
    }

    /// <summary>
    /// The width a fitted table may take: the terminal's when there is one, else $COLUMNS, else 160 (a file or a pipe).
    /// </summary>
    public static int FitWidth(TextWriter writer)
    {
        bool redirected = writer != Console.Out || Console.IsOutputRedirected;
        if (!redirected)
        {
            try { if (Console.WindowWidth > 0) return Console.WindowWidth; } catch (IOException) { }
        }
        return int.TryParse(System.Environment.GetEnvironmentVariable("COLUMNS"), out int c) && c is >= 40 and <= 1000 ? c : 160;
    }
}
