using System.Globalization;

namespace CourseSim.Experiments;

/// <summary>For riders: one pair's paired differences by the race's wind, and the fitted crossover (null: too few races).</summary>
public sealed record RiderFigures(string A, string B, IReadOnlyList<(double WindKn, double DiffS)> Points, CrossoverFit? Fit)
{
    public static RiderFigures Of(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, string a, string b)
    {
        var ra = rows.Where(r => r.Variant == a && r.BoardId == spec.Board).ToDictionary(r => r.Race);
        var rb = rows.Where(r => r.Variant == b && r.BoardId == spec.Board).ToDictionary(r => r.Race);
        var pts = ra.Keys.Intersect(rb.Keys).Order().Where(k => double.IsFinite(ra[k].WindKn))
            .Select(k => (ra[k].WindKn, ra[k].TimeOrLimitS - rb[k].TimeOrLimitS)).ToList();
        return new RiderFigures(a, b, pts, CrossoverFit.Of(pts.Select(p => p.Item1).ToArray(), pts.Select(p => p.Item2).ToArray()));
    }
}

/// <summary>
/// The headline for each user, one or two sentences with their intervals, chosen by the experiment's focus: riders
/// (where one set-up overtakes the other), organisers (race duration, target, line), coaches (which variant beats which,
/// Holm-adjusted when there are more than two).
/// </summary>
public static class Headlines
{
    static string F(double v, string fmt = "0.0") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";
    static string Pct(Interval w) => $"{F(w.Estimate * 100, "0")} % of races ({F(w.Low * 100, "0")}-{F(w.High * 100, "0")})";

    /// <summary>The headlines, as (user, sentence) in the order rider, organiser, coach.</summary>
    public static IReadOnlyList<(string User, string Text)> Of(ExperimentSpec spec, IReadOnlyList<PairSummary> pairs,
        IReadOnlyList<OrganiserFigures> organisers, IReadOnlyList<RiderFigures> riders)
    {
        var list = new List<(string, string)>();
        bool all = spec.Focus == "all";
        if (spec.Focus == "rider" || all && riders.Count > 0) list.Add(("rider", Rider(spec, pairs, riders)));
        if (spec.Focus == "organiser" || all) list.Add(("organiser", Organiser(spec, organisers)));
        if ((spec.Focus == "coach" || all) && pairs.Count > 0) list.Add(("coach", Coach(spec, pairs)));
        return list;
    }

    static string Diff(PairSummary p) => $"{F(Math.Abs(p.MeanDiffT.Estimate), "0")} s per race ({F(Math.Abs(p.MeanDiffT.Estimate) == p.MeanDiffT.Estimate ? p.MeanDiffT.Low : -p.MeanDiffT.High, "0")} to " +
        $"{F(Math.Abs(p.MeanDiffT.Estimate) == p.MeanDiffT.Estimate ? p.MeanDiffT.High : -p.MeanDiffT.Low, "0")} s)";

    static string Overall(PairSummary p)
    {
        string faster = p.MeanDiffT.Estimate < 0 ? p.A : p.B, slower = faster == p.A ? p.B : p.A;
        return p.Significant
            ? $"{faster} beats {slower} by {Diff(p)}{(p.Adjusted ? $", Holm-adjusted p {F(p.PHolm, "0.000")}" : "")}, over {p.Pairs} paired races"
            : $"{p.A} and {p.B} are not resolved: {faster} ahead by {Diff(p)} over {p.Pairs} paired races{(p.Adjusted ? " (Holm-adjusted)" : "")}";
    }

