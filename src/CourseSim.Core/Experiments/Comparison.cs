namespace CourseSim.Experiments;

/// <summary>A variant's summary on the focus board: races, mean elapsed time, win share with its Wilson interval.</summary>
public sealed record VariantSummary(string Name, int Races, double MeanElapsedS, Interval WinShare, double MeanPlace);

/// <summary>A pair of variants compared race by race on the focus board.</summary>
public sealed record PairSummary(string A, string B, int Pairs, Interval MeanDiffT, Interval MeanDiffBootstrap, Interval WinProbability,
    bool Significant, int PairsNeeded, Interval? PlaceDiffT = null, Interval? PlaceDiffBootstrap = null);

/// <summary>
/// Paired comparison of variants on the focus board's time. A board that did not
/// finish counts the race's duration (the time limit) as its time, so it ranks behind every finisher.
/// </summary>
public static class Comparison
{

    public static (IReadOnlyList<VariantSummary> Variants, IReadOnlyList<PairSummary> Pairs) Of(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, ulong seed)
    {
        var focus = rows.Where(r => r.BoardId == spec.Focus).ToList();
        var byVariant = spec.Variants.ToDictionary(v => v.Name, v => focus.Where(r => r.Variant == v.Name).ToDictionary(r => r.Race));
        var variants = new List<VariantSummary>();
        foreach (var v in spec.Variants)
        {
            var list = byVariant[v.Name].Values.OrderBy(r => r.Race).ToList();
            if (list.Count == 0) { variants.Add(new VariantSummary(v.Name, 0, double.NaN, new Interval(double.NaN, double.NaN, double.NaN), double.NaN)); continue; }
            int wins = list.Count(r => r.Place == 1);
            variants.Add(new VariantSummary(v.Name, list.Count, list.Average(r => r.TimeOrLimitS), Statistics.Wilson(wins, list.Count),
                list.Average(r => (double)(r.Place ?? int.MaxValue / 2))));
        }
        // Finishers per race of each variant, counted once: a board that did not finish takes the place after the last.
        var finishers = rows.Where(r => r.Place is not null).GroupBy(r => (r.Variant, r.Race)).ToDictionary(g => g.Key, g => g.Count());
        double PlaceOf(RaceRow r) => r.Place ?? (finishers.GetValueOrDefault((r.Variant, r.Race)) + 1);
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
                var t = Statistics.PairedT(d);
                var boot = Statistics.BootstrapMean(d, seed ^ (ulong)(i * 1000 + j));
                var (_, sd) = Statistics.MeanSd(d);
                var dp = common.Select(k => PlaceOf(a[k]) - PlaceOf(b[k])).ToArray();
                pairs.Add(new PairSummary(spec.Variants[i].Name, spec.Variants[j].Name, common.Count, t, boot, Statistics.WinProbability(ta, tb),
                    t.ExcludesZero, Statistics.PairsNeeded(t.Estimate, sd), Statistics.PairedT(dp), Statistics.BootstrapMean(dp, seed ^ (ulong)(i * 1000 + j) ^ 0x9A))); 
            }
        return (variants, pairs);
    }
}
