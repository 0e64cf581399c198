using MathNet.Numerics.Distributions;

namespace CourseSim.Experiments;

/// <summary>
/// How many paired races a difference needs, and the smallest difference the races at hand can resolve, both from the
/// observed standard deviation of the paired differences with its own 95 % interval. <see cref="Estimate"/> is NaN
/// when it is not estimated: fewer than <see cref="RacesNeededPlanner.MinimumPairs"/> pairs (the standard deviation is
/// too rough), or a zero observed difference. Estimates above <see cref="RacesNeededPlanner.Cap"/> are shown as
/// "more than" the cap, so the figure cannot blow up.
/// </summary>
public readonly record struct RacesNeeded(double Estimate, double Low, double High, Interval ResolvableS)
{
    public bool Known => double.IsFinite(Estimate);
    public bool Capped => Known && Estimate >= RacesNeededPlanner.Cap;
}

/// <summary>
/// Sample size for a paired comparison by the normal approximation n = ((z(1 - alpha/2) + z(power)) sd / difference)^2
/// (e.g. Chow, Shao and Wang 2008, Sample Size Calculations in Clinical Research, 2nd ed., sec. 3.1), and its inverse,
/// the difference resolvable with n pairs: (z(1 - alpha/2) + z(power)) sd / sqrt(n). The uncertainty comes from the
/// chi-square interval of the standard deviation: sd sqrt((n-1) / chi2(1 - a/2, n-1)) .. sd sqrt((n-1) / chi2(a/2, n-1))
/// (e.g. NIST/SEMATECH e-Handbook of Statistical Methods, sec. 7.2.3 / 1.3.5.8).
/// </summary>
public static class RacesNeededPlanner
{
    /// <summary>Below this many pairs no estimate is given: the standard deviation's interval spans a factor of 2.</summary>
    public const int MinimumPairs = 10;
    /// <summary>The most races per variant an experiment accepts; larger estimates are shown as "more than" this.</summary>
    public const double Cap = 100000;

    /// <summary>(z(1 - alpha/2) + z(power))</summary>
    static double Z(double alpha, double power) => Normal.InvCDF(0, 1, 1 - alpha / 2) + Normal.InvCDF(0, 1, power);

    /// <summary>Pairs needed for a difference, at the standard deviation given; rounded up, at least 2, at most the cap.</summary>
    public static double Pairs(double difference, double sd, double alpha = 0.05, double power = 0.8)
    {
        if (difference == 0 || !double.IsFinite(difference)) return double.NaN;
        double n = Math.Pow(Z(alpha, power) * sd / difference, 2);
        return Math.Min(Cap, Math.Max(2, Math.Ceiling(n)));
    }

    /// <summary>The figures for paired differences of observed mean <paramref name="difference"/>, standard deviation
    /// <paramref name="sd"/> over <paramref name="n"/> pairs.</summary>
    public static RacesNeeded Of(double difference, double sd, int n, double alpha = 0.05, double power = 0.8)
    {
        if (n < MinimumPairs || !double.IsFinite(sd))
            return new RacesNeeded(double.NaN, double.NaN, double.NaN, new Interval(double.NaN, double.NaN, double.NaN));
        double lo = sd * Math.Sqrt((n - 1) / ChiSquared.InvCDF(n - 1, 0.975));
        double hi = sd * Math.Sqrt((n - 1) / ChiSquared.InvCDF(n - 1, 0.025));
        double z = Z(alpha, power) / Math.Sqrt(n);
        var resolvable = new Interval(z * sd, z * lo, z * hi);
        return new RacesNeeded(Pairs(difference, sd, alpha, power), Pairs(difference, lo, alpha, power), Pairs(difference, hi, alpha, power), resolvable);
    }
}
