using CourseSim.Random;
using MathNet.Numerics.Distributions;

namespace CourseSim.Experiments;

/// <summary>An interval with its point estimate.</summary>
public readonly record struct Interval(double Estimate, double Low, double High)
{
    /// <summary>Whether the interval excludes zero (the difference is resolved at this level).</summary>
    public bool ExcludesZero => Low > 0 || High < 0;
}

/// <summary>
/// The statistics experiments report: Wilson score intervals for shares (plain and modified), Garwood's Poisson interval for rates,
/// paired t intervals and studentised bootstrap intervals for paired differences, Holm's adjustment, the chance one variant beats the
/// other, and the number of races a difference of a given size needs. Quantiles from MathNet.Numerics.
/// </summary>
public static class Statistics
{
    /// <summary>
    /// Wilson score interval for a share k of n (Wilson 1927, JASA 22:209-212; method 3 of Newcombe 1998, Stat Med
    /// 17:857-872), at two-sided level <paramref name="confidence"/>.
    /// </summary>
    public static Interval Wilson(int k, int n, double confidence = 0.95)
    {
        if (n <= 0) throw new ArgumentOutOfRangeException(nameof(n), "a share needs at least one trial");
        if (k < 0 || k > n) throw new ArgumentOutOfRangeException(nameof(k), $"successes {k} outside 0..{n}");
        double p = (double)k / n;
        var (low, high) = WilsonBounds(p, n, Normal.InvCDF(0, 1, 1 - (1 - confidence) / 2));
        return new Interval(p, low, high);
    }

    /// <summary>
    /// The Wilson score bounds of a share p over n trials (n may be an effective, non-whole sample size) at normal
    /// quantile z. At p = 0 and p = 1 the bound is exactly 0 or 1 (centre and half agree there; rounding would leave 1e-17).
    /// </summary>
    static (double Low, double High) WilsonBounds(double p, double n, double z)
    {
        double z2 = z * z;
        double centre = (p + z2 / (2 * n)) / (1 + z2 / n);
        double half = z / (1 + z2 / n) * Math.Sqrt(p * (1 - p) / n + z2 / (4.0 * n * n));
        return (p <= 0 ? 0 : Math.Max(0, centre - half), p >= 1 ? 1 : Math.Min(1, centre + half));
    }

    /// <summary>
    /// A share of boards pooled over races, where boards of one race are not independent (they sail the same wind and
    /// follow each other): the Wilson interval with Kish's effective sample size, n / deff with deff = 1 + (m - 1) rho
    /// (Kish 1965, Survey Sampling, sec. 5.4), rho the intra-race correlation by one-way analysis of variance (Donner
    /// 1986, Int Stat Rev 54:67-82), clipped to 0..1 and taken as 1 when every race is alike (no variance to tell it);
    /// as Dean and Pagano 2015 (J Surv Stat Methodol 3:484-503) recommend for clustered shares (from memory).
    /// <paramref name="k"/> and <paramref name="n"/>: each race's count and boards.
    /// </summary>
    public static Interval ClusteredShare(IReadOnlyList<int> k, IReadOnlyList<int> n, double confidence = 0.95)
    {
        int races = 0; double total = 0, hits = 0, sumSq = 0;
        for (int i = 0; i < n.Count; i++)
            if (n[i] > 0) { races++; total += n[i]; hits += k[i]; sumSq += (double)n[i] * n[i]; }
        if (races == 0) return new Interval(double.NaN, double.NaN, double.NaN);
        double p = hits / total, rho = 1, m0 = total / races;
        if (races > 1)
        {
            double between = 0, within = 0;
            for (int i = 0; i < n.Count; i++)
            {
                if (n[i] == 0) continue;
                double pi = (double)k[i] / n[i];
                between += n[i] * (pi - p) * (pi - p);
                within += n[i] * pi * (1 - pi);
            }
            double msb = between / (races - 1), msw = total > races ? within / (total - races) : 0;
            m0 = (total - sumSq / total) / (races - 1);
            double den = msb + (m0 - 1) * msw;
            rho = den > 1e-12 ? Math.Clamp((msb - msw) / den, 0, 1) : 1;
        }
        double nEff = total / (1 + (m0 - 1) * rho);
        var (low, high) = WilsonBounds(p, nEff, Normal.InvCDF(0, 1, 1 - (1 - confidence) / 2));
        return new Interval(p, low, high);
    }