    public static string Rider(ExperimentSpec spec, IReadOnlyList<PairSummary> pairs, IReadOnlyList<RiderFigures> riders)
    {
        if (riders.Count == 0 || riders[0].Fit is null)
            return pairs.Count == 0 ? "One variant: nothing to compare." : Overall(pairs[0]) + " (no range of winds to find a crossover in: set wind_min_kn and wind_max_kn).";
        var r = riders[0];
        var fit = r.Fit!;
        var res = fit.Crossovers.Where(c => c.Resolved).ToList();
        string range = $"{F(fit.Grid[0], "0")}-{F(fit.Grid[^1], "0")} kn";
        if (res.Count == 1)
        {
            var c = res[0];
            string below = c.FasterBelowSign < 0 ? r.A : r.B, above = below == r.A ? r.B : r.A;
            return $"{below} is faster below {F(c.WindKn)} kn (95 % interval {F(c.LowKn)}-{F(c.HighKn)} kn), {above} above ({fit.Points} paired races across {range}, spline fit).";
        }
        if (res.Count > 1)
            return $"{r.A} and {r.B} swap more than once across {range}: at " + string.Join(", ", res.Select(c => $"{F(c.WindKn)} kn ({F(c.LowKn)}-{F(c.HighKn)})")) + ".";
        var p = pairs.First(x => x.A == r.A && x.B == r.B);
        if (fit.Crossovers.Count > 0)
        {
            var c = fit.Crossovers[0];
            return $"Crossover not resolved: the fitted difference {r.A} - {r.B} changes sign near {F(c.WindKn)} kn, but its 95 % band holds zero from {F(c.LowKn)} to {F(c.HighKn)} kn. Overall, {Overall(p)}.";
        }
        return $"No crossover in {range}: {Overall(p)}.";
    }

    public static string Organiser(ExperimentSpec spec, IReadOnlyList<OrganiserFigures> organisers)
    {
        var parts = new List<string>();
        foreach (var o in organisers)
        {
            var s = $"{o.Variant}: median race {F(o.FirstFinisherS.Median / 60)} min to the first finisher (P10-P90 {F(o.FirstFinisherS.P10 / 60)}-{F(o.FirstFinisherS.P90 / 60)}), " +
                $"{F(o.LastFinisherS.Median / 60)} min to the last";
            if (o.WithinTarget is Interval w) s += $"; within 10 % of the {F(spec.TargetDurationS / 60)}-min target in {Pct(w)}";
            if (o.SomeNotFinished.Estimate > 0) s += $"; a board still out at the time limit in {Pct(o.SomeNotFinished)}";
            parts.Add(s + ".");
        }
        if (organisers.Count > 0)
        {
            var o = organisers[0];
            var b = o.LineBiasDeg;
            string end = b.Estimate > 0 ? "right-hand (boat)" : "left-hand (pin)";
            parts.Add(b.ExcludesZero
                ? $"Start line: the {end} end favoured by {F(Math.Abs(b.Estimate))}° on average ({F(Math.Min(Math.Abs(b.Low), Math.Abs(b.High)))}-{F(Math.Max(Math.Abs(b.Low), Math.Abs(b.High)))}), {F(Math.Abs(o.LineBiasM.Estimate), "0")} m of line; the right end favoured in {Pct(o.RightEndFavoured)}."
                : $"Start line: no end favoured on average (mean bias {F(b.Estimate)}°, {F(b.Low)} to {F(b.High)}; positive favours the right-hand end); the right end favoured in {Pct(o.RightEndFavoured)}.");
        }
        return string.Join(" ", parts);
    }

    public static string Coach(ExperimentSpec spec, IReadOnlyList<PairSummary> pairs)
    {
        var resolved = pairs.Where(p => p.Significant).OrderByDescending(p => Math.Abs(p.MeanDiffT.Estimate)).ToList();
        string how = pairs.Count > 1 ? $" ({pairs.Count} comparisons, Holm-adjusted)" : "";
        if (resolved.Count > 0) return string.Join("; ", resolved.Select(Overall)) + how + ".";
        var big = pairs.OrderByDescending(p => Math.Abs(p.MeanDiffT.Estimate)).First();
        string need = big.Needed.Known ? $"; a difference this size needs about {(big.Needed.Capped ? "more than " : "")}{F(big.Needed.Estimate, "#,0")} races ({F(big.Needed.Low, "#,0")}-{F(big.Needed.High, "#,0")})" : "";
        return $"No difference resolved{how}. The largest: {Overall(big)}{need}.";
    }
}
