using CourseSim.Equilibrium;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>PNG charts of polars. Our own palette: a colour-blind-safe sequence (Okabe and Ito 2008).</summary>
public static class PolarCharts
{
    public static readonly Color[] Palette =
    [
        Color.FromHex("#0072B2"), Color.FromHex("#E69F00"), Color.FromHex("#009E73"), Color.FromHex("#CC79A7"),
        Color.FromHex("#56B4E9"), Color.FromHex("#D55E00"), Color.FromHex("#F0E442"), Color.FromHex("#000000"),
    ];

    // An ordered ramp through the palette (light wind blue .. strong wind purple): one distinct colour per wind speed
    // however many are asked for, and neighbouring winds in neighbouring colours.
    static readonly Color[] Ramp =
    [
        Color.FromHex("#0072B2"), Color.FromHex("#56B4E9"), Color.FromHex("#009E73"), Color.FromHex("#E69F00"),
        Color.FromHex("#D55E00"), Color.FromHex("#CC79A7"), Color.FromHex("#6A3D9A"),
    ];

    /// <summary>Colour of wind speed number <paramref name="i"/> of <paramref name="n"/> on the ramp.</summary>
    public static Color WindColor(int i, int n)
    {
        double t = n <= 1 ? 0 : (double)i / (n - 1) * (Ramp.Length - 1);
        int k = Math.Min((int)t, Ramp.Length - 2);
        double f = t - k;
        Color a = Ramp[k], b = Ramp[k + 1];
        byte Mix(byte x, byte y) => (byte)Math.Round(x + f * (y - x));
        return new Color(Mix(a.R, b.R), Mix(a.G, b.G), Mix(a.B, b.B));
    }

