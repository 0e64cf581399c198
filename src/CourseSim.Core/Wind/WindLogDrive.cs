using CourseSim.Random;
using CourseSim.Units;
using CourseSim.Wind.Fit;

namespace CourseSim.Wind;

/// <summary>
/// A measured log driving the field's large scales (docs/wind-fit.md, "Driving a scenario with a log"): the mean speed
/// and direction at the course origin follow the log, on its own time grid, starting <see cref="OffsetS"/> seconds after
/// its first row at the starting signal; the field carries them across the course by Taylor's hypothesis, and the gust
/// tile adds the scales the log cannot resolve. Beyond either end of the log its first or last value holds.
/// With <see cref="Random"/> each race draws its window from the log by its seed (<see cref="ForSeed"/>), so a batch
/// samples a season of real afternoons and stays independent of the thread count.
/// </summary>
public sealed record WindLogDrive
{
    public required string Path { get; init; }
    public required double Dt { get; init; }
    /// <summary>Speed (m/s) and direction (deg, relative to <see cref="MeanDirDeg"/>, unwrapped) on the grid.</summary>
    public required double[] U { get; init; }
    public required double[] D { get; init; }
    public required double MeanDirDeg { get; init; }
    public double OffsetS { get; init; }
    public bool Random { get; init; }
    /// <summary>Seconds before the signal (countdown) and after it (time limit) a race needs from the log.</summary>
    public double LeadS { get; init; }
    public double SpanS { get; init; }
    public double DurationS => (U.Length - 1) * Dt;

    /// <summary>Random-window stream of the counter-based generator.</summary>
    public const ulong WindowStream = 0x5717_0010;

    public static WindLogDrive From(WindLog log, double offsetS, bool random, double leadS, double spanS)
    {
        var s = LogSeries.From(log);
        return new WindLogDrive { Path = log.Path, Dt = s.Dt, U = s.U, D = s.D, MeanDirDeg = s.MeanDirDeg, OffsetS = offsetS, Random = random, LeadS = leadS, SpanS = spanS };
    }

    /// <summary>Latest start a window can have so the whole race lies in the log (0 when the log is shorter).</summary>
    public double LatestOffset => Math.Max(LeadS, DurationS - SpanS + LeadS);

    /// <summary>
    /// The wind settings of the race with this seed: with random windows the offset is drawn uniformly over the log
    /// (keyed by the seed alone); the mean speed and direction become the window's, so the course and the riders' plans
    /// use the wind of that afternoon. Shift keys do not apply (the log gives the shifts).
    /// </summary>
    public static WindSettings ForSeed(WindSettings w, ulong seed)
    {
        if (w.Log is not { } log) return w;
        double off = log.OffsetS;
        if (log.Random)
        {
            double lo = Math.Min(log.LeadS, log.DurationS), hi = log.LatestOffset;
            off = lo + new CounterRng(seed, WindowStream).Uniform(0) * Math.Max(0, hi - lo);
        }
        var l2 = log with { OffsetS = off };
        var (u, d) = l2.WindowMean();
        return w with
        {
            Log = l2, SpeedKn = Math.Clamp(Unit.MsToKnots(u), 0, 45), DirectionDeg = Unit.WrapDeg360(d),
            RampKnPerHour = 0, ShiftAmplitudeDeg = 0, PersistentDegPerMin = 0,
            GustIntensity = w.GustIntensity * Math.Sqrt(1 - ResolvedShare(w.GustLengthM / Math.Max(u, 0.5), log.Dt)),
        };
    }

    /// <summary>
    /// The share of the von Karman variance (integral time <paramref name="tInt"/>) that means over
    /// <paramref name="avgS"/> s keep: the integral of S(f) sinc^2(pi f T) over the integral of S(f). The log already
    /// holds that share of the gusts, so a log-driven field's gust tile carries only the rest: gust_intensity (the
    /// total, as wind-fit reports it) times sqrt(1 - share).
    /// </summary>
    public static double ResolvedShare(double tInt, double avgS)
    {
        double num = 0, den = 0, prev = double.NaN, pn = 0, pd = 0;
        for (double lf = -7; lf <= 2; lf += 0.01)
        {
            double f = Math.Pow(10, lf), s = Fit.Spectra.VonKarman(f, 1, tInt) * f; // density per ln f
            double x = Math.PI * f * avgS, h = x > 0 ? Math.Sin(x) / x : 1;
            if (!double.IsNaN(prev)) { num += 0.5 * (pn + s * h * h); den += 0.5 * (pd + s); }
            prev = f; pn = s * h * h; pd = s;
        }
        return Math.Clamp(num / den, 0, 1);
    }

    /// <summary>Mean speed (m/s) and circular-mean direction (deg) over the race's window.</summary>
    public (double SpeedMs, double DirDeg) WindowMean()
    {
        double su = 0, sx = 0, sy = 0; int n = 0;
        for (double t = -LeadS; t <= SpanS - LeadS; t += Dt)
        {
            su += SpeedAt(t);
            double r = Unit.DegToRad(DirectionAt(t));
            sx += Math.Sin(r); sy += Math.Cos(r); n++;
        }
        return n == 0 ? (SpeedAt(0), DirectionAt(0)) : (su / n, Unit.RadToDeg(Math.Atan2(sx, sy)));
    }

    double Index(double t, out int i)
    {
        double x = Math.Clamp((OffsetS + t) / Dt, 0, U.Length - 1);
        i = Math.Min((int)x, U.Length - 2);
        return x - i;
    }

    /// <summary>Logged speed (m/s) at race time t (s from the signal), linearly interpolated.</summary>
    public double SpeedAt(double t)
    {
        if (U.Length == 1) return U[0];
        double f = Index(t, out int i);
        return U[i] + f * (U[i + 1] - U[i]);
    }

    /// <summary>Logged direction (deg from, not wrapped) at race time t.</summary>
    public double DirectionAt(double t)
    {
        if (D.Length == 1) return MeanDirDeg + D[0];
        double f = Index(t, out int i);
        return MeanDirDeg + D[i] + f * (D[i + 1] - D[i]);
    }
}
