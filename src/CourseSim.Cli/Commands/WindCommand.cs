using System.CommandLine;
using System.Globalization;
using CourseSim.Cli.Output;
using CourseSim.Wind;
using CourseSim.Engine;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary><c>coursesim wind SCENARIO</c>: statistics, a time series and a map of a scenario's wind field.</summary>
public static class WindCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("scenario") { Description = "scenario file (TOML) with a [wind] table" };
        var seed = new Option<ulong?>("--seed") { Description = "random seed of the wind field (default: race.seed in the scenario, the wind its races sail)" };
        var at = new Option<string>("--at") { Description = "point for statistics and the time series, x,y metres east,north of the origin", DefaultValueFactory = _ => "0,0" };
        var duration = new Option<double>("--duration") { Description = "length of the time series, s", DefaultValueFactory = _ => 3600 };
        var set = new Option<string[]>("--set") { Description = "override a key, table.key=value (repeatable)" };
        var outDir = new Option<string?>("--out") { Description = "folder for the PNG charts (default out/wind-NAME)" };
        var format = new Option<string>("--format") { Description = "table or json", DefaultValueFactory = _ => "table" };
        format.AcceptOnlyFromAmong("table", "json");
        var cmd = new Command("wind", "Summary statistics, time series and map of a scenario's wind field.") { file, seed, at, duration, set, outDir, format };
        cmd.SetAction(pr => Run(pr.GetValue(file)!, pr.GetValue(seed), pr.GetValue(at)!, pr.GetValue(duration), pr.GetValue(set) ?? [],
            pr.GetValue(outDir), pr.GetValue(format)!, stdout));
        return cmd;
    }

    static int Run(string path, ulong? seedOption, string atText, double duration, string[] sets, string? outDir, string format, TextWriter stdout)
    {
        var parts = atText.Split(',');
        if (parts.Length != 2 || !double.TryParse(parts[0], NumberStyles.Float, CultureInfo.InvariantCulture, out double x)
            || !double.TryParse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture, out double y) || !double.IsFinite(x) || !double.IsFinite(y))
            throw new UsageException($"--at: '{atText}' is not x,y in metres (for example 250,-400)");
        if (!(duration >= 60 && duration <= 86400)) throw new UsageException($"--duration: {duration} is out of range (accepted 60 to 86400 s)");
        var f = ScenarioFile.Load(path, sets);
        var settings0 = WindFile.From(f);
        // The race's wind field is WindField(settings, race seed) (RaceContext), so without --seed this is the wind the
        // scenario's races sail.
        ulong seed = ScenarioFile.SeedOf(f, seedOption);
        var settings = WindLogDrive.ForSeed(settings0, seed);
        string name = f.Text("name") is { Length: > 0 } n ? n : Path.GetFileNameWithoutExtension(path);
        var field = new WindField(settings, seed);
        var (t, sp, dir) = WindStatistics.Series(field, x, y, duration);
        var summary = WindStatistics.Summarise(sp, dir, 1.0);
        string dir0 = outDir ?? Path.Combine("out", $"wind-{PolarCommand.Slug(name)}");
        Directory.CreateDirectory(dir0);
        string series = Path.Combine(dir0, "wind-series.png"), map = Path.Combine(dir0, "wind-map.png");
        WindCharts.Series(t, sp, dir, $"{name}: wind at ({x:0}, {y:0}) m, seed {seed}", series);
        WindCharts.Map(field, f.Number("wind.area_m"), 0, $"{name}: wind at the start, seed {seed}", map);
        if (format == "json")
        {
            stdout.WriteLine(Json.Serialize(new
            {
                scenario = name, seed, at_m = new[] { x, y }, duration_s = duration,
                speed_mean_kn = summary.SpeedMeanKn, speed_sigma_kn = summary.SpeedSigmaKn, speed_min_kn = summary.SpeedMinKn, speed_max_kn = summary.SpeedMaxKn,
                direction_mean_deg = summary.DirectionMeanDeg, direction_sigma_deg = summary.DirectionSigmaDeg,
                direction_min_deg = summary.DirectionMinDeg, direction_max_deg = summary.DirectionMaxDeg,
                gust_factor = summary.GustFactor, shift_period_s = summary.ShiftPeriodS, samples = summary.Samples,
                charts = new[] { series, map }, caution = Caution.Text,
            }));
            return ExitCodes.Ok;
        }
        var console = Terminal.For(stdout);
        var table = new Table().Border(TableBorder.Simple).Title($"[bold]{Markup.Escape(name)}[/]: wind at ({x:0}, {y:0}) m over {duration:0} s, seed {seed}");
        table.AddColumn("quantity"); table.AddColumn(new TableColumn("mean").RightAligned()); table.AddColumn(new TableColumn("sigma").RightAligned());
        table.AddColumn(new TableColumn("min").RightAligned()); table.AddColumn(new TableColumn("max").RightAligned());
        table.AddRow("speed (kn, 10 m)", F(summary.SpeedMeanKn), F(summary.SpeedSigmaKn), F(summary.SpeedMinKn), F(summary.SpeedMaxKn));
        table.AddRow("direction (deg from)", F(summary.DirectionMeanDeg, "0"), F(summary.DirectionSigmaDeg), F(summary.DirectionMinDeg, "0"), F(summary.DirectionMaxDeg, "0"));
        console.Write(table);
        console.MarkupLine($"Gust factor (peak 3-s over 10-min mean): [bold]{F(summary.GustFactor, "0.00")}[/]; observed shift period: [bold]{(summary.ShiftPeriodS is double p ? F(p, "0") + " s" : "none seen")}[/]; {summary.Samples} samples at 1 Hz");
        console.MarkupLine("[grey]" + Markup.Escape($"Wrote {series}, {map}") + "[/]");
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return ExitCodes.Ok;
    }

    static string F(double v, string fmt = "0.0") => v.ToString(fmt, CultureInfo.InvariantCulture);
}