    /// <summary>
    /// Speed against true wind angle, one curve per wind speed, the wind from the top: the sustained speed solid, the
    /// speed from a start off the plane dashed where it differs; best VMG points as diamonds. Speed rings every 5 kn.
    /// </summary>
    public static void Polar(Polar polar, string path, string? subtitle = null)
    {
        var plt = new Plot();
        var winds = polar.Points.Select(p => p.TwsKn).Distinct().Order().ToList();
        double max = Math.Max(5, Math.Ceiling(polar.Points.Max(p => Math.Max(p.SpeedKn, double.IsNaN(p.GetPlaningSpeedKn) ? 0 : p.GetPlaningSpeedKn)) / 5) * 5);
        // Grid: speed rings every 5 kn and spokes every 30 degrees, drawn by hand so the diagram reads like a polar.
        for (double r = 5; r <= max; r += 5)
        {
            var xs = new List<double>(); var ys = new List<double>();
            for (int a = 0; a <= 180; a += 3) { xs.Add(r * Math.Sin(a * Math.PI / 180)); ys.Add(r * Math.Cos(a * Math.PI / 180)); }
            var ring = plt.Add.ScatterLine(xs.ToArray(), ys.ToArray());
            ring.Color = Colors.Gray.WithAlpha(0.35); ring.LineWidth = 1;
            var t = plt.Add.Text($"{r:0} kn", 0, r); t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        var axisLabel = plt.Add.Text("board speed, kn: the rings; true wind angle: the spokes (wind from the top)", -max * 0.1, max * 1.12);
        axisLabel.LabelFontColor = Colors.Gray; axisLabel.LabelFontSize = 12;
        for (int a = 0; a <= 180; a += 30)
        {
            double s = Math.Sin(a * Math.PI / 180), c = Math.Cos(a * Math.PI / 180);
            var l = plt.Add.Line(0, 0, max * s, max * c); l.Color = Colors.Gray.WithAlpha(0.35); l.LineWidth = 1;
            var t = plt.Add.Text($"{a}° TWA", max * 1.04 * s, max * 1.04 * c); t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        // At most ten wind speeds in the legend: with a finer grid every k-th is named (the ramp orders the rest).
        int every = Math.Max(1, (int)Math.Ceiling(winds.Count / 10.0));
        double far = max * 100; // legend-only samples sit far outside the view
        for (int i = 0; i < winds.Count; i++)
        {
            var pts = polar.Points.Where(p => p.TwsKn == winds[i]).OrderBy(p => p.TwaDeg).ToList();
            double X(double v, double a) => v * Math.Sin(a * Math.PI / 180);
            double Y(double v, double a) => v * Math.Cos(a * Math.PI / 180);
            var color = WindColor(i, winds.Count);
            var line = plt.Add.ScatterLine(pts.Select(p => X(p.SpeedKn, p.TwaDeg)).ToArray(), pts.Select(p => Y(p.SpeedKn, p.TwaDeg)).ToArray());
            line.Color = color; line.LineWidth = 2.2f;
            if (i % every == 0 || i == winds.Count - 1) line.LegendText = $"{winds[i]:0.#} kn";
            // The get-planing branch where it differs from the sustained speed by more than 0.3 kn, in runs of angles.
            var run = new List<PolarPoint>();
            void Flush()
            {
                if (run.Count >= 2)
                {
                    var g = plt.Add.ScatterLine(run.Select(p => X(p.GetPlaningSpeedKn, p.TwaDeg)).ToArray(), run.Select(p => Y(p.GetPlaningSpeedKn, p.TwaDeg)).ToArray());
                    g.Color = color.WithAlpha(0.8); g.LineWidth = 1.4f; g.LinePattern = LinePattern.Dashed;
                }
                run.Clear();
            }
            foreach (var p in pts)
            {
                if (!double.IsNaN(p.GetPlaningSpeedKn) && Math.Abs(p.GetPlaningSpeedKn - p.SpeedKn) > 0.3) run.Add(p); else Flush();
            }
            Flush();
            foreach (var v in new[] { polar.Upwind[i], polar.Downwind[i] })
            {
                var m = plt.Add.Marker(X(v.SpeedKn, v.TwaDeg), Y(v.SpeedKn, v.TwaDeg));
                m.Color = color; m.Size = 10; m.Shape = MarkerShape.FilledDiamond;
            }
        }
        var key1 = plt.Add.ScatterLine(new[] { far, far + 1 }, new[] { far, far }); key1.Color = Colors.Black; key1.LineWidth = 2.2f;
        key1.LegendText = "solid: speed held (planing through lulls)";
        var key2 = plt.Add.ScatterLine(new[] { far, far + 1 }, new[] { far, far }); key2.Color = Colors.Black; key2.LineWidth = 1.4f;
        key2.LinePattern = LinePattern.Dashed; key2.LegendText = "dashed: from a start off the plane";
        var key3 = plt.Add.Marker(far, far); key3.Color = Colors.Black; key3.Size = 10; key3.Shape = MarkerShape.FilledDiamond;
        key3.LegendText = "best VMG up / down";
        // The title as text in the plot (a frameless plot drops the axis title).
        var title = plt.Add.Text($"{polar.Name}: board speed by true wind angle", -max * 0.1, max * 1.27);
        title.LabelFontSize = 17; title.LabelBold = true;
        if (subtitle is not null) { var sub = plt.Add.Text(subtitle, -max * 0.1, max * 1.19); sub.LabelFontSize = 13; }
        plt.Axes.SetLimits(-max * 0.12, max * 1.25, -max * 1.2, max * 1.3);
        plt.Axes.SquareUnits();
        plt.Axes.Frameless();
        plt.HideGrid();
        plt.ShowLegend(Edge.Right);
        var note = plt.Add.Text(CautionLines, -max * 0.1, -max * 1.1);
        note.LabelFontSize = 12; note.LabelFontColor = Colors.DimGray;
        plt.SavePng(path, 1150, 1050);
    }

    /// <summary>The caution (<see cref="Caution.Text"/>) in two lines, for the foot of a chart: a chart is passed
    /// around without the terminal output it came with.</summary>
    public static readonly string CautionLines = Caution.Text.Replace("; defer", ";\ndefer", StringComparison.Ordinal);

    /// <summary>An x-axis label with the caution under it, in the label's font made smaller and plain.</summary>
    public static void XLabelWithCaution(Plot plt, string label)
    {
        plt.XLabel($"{label}\n\n{CautionLines}");
        plt.Axes.Bottom.Label.FontSize = 12; plt.Axes.Bottom.Label.Bold = false;
    }

    /// <summary>A one-line description of a set-up for chart titles: rider mass, sail, board.</summary>
    public static string Describe(Equipment eq) =>
        $"rider {eq.Rider.MassKg:0} kg; sail {eq.Sail.AreaM2:0.0} m², outhaul {eq.Sail.Outhaul:0.##}; board {eq.Board.VolumeL:0} l, {eq.Board.WidthCm:0} cm; fin {eq.Fin.AreaCm2:0} cm²";

    /// <summary>Two set-ups by wind speed: top speed, best upwind and downwind VMG; A solid, B dashed.</summary>
    public static void Comparison(PolarComparison cmp, string path)
    {
        var plt = new Plot();
        double[] x = cmp.Rows.Select(r => r.TwsKn).ToArray();
        void Pair(string label, Func<ComparisonRow, double> a, Func<ComparisonRow, double> b, Color c)
        {
            var sa = plt.Add.Scatter(x, cmp.Rows.Select(a).ToArray()); sa.Color = c; sa.LineWidth = 2; sa.LegendText = $"{label}: {cmp.A.Name}";
            var sb = plt.Add.Scatter(x, cmp.Rows.Select(b).ToArray()); sb.Color = c; sb.LineWidth = 2; sb.LinePattern = LinePattern.Dashed;
            sb.MarkerShape = MarkerShape.OpenCircle; sb.LegendText = $"{label}: {cmp.B.Name}";
        }
        Pair("top speed", r => r.TopSpeedA, r => r.TopSpeedB, Palette[0]);
        Pair("upwind VMG", r => r.UpVmgA, r => r.UpVmgB, Palette[1]);
        Pair("downwind VMG", r => r.DownVmgA, r => r.DownVmgB, Palette[2]);
        foreach (var cr in cmp.Crossovers)
        {
            var v = plt.Add.VerticalLine(cr.TwsKn); v.Color = Colors.Gray; v.LinePattern = LinePattern.Dotted;
            v.LegendText = $"crossover, {cr.Measure}: {cr.TwsKn:0.0} kn";
        }
        plt.Title($"{cmp.A.Name} (solid) vs {cmp.B.Name} (dashed)");
        XLabelWithCaution(plt, "true wind speed at 10 m (kn)");
        plt.YLabel("knots");
        plt.ShowLegend(Alignment.UpperLeft);
        plt.SavePng(path, 1000, 650);
    }
}