    /// <summary>
    /// The modified Wilson interval of Brown, Cai and DasGupta (2001, Stat Sci 16:101-133, sec. 4.1.1): the Wilson
    /// interval, except that for 1 to x* successes (x* = 2 for n up to 50, 3 above) the lower bound is the Poisson one,
    /// chi2(2x; alpha) / 2n, and symmetrically the upper bound for 1 to x* failures. Plain Wilson's coverage dips well
    /// below the nominal level for shares near 0 or 1 (a rare event seen once in 10 races); this repairs it.
    /// </summary>
    public static Interval WilsonModified(int k, int n, double confidence = 0.95)
    {
        var w = Wilson(k, n, confidence);
        int xStar = n <= 50 ? 2 : 3;
        double alpha = 1 - confidence;
        double low = w.Low, high = w.High;
        if (k >= 1 && k <= xStar) low = ChiSquared.InvCDF(2 * k, alpha) / (2.0 * n);
        if (n - k >= 1 && n - k <= xStar) high = 1 - ChiSquared.InvCDF(2 * (n - k), alpha) / (2.0 * n);
        return new Interval(w.Estimate, low, high);
    }

    /// <summary>
    /// A rate of events per race from a total count over n races, with Garwood's exact Poisson interval (Garwood 1936,
    /// Biometrika 28:437-442): chi2(2K; alpha/2) / 2n to chi2(2K + 2; 1 - alpha/2) / 2n (0 below when K = 0). For rare
    /// counts (contacts per race), where a t interval over ten races that all saw none would shrink to nothing.
    /// </summary>
    public static Interval PoissonRate(int total, int n, double confidence = 0.95)
    {
        if (n <= 0) throw new ArgumentOutOfRangeException(nameof(n), "a rate needs at least one race");
        if (total < 0) throw new ArgumentOutOfRangeException(nameof(total), "a count cannot be negative");
        double a = 1 - confidence;
        double low = total == 0 ? 0 : ChiSquared.InvCDF(2 * total, a / 2) / (2.0 * n);
        return new Interval((double)total / n, low, ChiSquared.InvCDF(2 * total + 2, 1 - a / 2) / (2.0 * n));
    }

    /// <summary>Mean and sample standard deviation (n - 1), summed in order (deterministic).</summary>
    public static (double Mean, double Sd) MeanSd(ReadOnlySpan<double> x)
    {
        if (x.Length == 0) throw new ArgumentException("no values");
        double sum = 0;
        foreach (var v in x) sum += v;
        double mean = sum / x.Length, ss = 0;
        foreach (var v in x) ss += (v - mean) * (v - mean);
        return (mean, x.Length > 1 ? Math.Sqrt(ss / (x.Length - 1)) : double.NaN);
    }

    /// <summary>Student's t interval for the mean of paired differences d (Student 1908, Biometrika 6:1-25).</summary>
    public static Interval PairedT(ReadOnlySpan<double> d, double confidence = 0.95)
    {
        if (d.Length < 2) throw new ArgumentException("a paired t interval needs at least two pairs");
        var (mean, sd) = MeanSd(d);
        double t = StudentT.InvCDF(0, 1, d.Length - 1, 1 - (1 - confidence) / 2);
        double half = t * sd / Math.Sqrt(d.Length);
        return new Interval(mean, mean - half, mean + half);
    }

