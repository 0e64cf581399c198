using CourseSim.Units;
using CourseSim.Wind.Fit;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>The wind fit's PNG: the log against the fitted model, as a series (top) and a spectrum (bottom).</summary>
public static class WindFitCharts
{
    public static void Draw(WindFitResult r, string title, string path)
    {
        var mp = new Multiplot();
        mp.AddPlots(2);
        Series(mp.GetPlot(0), r, title);
        Spectrum(mp.GetPlot(1), r);
        mp.SavePng(path, 1100, 900);
    }

    static void Series(Plot plt, WindFitResult r, string title)
    {
        var s = r.Series; double dt = s.Dt;
        double[] min = Enumerable.Range(0, s.Count).Select(i => i * dt / 60).ToArray();
        var sp = plt.Add.ScatterLine(min, s.U.Select(Unit.MsToKnots).ToArray()); sp.Color = PolarCharts.Palette[0]; sp.LineWidth = 1; sp.LegendText = "log: speed (kn, left)";
        if (r.Log.HasGust)
        {
            var g = plt.Add.ScatterPoints(min, s.G.Select(v => double.IsFinite(v) ? Unit.MsToKnots(v) : double.NaN).ToArray());
            g.Color = PolarCharts.Palette[0].WithAlpha(0.45); g.MarkerSize = 2.5f; g.LegendText = "log: gust (kn)";
        }
        var e = r.Estimate;
        var fit = plt.Add.ScatterLine(new[] { 0, min[^1] }, new[] { Unit.MsToKnots(e.U0), Unit.MsToKnots(e.U0 + e.RampMsPerS * s.Count * dt) });
        fit.Color = Colors.Black; fit.LineWidth = 2; fit.LinePattern = LinePattern.Dashed; fit.LegendText = "fit: mean and ramp";
        var d = plt.Add.ScatterLine(min, s.D.Select(v => s.MeanDirDeg + v).ToArray()); d.Color = PolarCharts.Palette[5]; d.LineWidth = 1;
        d.LegendText = "log: direction (deg, right)"; d.Axes.YAxis = plt.Axes.Right;
        var df = plt.Add.ScatterLine(new[] { 0, min[^1] }, new[] { s.MeanDirDeg + e.Dir0Deg, s.MeanDirDeg + e.Dir0Deg + e.TrendDegPerS * s.Count * dt });
        df.Color = PolarCharts.Palette[5]; df.LineWidth = 2; df.LinePattern = LinePattern.Dashed; df.Axes.YAxis = plt.Axes.Right; df.LegendText = "fit: direction and trend";
        plt.Axes.Right.Label.Text = "direction the wind comes from (deg true)";
        plt.YLabel("speed (kn)"); plt.XLabel("minutes from the start of the window");
        plt.Title(title);
        plt.ShowLegend(Alignment.UpperLeft);
    }

    static void Spectrum(Plot plt, WindFitResult r)
    {
        var sp = r.SpeedSpectrum;
        var k = Enumerable.Range(0, sp.F.Length).Where(i => sp.P[i] > 0).ToArray();
        var obs = plt.Add.ScatterPoints(k.Select(i => Math.Log10(sp.F[i])).ToArray(), k.Select(i => Math.Log10(sp.P[i])).ToArray());
        obs.Color = PolarCharts.Palette[0]; obs.MarkerSize = 3; obs.LegendText = $"log: speed spectrum (Welch, {sp.Segments} segments)";
        if (double.IsFinite(r.Estimate.Sigma2U))
        {
            var f = k.Select(i => sp.F[i]).ToArray();
            var m = plt.Add.ScatterLine(f.Select(Math.Log10).ToArray(), f.Select(x => Math.Log10(r.ModelSpeedDensity(x))).ToArray());
            m.Color = Colors.Black; m.LineWidth = 2; m.LegendText = "fit: von Karman through the station's averaging";
            if (WindEstimator.SpeedFitMaxHz < f[^1])
            {
                var cut = plt.Add.VerticalLine(Math.Log10(WindEstimator.SpeedFitMaxHz)); cut.Color = Colors.Gray; cut.LinePattern = LinePattern.Dotted;
                cut.LegendText = "fitted up to here";
            }
        }
        plt.Axes.Bottom.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic { LabelFormatter = v => Pow10(v) };
        plt.Axes.Left.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic { LabelFormatter = v => Pow10(v) };
        plt.XLabel("frequency (Hz, log scale)"); plt.YLabel("speed spectral density ((m/s)^2/Hz, log scale)");
        plt.ShowLegend(Alignment.LowerLeft);
    }

    static string Pow10(double v) => Math.Pow(10, v).ToString("G2", System.Globalization.CultureInfo.InvariantCulture);
}
