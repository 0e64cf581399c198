using System.Globalization;
using System.Net;
using System.Text;
using CourseSim.Experiments;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>
/// The experiment report: Markdown and one self-contained HTML page (charts embedded as PNG) with the
/// variants, the paired differences and the distribution of race durations.
/// </summary>
public static class ExperimentReport
{
    static string F(double v, string fmt = "0.0") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";

    /// <summary>Race durations (first finisher) by variant.</summary>
    static Dictionary<string, double[]> Durations(ExperimentSpec spec, IReadOnlyList<RaceRow> rows) =>
        spec.Variants.ToDictionary(v => v.Name, v => rows.Where(r => r.Variant == v.Name && r.Place == 1).Select(r => r.ElapsedS ?? r.DurationS).Order().ToArray());

    public static byte[] DurationChart(ExperimentSpec spec, IReadOnlyList<RaceRow> rows)
    {
        var plt = new Plot();
        var d = Durations(spec, rows);
        var all = d.Values.SelectMany(x => x).ToArray();
        if (all.Length > 0)
        {
            double lo = Math.Floor(all.Min() / 30) * 30, hi = Math.Ceiling(all.Max() / 30) * 30 + 30;
            int bins = Math.Max(1, (int)((hi - lo) / 30));
            int k = 0;
            foreach (var (name, values) in d)
            {
                var counts = new double[bins];
                foreach (var v in values) counts[Math.Clamp((int)((v - lo) / 30), 0, bins - 1)]++;
                var xs = Enumerable.Range(0, bins).Select(i => (lo + 30 * i + 15) / 60.0).ToArray();
                var line = plt.Add.ScatterLine(xs, counts);
                line.Color = PolarCharts.Palette[k % PolarCharts.Palette.Length]; line.LineWidth = 2; line.LegendText = name;
                line.MarkerSize = 6;
                k++;
            }
        }
        plt.Title("Race duration (winner's time): races per 30-second bin");
        plt.XLabel("minutes"); plt.YLabel("races");
        plt.ShowLegend(Alignment.UpperRight);
        return plt.GetImageBytes(900, 450, ImageFormat.Png);
    }

    /// <summary>Side fairness: mean place of the boards that went left and right on the first beat, per variant.</summary>
    public static byte[] SideChart(ExperimentSpec spec, IReadOnlyList<RaceRow> rows)
    {
        var plt = new Plot();
        var bars = new List<Bar>();
        for (int i = 0; i < spec.Variants.Count; i++)
        {
            var vr = rows.Where(r => r.Variant == spec.Variants[i].Name && r.Place is not null).ToList();
            foreach (var (side, k) in new[] { ("left", 0), ("right", 1) })
            {
                var places = vr.Where(r => r.FirstBeatSide == side).Select(r => (double)r.Place!.Value).ToList();
                if (places.Count == 0) continue;
                bars.Add(new Bar { Position = 3 * i + k, Value = places.Average(), FillColor = PolarCharts.Palette[k], Label = $"{side} {places.Average():0.0}" });
            }
        }
        var b = plt.Add.Bars(bars);
        b.ValueLabelStyle.FontSize = 12;
        plt.Axes.Bottom.SetTicks(Enumerable.Range(0, spec.Variants.Count).Select(i => 3.0 * i + 0.5).ToArray(), spec.Variants.Select(v => v.Name).ToArray());
        plt.Title("Side fairness: mean place of boards that went left and right on the first beat (lower is better)");
        plt.YLabel("mean place");
        plt.Axes.Margins(bottom: 0);
        return plt.GetImageBytes(900, 420, ImageFormat.Png);
    }

