using System.CommandLine;
using System.Globalization;
using System.Text;
using CourseSim.Cli.Output;
using CourseSim.Equilibrium;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary><c>coursesim polar EQUIPMENT [B]</c>: steady-state polars of one set-up, or two side by side.</summary>
public static class PolarCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var files = new Argument<string[]>("equipment") { Arity = new ArgumentArity(1, 2), Description = "one equipment file (TOML), or two to compare" };
        var wind = new Option<string>("--wind") { Description = "true wind speeds at 10 m, kn: a list (6,8,10) or a range (6:30:2)", DefaultValueFactory = _ => "6,8,10,12,14,16,18,20,22,25" };
        var angles = new Option<string>("--angles") { Description = "true wind angles, deg: start:stop:step or a list", DefaultValueFactory = _ => "30:180:5" };
        var set = new Option<string[]>("--set") { Description = "override a key, table.key=value (repeatable)", AllowMultipleArgumentsPerToken = false };
        var outDir = new Option<string?>("--out") { Description = "folder for polar.csv and the PNG chart (default out/polar-NAME)" };
        var format = new Option<string>("--format") { Description = "what to print: table, csv or json", DefaultValueFactory = _ => "table" };
        format.AcceptOnlyFromAmong("table", "csv", "json");
        var cmd = new Command("polar", "Steady-state speed, VMG and planing threshold of a set-up (or two compared).")
        {
            files, wind, angles, set, outDir, format,
        };
        cmd.SetAction(pr => Run(pr.GetValue(files)!, pr.GetValue(wind)!, pr.GetValue(angles)!, pr.GetValue(set) ?? [],
            pr.GetValue(outDir), pr.GetValue(format)!, stdout, stderr));
        return cmd;
    }

    static int Run(string[] files, string windText, string angleText, string[] sets, string? outDir, string format, TextWriter stdout, TextWriter stderr)
    {
        var winds = Lists.Parse(windText, "--wind", 1, 60);
        var angles = Lists.Parse(angleText, "--angles", 20, 180);
        var equipment = files.Select(f => EquipmentFile.Load(f, sets)).ToList();
        var polars = equipment.Select(e => Polar.Compute(e, winds, angles)).ToList();
        string dir = outDir ?? Path.Combine("out", polars.Count == 1 ? $"polar-{Slug(polars[0].Name)}" : $"compare-{Slug(polars[0].Name)}-{Slug(polars[1].Name)}");
        Directory.CreateDirectory(dir);
        var written = new List<string>();
        for (int k = 0; k < polars.Count; k++)
        {
            var p = polars[k];
            string stem = polars.Count == 1 ? "polar" : $"polar-{Slug(p.Name)}";
            File.WriteAllText(Path.Combine(dir, stem + ".csv"), Csv(p));
            PolarCharts.Polar(p, Path.Combine(dir, stem + ".png"), PolarCharts.Describe(equipment[k]));
            written.Add(Path.Combine(dir, stem + ".csv")); written.Add(Path.Combine(dir, stem + ".png"));
        }
        PolarComparison? cmp = null;
        if (polars.Count == 2)
        {
            cmp = PolarComparison.Of(polars[0], polars[1]);
            PolarCharts.Comparison(cmp, Path.Combine(dir, "comparison.png"));
            written.Add(Path.Combine(dir, "comparison.png"));
        }
        switch (format)
        {
            case "json":
                stdout.WriteLine(cmp is null ? Json.Serialize(JsonPolar(polars[0])) : Json.Serialize(new
                {
                    caution = Caution.Text, a = JsonPolar(cmp.A), b = JsonPolar(cmp.B),
                    comparison = cmp.Rows, crossovers = cmp.Crossovers,
                }));
                break;
            case "csv":
                stdout.Write(Csv(polars[0]));
                stderr.WriteLine(Caution.Text);
                break;
            default:
                var console = Terminal.For(stdout, 40 + 9 * winds.Count);
                foreach (var p in polars) PrintPolar(console, p);
                if (cmp is not null) PrintComparison(console, cmp);
                console.WriteLine();
                console.MarkupLine("[grey]" + Markup.Escape("Wrote " + string.Join(", ", written)) + "[/]");
                console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
                break;
        }
        return ExitCodes.Ok;
    }

    static object JsonPolar(Polar p) => new
    {
        name = p.Name,
        caution = Caution.Text,
        points = p.Points,
        upwind = p.Upwind,
        downwind = p.Downwind,
        planing_threshold_kn = p.Threshold,
    };

    internal static string Slug(string name)
    {
        var sb = new StringBuilder();
        foreach (char c in name.ToLowerInvariant())
        {
            char o = char.IsLetterOrDigit(c) ? c : '-';
            if (o == '-' && sb.Length > 0 && sb[^1] == '-') continue; // one dash for any run of other characters
            sb.Append(o);
        }
        return sb.ToString().Trim('-') is { Length: > 0 } s ? s : "setup";
    }

    static string F(double v, string fmt = "0.00") => v.ToString(fmt, CultureInfo.InvariantCulture);
    static string F(double? v, string fmt = "0.00") => v is double d ? F(d, fmt) : "";

    public static string Csv(Polar p)
    {
        var sb = new StringBuilder("tws_kn,twa_deg,speed_kn,vmg_kn,leeway_deg,aoa_deg,heel_use,planing,displacement_speed_kn,planing_speed_kn,awa_deg,aws_kn,get_planing_speed_kn,planing_share,harness_n\n");
        foreach (var x in p.Points)
            sb.Append(string.Join(',', F(x.TwsKn, "0.##"), F(x.TwaDeg, "0.##"), F(x.SpeedKn), F(x.VmgKn), F(x.LeewayDeg), F(x.AoaDeg), F(x.HeelUse, "0.000"),
                x.Planing ? "true" : "false", F(x.DisplacementSpeedKn), F(x.PlaningSpeedKn), F(x.AwaDeg, "0.0"), F(x.AwsKn),
                F(x.GetPlaningSpeedKn), F(x.PlaningShare, "0.000"), F(x.HarnessN, "0"))).Append('\n');
        return sb.ToString();
    }

    static void PrintPolar(IAnsiConsole console, Polar p)
    {
        var winds = p.Points.Select(x => x.TwsKn).Distinct().Order().ToList();
        var table = new Table().Border(TableBorder.Simple).Title($"[bold]{Markup.Escape(p.Name)}[/]: board speed, kn (plain = planing, (x) = not planing)");
        table.AddColumn(new TableColumn("TWA \\ TWS").RightAligned());
        foreach (var w in winds) table.AddColumn(new TableColumn($"{w:0.#} kn").RightAligned());
        foreach (var a in p.Points.Select(x => x.TwaDeg).Distinct().Order())
        {
            var cells = new List<string> { $"{a:0.#}°" };
            foreach (var w in winds)
            {
                var pt = p.Points.First(x => x.TwsKn == w && x.TwaDeg == a);
                cells.Add(pt.Planing ? F(pt.SpeedKn, "0.0") : $"[grey]({F(pt.SpeedKn, "0.0")})[/]");
            }
            table.AddRow(cells.ToArray());
        }
        table.AddEmptyRow();
        table.AddRow(Row("up VMG", winds, i => $"{F(p.Upwind[i].VmgKn, "0.0")} {p.Upwind[i].TwaDeg:0}°"));
        table.AddRow(Row("down VMG", winds, i => $"{F(p.Downwind[i].VmgKn, "0.0")} {p.Downwind[i].TwaDeg:0}°"));
        console.Write(table);
        console.MarkupLine($"Planing threshold (true wind at 10 m): [bold]{Thr(p.Threshold.WithoutPumping)}[/] without pumping, [bold]{Thr(p.Threshold.WithPumping)}[/] with pumping");
        console.WriteLine();
    }

    static string Thr(double? v) => v is double d ? $"{F(d, "0.0")} kn" : $"none below {Polar.ThresholdSearchMaxKn} kn";

    static string[] Row(string label, List<double> winds, Func<int, string> cell)
    {
        var cells = new List<string> { label };
        for (int i = 0; i < winds.Count; i++) cells.Add(cell(i));
        return cells.ToArray();
    }

    static void PrintComparison(IAnsiConsole console, PolarComparison c)
    {
        var t = new Table().Border(TableBorder.Simple).Title($"[bold]{Markup.Escape(c.A.Name)}[/] (A) against [bold]{Markup.Escape(c.B.Name)}[/] (B), kn");
        foreach (var h in new[] { "TWS", "top A", "top B", "up VMG A", "up VMG B", "down VMG A", "down VMG B" }) t.AddColumn(new TableColumn(h).RightAligned());
        foreach (var r in c.Rows)
            t.AddRow(F(r.TwsKn, "0.#"), Best(r.TopSpeedA, r.TopSpeedB), Best(r.TopSpeedB, r.TopSpeedA), Best(r.UpVmgA, r.UpVmgB), Best(r.UpVmgB, r.UpVmgA),
                Best(r.DownVmgA, r.DownVmgB), Best(r.DownVmgB, r.DownVmgA));
        console.Write(t);
        console.MarkupLine($"Planing threshold A: {Thr(c.A.Threshold.WithoutPumping)} ({Thr(c.A.Threshold.WithPumping)} pumping); B: {Thr(c.B.Threshold.WithoutPumping)} ({Thr(c.B.Threshold.WithPumping)} pumping)");
        if (c.Crossovers.Count == 0) console.MarkupLine("No crossover in the wind range asked: one set-up leads on each measure throughout.");
        foreach (var x in c.Crossovers)
            console.MarkupLine($"Crossover: {x.Measure} at {F(x.TwsKn, "0.0")} kn; above it [bold]{Markup.Escape(x.FasterAbove)}[/] is faster");
    }

    static string Best(double mine, double other) => mine > other + 0.05 ? $"[bold]{F(mine, "0.0")}[/]" : F(mine, "0.0");
}
