namespace CourseSim.Experiments;

/// <summary>One wind-speed bin of paired differences: its range (kn), the races in it and their mean difference (s).</summary>
public readonly record struct WindBin(double LowKn, double HighKn, int Races, double MeanDiffS);

/// <summary>
/// For riders: paired differences binned by the race's wind, and the winds where
/// the sign of the binned mean difference changes (where one rig overtakes the other), by linear interpolation between
/// the centres of neighbouring bins.
/// </summary>
public static class WindBins
{
    public static IReadOnlyList<WindBin> Of(IEnumerable<(double WindKn, double DiffS)> pairs, double binKn)
    {
        if (binKn <= 0) throw new ArgumentOutOfRangeException(nameof(binKn));
        return pairs.Where(p => double.IsFinite(p.WindKn) && double.IsFinite(p.DiffS))
            .GroupBy(p => Math.Floor(p.WindKn / binKn))
            .OrderBy(g => g.Key)
            .Select(g => new WindBin(g.Key * binKn, (g.Key + 1) * binKn, g.Count(), g.Average(p => p.DiffS)))
            .ToList();
    }

    /// <summary>Winds (kn) where the mean difference changes sign between neighbouring bins.</summary>
    public static IReadOnlyList<double> Crossovers(IReadOnlyList<WindBin> bins)
    {
        var list = new List<double>();
        for (int i = 1; i < bins.Count; i++)
        {
            double a = bins[i - 1].MeanDiffS, b = bins[i].MeanDiffS;
            if (a == 0 || Math.Sign(a) == Math.Sign(b)) continue;
            double ca = 0.5 * (bins[i - 1].LowKn + bins[i - 1].HighKn), cb = 0.5 * (bins[i].LowKn + bins[i].HighKn);
            list.Add(ca + (cb - ca) * a / (a - b));
        }
        return list;
    }
}
