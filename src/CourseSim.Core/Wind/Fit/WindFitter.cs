using CourseSim.Random;
using CourseSim.Units;

namespace CourseSim.Wind.Fit;

/// <summary>One fitted key of the [wind] table with its 95 % interval; <c>Resolved</c> false when the log cannot tell it.</summary>
public sealed record FittedValue(string Key, double Value, double Low, double High, bool Resolved, string Method);

/// <summary>The result of fitting the field to a log (docs/wind-fit.md).</summary>
public sealed class WindFitResult
{
    public required WindLog Log { get; init; }
    public required LogSeries Series { get; init; }
    public required double AveragingS { get; init; }
    public required WindEstimate Estimate { get; init; }
    public required IReadOnlyList<FittedValue> Values { get; init; }
    public required WindSettings Settings { get; init; }
    public required double GustFactorLog { get; init; }
    public required double GustFactorModel { get; init; }
    public required Spectrum SpeedSpectrum { get; init; }
    public required int Replicates { get; init; }
    public required IReadOnlyList<string> Notes { get; init; }
    public FittedValue this[string key] => Values.First(v => v.Key == key);
    /// <summary>The fitted model's speed spectrum as the station sees it (m^2/s^2 per Hz).</summary>
    public double ModelSpeedDensity(double f) => Spectra.Observed(f, Estimate.Sigma2U, Estimate.TIntU, Series.Dt, AveragingS);
}

