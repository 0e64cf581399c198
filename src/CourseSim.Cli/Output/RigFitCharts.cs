using CourseSim.Equilibrium;
using CourseSim.RigFit;
using CourseSim.Units;
using ScottPlot;

namespace CourseSim.Cli.Output;

/// <summary>The rig fit's PNG: the rider's steady stretches on a polar diagram over the model's polar before and after.</summary>
public static class RigFitCharts
{
    public static void Draw(RigFitResult r, Equipment original, string title, string path)
    {
        var plt = new Plot();
        double twsKn = Math.Round(Unit.MsToKnots(r.Stretches.Average(s => s.TwsMs)));
        double tws = Unit.KnotsToMs(twsKn);
        var angles = Enumerable.Range(0, 15).Select(i => 40.0 + i * 10).ToArray();
        double max = 0;
        foreach (var (eq, label, color, pattern) in new[] { (original, "model before", Colors.Gray, LinePattern.Dashed), (r.Fitted, "model fitted", Colors.Black, LinePattern.Solid) })
        {
            var vpp = new VelocityPrediction(new BoardPhysics(eq));
            var sp = angles.Select(a => Unit.MsToKnots(vpp.SpeedAt(tws, Unit.DegToRad(a)))).ToArray();
            max = Math.Max(max, sp.Max());
            var line = plt.Add.ScatterLine(angles.Select((a, i) => sp[i] * Math.Sin(Unit.DegToRad(a))).ToArray(), angles.Select((a, i) => sp[i] * Math.Cos(Unit.DegToRad(a))).ToArray());
            line.Color = color; line.LinePattern = pattern; line.LineWidth = 2; line.LegendText = $"{label}, {twsKn:0} kn";
        }
        var pts = r.Stretches;
        var sc = plt.Add.ScatterPoints(pts.Select(p => Unit.MsToKnots(p.S.SpeedMs) * Math.Sin(Unit.DegToRad(p.TwaDeg))).ToArray(),
            pts.Select(p => Unit.MsToKnots(p.S.SpeedMs) * Math.Cos(Unit.DegToRad(p.TwaDeg))).ToArray());
        sc.Color = PolarCharts.Palette[0].WithAlpha(0.6); sc.MarkerSize = 5;
        sc.LegendText = $"steady stretches of {TrackAnalysis.StretchS:0} s ({pts.Count}; wind {Unit.MsToKnots(pts.Min(p => p.TwsMs)):0}-{Unit.MsToKnots(pts.Max(p => p.TwsMs)):0} kn)";
        max = Math.Max(max, pts.Max(p => Unit.MsToKnots(p.S.SpeedMs)));
        double ring = max > 30 ? 10 : 5;
        for (double v = ring; v <= max + ring; v += ring)
        {
            var c = plt.Add.Arc(new Coordinates(0, 0), v, Angle.FromDegrees(-90), Angle.FromDegrees(180));
            c.LineColor = Colors.LightGray; c.LineWidth = 1;
            var t = plt.Add.Text($"{v:0} kn", v * 0.02, -v); t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        foreach (double a in new[] { 45.0, 90, 135 })
        {
            var l = plt.Add.Line(0, 0, (max + ring) * Math.Sin(Unit.DegToRad(a)), (max + ring) * Math.Cos(Unit.DegToRad(a)));
            l.Color = Colors.LightGray; l.LinePattern = LinePattern.Dotted;
            var t = plt.Add.Text($"{a:0} deg", (max + ring * 0.6) * Math.Sin(Unit.DegToRad(a)), (max + ring * 0.6) * Math.Cos(Unit.DegToRad(a)));
            t.LabelFontColor = Colors.Gray; t.LabelFontSize = 11;
        }
        plt.Axes.SetLimits(-2, max + ring, -(max + ring), max + ring);
        plt.Axes.SquareUnits();
        plt.Title(title);
        plt.XLabel("speed across the wind (kn)"); plt.YLabel("speed towards the wind (kn); true wind from the top");
        plt.ShowLegend(Alignment.UpperLeft);
        plt.SavePng(path, 900, 1000);
    }
}
