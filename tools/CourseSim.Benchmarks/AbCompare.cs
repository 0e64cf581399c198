using System.Diagnostics;
using System.Globalization;
using System.Text.RegularExpressions;
using CourseSim.Experiments;

namespace CourseSim.Benchmarks;

/// <summary>
/// `ab OTHER/CourseSim.Benchmarks.dll [--rounds N] [--races M] [--this PATH]`: this build (or the one at PATH) against
/// another (a copy of the benchmark's build folder from another commit), on this shared machine whose speed swings by more than the changes measured. Each
/// round runs `race-loop M` in a child process of each build, one after the other, alternating which goes first; a
/// round's figure is the median CPU of the last half of its M races (the first races after the warm-up still run code
/// the JIT has not finished tiering up: 1.5, 0.8, 0.8, 0.7 s before settling near 0.5 s here). The ratio this build / other is given per round and as the
/// geometric mean over rounds with a 95 % t interval on the log ratios (paired by round, so a slow spell of the machine
/// that spans a round cancels). The two builds must race alike (the same end time): a model change makes the ratio
/// compare different races, and the tool says so.
/// </summary>
public static partial class AbCompare
{
    [GeneratedRegex(@"race \d+: ([0-9.]+) s CPU, ends at ([0-9.]+) s")]
    private static partial Regex RaceLine();

    public static int Run(string[] args)
    {
        int rounds = 6, races = 8;
        string? other = args.Length >= 2 ? args[1] : null;
        string self = typeof(AbCompare).Assembly.Location;
        for (int i = 2; i < args.Length; i++)
        {
            if (args[i] == "--this" && i + 1 < args.Length && File.Exists(args[i + 1])) { self = args[++i]; continue; }
            int v = 0;
            bool ok = i + 1 < args.Length && int.TryParse(args[i + 1], NumberStyles.None, CultureInfo.InvariantCulture, out v)
                      && v >= (args[i] == "--races" ? 4 : 2) && v <= 100; // at least two races after the first half
            if (args[i] == "--rounds" && ok) rounds = int.Parse(args[++i], CultureInfo.InvariantCulture);
            else if (args[i] == "--races" && ok) races = int.Parse(args[++i], CultureInfo.InvariantCulture);
            else { other = null; break; }
        }
        if (other is null || !File.Exists(other))
        {
            Console.Error.WriteLine($"error: ab: expected the path of another build's CourseSim.Benchmarks.dll (an existing file), then optionally " +
                                    $"--rounds N (2 to 100), --races M (4 to 100) and --this PATH (another build in place of this one), got '{string.Join(' ', args.Skip(1))}'");
            return 2;
        }
        Console.WriteLine($"ab: this build ({self}) against {other}: {rounds} rounds of race-loop {races} each, alternating which runs first");
        var logRatios = new List<double>();
        string? endSelf = null, endOther = null;
        for (int r = 0; r < rounds; r++)
        {
            (double Cpu, string End) mine, theirs;
            if (r % 2 == 0) { mine = Loop(self, races); theirs = Loop(other, races); }
            else { theirs = Loop(other, races); mine = Loop(self, races); }
            endSelf ??= mine.End; endOther ??= theirs.End;
            logRatios.Add(Math.Log(mine.Cpu / theirs.Cpu));
            Console.WriteLine($"  round {r + 1}: this {mine.Cpu:F3} s, other {theirs.Cpu:F3} s CPU a race (median of the last {races - races / 2} of {races}): ratio {mine.Cpu / theirs.Cpu:F3}");
        }
        var iv = Statistics.PairedT(logRatios.ToArray());
        Console.WriteLine($"this build / other: {Math.Exp(iv.Estimate):F3} x CPU a race (95 % t over {rounds} rounds: {Math.Exp(iv.Low):F3} to {Math.Exp(iv.High):F3}); " +
                          (iv.High < 0 ? "this build is faster" : iv.Low > 0 ? "this build is slower" : "no difference resolved"));
        if (endSelf != endOther)
            Console.WriteLine($"warning: the two builds race differently (the race ends at {endSelf} s against {endOther} s): the ratio compares different races");
        return 0;
    }

    /// <summary>The median CPU of a child process's races (race-loop), and the race's end time as printed.</summary>
    static (double Cpu, string End) Loop(string dll, int races)
    {
        var psi = new ProcessStartInfo("dotnet", $"\"{dll}\" race-loop {races}") { RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi) ?? throw new InvalidOperationException($"cannot start dotnet {dll}");
        string output = p.StandardOutput.ReadToEnd();
        string error = p.StandardError.ReadToEnd();
        p.WaitForExit();
        var found = RaceLine().Matches(output).Select(m => (Cpu: double.Parse(m.Groups[1].Value, CultureInfo.InvariantCulture), End: m.Groups[2].Value)).ToList();
        if (p.ExitCode != 0 || found.Count != races)
            throw new InvalidOperationException($"{dll} race-loop {races} exited with {p.ExitCode} and printed {found.Count} race lines: {error.Trim()}");
        return (Stats.Median(found.Skip(races / 2).Select(f => f.Cpu).ToList()), found[0].End);
    }
}