/// <summary>
/// Fits the wind field's parameters to a measured log and gives each an interval (docs/wind-fit.md): moving-block
/// bootstrap (Kunsch 1989, Ann. Statist. 17) of the line fits for mean, ramp, direction and trend; a parametric
/// bootstrap (Efron and Tibshirani 1993, An Introduction to the Bootstrap, ch. 6) for the spectral parameters, whose
/// structure is longer than any block a log of a few hours could give.
/// </summary>
public static class WindFitter
{
    public static WindFitResult Fit(WindLog log, double? averagingS = null, int replicates = 100, ulong seed = 1, Action<int, int>? progress = null)
    {
        var ser = LogSeries.From(log);
        double dt = ser.Dt, avg = averagingS ?? dt;
        var est = WindEstimator.Estimate(ser.U, ser.OkU, ser.D, ser.OkD, dt, avg);
        var notes = new List<string>();
        bool coarse = dt > WindEstimator.CoarseStepS;
        bool gustOk = double.IsFinite(est.Sigma2U) && est.TIntU < 0.8 * log.DurationS / 4;
        bool shiftOk = double.IsFinite(est.ShiftPeriodS) && est.ShiftAmpDeg > 0 && est.ShiftPeriodS >= 4 * dt && est.ShiftPeriodS <= log.DurationS / 3;
        if (coarse) notes.Add($"rows every {dt:0} s: gusts (seconds to a minute) and shifts of a few minutes are averaged away or aliased; only mean, ramp, direction and trend are fitted. A log every minute or faster resolves them.");
        else if (!shiftOk) notes.Add("no oscillating shift with a period between 4 rows and a third of the log was found");
        if (ser.GapShare > 0.02) notes.Add($"{ser.GapShare:P0} of the time grid were gaps, filled linearly for the spectra");
        if (log.DurationS < 3600) notes.Add($"the log covers {log.DurationS / 60:0} min: intervals are wide; an hour or more is better");

        // Mean, ramp, direction, trend: moving-block bootstrap of the residuals of the two lines.
        double bl = Math.Max(1200, Math.Max(shiftOk ? 2 * est.ShiftPeriodS : 0, gustOk ? 10 * est.TIntU : 0));
        int block = Math.Clamp((int)Math.Round(bl / dt), 3, Math.Max(3, ser.Count / 5));
        var rng = new CounterRng(seed, 0xF17_0001);
        var lines = BlockBootstrap(ser, block, 400, rng);
        var arLines = ArBootstrap(ser, 400, rng.For(999_999));
        double u0 = est.U0, sigU = gustOk ? Math.Sqrt(est.Sigma2U) : double.NaN;
        // The field's speed is |(U + u, v)|: its mean exceeds the along-wind mean U by about sigma_v^2/(2U), with
        // sigma_v = 0.8 sigma_u (IEC 61400-1 ed. 3, annex B; the field's lateral component, docs/wind.md).
        // Without a resolved spectrum the intensity for this small correction comes from the log's gust factor,
        // I = (G - 1)/2.5 (a peak factor times sigma_3s/sigma of about 2.5, common practice), else the default 0.12.
        double gl = StationSampler.GustFactor(log, dt);
        double iLift = gustOk ? sigU / u0 : double.IsFinite(gl) ? Math.Clamp((gl - 1) / 2.5, 0, 0.4) : new WindSettings().GustIntensity;
        double lift = u0 > 1 ? 0.32 * iLift * iLift * u0 : 0;
        // Rows are stamped at the end of their averaging interval: the window starts avg before the first stamp, and a
        // row's mean belongs to the middle of its interval, so the line is read avg/2 before the first stamp.
        double back = avg / 2;
        // Spectral parameters: parametric bootstrap from the fitted model through the same station sampling. Its
        // replicates also give the lines' spread under the fitted spectrum; each line parameter takes the wider of the
        // two intervals (the block bootstrap underestimates the variance when a log holds few blocks).
        var boot = new List<WindEstimate>();
        if (!coarse)
        {
            for (int r = 0; r < replicates; r++)
            {
                boot.Add(Replicate(est, ser, dt, avg, shiftOk, rng.For((ulong)r + 1)));
                progress?.Invoke(r + 1, replicates);
            }
        }
        string blockHow = $"widest of block bootstrap ({block * dt / 60:0} min blocks), AR(1) residual bootstrap{(coarse ? "" : " and parametric")}";
        var vals = new List<FittedValue>
        {
            Wider3(arLines, l => Unit.MsToKnots(l.A - l.B * back - lift), Interval("speed_kn", Unit.MsToKnots(u0 - est.RampMsPerS * back - lift), lines.Select(l => Unit.MsToKnots(l.A - l.B * back - lift)), true, "least-squares line, " + blockHow, false),
                Interval("speed_kn", Unit.MsToKnots(u0 - est.RampMsPerS * back - lift), boot.Select(b => Unit.MsToKnots(b.U0 - b.RampMsPerS * back - lift)), true, "", false)),
            Wider3(arLines, l => Unit.MsToKnots(l.B) * 3600, Interval("ramp_kn_per_hour", Unit.MsToKnots(est.RampMsPerS) * 3600, lines.Select(l => Unit.MsToKnots(l.B) * 3600), true, "slope of the same line", false),
                Interval("ramp_kn_per_hour", Unit.MsToKnots(est.RampMsPerS) * 3600, boot.Select(b => Unit.MsToKnots(b.RampMsPerS) * 3600), true, "", false)),
            Wider3(arLines, l => Unit.WrapDeg360(ser.MeanDirDeg + l.C - l.E * back), Interval("direction_deg", Unit.WrapDeg360(ser.MeanDirDeg + est.Dir0Deg - est.TrendDegPerS * back), lines.Select(l => Unit.WrapDeg360(ser.MeanDirDeg + l.C - l.E * back)), true, "least-squares line of the unwrapped direction, " + blockHow, false, circular: true),
                Interval("direction_deg", Unit.WrapDeg360(ser.MeanDirDeg + est.Dir0Deg - est.TrendDegPerS * back), boot.Select(b => Unit.WrapDeg360(ser.MeanDirDeg + b.Dir0Deg - b.TrendDegPerS * back)), true, "", false, circular: true)),
            Wider3(arLines, l => l.E * 60, Interval("persistent_deg_per_min", est.TrendDegPerS * 60, lines.Select(l => l.E * 60), true, "slope of the direction line", false),
                Interval("persistent_deg_per_min", est.TrendDegPerS * 60, boot.Select(b => b.TrendDegPerS * 60), true, "", false)),
        };
        const string gustHow = "Whittle fit of the station-filtered von Karman spectrum (Welch), parametric bootstrap";
        const string shiftHow = "periodogram of the direction above the gust baseline, parametric bootstrap";
        vals.Add(Interval("shift_amplitude_deg", shiftOk ? est.ShiftAmpDeg : double.NaN, boot.Select(b => b.ShiftAmpDeg), shiftOk, shiftHow, true));
        vals.Add(Interval("shift_period_s", shiftOk ? est.ShiftPeriodS : double.NaN, boot.Select(b => b.ShiftPeriodS), shiftOk, shiftHow, true));
        vals.Add(Interval("shift_irregularity", shiftOk ? est.ShiftIrr : double.NaN, boot.Select(b => b.ShiftIrr), shiftOk, shiftHow, false, 0, 1));
        vals.Add(Interval("gust_intensity", gustOk ? sigU / u0 : double.NaN, boot.Select(b => Math.Sqrt(b.Sigma2U) / u0), gustOk, gustHow, true));
        vals.Add(Interval("gust_length_m", gustOk ? est.TIntU * u0 : double.NaN, boot.Select(b => b.TIntU * u0), gustOk, gustHow, true));

        var defaults = new WindSettings();
        double V(string k, double def) => vals.First(v => v.Key == k) is { Resolved: true } fv && double.IsFinite(fv.Value) ? fv.Value : def;
        var fitted = defaults with
        {
            SpeedKn = Math.Clamp(V("speed_kn", 14), 0, 45), DirectionDeg = V("direction_deg", 225), RampKnPerHour = Math.Clamp(V("ramp_kn_per_hour", 0), -20, 20),
            PersistentDegPerMin = Math.Clamp(V("persistent_deg_per_min", 0), -5, 5),
            ShiftAmplitudeDeg = shiftOk ? Math.Clamp(V("shift_amplitude_deg", 0), 0, 45) : 0, ShiftPeriodS = Math.Clamp(V("shift_period_s", 360), 30, 7200),
            ShiftIrregularity = Math.Clamp(V("shift_irregularity", 0.3), 0, 1),
            GustIntensity = Math.Clamp(V("gust_intensity", defaults.GustIntensity), 0, 0.4), GustLengthM = Math.Clamp(V("gust_length_m", defaults.GustLengthM), 10, 2000),
        };
        double gLog = StationSampler.GustFactor(log, dt);
        double gModel = double.NaN;
        if (double.IsFinite(gLog))
        {
            var field = new WindField(fitted, seed);
            var rows = StationSampler.Sample(field, 0, 0, Math.Clamp(log.DurationS, 1800, 6 * 3600), dt, log.HasGust);
            gModel = StationSampler.GustFactor(StationSampler.ToLog(rows), dt);
        }
        return new WindFitResult
        {
            Log = log, Series = ser, AveragingS = avg, Estimate = est, Values = vals, Settings = fitted, GustFactorLog = gLog, GustFactorModel = gModel,
            SpeedSpectrum = Spectra.Welch(Detrended(ser.U, est.U0, est.RampMsPerS, dt), dt, WindEstimator.SegmentLength(ser.Count)),
            Replicates = coarse ? 0 : replicates, Notes = notes,
        };
    }