    /// <summary>Riders: the paired difference of the focus board's time by the race's mean wind, one line per pair.</summary>
    public static byte[]? CrossoverChart(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, IReadOnlyList<(string Variant, int Race, string Line)> metrics,
        IReadOnlyList<PairSummary> pairs)
    {
        if (double.IsNaN(spec.WindMinKn) || pairs.Count == 0) return null;
        var wind = WindByRace(metrics);
        var plt = new Plot();
        for (int i = 0; i < pairs.Count; i++)
        {
            var p = pairs[i];
            var a = rows.Where(r => r.Variant == p.A && r.BoardId == spec.Focus).ToDictionary(r => r.Race);
            var b = rows.Where(r => r.Variant == p.B && r.BoardId == spec.Focus).ToDictionary(r => r.Race);
            var bins = WindBins.Of(a.Keys.Intersect(b.Keys).Where(wind.ContainsKey).Select(k => (wind[k], a[k].TimeOrLimitS - b[k].TimeOrLimitS)), 2);
            if (bins.Count == 0) continue;
            var line = plt.Add.ScatterLine(bins.Select(x => 0.5 * (x.LowKn + x.HighKn)).ToArray(), bins.Select(x => x.MeanDiffS).ToArray());
            line.Color = PolarCharts.Palette[i % PolarCharts.Palette.Length]; line.LineWidth = 2; line.MarkerSize = 7; line.LegendText = $"{p.A} - {p.B}";
        }
        var zero = plt.Add.HorizontalLine(0); zero.Color = Colors.Gray; zero.LinePattern = LinePattern.Dashed;
        plt.Title("Paired difference of the focus board's time by the race's mean wind (2-kn bins)");
        plt.XLabel("mean wind, kn"); plt.YLabel("seconds (negative: the first variant faster)");
        plt.ShowLegend(Alignment.UpperRight);
        return plt.GetImageBytes(900, 450, ImageFormat.Png);
    }

    public static byte[] IntervalChart(IReadOnlyList<PairSummary> pairs)
    {
        var plt = new Plot();
        for (int i = 0; i < pairs.Count; i++)
        {
            var p = pairs[i];
            var c = PolarCharts.Palette[i % PolarCharts.Palette.Length];
            var bar = plt.Add.Line(p.MeanDiffT.Low, i, p.MeanDiffT.High, i); bar.Color = c; bar.LineWidth = 4;
            var m = plt.Add.Marker(p.MeanDiffT.Estimate, i); m.Color = c; m.Size = 10;
            var t = plt.Add.Text($"{p.A} - {p.B}", p.MeanDiffT.Low, i + 0.25); t.LabelFontSize = 12;
        }
        if (pairs.Count > 0)
        {
            double lo = Math.Min(0, pairs.Min(p => p.MeanDiffT.Low)), hi = Math.Max(0, pairs.Max(p => p.MeanDiffT.High));
            double pad = Math.Max(1, 0.1 * (hi - lo));
            plt.Axes.SetLimitsX(lo - pad, hi + pad);
        }
        var zero = plt.Add.VerticalLine(0); zero.Color = Colors.Gray; zero.LinePattern = LinePattern.Dashed;
        plt.Title("Paired difference of the focus board's time, s (95 % t interval)");
        plt.XLabel("seconds (negative: the first variant faster)");
        plt.Axes.Left.TickLabelStyle.IsVisible = false;
        plt.Axes.SetLimitsY(-0.6, Math.Max(1, pairs.Count) - 0.2);
        return plt.GetImageBytes(900, Math.Max(220, 90 * pairs.Count + 120), ImageFormat.Png);
    }

