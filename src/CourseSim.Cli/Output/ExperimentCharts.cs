using CourseSim.Experiments;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>
/// The experiment report's charts (PNG): race durations as a histogram of bars with integer counts, the paired
/// differences with their intervals, side fairness with error bars, and for riders the fitted difference by wind with
/// its 95 % band, the crossover's interval and the polars' crossovers.
/// </summary>
public static class ExperimentCharts
{
    const double BinS = 30;

    static void IntegerTicks(IAxis axis) => axis.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic { IntegerTicksOnly = true };

    /// <summary>First finisher's time by variant, races per 30-s bin, bars side by side.</summary>
    public static byte[] Durations(IReadOnlyList<OrganiserFigures> figures, IReadOnlyList<RaceRow> rows, ExperimentSpec spec)
    {
        var plt = new Plot();
        var d = spec.Variants.ToDictionary(v => v.Name, v => rows.Where(r => r.Variant == v.Name).GroupBy(r => r.Race)
            .Select(g => g.First().FirstFinisherS).Where(double.IsFinite).ToArray());
        var all = d.Values.SelectMany(x => x).ToArray();
        if (all.Length > 0)
        {
            double lo = Math.Floor(all.Min() / BinS) * BinS, hi = Math.Floor(all.Max() / BinS) * BinS + BinS;
            int bins = Math.Max(1, (int)Math.Round((hi - lo) / BinS));
            int k = 0, nv = d.Count;
            double width = 0.8 / nv;
            var bars = new List<Bar>();
            foreach (var (name, values) in d)
            {
                var counts = new int[bins];
                foreach (var v in values) counts[Math.Clamp((int)((v - lo) / BinS), 0, bins - 1)]++;
                var colour = PolarCharts.Palette[k % PolarCharts.Palette.Length];
                for (int i = 0; i < bins; i++)
                    if (counts[i] > 0) bars.Add(new Bar { Position = i + (k - (nv - 1) / 2.0) * width, Value = counts[i], Size = width * 0.95, FillColor = colour });
                plt.Legend.ManualItems.Add(new LegendItem { LabelText = name, FillColor = colour });
                k++;
            }
            plt.Add.Bars(bars);
            int step = Math.Max(1, bins / 12);
            var ticks = Enumerable.Range(0, bins).Where(i => i % step == 0).ToArray();
            plt.Axes.Bottom.SetTicks(ticks.Select(i => (double)i).ToArray(), ticks.Select(i => $"{(lo + BinS * i) / 60:0.0}").ToArray());
        }
        IntegerTicks(plt.Axes.Left);
        plt.Axes.Margins(bottom: 0);
        plt.Title("Race duration (first finisher): races per 30-second bin");
        plt.XLabel("minutes from the signal (bin start)"); plt.YLabel("races");
        plt.ShowLegend(Alignment.UpperRight);
        return plt.GetImageBytes(900, 420, ImageFormat.Png);
    }

    /// <summary>Paired differences with their 95 % t intervals (null with fewer than two variants).</summary>
    public static byte[]? Intervals(IReadOnlyList<PairSummary> pairs)
    {
        if (pairs.Count == 0) return null;
        var plt = new Plot();
        for (int i = 0; i < pairs.Count; i++)
        {
            var p = pairs[i];
            var c = PolarCharts.Palette[i % PolarCharts.Palette.Length];
            var bar = plt.Add.Line(p.MeanDiffT.Low, i, p.MeanDiffT.High, i); bar.Color = c; bar.LineWidth = 4;
            var m = plt.Add.Marker(p.MeanDiffT.Estimate, i); m.Color = c; m.Size = 10;
            var t = plt.Add.Text($"{p.A} - {p.B}{(p.Significant ? " (resolved)" : "")}", p.MeanDiffT.Low, i + 0.25); t.LabelFontSize = 12;
        }
        double lo = Math.Min(0, pairs.Min(p => p.MeanDiffT.Low)), hi = Math.Max(0, pairs.Max(p => p.MeanDiffT.High));
        double pad = Math.Max(1, 0.1 * (hi - lo));
        plt.Axes.SetLimitsX(lo - pad, hi + pad);
        var zero = plt.Add.VerticalLine(0); zero.Color = Colors.Gray; zero.LinePattern = LinePattern.Dashed;
        plt.Title(pairs.Count > 1 ? "Paired difference of the board's time, s (95 % t interval, unadjusted; resolved: after Holm)" : "Paired difference of the board's time, s (95 % t interval)");
        plt.XLabel("seconds (negative: the first variant faster)");
        plt.Axes.Left.TickLabelStyle.IsVisible = false;
        plt.Axes.SetLimitsY(-0.6, Math.Max(1, pairs.Count) - 0.2);
        return plt.GetImageBytes(900, Math.Max(220, 90 * pairs.Count + 120), ImageFormat.Png);
    }

