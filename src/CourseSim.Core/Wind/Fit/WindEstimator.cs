using MathNet.Numerics.Optimization;

namespace CourseSim.Wind.Fit;

/// <summary>Point estimates of the field's parameters from one regular series (SI: m/s, s, deg).</summary>
public sealed record WindEstimate(double U0, double RampMsPerS, double Dir0Deg, double TrendDegPerS,
    double Sigma2U, double TIntU, double ShiftAmpDeg, double ShiftPeriodS, double ShiftIrr,
    double LatLevel, double LatTInt, double Sigma2D);

/// <summary>
/// The estimators of the wind fit (docs/wind-fit.md, "Method"): least-squares lines for mean and ramp, direction and
/// trend; a Whittle fit of the station-filtered von Karman spectrum to the Welch spectrum of the speed for turbulence
/// intensity and integral time; the oscillating shift from the periodogram of the direction above the fitted
/// gust baseline.
/// </summary>
public static class WindEstimator
{
    /// <summary>Logs sampled more coarsely than this (s) resolve neither gusts nor shifts of a few minutes.</summary>
    public const double CoarseStepS = 120;
    /// <summary>The speed spectrum is fitted up to 0.1 Hz: above, an anemometer's own response (a distance constant of a
    /// few metres) and the gust field's smallest scale (about 12 m, docs/wind.md) bend it below von Karman's form.</summary>
    public const double SpeedFitMaxHz = 0.1;

    public static (double A, double B) Line(double[] y, bool[] ok, double dt)
    {
        double st = 0, sy = 0, stt = 0, sty = 0; int n = 0;
        for (int i = 0; i < y.Length; i++)
        {
            if (!ok[i]) continue;
            double t = i * dt; st += t; sy += y[i]; stt += t * t; sty += t * y[i]; n++;
        }
        double den = n * stt - st * st;
        double b = den > 0 ? (n * sty - st * sy) / den : 0;
        return ((sy - b * st) / n, b);
    }

    public static int SegmentLength(int n) => Math.Max(16, Spectra.HighestPow2(Math.Max(16, n / 8)));

    public static WindEstimate Estimate(double[] u, bool[] okU, double[] d, bool[] okD, double dt, double avgS, WindEstimate? start = null)
    {
        var (a, b) = Line(u, okU, dt);
        var (c, e) = Line(d, okD, dt);
        int n = u.Length, seg = SegmentLength(n);
        var ru = new double[n]; var rd = new double[n];
        for (int i = 0; i < n; i++) { ru[i] = u[i] - a - b * i * dt; rd[i] = d[i] - c - e * i * dt; }
        double s2 = double.NaN, ti = double.NaN;
        if (dt <= CoarseStepS)
            (s2, ti) = FitVonKarman(Spectra.Welch(ru, dt, seg), dt, avgS, Variance(ru), Math.Max(2 * dt, 10), 0, SpeedFitMaxHz,
                start: start is { } st && double.IsFinite(st.Sigma2U) ? (st.Sigma2U, st.TIntU) : null);
        double amp = double.NaN, per = double.NaN, irr = double.NaN, latL = double.NaN, latT = double.NaN;
        if (dt <= CoarseStepS) (amp, per, irr, latL, latT) = Shift(rd, dt, avgS, seg, start);
        return new WindEstimate(a, b, c, e, s2, ti, amp, per, irr, latL, latT, Variance(rd));
    }

    public static double Variance(double[] x)
    {
        double m = x.Average(), s = 0;
        foreach (var v in x) s += (v - m) * (v - m);
        return s / x.Length;
    }

