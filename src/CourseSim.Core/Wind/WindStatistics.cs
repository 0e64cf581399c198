using CourseSim.Units;

namespace CourseSim.Wind;

/// <summary>Summary statistics of a wind time series at one point.</summary>
public sealed record WindSummary(double SpeedMeanKn, double SpeedSigmaKn, double SpeedMinKn, double SpeedMaxKn,
    double DirectionMeanDeg, double DirectionSigmaDeg, double DirectionMinDeg, double DirectionMaxDeg,
    double GustFactor, double? ShiftPeriodS, int Samples);

public static class WindStatistics
{
    /// <summary>Samples the field at (x, y) every <paramref name="dt"/> seconds for <paramref name="duration"/> seconds.</summary>
    public static (double[] t, double[] speedKn, double[] dirDeg) Series(WindField f, double x, double y, double duration, double dt = 1.0)
    {
        int n = (int)(duration / dt) + 1;
        var t = new double[n]; var s = new double[n]; var d = new double[n];
        for (int i = 0; i < n; i++) { t[i] = i * dt; var w = f.Sample(x, y, t[i]); s[i] = w.SpeedKn; d[i] = w.FromDeg; }
        return (t, s, d);
    }

    /// <summary>Directions unwrapped around their circular mean, so statistics do not jump at north.</summary>
    public static double[] Unwrap(double[] dirDeg, out double meanDeg)
    {
        double sx = 0, sy = 0;
        foreach (var d in dirDeg) { sx += Math.Sin(Unit.DegToRad(d)); sy += Math.Cos(Unit.DegToRad(d)); }
        meanDeg = Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(sx, sy)));
        var r = new double[dirDeg.Length];
        for (int i = 0; i < r.Length; i++) r[i] = Unit.WrapDeg180(dirDeg[i] - meanDeg);
        return r;
    }

    /// <summary>
    /// Gust factor: the peak 3-s mean speed over the mean speed in each 10-min window, averaged over windows (WMO usage:
    /// Harper, Kepert and Ginger 2010, WMO/TD-No. 1555). Needs 1 Hz samples.
    /// </summary>
    public static double GustFactor(double[] speed, double dt)
    {
        int win = (int)Math.Round(600 / dt), g = Math.Max(1, (int)Math.Round(3 / dt));
        if (speed.Length < win) win = speed.Length;
        double sum = 0; int count = 0;
        for (int start = 0; start + win <= speed.Length; start += win)
        {
            double mean = 0; for (int i = start; i < start + win; i++) mean += speed[i]; mean /= win;
            double peak = 0, run = 0;
            for (int i = start; i < start + win; i++)
            {
                run += speed[i]; if (i - start >= g) run -= speed[i - g];
                if (i - start >= g - 1) peak = Math.Max(peak, run / g);
            }
            if (mean > 0) { sum += peak / mean; count++; }
        }
        return count > 0 ? sum / count : double.NaN;
    }

    /// <summary>
    /// Observed shift period: twice the mean time between crossings of the mean by the 60-s smoothed direction. A crossing
    /// counts only once the signal has gone past half a standard deviation on the other side (hysteresis), so gust noise
    /// riding on the shift does not add crossings.
    /// </summary>
    public static double? ShiftPeriod(double[] relDir, double dt)
    {
        int w = Math.Max(1, (int)(60 / dt));
        var sm = new double[relDir.Length];
        double run = 0;
        for (int i = 0; i < relDir.Length; i++) { run += relDir[i]; if (i >= w) run -= relDir[i - w]; sm[i] = run / Math.Min(i + 1, w); }
        if (sm.Length <= w + 2) return null;
        var tail = sm.Skip(w).ToArray();
        double mean = tail.Average(), sd = Math.Sqrt(tail.Select(v => (v - mean) * (v - mean)).Average());
        double band = 0.5 * sd;
        int state = 0, crossings = 0, first = -1, last = -1;
        for (int i = w; i < sm.Length; i++)
        {
            double v = sm[i] - mean;
            int next = v > band ? 1 : v < -band ? -1 : state;
            if (state != 0 && next != state) { crossings++; if (first < 0) first = i; last = i; }
            state = next;
        }
        if (crossings < 3) return null;
        return 2 * (last - first) * dt / (crossings - 1);
    }

    public static WindSummary Summarise(double[] speedKn, double[] dirDeg, double dt)
    {
        var rel = Unwrap(dirDeg, out double mean);
        double sm = speedKn.Average();
        double ssd = Math.Sqrt(speedKn.Select(v => (v - sm) * (v - sm)).Average());
        double rm = rel.Average();
        double dsd = Math.Sqrt(rel.Select(v => (v - rm) * (v - rm)).Average());
        return new WindSummary(sm, ssd, speedKn.Min(), speedKn.Max(), mean, dsd,
            Unit.WrapDeg360(mean + rel.Min()), Unit.WrapDeg360(mean + rel.Max()), GustFactor(speedKn, dt), ShiftPeriod(rel, dt), speedKn.Length);
    }
}
