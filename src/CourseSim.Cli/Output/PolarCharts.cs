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

    /// <summary>Speed against true wind angle, one curve per wind speed, the wind from the top; best VMG points marked.</summary>
    public static void Polar(Polar polar, string path)
    {
        var plt = new Plot();
        var winds = polar.Points.Select(p => p.TwsKn).Distinct().Order().ToList();
        double max = Math.Max(5, Math.Ceiling(polar.Points.Max(p => p.SpeedKn) / 5) * 5);
        // Grid: speed rings every 5 kn and spokes every 30 degrees, drawn by hand so the diagram reads like a polar.
        for (double r = 5; r <= max; r += 5)
        {
            var xs = new List<double>(); var ys = new List<double>();
            for (int a = 0; a <= 180; a += 3) { xs.Add(r * Math.Sin(a * Math.PI / 180)); ys.Add(r * Math.Cos(a * Math.PI / 180)); }
            var ring = plt.Add.ScatterLine(xs.ToArray(), ys.ToArray());
            ring.Color = Colors.Gray.WithAlpha(0.35); ring.LineWidth = 1;
            var t = plt.Add.Text($"{r:0} kn", 0, r); t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        for (int a = 0; a <= 180; a += 30)
        {
            double s = Math.Sin(a * Math.PI / 180), c = Math.Cos(a * Math.PI / 180);
            var l = plt.Add.Line(0, 0, max * s, max * c); l.Color = Colors.Gray.WithAlpha(0.35); l.LineWidth = 1;
            var t = plt.Add.Text($"{a}°", max * 1.04 * s, max * 1.04 * c); t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        for (int i = 0; i < winds.Count; i++)
        {
            var pts = polar.Points.Where(p => p.TwsKn == winds[i]).OrderBy(p => p.TwaDeg).ToList();
            var xs = pts.Select(p => p.SpeedKn * Math.Sin(p.TwaDeg * Math.PI / 180)).ToArray();
            var ys = pts.Select(p => p.SpeedKn * Math.Cos(p.TwaDeg * Math.PI / 180)).ToArray();
            var color = Palette[i % Palette.Length];
            var line = plt.Add.ScatterLine(xs, ys);
            line.Color = color; line.LineWidth = 2; line.LegendText = $"{winds[i]:0.#} kn";
            foreach (var v in new[] { polar.Upwind[i], polar.Downwind[i] })
            {
                var m = plt.Add.Marker(v.SpeedKn * Math.Sin(v.TwaDeg * Math.PI / 180), v.SpeedKn * Math.Cos(v.TwaDeg * Math.PI / 180));
                m.Color = color; m.Size = 9; m.Shape = MarkerShape.FilledDiamond;
            }
        }
        plt.Title($"{polar.Name}: board speed (kn) by true wind angle; diamonds = best VMG");
        plt.Axes.SetLimits(-max * 0.08, max * 1.15, -max * 1.1, max * 1.1);
        plt.Axes.SquareUnits();
        plt.Axes.Frameless();
        plt.HideGrid();
        plt.ShowLegend(Alignment.UpperRight);
        plt.SavePng(path, 900, 1000);
    }

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
        }
        plt.Title($"{cmp.A.Name} (solid) vs {cmp.B.Name} (dashed)");
        plt.XLabel("true wind speed at 10 m (kn)");
        plt.YLabel("knots");
        plt.ShowLegend(Alignment.UpperLeft);
        plt.SavePng(path, 1000, 650);
    }
}