    /// <summary>Side fairness: mean place (scored) of the boards that went left and right on the first beat, each race's
    /// mean averaged over races, with 95 % t intervals as error bars.</summary>
    public static byte[] Sides(IReadOnlyList<OrganiserFigures> figures)
    {
        var plt = new Plot();
        var bars = new List<Bar>();
        for (int i = 0; i < figures.Count; i++)
            foreach (var (iv, k) in new[] { (figures[i].ShareLeft, 0), (figures[i].WinnerLeft, 1) })
                if (double.IsFinite(iv.Estimate)) bars.Add(new Bar { Position = 3 * i + k, Value = 100 * iv.Estimate, FillColor = PolarCharts.Palette[k] });
        // Bars first, whiskers and ticks over them.
        plt.Add.Bars(bars);
        for (int i = 0; i < figures.Count; i++)
        {
            var o = figures[i];
            // The share of all boards that went left (clustered Wilson) and of first finishers in races where both sides
            // were sailed (modified Wilson): with even sides the second is about the share of boards that went left in
            // those races, drawn as a tick.
            foreach (var (iv, k) in new[] { (o.ShareLeft, 0), (o.WinnerLeft, 1) })
            {
                if (!double.IsFinite(iv.Estimate)) continue;
                double x = 3 * i + k;
                if (!double.IsFinite(iv.Low) || !double.IsFinite(iv.High)) continue;
                // Wilson intervals are not symmetric: whiskers drawn as lines with caps.
                var w = plt.Add.Line(x, 100 * iv.Low, x, 100 * iv.High); w.LineColor = Colors.Black; w.LineWidth = 1.5f;
                foreach (double y in new[] { iv.Low, iv.High })
                {
                    var cap = plt.Add.Line(x - 0.15, 100 * y, x + 0.15, 100 * y); cap.LineColor = Colors.Black; cap.LineWidth = 1.5f;
                }
            }
            if (double.IsFinite(o.LeftInSplitRaces))
            {
                var even = plt.Add.Line(3 * i + 0.55, 100 * o.LeftInSplitRaces, 3 * i + 1.45, 100 * o.LeftInSplitRaces);
                even.LineColor = Colors.Black; even.LinePattern = LinePattern.Dashed; even.LineWidth = 2;
            }
        }
        plt.Legend.ManualItems.Add(new LegendItem { LabelText = "boards that went left", FillColor = PolarCharts.Palette[0] });
        plt.Legend.ManualItems.Add(new LegendItem { LabelText = "first finishers that went left (races with both sides sailed)", FillColor = PolarCharts.Palette[1] });
        plt.Legend.ManualItems.Add(new LegendItem { LabelText = "even sides: boards that went left in those races", LineColor = Colors.Black, LinePattern = LinePattern.Dashed, LineWidth = 2 });
        plt.ShowLegend(Edge.Bottom);
        plt.Axes.Bottom.SetTicks(Enumerable.Range(0, figures.Count).Select(i => 3.0 * i + 0.5).ToArray(), figures.Select(v => v.Variant).ToArray());
        plt.Title("Side fairness on the first beat: share going left (95 % intervals)");
        plt.YLabel("% going left");
        plt.Axes.SetLimitsY(0, 105);
        return plt.GetImageBytes(900, 420, ImageFormat.Png);
    }

    /// <summary>Riders: each race's paired difference against its wind, the spline fit with its 95 % band, the
    /// crossover's interval shaded, and the polars' crossovers as dashed lines.</summary>
    public static byte[]? Crossover(RiderFigures r, IReadOnlyList<(string Measure, double TwsKn)> polarCrossovers)
    {
        if (r.Fit is not { } fit) return null;
        var plt = new Plot();
        foreach (var c in fit.Crossovers.Where(c => c.Resolved))
        {
            var span = plt.Add.HorizontalSpan(c.LowKn, c.HighKn);
            span.FillColor = Colors.Orange.WithAlpha(0.18); span.LineColor = Colors.Transparent;
            span.LegendText = "crossover, 95 % interval";
        }
        var band = plt.Add.FillY(fit.Grid, fit.Low, fit.High);
        band.FillColor = PolarCharts.Palette[0].WithAlpha(0.25); band.LineColor = Colors.Transparent; band.LegendText = "95 % band";
        var pts = plt.Add.ScatterPoints(r.Points.Select(p => p.WindKn).ToArray(), r.Points.Select(p => p.DiffS).ToArray());
        pts.Color = Colors.Gray; pts.MarkerSize = 5; pts.LegendText = "races";
        var line = plt.Add.ScatterLine(fit.Grid, fit.Fit); line.Color = PolarCharts.Palette[0]; line.LineWidth = 2; line.MarkerSize = 0;
        line.LegendText = $"natural spline fit ({fit.Knots.Length} knots)";
        var zero = plt.Add.HorizontalLine(0); zero.Color = Colors.Black; zero.LinePattern = LinePattern.Dashed; zero.LineWidth = 1;
        int k = 0;
        foreach (var (measure, tws) in polarCrossovers)
        {
            if (tws < fit.Grid[0] || tws > fit.Grid[^1]) continue;
            var v = plt.Add.VerticalLine(tws); v.Color = PolarCharts.Palette[(2 + k++) % PolarCharts.Palette.Length]; v.LinePattern = LinePattern.Dotted;
            v.LineWidth = 2; v.LegendText = $"polars cross: {measure} {tws:0.0} kn";
        }
        plt.Title($"{r.A} - {r.B}: paired difference of the board's time by the race's mean wind");
        plt.XLabel("mean wind, kn"); plt.YLabel($"seconds (negative: {r.A} faster)");
        plt.ShowLegend(Alignment.UpperRight);
        return plt.GetImageBytes(900, 480, ImageFormat.Png);
    }
}