    /// <summary>
    /// Whittle's approximate likelihood for an averaged periodogram, sum over frequencies of P_k/S_k + ln S_k
    /// (Whittle 1953, Ark. Mat. 2; for Welch estimates, Percival and Walden 1993, Spectral Analysis for Physical
    /// Applications, sec. 6.17, from memory), minimised over ln sigma^2 and ln T with MathNet's Nelder-Mead simplex.
    /// </summary>
    public static (double Sigma2, double TInt) FitVonKarman(Spectrum s, double dt, double avgS, double var0, double t0, double fMin = 0,
        double fMax = double.MaxValue, (double, double)? start = null)
    {
        // Bins grouped into bands of a tenth of a decade (the likelihood of a band of n bins is n times that of its mean),
        // so a fit costs the same whatever the record length.
        var bands = new List<(double F, double P, int N)>();
        double edge = 0; double fs = 0, ps = 0; int nb = 0;
        for (int k = 0; k < s.F.Length; k++)
        {
            if (s.F[k] < fMin || s.F[k] > fMax) continue;
            if (nb > 0 && s.F[k] > edge) { bands.Add((fs / nb, ps / nb, nb)); fs = 0; ps = 0; nb = 0; }
            if (nb == 0) edge = s.F[k] * 1.2589;
            fs += s.F[k]; ps += s.P[k]; nb++;
        }
        if (nb > 0) bands.Add((fs / nb, ps / nb, nb));
        if (bands.Count < 3) return (double.NaN, double.NaN);
        double Cost(double ls2, double lt)
        {
            if (lt < Math.Log(0.2) || lt > Math.Log(4000) || ls2 > 20 || ls2 < -30) return 1e12 + Math.Abs(lt) + Math.Abs(ls2);
            double s2 = Math.Exp(ls2), t = Math.Exp(lt), c = 0;
            foreach (var b in bands)
            {
                double m = Spectra.Observed(b.F, s2, t, dt, avgS);
                c += b.N * (b.P / m + Math.Log(m));
            }
            return c;
        }
        double bl, bt;
        if (start is (double s0, double st0)) { bl = Math.Log(s0); bt = Math.Log(st0); }
        else
        {
            // A coarse scan of the time scale first (the likelihood can be flat in T for averaged logs), then the simplex.
            double bestC = double.MaxValue; bl = 0; bt = Math.Log(t0);
            double l0 = Math.Log(Math.Max(var0, 1e-6));
            for (double lt = Math.Log(1); lt <= Math.Log(1000); lt += 0.35)
                for (double ls = l0 - 1; ls <= l0 + 4; ls += 0.5)
                {
                    double cc = Cost(ls, lt);
                    if (cc < bestC) { bestC = cc; bl = ls; bt = lt; }
                }
        }
        try
        {
            var r = NelderMeadSimplex.Minimum(ObjectiveFunction.Value(v => Cost(v[0], v[1])),
                MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense([bl, bt]),
                MathNet.Numerics.LinearAlgebra.Vector<double>.Build.Dense([0.3, 0.3]), 1e-4, 250);
            return (Math.Exp(r.MinimizingPoint[0]), Math.Exp(r.MinimizingPoint[1]));
        }
        catch (MaximumIterationsException) { return (Math.Exp(bl), Math.Exp(bt)); }
    }

    /// <summary>
    /// The oscillating shift: the Tukey-tapered periodogram of the whole detrended direction series; the gust baseline (the
    /// lateral component, a von Karman spectrum fitted above the shift band) is subtracted, and the excess within
    /// [f/3, 3 f] around its peak gives the amplitude (variance A^2/2), the period (its power-weighted geometric-mean
    /// frequency) and the irregularity (its spread in octaves, less a pure sinusoid's spread at this record length,
    /// against the field's uniform spread over +-irr octaves, variance irr^2/3).
    /// </summary>
    static (double Amp, double Per, double Irr, double LatLevel, double LatT) Shift(double[] rd, double dt, double avgS, int seg, WindEstimate? start)
    {
        var full = Periodogram(rd, dt);
        double fNyq = 0.5 / dt, lo = Math.Max(1.0 / 7200, full.F[0]), hi = Math.Min(1.0 / 30, fNyq / 2);
        // Peak of f P(f) (a log-frequency view), smoothed over 5 bins.
        double best = 0, fPeak = double.NaN;
        for (int k = 2; k < full.F.Length - 2; k++)
        {
            if (full.F[k] < lo || full.F[k] > hi) continue;
            double v = 0; for (int q = -2; q <= 2; q++) v += full.P[k + q];
            v *= full.F[k];
            if (v > best) { best = v; fPeak = full.F[k]; }
        }
        if (double.IsNaN(fPeak)) return (0, double.NaN, double.NaN, double.NaN, double.NaN);
        var welch = Spectra.Welch(rd, dt, seg);
        double latL, latT;
        int above = welch.F.Count(f => f > 2.5 * fPeak);
        if (above >= 12) (latL, latT) = FitVonKarman(welch, dt, avgS, Variance(rd) * 0.3, 10, 2.5 * fPeak,
            start: start is { } st && double.IsFinite(st.LatTInt) ? (st.LatLevel, st.LatTInt) : null);
        else { latL = Flat(welch, 1.5 * fPeak); latT = double.NaN; }
        double Base(double f) => Baseline(f, latL, latT, dt, avgS);
        var (amp, per, spread) = Excess(full, Base, fPeak);
        var (_, _, spread0) = Excess(Periodogram(Tone(rd.Length, dt, 1 / per), dt), _ => 0, 1 / per);
        double irr = Math.Sqrt(3 * Math.Max(0, spread * spread - spread0 * spread0));
        // An averaging station holds the interval's mean of the shift: its amplitude times sinc(pi T_avg / P).
        if (avgS > 0) { double x = Math.PI * avgS / per; amp /= Math.Sin(x) / x; }
        return (amp, per, Math.Min(irr, 1), latL, latT);
    }

