using CourseSim.Units;

namespace CourseSim.Wind.Fit;

/// <summary>One row a station writes: mean speed (m/s), direction (deg from) and gust (m/s; NaN when not logged).</summary>
public readonly record struct StationRow(double T, double SpeedMs, double DirDeg, double GustMs);

/// <summary>
/// How a station turns the wind into rows (docs/wind-fit.md): means over each interval of <c>dt</c> (speed: scalar mean; direction: vector mean of unit vectors) with the gust
/// the highest 3-s running mean within the interval (WMO usage: Harper, Kepert and Ginger 2010, WMO/TD-No. 1555).
/// </summary>
public static class StationSampler
{
    /// <summary>Samples per second at which <see cref="Sample"/> reads the field before averaging.</summary>
    public const int SampleHz = 4;

    /// <summary>Rows from a series sampled at <paramref name="hz"/> (speed m/s, direction deg): means over each interval of
    /// <paramref name="dt"/> s (a whole number of samples), the gust the highest 3-s running mean within it.</summary>
    public static List<StationRow> Rows(double[] speed, double[] dir, int hz, double dt, bool gusts)
    {
        var rows = new List<StationRow>();
        int w = Math.Max(1, (int)Math.Round(dt * hz)), g = 3 * hz;
        for (int s = 0; s + w <= speed.Length; s += w)
        {
            double m = 0, sx = 0, sy = 0, peak = 0, run = 0;
            for (int i = s; i < s + w; i++)
            {
                m += speed[i];
                sx += Math.Sin(Unit.DegToRad(dir[i])); sy += Math.Cos(Unit.DegToRad(dir[i]));
                run += speed[i]; if (i - s >= g) run -= speed[i - g];
                if (i - s >= g - 1) peak = Math.Max(peak, run / g);
            }
            rows.Add(new StationRow((double)(s + w) / hz, m / w, Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(sx, sy))), gusts && w >= g ? peak : double.NaN));
        }
        return rows;
    }

    /// <summary>The field at one point as a station logs it, for <paramref name="durationS"/> seconds: read at
    /// <see cref="SampleHz"/> and averaged over each row's interval.</summary>
    public static List<StationRow> Sample(WindField field, double x, double y, double durationS, double dt, bool gusts)
    {
        var (_, sp, dir) = WindStatistics.Series(field, x, y, durationS - 1.0 / SampleHz, 1.0 / SampleHz);
        for (int i = 0; i < sp.Length; i++) sp[i] = Unit.KnotsToMs(sp[i]);
        return Rows(sp, dir, SampleHz, dt, gusts);
    }

    /// <summary>The rows as a log (times from 0), for the fitter.</summary>
    public static WindLog ToLog(IReadOnlyList<StationRow> rows, string name = "station") => new()
    {
        Path = name, Start = DateTimeOffset.UnixEpoch, T = rows.Select(r => r.T).ToArray(), SpeedMs = rows.Select(r => r.SpeedMs).ToArray(),
        DirDeg = rows.Select(r => r.DirDeg).ToArray(), GustMs = rows.Select(r => r.GustMs).ToArray(), Problems = [], Mapping = "synthetic",
    };

    /// <summary>
    /// The gust factor a log shows: with a gust column, the mean over rows of gust over mean speed (the station's own
    /// interval); without one, from samples every 3 s or faster, the peak 3-s mean over each 10-min mean, averaged.
    /// NaN when neither can be formed.
    /// </summary>
    public static double GustFactor(WindLog log, double dt)
    {
        if (log.HasGust)
        {
            double s = 0; int n = 0;
            for (int i = 0; i < log.Count; i++)
                if (double.IsFinite(log.GustMs[i]) && log.SpeedMs[i] > 0.5) { s += log.GustMs[i] / log.SpeedMs[i]; n++; }
            return n > 0 ? s / n : double.NaN;
        }
        if (dt > 3) return double.NaN;
        var series = LogSeries.From(log, dt);
        return WindStatistics.GustFactor(series.U, dt);
    }
}