    /// <summary>
    /// Symmetric studentised (bootstrap-t) interval for the mean of d (Efron and Tibshirani 1993, An Introduction to the
    /// Bootstrap, ch. 12.5; the symmetric form: Hall 1988, J R Stat Soc B 50:35-45): each resample's
    /// t = (mean* - mean) / se*, and the interval mean +- q se with q the (1 - a) quantile of |t*|. Unlike the percentile
    /// bootstrap it holds its level at small n (the percentile interval is too narrow by about the factor t/z there);
    /// the symmetric form's coverage error is of smaller order than the equal-tailed one's (Hall 1988).
    /// A resample with no spread counts as an infinite t (or zero when its mean equals the mean): conservative.
    /// Resamples are drawn with our counter-based generator, so the interval is the same on every machine for a seed.
    /// </summary>
    public static Interval BootstrapT(ReadOnlySpan<double> d, ulong seed, int resamples = 4000, double confidence = 0.95)
    {
        if (d.Length < 2) throw new ArgumentException("a bootstrap needs at least two values");
        var (mean, sd) = MeanSd(d);
        double se = sd / Math.Sqrt(d.Length);
        if (se == 0) return new Interval(mean, mean, mean);
        var rng = new CounterRng(seed, 0xB007);
        var ts = new double[resamples];
        ulong c = 0;
        int n = d.Length;
        for (int r = 0; r < resamples; r++)
        {
            double s = 0, ss = 0;
            for (int i = 0; i < n; i++)
            {
                double v = d[(int)(rng.Uniform(c++) * n)];
                s += v; ss += v * v;
            }
            double m = s / n, var = Math.Max(0, (ss - n * m * m) / (n - 1));
            double seStar = Math.Sqrt(var / n);
            double diff = m - mean;
            ts[r] = seStar > 1e-12 * (Math.Abs(mean) + se) ? Math.Abs(diff) / seStar : Math.Abs(diff) <= 1e-12 * (Math.Abs(mean) + se) ? 0 : double.PositiveInfinity;
        }
        Array.Sort(ts);
        double q = Quantile(ts, confidence);
        return new Interval(mean, mean - q * se, mean + q * se);
    }

    /// <summary>Two-sided p-value of the paired t test that the mean of d is zero (Student 1908); 1 when there is no
    /// spread and the mean is zero, 0 when there is no spread and the mean is not.</summary>
    public static double PairedTP(ReadOnlySpan<double> d)
    {
        if (d.Length < 2) throw new ArgumentException("a paired t test needs at least two pairs");
        var (mean, sd) = MeanSd(d);
        if (sd == 0) return mean == 0 ? 1 : 0;
        double t = mean / (sd / Math.Sqrt(d.Length));
        return 2 * (1 - StudentT.CDF(0, 1, d.Length - 1, Math.Abs(t)));
    }

    /// <summary>
    /// Holm's step-down adjustment of p-values for m comparisons (Holm 1979, Scand J Statist 6:65-70): sorted
    /// ascending, p(i) becomes max over j &lt;= i of min(1, (m - j + 1) p(j)); a comparison is significant at level alpha
    /// when its adjusted p is at most alpha. Controls the family-wise error rate. Returned in the input order.
    /// </summary>
    public static double[] Holm(IReadOnlyList<double> p)
    {
        int m = p.Count;
        var order = Enumerable.Range(0, m).OrderBy(i => p[i]).ThenBy(i => i).ToArray();
        var adj = new double[m];
        double run = 0;
        for (int k = 0; k < m; k++)
        {
            run = Math.Max(run, Math.Min(1, (m - k) * p[order[k]]));
            adj[order[k]] = run;
        }
        return adj;
    }

    /// <summary>Linear-interpolation quantile of sorted values (Hyndman and Fan 1996, definition 7).</summary>
    public static double Quantile(double[] sorted, double p)
    {
        if (sorted.Length == 0) throw new ArgumentException("no values");
        double h = (sorted.Length - 1) * Math.Clamp(p, 0, 1);
        int lo = (int)Math.Floor(h);
        int hi = Math.Min(lo + 1, sorted.Length - 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }

    /// <summary>Share of pairs where a beat b (a smaller time), ties counting half, with its Wilson interval.</summary>
    public static Interval WinProbability(ReadOnlySpan<double> a, ReadOnlySpan<double> b, double confidence = 0.95)
    {
        if (a.Length != b.Length || a.Length == 0) throw new ArgumentException("pairs of equal, non-zero length needed");
        double wins = 0;
        for (int i = 0; i < a.Length; i++) wins += a[i] < b[i] ? 1 : a[i] == b[i] ? 0.5 : 0;
        var w = Wilson((int)Math.Round(wins), a.Length, confidence);
        return w with { Estimate = wins / a.Length };
    }
}
