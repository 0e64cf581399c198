namespace CourseSim.Benchmarks;

/// <summary>Best and median of repeated stretches (the machine is shared: the best is the least disturbed).</summary>
public static class Stats
{
    public static double Min(IReadOnlyList<double> xs) => xs.Count == 0 ? double.NaN : xs.Min();
    public static double Max(IReadOnlyList<double> xs) => xs.Count == 0 ? double.NaN : xs.Max();

    public static double Median(IReadOnlyList<double> xs)
    {
        if (xs.Count == 0) return double.NaN;
        var s = xs.OrderBy(x => x).ToArray();
        return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[s.Length / 2 - 1] + s[s.Length / 2]);
    }

    /// <summary>"best / median" of costs (lower is better).</summary>
    public static string Cost(IReadOnlyList<double> xs, string fmt = "F0") => $"{Min(xs).ToString(fmt)} / {Median(xs).ToString(fmt)}";

    /// <summary>"best / median" of rates (higher is better).</summary>
    public static string Rate(IReadOnlyList<double> xs, string fmt = "F2") => $"{Max(xs).ToString(fmt)} / {Median(xs).ToString(fmt)}";

    public static string Verdict(bool met) => met ? "met" : "NOT met";
}