    public static string Markdown(ExperimentSpec spec, IReadOnlyList<VariantSummary> variants, IReadOnlyList<PairSummary> pairs,
        IReadOnlyList<RaceRow> rows, bool complete, IReadOnlyList<(string Variant, int Race, string Line)>? metrics = null)
    {
        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"# {spec.Name}\n\n");
        if (spec.Description.Length > 0) sb.Append(spec.Description).Append("\n\n");
        sb.Append(CultureInfo.InvariantCulture, $"{spec.Races} races per variant, {(spec.CommonSeeds ? "paired by seed (every variant sails race i in the same wind)" : "independent seeds")}; compared on board **{spec.Focus}**; master seed {spec.MasterSeed}.");
        if (!complete) sb.Append(" **Stopped early: this report covers the races that finished.**");
        sb.Append("\n\n| variant | races | mean time (s) | win share (95 %) | mean place | race duration median (P10-P90), min |\n|---|---|---|---|---|---|\n");
        var dur = Durations(spec, rows);
        foreach (var v in variants)
        {
            var d = dur[v.Name];
            string dd = d.Length == 0 ? "-" : $"{F(Statistics.Quantile(d, 0.5) / 60)} ({F(Statistics.Quantile(d, 0.1) / 60)}-{F(Statistics.Quantile(d, 0.9) / 60)})";
            sb.Append(CultureInfo.InvariantCulture, $"| {v.Name} | {v.Races} | {F(v.MeanElapsedS)} | {F(v.WinShare.Estimate * 100, "0")} % ({F(v.WinShare.Low * 100, "0")}-{F(v.WinShare.High * 100, "0")}) | {F(v.MeanPlace)} | {dd} |\n");
        }
        if (pairs.Count > 0)
        {
            sb.Append("\n| a - b | races | mean difference (s) | 95 % t interval | bootstrap interval | place difference (95 %) | a faster in | verdict |\n|---|---|---|---|---|---|---|---|\n");
            foreach (var p in pairs)
            {
                string place = p.PlaceDiffT is Interval pd ? $"{F(pd.Estimate, "0.00")} ({F(pd.Low, "0.00")} to {F(pd.High, "0.00")}{(p.PlaceDiffBootstrap is Interval pb ? $"; bootstrap {F(pb.Low, "0.00")} to {F(pb.High, "0.00")}" : "")})" : "-";
                sb.Append(CultureInfo.InvariantCulture, $"| {p.A} - {p.B} | {p.Pairs} | {F(p.MeanDiffT.Estimate)} | {F(p.MeanDiffT.Low)} to {F(p.MeanDiffT.High)} | {F(p.MeanDiffBootstrap.Low)} to {F(p.MeanDiffBootstrap.High)} | {place} | {F(p.WinProbability.Estimate * 100, "0")} % | {(p.Significant ? "resolved" : $"not resolved: about {p.PairsNeeded} races needed")} |\n");
            }
        }
        sb.Append("\nA difference is called resolved only when its 95 % interval excludes zero. A board that did not finish counts the time limit.\n\n");
        if (spec.Variants.Count > 2) sb.Append(HeadToHead(spec, pairs));
        if (metrics is not null) sb.Append(Organisers(spec, rows, metrics));
        if (metrics is not null && !double.IsNaN(spec.WindMinKn)) sb.Append(Riders(spec, rows, metrics, pairs));
        sb.Append("> ").Append(Caution.Text).Append('\n');
        return sb.ToString();
    }

    /// <summary>
    /// For coaches: a head-to-head matrix, the share of paired races where the row variant's focus board beat the
    /// column's, with its 95 % Wilson interval, and a mark where the paired time difference is resolved.
    /// </summary>
    static string HeadToHead(ExperimentSpec spec, IReadOnlyList<PairSummary> pairs)
    {
        var names = spec.Variants.Select(v => v.Name).ToList();
        var sb = new StringBuilder("## Head to head\n\nShare of paired races the row beat the column (95 % interval); * where the paired time difference is resolved.\n\n| row beats column | ");
        sb.Append(string.Join(" | ", names)).Append(" |\n|").Append(string.Concat(Enumerable.Repeat("---|", names.Count + 1))).Append('\n');
        foreach (var r in names)
        {
            sb.Append("| ").Append(r);
            foreach (var c in names)
            {
                if (r == c) { sb.Append(" | -"); continue; }
                var p = pairs.FirstOrDefault(x => x.A == r && x.B == c);
                var q = pairs.FirstOrDefault(x => x.A == c && x.B == r);
                string cell = p is not null ? Cell(p.WinProbability, p.Significant)
                    : q is not null ? Cell(new Interval(1 - q.WinProbability.Estimate, 1 - q.WinProbability.High, 1 - q.WinProbability.Low), q.Significant) : "-";
                sb.Append(" | ").Append(cell);
            }
            sb.Append(" |\n");
        }
        return sb.Append('\n').ToString();

        static string Cell(Interval w, bool sig) => $"{F(w.Estimate * 100, "0")} % ({F(w.Low * 100, "0")}-{F(w.High * 100, "0")}){(sig ? " *" : "")}";
    }

    /// <summary>
    /// For organisers: race duration, mean leg times of the finishers, start-line bias, side fairness on the first beat
    /// (mean place of the boards that went left against those that went right) and bunching at the marks.
    /// </summary>
    static string Organisers(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, IReadOnlyList<(string Variant, int Race, string Line)> metrics)
    {
        var sb = new StringBuilder("## For race organisers\n\n");
        sb.Append("| variant | winner's time, median (P10-P90), min | mean leg times of finishers, min | line bias, mean abs (deg) | line advantage, mean (m) | first beat: share left; mean place left / right | peak boards within 30 m of a mark, mean | roundings within 5 s of the one before, per race | contacts per race (avoidable) |\n|---|---|---|---|---|---|---|---|---|\n");
        foreach (var v in spec.Variants)
        {
            var m = metrics.Where(x => x.Variant == v.Name).Select(x => x.Line.Split(',')).ToList();
            if (m.Count == 0) continue;
            double P(string[] f, int i) => f[i].Length == 0 ? double.NaN : double.Parse(f[i], CultureInfo.InvariantCulture);
            var winners = m.Select(f => P(f, 2)).Where(double.IsFinite).Order().ToArray();
            string dur = winners.Length == 0 ? "-" : $"{F(Statistics.Quantile(winners, 0.5) / 60)} ({F(Statistics.Quantile(winners, 0.1) / 60)}-{F(Statistics.Quantile(winners, 0.9) / 60)})";
            var vr = rows.Where(r => r.Variant == v.Name).ToList();
            var finishers = vr.Where(r => r.Finished).Select(r => r.Splits).Where(s => s.Length > 0).ToList();
            string legs = "-";
            if (finishers.Count > 0)
            {
                int nLegs = finishers.Min(s => s.Length);
                legs = string.Join(" ", Enumerable.Range(0, nLegs).Select(k => F(finishers.Average(s => s[k] - (k == 0 ? 0 : s[k - 1])) / 60, "0.0")));
            }
            double bias = m.Average(f => Math.Abs(P(f, 3))), adv = m.Average(f => P(f, 4));
            var left = vr.Where(r => r.FirstBeatSide == "left").ToList(); var right = vr.Where(r => r.FirstBeatSide == "right").ToList();
            double shareLeft = (left.Count + right.Count) == 0 ? double.NaN : (double)left.Count / (left.Count + right.Count);
            double placeL = left.Where(r => r.Place is not null).Select(r => (double)r.Place!.Value).DefaultIfEmpty(double.NaN).Average();
            double placeR = right.Where(r => r.Place is not null).Select(r => (double)r.Place!.Value).DefaultIfEmpty(double.NaN).Average();
            sb.Append(CultureInfo.InvariantCulture, $"| {v.Name} | {dur} | {legs} | {F(bias)} | {F(adv)} | {F(shareLeft * 100, "0")} %; {F(placeL)} / {F(placeR)} | {F(m.Average(f => P(f, 5)))} | {F(m.Average(f => P(f, 6)), "0.0")} | {F(m.Average(f => f.Length > 8 ? P(f, 8) : double.NaN), "0.00")} ({F(m.Average(f => f.Length > 9 ? P(f, 9) : double.NaN), "0.00")}) |\n");
        }
        if (!double.IsNaN(spec.TargetDurationS))
        {
            sb.Append(CultureInfo.InvariantCulture, $"\nTarget duration {F(spec.TargetDurationS / 60)} min: ");
            var parts = new List<string>();
            foreach (var v in spec.Variants)
            {
                var w = metrics.Where(x => x.Variant == v.Name).Select(x => x.Line.Split(',')[2]).Where(x => x.Length > 0)
                    .Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
                if (w.Length == 0) continue;
                int within = w.Count(x => Math.Abs(x - spec.TargetDurationS) <= 0.1 * spec.TargetDurationS);
                var share = Statistics.Wilson(within, w.Length);
                parts.Add($"{v.Name} within 10 % of it in {F(share.Estimate * 100, "0")} % of races ({F(share.Low * 100, "0")}-{F(share.High * 100, "0")})");
            }
            sb.Append(string.Join("; ", parts)).Append(".\n");
        }
        sb.Append("\nLine bias: the wind at the middle of the line at the signal against the line's square; advantage = line length x sin(bias). ")
          .Append("Side: the board's mean offset from the line start to the first mark while on the first leg. ")
          .Append("Contacts: hulls within 1 m, judged under the racing rules (docs/tactics.md); avoidable: the keep-clear rider had seen it in time and was free to act.\n\n");
        return sb.ToString();
    }

    /// <summary>
    /// For riders: the paired difference of the focus board's time binned by the race's wind (the experiment spans a
    /// range of winds), and the winds where one variant overtakes the other.
    /// </summary>
    /// <summary>Mean wind (kn) each race was sailed in, from field 7 of its metrics line (the wind_kn column).</summary>
    static Dictionary<int, double> WindByRace(IReadOnlyList<(string Variant, int Race, string Line)> metrics) =>
        metrics.GroupBy(m => m.Race).ToDictionary(g => g.Key, g => double.Parse(g.First().Line.Split(',')[7], CultureInfo.InvariantCulture));

    static string Riders(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, IReadOnlyList<(string Variant, int Race, string Line)> metrics,
        IReadOnlyList<PairSummary> pairs)
    {
        var sb = new StringBuilder("## For riders\n\n");
        var wind = WindByRace(metrics);
        foreach (var p in pairs)
        {
            var a = rows.Where(r => r.Variant == p.A && r.BoardId == spec.Focus).ToDictionary(r => r.Race);
            var b = rows.Where(r => r.Variant == p.B && r.BoardId == spec.Focus).ToDictionary(r => r.Race);
            var diffs = a.Keys.Intersect(b.Keys).Where(wind.ContainsKey).Select(k => (wind[k], a[k].TimeOrLimitS - b[k].TimeOrLimitS)).ToList();
            var bins = WindBins.Of(diffs, 2);
            sb.Append(CultureInfo.InvariantCulture, $"{p.A} - {p.B}, by the race's mean wind (negative: {p.A} faster):\n\n| wind (kn) | races | mean difference (s) |\n|---|---|---|\n");
            foreach (var bin in bins) sb.Append(CultureInfo.InvariantCulture, $"| {F(bin.LowKn, "0")}-{F(bin.HighKn, "0")} | {bin.Races} | {F(bin.MeanDiffS)} |\n");
            var cross = WindBins.Crossovers(bins);
            sb.Append('\n').Append(cross.Count == 0 ? $"No crossover in {F(spec.WindMinKn, "0")}-{F(spec.WindMaxKn, "0")} kn." :
                "Crossover near " + string.Join(", ", cross.Select(c => F(c, "0.0") + " kn")) + " (where the binned mean changes sign; few races per bin make it rough).");
            // Beside it, the steady-state polars of the focus board's set-up in the two variants (docs/polar.md).
            var ea = spec.Variants.First(v => v.Name == p.A).Setup.Boards.First(x => x.Id == spec.Focus).Equipment;
            var eb = spec.Variants.First(v => v.Name == p.B).Setup.Boards.First(x => x.Id == spec.Focus).Equipment;
            if (ea != eb)
            {
                double[] winds = Enumerable.Range(0, 14).Select(i => 6.0 + 2 * i).ToArray();
                double[] angles = Enumerable.Range(0, 31).Select(i => 30.0 + 5 * i).ToArray();
                var cmp = CourseSim.Equilibrium.PolarComparison.Of(CourseSim.Equilibrium.Polar.Compute(ea, winds, angles), CourseSim.Equilibrium.Polar.Compute(eb, winds, angles));
                sb.Append(" The polars of the two set-ups cross at: ")
                  .Append(cmp.Crossovers.Count == 0 ? "none in 6-32 kn" : string.Join("; ", cmp.Crossovers.Select(c => $"{c.Measure} {F(c.TwsKn, "0.0")} kn ({c.FasterAbove} faster above)")))
                  .Append('.');
            }
            sb.Append("\n\n");
        }
        return sb.ToString();
    }

    /// <summary>The HTML page: the Markdown's content as tables, with the charts embedded.</summary>
    public static string Html(ExperimentSpec spec, string markdown, byte[] durations, byte[] intervals, byte[]? sides = null, byte[]? crossover = null)
    {
        var sb = new StringBuilder();
        sb.Append("<!doctype html><html lang=\"en\"><head><meta charset=\"utf-8\"><title>").Append(WebUtility.HtmlEncode(spec.Name)).Append("</title>");
        sb.Append("<style>body{font-family:system-ui,sans-serif;max-width:980px;margin:2em auto;color:#1d2a33}table{border-collapse:collapse;margin:1em 0}" +
                  "td,th{border-bottom:1px solid #c9d3da;padding:4px 10px;text-align:left}th{background:#eef3f6}blockquote{color:#7a4b00;border-left:4px solid #E69F00;padding-left:1em}</style></head><body>");
        foreach (var block in markdown.Split("\n\n"))
        {
            var lines = block.Split('\n', StringSplitOptions.RemoveEmptyEntries);
            if (lines.Length == 0) continue;
            if (lines[0].StartsWith("# ", StringComparison.Ordinal)) sb.Append("<h1>").Append(WebUtility.HtmlEncode(lines[0][2..])).Append("</h1>");
            else if (lines[0].StartsWith("## ", StringComparison.Ordinal)) sb.Append("<h2>").Append(WebUtility.HtmlEncode(lines[0][3..])).Append("</h2>");
            else if (lines[0].StartsWith('|'))
            {
                sb.Append("<table>");
                for (int i = 0; i < lines.Length; i++)
                {
                    if (i == 1) continue; // the Markdown separator row
                    var cells = lines[i].Trim('|').Split('|');
                    sb.Append("<tr>");
                    foreach (var c in cells) sb.Append(i == 0 ? "<th>" : "<td>").Append(WebUtility.HtmlEncode(c.Trim())).Append(i == 0 ? "</th>" : "</td>");
                    sb.Append("</tr>");
                }
                sb.Append("</table>");
            }
            else if (lines[0].StartsWith("> ", StringComparison.Ordinal)) sb.Append("<blockquote>").Append(WebUtility.HtmlEncode(lines[0][2..])).Append("</blockquote>");
            else sb.Append("<p>").Append(WebUtility.HtmlEncode(string.Join(' ', lines)).Replace("**", "")).Append("</p>");
        }
        sb.Append("<h2>Race durations</h2><img alt=\"race durations\" src=\"data:image/png;base64,").Append(Convert.ToBase64String(durations)).Append("\">");
        sb.Append("<h2>Paired differences</h2><img alt=\"paired differences\" src=\"data:image/png;base64,").Append(Convert.ToBase64String(intervals)).Append("\">");
        if (sides is not null) sb.Append("<h2>Side fairness</h2><img alt=\"side fairness\" src=\"data:image/png;base64,").Append(Convert.ToBase64String(sides)).Append("\">");
        if (crossover is not null) sb.Append("<h2>By wind speed</h2><img alt=\"difference by wind speed\" src=\"data:image/png;base64,").Append(Convert.ToBase64String(crossover)).Append("\">");
        sb.Append("</body></html>\n");
        return sb.ToString();
    }
}