    static double[] Detrended(double[] x, double a, double b, double dt) => x.Select((v, i) => v - a - b * i * dt).ToArray();

    readonly record struct Lines(double A, double B, double C, double E);

    static List<Lines> BlockBootstrap(LogSeries s, int block, int reps, CounterRng rng)
    {
        double dt = s.Dt; int n = s.Count;
        var (a, b) = WindEstimator.Line(s.U, s.OkU, dt);
        var (c, e) = WindEstimator.Line(s.D, s.OkD, dt);
        var ru = new double[n]; var rd = new double[n];
        for (int i = 0; i < n; i++) { ru[i] = s.U[i] - a - b * i * dt; rd[i] = s.D[i] - c - e * i * dt; }
        var list = new List<Lines>(reps);
        var yu = new double[n]; var yd = new double[n]; var ku = new bool[n]; var kd = new bool[n];
        for (int r = 0; r < reps; r++)
        {
            var br = rng.For(1000 + (ulong)r);
            int i = 0; ulong q = 0;
            while (i < n)
            {
                int st = (int)(br.Uniform(q++) * (n - block + 1));
                for (int k = 0; k < block && i < n; k++, i++)
                {
                    yu[i] = a + b * i * dt + ru[st + k]; ku[i] = s.OkU[st + k];
                    yd[i] = c + e * i * dt + rd[st + k]; kd[i] = s.OkD[st + k];
                }
            }
            var (a2, b2) = WindEstimator.Line(yu, ku, dt);
            var (c2, e2) = WindEstimator.Line(yd, kd, dt);
            list.Add(new Lines(a2, b2, c2, e2));
        }
        return list;
    }