    /// <summary>The gust baseline of the direction spectrum: von Karman through the station, or flat (level only) when
    /// the log has too few frequencies above the shift to fit its shape.</summary>
    public static double Baseline(double f, double level, double tInt, double dt, double avgS)
        => double.IsFinite(tInt) ? Spectra.Observed(f, level, tInt, dt, avgS) : level;

    static double Flat(Spectrum s, double fFrom)
    {
        var v = s.F.Select((f, k) => (f, k)).Where(p => p.f > fFrom).Select(p => s.P[p.k]).ToArray();
        return v.Length > 0 ? v.Average() : 0;
    }

    static double[] Tone(int n, double dt, double f) => Enumerable.Range(0, n).Select(i => Math.Sin(2 * Math.PI * f * i * dt)).ToArray();

    static (double Amp, double Per, double SpreadOct) Excess(Spectrum full, Func<double, double> baseline, double fPeak)
    {
        double fc = fPeak;
        double var = 0, wsum = 0, lsum = 0, l2 = 0;
        for (int iter = 0; iter < 3; iter++)
        {
            var = 0; wsum = 0; lsum = 0; l2 = 0;
            double df = full.F[1] - full.F[0];
            for (int k = 0; k < full.F.Length; k++)
            {
                double f = full.F[k];
                if (f < fc / 3 || f > fc * 3) continue;
                double ex = full.P[k] - baseline(f);
                var += ex * df;
                if (ex <= 0) continue;
                double lf = Math.Log2(f);
                wsum += ex; lsum += ex * lf; l2 += ex * lf * lf;
            }
            if (wsum <= 0) return (0, 1 / fPeak, 0);
            fc = Math.Pow(2, lsum / wsum);
        }
        double m = lsum / wsum;
        return (Math.Sqrt(2 * Math.Max(var, 0)), 1 / fc, Math.Sqrt(Math.Max(0, l2 / wsum - m * m)));
    }

    /// <summary>Periodogram of the whole series with a Tukey taper (cosine over the first and last 10 %: the record is
    /// weighted evenly, so a shift whose strength waxes and wanes is not judged by the middle of the log alone),
    /// zero-padded to a power of two (one-sided density).</summary>
    public static Spectrum Periodogram(double[] x, double dt)
    {
        int n = x.Length, N = Spectra.HighestPow2(n); if (N < n) N *= 2;
        N *= 2;
        var buf = new System.Numerics.Complex[N];
        double m = x.Average(), w2 = 0;
        int edge = Math.Max(1, n / 10);
        for (int j = 0; j < n; j++)
        {
            int e = Math.Min(j, n - 1 - j);
            double w = e >= edge ? 1 : 0.5 - 0.5 * Math.Cos(Math.PI * e / edge);
            w2 += w * w; buf[j] = (x[j] - m) * w;
        }
        MathNet.Numerics.IntegralTransforms.Fourier.Forward(buf, MathNet.Numerics.IntegralTransforms.FourierOptions.Matlab);
        var f = new double[N / 2 - 1]; var p = new double[N / 2 - 1];
        for (int k = 1; k < N / 2; k++)
        {
            f[k - 1] = k / (N * dt);
            p[k - 1] = 2 * dt * (buf[k].Real * buf[k].Real + buf[k].Imaginary * buf[k].Imaginary) / w2;
        }
        return new Spectrum(f, p, 1);
    }
}
