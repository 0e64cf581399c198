namespace CourseSim.Experiments;

/// <summary>A variant's summary on the compared board: races, mean time, win share with its Wilson interval, and the
/// mean place that counts (a board that did not finish takes the place after the last finisher).</summary>
public sealed record VariantSummary(string Name, int Races, double MeanElapsedS, Interval WinShare, double MeanPlace);

/// <summary>
/// A pair of variants compared race by race on the board: the paired difference of time (a minus b) with its t and
/// studentised bootstrap intervals, the t test's p-value and, with more than two variants, its Holm-adjusted p; the
/// share of races a beat b; whether the difference is resolved (after Holm when there are more than two variants); the
/// races a difference of this size needs; and the paired difference of place (t interval only: places take a few whole
/// values, and the studentised bootstrap on them is far too wide, resolving 0 of 100 A/A experiments where 5 were due).
/// </summary>
public sealed record PairSummary(string A, string B, int Pairs, Interval MeanDiffT, Interval MeanDiffBootstrap, Interval WinProbability,
    bool Significant, RacesNeeded Needed, Interval? PlaceDiffT = null, double P = double.NaN,
    double PHolm = double.NaN)
{
    /// <summary>Whether Holm's adjustment applies (more than one comparison).</summary>
    public bool Adjusted => !double.IsNaN(PHolm);
}

/// <summary>
/// Paired comparison of variants on the board's time. A board that did not finish counts the time limit as its time,
/// so it ranks behind every finisher, and the place after the last finisher.
/// </summary>
public static class Comparison
{
    /// <summary>Level of every interval and test.</summary>
    public const double Alpha = 0.05;

    public static (IReadOnlyList<VariantSummary> Variants, IReadOnlyList<PairSummary> Pairs) Of(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, ulong seed)
    {
        var focus = rows.Where(r => r.BoardId == spec.Board).ToList();
        var byVariant = spec.Variants.ToDictionary(v => v.Name, v => focus.Where(r => r.Variant == v.Name).ToDictionary(r => r.Race));
        var variants = new List<VariantSummary>();
        foreach (var v in spec.Variants)
        {
            var list = byVariant[v.Name].Values.OrderBy(r => r.Race).ToList();
            if (list.Count == 0) { variants.Add(new VariantSummary(v.Name, 0, double.NaN, new Interval(double.NaN, double.NaN, double.NaN), double.NaN)); continue; }
            int wins = list.Count(r => r.Place == 1);
            variants.Add(new VariantSummary(v.Name, list.Count, list.Average(r => r.TimeOrLimitS), Statistics.Wilson(wins, list.Count),
                list.Average(r => (double)r.PlaceScored)));
        }
        var pairs = new List<PairSummary>();
        for (int i = 0; i < spec.Variants.Count; i++)
            for (int j = i + 1; j < spec.Variants.Count; j++)
            {
                var a = byVariant[spec.Variants[i].Name]; var b = byVariant[spec.Variants[j].Name];
                var common = a.Keys.Intersect(b.Keys).Order().ToList();
                if (common.Count < 2) continue;
                var ta = common.Select(k => a[k].TimeOrLimitS).ToArray();
                var tb = common.Select(k => b[k].TimeOrLimitS).ToArray();
                var d = ta.Zip(tb, (x, y) => x - y).ToArray();
                var t = Statistics.PairedT(d, 1 - Alpha);
                ulong s = seed ^ (ulong)(i * 1000 + j);
                var boot = Statistics.BootstrapT(d, s, confidence: 1 - Alpha);
                var (mean, sd) = Statistics.MeanSd(d);
                var dp = common.Select(k => (double)(a[k].PlaceScored - b[k].PlaceScored)).ToArray();
                pairs.Add(new PairSummary(spec.Variants[i].Name, spec.Variants[j].Name, common.Count, t, boot, Statistics.WinProbability(ta, tb, 1 - Alpha),
                    t.ExcludesZero, RacesNeededPlanner.Of(mean, sd, common.Count, Alpha), Statistics.PairedT(dp, 1 - Alpha), Statistics.PairedTP(d)));
            }
        // More than one comparison: Holm's step-down adjustment of the paired t tests decides what is resolved.
        if (pairs.Count > 1)
        {
            var adj = Statistics.Holm(pairs.Select(p => p.P).ToArray());
            for (int k = 0; k < pairs.Count; k++) pairs[k] = pairs[k] with { PHolm = adj[k], Significant = adj[k] <= Alpha };
        }
        return (variants, pairs);
    }
}
