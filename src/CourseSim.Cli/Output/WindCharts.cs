using CourseSim.Wind;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>PNG charts of the wind field: a time series at a point and a map of the course area.</summary>
public static class WindCharts
{
    public static void Series(double[] t, double[] speedKn, double[] dirDeg, string title, string path)
    {
        var plt = new Plot();
        double[] minutes = t.Select(v => v / 60).ToArray();
        var rel = WindStatistics.Unwrap(dirDeg, out double mean);
        var s = plt.Add.ScatterLine(minutes, speedKn); s.Color = PolarCharts.Palette[0]; s.LegendText = "speed (kn, left)"; s.LineWidth = 1.2f;
        var d = plt.Add.ScatterLine(minutes, rel.Select(r => mean + r).ToArray()); d.Color = PolarCharts.Palette[5]; d.LegendText = "direction from (deg, right)";
        d.Axes.YAxis = plt.Axes.Right; d.LineWidth = 1.2f;
        plt.Axes.Right.Label.Text = "direction the wind comes from (deg true)";
        plt.YLabel("speed at 10 m (kn)");
        PolarCharts.XLabelWithCaution(plt, "minutes");
        plt.Title(title);
        plt.ShowLegend(Alignment.UpperLeft);
        plt.SavePng(path, 1100, 500);
    }

    /// <summary>Speed shading over the course area with direction arrows (pointing where the wind blows to).</summary>
    public static void Map(WindField field, double areaM, double t, string title, string path)
    {
        var plt = new Plot();
        int n = 80;
        double half = areaM / 2, step = areaM / (n - 1);
        var grid = new double[n, n];
        for (int r = 0; r < n; r++)
            for (int c = 0; c < n; c++)
                grid[r, c] = field.Sample(-half + c * step, half - r * step, t).SpeedKn;
        var hm = plt.Add.Heatmap(grid);
        hm.Colormap = new ScottPlot.Colormaps.Viridis();
        hm.Extent = new CoordinateRect(-half, half, -half, half);
        plt.Add.ColorBar(hm); // its own label overlaps the tick labels: the title names the shading instead
        int m = 10; double as_ = areaM / m;
        for (int i = 0; i < m; i++)
            for (int j = 0; j < m; j++)
            {
                double x = -half + (i + 0.5) * as_, y = -half + (j + 0.5) * as_;
                var w = field.Sample(x, y, t);
                double r = w.FromDeg * Math.PI / 180, len = as_ * 0.35 * Math.Clamp(w.SpeedKn / Math.Max(field.Settings.SpeedKn, 1), 0.5, 1.5);
                var a = plt.Add.Arrow(new Coordinates(x + Math.Sin(r) * len / 2, y + Math.Cos(r) * len / 2), new Coordinates(x - Math.Sin(r) * len / 2, y - Math.Cos(r) * len / 2));
                a.ArrowFillColor = Colors.White; a.ArrowLineColor = Colors.Black; a.ArrowLineWidth = 1;
            }
        plt.Title($"{title}\nshading: speed at 10 m (kn); arrows: where the wind blows to");
        PolarCharts.XLabelWithCaution(plt, "east (m)"); plt.YLabel("north (m)");
        plt.Axes.SquareUnits();
        plt.SavePng(path, 900, 800);
    }
}
