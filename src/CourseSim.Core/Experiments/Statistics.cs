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
/// The statistics experiments report: Wilson score intervals for shares,
/// paired t intervals and percentile bootstrap intervals for paired differences, the chance one variant beats the
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
        double z = Normal.InvCDF(0, 1, 1 - (1 - confidence) / 2);
        double p = (double)k / n, z2 = z * z;
        double centre = (p + z2 / (2 * n)) / (1 + z2 / n);
        double half = z / (1 + z2 / n) * Math.Sqrt(p * (1 - p) / n + z2 / (4.0 * n * n));
        return new Interval(p, Math.Max(0, centre - half), Math.Min(1, centre + half));
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
    /// Percentile bootstrap interval for the mean of d (Efron and Tibshirani 1993, An Introduction to the Bootstrap,
    /// ch. 13): <paramref name="resamples"/> resamples drawn with our counter-based generator, so the interval is the
    /// same on every machine for a given seed.
    /// </summary>
    public static Interval BootstrapMean(ReadOnlySpan<double> d, ulong seed, int resamples = 4000, double confidence = 0.95)
    {
        if (d.Length < 2) throw new ArgumentException("a bootstrap needs at least two values");
        var rng = new CounterRng(seed, 0xB007);
        var means = new double[resamples];
        ulong c = 0;
        for (int r = 0; r < resamples; r++)
        {
            double s = 0;
            for (int i = 0; i < d.Length; i++) s += d[(int)(rng.Uniform(c++) * d.Length)];
            means[r] = s / d.Length;
        }
        Array.Sort(means);
        double a = (1 - confidence) / 2;
        var (mean, _) = MeanSd(d);
        return new Interval(mean, Quantile(means, a), Quantile(means, 1 - a));
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

    /// <summary>
    /// Pairs needed for a two-sided test at level alpha to detect a mean difference <paramref name="difference"/> with
    /// the given power, for paired differences of standard deviation <paramref name="sd"/>: the normal approximation
    /// n = ((z_(1-alpha/2) + z_power) sd / difference)^2, rounded up.
    /// </summary>
    public static int PairsNeeded(double difference, double sd, double alpha = 0.05, double power = 0.8)
    {
        if (difference == 0) return int.MaxValue;
        double z = Normal.InvCDF(0, 1, 1 - alpha / 2) + Normal.InvCDF(0, 1, power);
        double n = Math.Pow(z * sd / difference, 2);
        return n > int.MaxValue ? int.MaxValue : Math.Max(2, (int)Math.Ceiling(n));
    }
}