    /// <summary>A series drawn from the fitted model as this station would log it, estimated again.</summary>
    static WindEstimate Replicate(WindEstimate est, LogSeries s, double dt, double avg, bool shiftOk, CounterRng rng)
    {
        int n = s.Count;
        var u = double.IsFinite(est.Sigma2U)
            ? Spectra.Synthesise(n, dt, f => Spectra.Observed(f, est.Sigma2U, est.TIntU, dt, avg), rng.For(1))
            : new double[n];
        double lat = est.LatLevel, latT = est.LatTInt;
        var d = double.IsFinite(lat) ? Spectra.Synthesise(n, dt, f => WindEstimator.Baseline(f, lat, latT, dt, avg), rng.For(2)) : new double[n];
        if (shiftOk)
        {
            // The field's own construction (WindField): six random-phase components, periods spread log-uniformly over
            // P 2^(-irr)..P 2^(irr), each of amplitude A/sqrt 6 (one pure sinusoid at irregularity 0).
            var sr = rng.For(3);
            int k = est.ShiftIrr <= 0 ? 1 : 6;
            for (int c = 0; c < k; c++)
            {
                double z = k == 1 ? 0 : 2 * sr.Uniform((ulong)(3 * c)) - 1;
                double w = 2 * Math.PI / est.ShiftPeriodS * Math.Pow(2, est.ShiftIrr * z), ph = 2 * Math.PI * sr.Uniform((ulong)(3 * c + 1));
                double amp = est.ShiftAmpDeg / Math.Sqrt(k);
                for (int i = 0; i < n; i++)
                {
                    // Averaged logs hold the interval's mean of the shift: the sinusoid times sinc(pi f T_avg), centred.
                    double t = i * dt + avg / 2, g = avg > 0 ? Math.Sin(w * avg / 2) / (w * avg / 2) : 1;
                    d[i] += amp * g * Math.Sin(w * t + ph);
                }
            }
        }
        for (int i = 0; i < n; i++) { u[i] += est.U0 + est.RampMsPerS * i * dt; d[i] += est.Dir0Deg + est.TrendDegPerS * i * dt; }
        return WindEstimator.Estimate(u, s.OkU, d, s.OkD, dt, avg, est);
    }

    static FittedValue Wider3(List<Lines> ar, Func<Lines, double> of, FittedValue a, FittedValue b)
    {
        var w = Wider(a, b);
        var c = Interval(a.Key, a.Value, ar.Select(of), true, "", false, circular: a.Key == "direction_deg");
        return Wider(w, c);
    }

