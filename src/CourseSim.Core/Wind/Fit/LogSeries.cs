using CourseSim.Units;

namespace CourseSim.Wind.Fit;

/// <summary>
/// A wind log on a regular time grid (docs/wind-fit.md, "Irregular logs"): the grid step is the log's median interval;
/// each grid time takes the linear interpolation of the two rows around it when they are at most 2.5 steps apart, else
/// it is a gap. Gaps are filled linearly for the spectra (their share is reported) and left out of the regressions.
/// Directions are unwrapped around the log's circular mean, so a wind from about north does not jump by 360 deg.
/// </summary>
public sealed class LogSeries
{
    public required double Dt { get; init; }
    /// <summary>Speed (m/s) and direction (deg, relative to <see cref="MeanDirDeg"/>), gaps filled.</summary>
    public required double[] U { get; init; }
    public required double[] D { get; init; }
    /// <summary>Gust (m/s) per grid time, NaN where the log has none.</summary>
    public required double[] G { get; init; }
    /// <summary>Which grid times had data (speed; direction).</summary>
    public required bool[] OkU { get; init; }
    public required bool[] OkD { get; init; }
    public required double MeanDirDeg { get; init; }
    public int Count => U.Length;
    public double GapShare => 1 - OkU.Count(b => b) / (double)Math.Max(1, OkU.Length);

    public static LogSeries From(WindLog log, double? step = null)
    {
        double dt = step ?? log.MedianStepS;
        if (!(dt > 0)) throw new Settings.SettingsException(log.Path, 0, null, "the log has no time step (all rows at one time?)");
        var dirs = log.DirDeg.Where(double.IsFinite).ToArray();
        double mean = dirs.Length > 0 ? CircularMean(dirs) : 0;
        int n = (int)Math.Floor(log.DurationS / dt + 1e-9) + 1;
        var u = new double[n]; var d = new double[n]; var g = new double[n];
        var okU = new bool[n]; var okD = new bool[n];
        int j = 0;
        double prevRel = 0;
        for (int i = 0; i < n; i++)
        {
            double t = log.T[0] + i * dt;
            while (j + 1 < log.Count && log.T[j + 1] <= t) j++;
            int k = Math.Min(j + 1, log.Count - 1);
            double t0 = log.T[j], t1 = log.T[k];
            g[i] = double.NaN;
            if (t1 - t0 > 2.5 * dt + 1e-9 && Math.Abs(t - t0) > 1e-9) continue;
            double w = t1 > t0 ? (t - t0) / (t1 - t0) : 0;
            u[i] = log.SpeedMs[j] + w * (log.SpeedMs[k] - log.SpeedMs[j]); okU[i] = true;
            g[i] = double.IsFinite(log.GustMs[j]) ? (w < 0.5 ? log.GustMs[j] : log.GustMs[k]) : double.NaN;
            double a = log.DirDeg[j], b = log.DirDeg[k];
            if (double.IsFinite(a) && double.IsFinite(b))
            {
                double ra = Unit.WrapDeg180(a - mean), rb = ra + Unit.WrapDeg180(b - a);
                double rel = ra + w * (rb - ra);
                // Keep the unwrapped series continuous (a slow veer past +-180 from the mean stays one curve).
                rel += 360 * Math.Round((prevRel - rel) / 360);
                d[i] = rel; okD[i] = true; prevRel = rel;
            }
        }
        if (okU.Count(x => x) < 10)
            throw new Settings.SettingsException(log.Path, 0, null, $"only {okU.Count(x => x)} times of a {dt:0.#}-s grid lie within 2.5 intervals of a row: the rows are too irregular or too gappy to fit (at least 10 needed)");
        Fill(u, okU); Fill(d, okD);
        return new LogSeries { Dt = dt, U = u, D = d, G = g, OkU = okU, OkD = okD, MeanDirDeg = mean };
    }

    public static double CircularMean(IEnumerable<double> deg)
    {
        double sx = 0, sy = 0;
        foreach (var v in deg) { sx += Math.Sin(Unit.DegToRad(v)); sy += Math.Cos(Unit.DegToRad(v)); }
        return Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(sx, sy)));
    }

    /// <summary>Linear interpolation across gaps; the ends take the nearest value.</summary>
    static void Fill(double[] x, bool[] ok)
    {
        int last = -1;
        for (int i = 0; i < x.Length; i++)
        {
            if (!ok[i]) continue;
            if (last < 0) for (int k = 0; k < i; k++) x[k] = x[i];
            else for (int k = last + 1; k < i; k++) x[k] = x[last] + (x[i] - x[last]) * (k - last) / (i - last);
            last = i;
        }
        if (last < 0) return;
        for (int k = last + 1; k < x.Length; k++) x[k] = x[last];
    }
}