    /// <summary>
    /// Residual bootstrap with an AR(1) model of each line's residuals (lag-1 autocorrelation phi, innovations of
    /// variance s^2 (1 - phi^2)): the variance of a line fitted to few, correlated rows (10-min means over a few hours),
    /// where blocks are too few to carry it.
    /// </summary>
    static List<Lines> ArBootstrap(LogSeries s, int reps, CounterRng rng)
    {
        double dt = s.Dt; int n = s.Count;
        var (a, b) = WindEstimator.Line(s.U, s.OkU, dt);
        var (c, e) = WindEstimator.Line(s.D, s.OkD, dt);
        var ru = new double[n]; var rd = new double[n];
        for (int i = 0; i < n; i++) { ru[i] = s.U[i] - a - b * i * dt; rd[i] = s.D[i] - c - e * i * dt; }
        static (double Phi, double Sd) Ar(double[] r)
        {
            double v = WindEstimator.Variance(r), m = r.Average(), c1 = 0;
            for (int i = 1; i < r.Length; i++) c1 += (r[i] - m) * (r[i - 1] - m);
            double phi = v > 0 ? Math.Clamp(c1 / (r.Length * v), -0.99, 0.99) : 0;
            return (phi, Math.Sqrt(v * (1 - phi * phi)));
        }
        var (pu, su) = Ar(ru); var (pd, sd) = Ar(rd);
        var list = new List<Lines>(reps);
        var yu = new double[n]; var yd = new double[n];
        for (int r = 0; r < reps; r++)
        {
            var g = rng.For((ulong)r);
            double xu = su / Math.Sqrt(1 - pu * pu) * g.Normal(0), xd = sd / Math.Sqrt(1 - pd * pd) * g.Normal(1);
            for (int i = 0; i < n; i++)
            {
                if (i > 0) { xu = pu * xu + su * g.Normal((ulong)(2 * i + 2)); xd = pd * xd + sd * g.Normal((ulong)(2 * i + 3)); }
                yu[i] = a + b * i * dt + xu; yd[i] = c + e * i * dt + xd;
            }
            var (a2, b2) = WindEstimator.Line(yu, s.OkU, dt);
            var (c2, e2) = WindEstimator.Line(yd, s.OkD, dt);
            list.Add(new Lines(a2, b2, c2, e2));
        }
        return list;
    }

    /// <summary>The first value with the union of both intervals (the second only when it has one).</summary>
    static FittedValue Wider(FittedValue a, FittedValue b)
        => double.IsFinite(b.Low) && double.IsFinite(a.Low) ? a with { Low = Math.Min(a.Low, b.Low), High = Math.Max(a.High, b.High) } : a;

    /// <summary>
    /// The basic bootstrap interval 2 theta - q(0.975) .. 2 theta - q(0.025) (Davison and Hinkley 1997, Bootstrap
    /// Methods and their Application, eq. 5.6), on the log scale for positive quantities, clamped to [lo, hi].
    /// </summary>
    static FittedValue Interval(string key, double value, IEnumerable<double> reps, bool resolved, string method, bool logScale,
        double lo = double.NegativeInfinity, double hi = double.PositiveInfinity, bool circular = false)
    {
        if (!resolved || !double.IsFinite(value)) return new FittedValue(key, double.NaN, double.NaN, double.NaN, false, method);
        var r = reps.Where(double.IsFinite).ToArray();
        if (circular) r = r.Select(x => value + Unit.WrapDeg180(x - value)).ToArray();
        if (logScale) r = r.Where(x => x > 0).ToArray();
        if (r.Length < 20) return new FittedValue(key, value, double.NaN, double.NaN, true, method);
        Array.Sort(r);
        double qlo = r[(int)(0.025 * (r.Length - 1))], qhi = r[(int)Math.Ceiling(0.975 * (r.Length - 1))];
        double a, b;
        if (logScale && value > 0) { a = value * value / qhi; b = value * value / qlo; }
        else { a = 2 * value - qhi; b = 2 * value - qlo; }
        a = Math.Max(a, lo); b = Math.Min(b, hi);
        if (circular) { a = value - (value - a); b = value + (b - value); }
        return new FittedValue(key, value, a, b, true, method);
    }
}
