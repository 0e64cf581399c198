using System.Globalization;
using System.Text;
using CourseSim.Experiments;

namespace CourseSim.Cli.Output;

/// <summary>Everything the report and the terminal show of one batch, computed once.</summary>
public sealed record BatchFindings(ExperimentSpec Spec, IReadOnlyList<VariantSummary> Variants, IReadOnlyList<PairSummary> Pairs,
    IReadOnlyList<RaceRow> Rows, IReadOnlyList<OrganiserFigures> Organisers, IReadOnlyList<RiderFigures> Riders,
    IReadOnlyList<(string User, string Text)> Headlines, bool Complete, string? PeekingWarning)
{
    public static BatchFindings Of(ExperimentSpec spec, IReadOnlyList<RaceRow> rows, IReadOnlyList<(string Variant, int Race, RaceMetrics Metrics)> metrics,
        bool complete, string? peeking = null)
    {
        var (variants, pairs) = Comparison.Of(spec, rows, spec.MasterSeed);
        var organisers = spec.Variants.Select(v => OrganiserFigures.Of(v.Name, metrics.Where(m => m.Variant == v.Name).Select(m => m.Metrics).ToList(),
            rows.Where(r => r.Variant == v.Name).ToList(), spec.TargetDurationS)).ToList();
        var riders = double.IsNaN(spec.WindMinKn) ? [] : pairs.Select(p => RiderFigures.Of(spec, rows, p.A, p.B)).ToList();
        return new BatchFindings(spec, variants, pairs, rows, organisers, riders, CourseSim.Experiments.Headlines.Of(spec, pairs, organisers, riders), complete, peeking);
    }
}

/// <summary>
/// The experiment report in Markdown: the headline for each user first, then the variants, the paired differences
/// (Holm-adjusted with more than two variants), the head-to-head matrix, the organisers' figures (one row per figure,
/// one column per variant) and the riders' crossover. <see cref="ReportHtml"/> turns it into one page with the charts.
/// </summary>
public static class ExperimentReport
{
    static string F(double v, string fmt = "0.0") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";
    static string Iv(Interval i, string fmt = "0.0", double scale = 1) => !double.IsFinite(i.Estimate) ? "-"
        : double.IsFinite(i.Low) ? $"{F(i.Estimate * scale, fmt)} ({F(i.Low * scale, fmt)} to {F(i.High * scale, fmt)})" : F(i.Estimate * scale, fmt);
    static string Pct(Interval? w) => w is not Interval i || !double.IsFinite(i.Estimate) ? "-" : $"{F(i.Estimate * 100, "0")} % ({F(i.Low * 100, "0")}-{F(i.High * 100, "0")})";
    static string Spr(Spread s) => s.Count == 0 ? "-" : $"{F(s.Median / 60)} ({F(s.P10 / 60)}-{F(s.P90 / 60)})";
    public static readonly Dictionary<string, string> Users = new() { ["rider"] = "For riders", ["organiser"] = "For organisers", ["coach"] = "For coaches" };

    /// <summary>A count's interval: its lower end is not below zero.</summary>
    static Interval Count(Interval i) => i with { Low = Math.Max(0, i.Low) };

    /// <summary>What a race needs, in words.</summary>
    public static string Needed(PairSummary p)
    {
        var n = p.Needed;
        if (!double.IsFinite(n.ResolvableS.Estimate)) return $"too few races to say how many would resolve it (at least {RacesNeededPlanner.MinimumPairs} needed)";
        string res = $"these {p.Pairs} races resolve about {F(n.ResolvableS.Estimate, "0")} s ({F(n.ResolvableS.Low, "0")}-{F(n.ResolvableS.High, "0")})";
        if (!n.Known) return res;
        return res + $"; {F(Math.Abs(p.MeanDiffT.Estimate), "0.0")} s needs {(n.Capped ? "more than " : "about ")}{F(n.Estimate, "#,0")} races ({F(n.Low, "#,0")}-{(n.High >= RacesNeededPlanner.Cap ? "more" : F(n.High, "#,0"))})";
    }

    public static string Markdown(BatchFindings b)
    {
        var spec = b.Spec;
        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"# {spec.Name}\n\n");
        if (spec.Description.Length > 0) sb.Append(spec.Description).Append("\n\n");
        sb.Append(CultureInfo.InvariantCulture, $"{spec.Races} races per variant, {(spec.CommonSeeds ? "paired by seed (every variant sails race i in the same wind)" : "independent seeds")}; compared on board **{spec.Board}**; master seed {spec.MasterSeed}.");
        if (!b.Complete) sb.Append(" **Stopped early: this report covers the races that finished.**");
        sb.Append("\n\n");
        if (b.PeekingWarning is string w) sb.Append("**Warning:** ").Append(w).Append("\n\n");
        if (b.Headlines.Count > 0)
        {
            sb.Append("## Headline\n\n");
            foreach (var (user, text) in b.Headlines) sb.Append("- **").Append(Users[user]).Append(":** ").Append(text).Append('\n');
            sb.Append('\n');
        }
        sb.Append("## Variants\n\n| variant | races | mean time (s) | win share (95 %) | mean place |\n|---|---|---|---|---|\n");
        foreach (var v in b.Variants)
            sb.Append(CultureInfo.InvariantCulture, $"| {v.Name} | {v.Races} | {F(v.MeanElapsedS)} | {Pct(v.WinShare)} | {F(v.MeanPlace)} |\n");
        sb.Append("\nA board that did not finish counts the time limit as its time and the place after the last finisher.\n\n");
        if (b.Pairs.Count > 0) sb.Append(Pairs(b.Pairs));
        if (spec.Variants.Count > 2) sb.Append(HeadToHead(spec, b.Pairs));
        sb.Append(Organisers(spec, b.Organisers));
        if (b.Riders.Count > 0) sb.Append(Riders(spec, b.Riders));
        sb.Append("> ").Append(Caution.Text).Append('\n');
        return sb.ToString();
    }

    static string Pairs(IReadOnlyList<PairSummary> pairs)
    {
        bool holm = pairs.Count > 1;
        var sb = new StringBuilder("## Paired differences\n\n");
        sb.Append($"| a - b | races | mean time difference, s (95 % t) | studentised bootstrap (95 %) | p{(holm ? " (Holm)" : "")} | place difference (95 % t) | a faster in | verdict | resolvable with these races, s | races needed for this difference |\n|---|---|---|---|---|---|---|---|---|---|\n");
        foreach (var p in pairs)
        {
            string pv = holm ? $"{F(p.P, "0.000")} ({F(p.PHolm, "0.000")})" : F(p.P, "0.000");
            var n = p.Needed;
            string resolvable = double.IsFinite(n.ResolvableS.Estimate) ? $"{F(n.ResolvableS.Estimate, "0")} ({F(n.ResolvableS.Low, "0")}-{F(n.ResolvableS.High, "0")})" : $"- (under {RacesNeededPlanner.MinimumPairs} races)";
            string needed = p.Significant ? "-" : n.Known ? $"{(n.Capped ? "over " : "")}{F(n.Estimate, "#,0")} ({F(n.Low, "#,0")}-{(n.High >= RacesNeededPlanner.Cap ? "more" : F(n.High, "#,0"))})" : "-";
            sb.Append(CultureInfo.InvariantCulture, $"| {p.A} - {p.B} | {p.Pairs} | {Iv(p.MeanDiffT)} | {F(p.MeanDiffBootstrap.Low)} to {F(p.MeanDiffBootstrap.High)} | {pv} | {(p.PlaceDiffT is Interval pd ? Iv(pd, "0.00") : "-")} | {Pct(p.WinProbability)} | {(p.Significant ? "resolved" : "not resolved")} | {resolvable} | {needed} |\n");
        }
        sb.Append("\nNegative: a faster. A difference is resolved when its paired t test rejects zero at 5 %");
        sb.Append(holm ? $"; with {pairs.Count} comparisons, after Holm's step-down adjustment of the p-values (family-wise error 5 %), so a t interval that excludes zero may still be unresolved." : " (its 95 % t interval excludes zero).");
        sb.Append(" Resolvable: the difference these races resolve at 80 % power; races needed: for 80 % power at the observed difference (omitted below 10 races or for a zero difference); both with the interval from the standard deviation's.\n\n");
        return sb.ToString();
    }

    /// <summary>
    /// For coaches: a head-to-head matrix, the share of paired races where the row variant's board beat the
    /// column's, with its 95 % Wilson interval, and a mark where the paired time difference is resolved (after Holm).
    /// </summary>
    static string HeadToHead(ExperimentSpec spec, IReadOnlyList<PairSummary> pairs)
    {
        var names = spec.Variants.Select(v => v.Name).ToList();
        var sb = new StringBuilder("## Head to head\n\nShare of paired races the row beat the column (95 % interval); * where the paired time difference is resolved (Holm-adjusted).\n\n| row beats column | ");
        sb.Append(string.Join(" | ", names)).Append(" |\n|").Append(string.Concat(Enumerable.Repeat("---|", names.Count + 1))).Append('\n');
        foreach (var r in names)
        {
            sb.Append("| ").Append(r);
            foreach (var c in names)
            {
                if (r == c) { sb.Append(" | -"); continue; }
                var p = pairs.FirstOrDefault(x => x.A == r && x.B == c);
                var q = pairs.FirstOrDefault(x => x.A == c && x.B == r);
                string cell = p is not null ? Cell(p.WinProbability, p.Significant)
                    : q is not null ? Cell(new Interval(1 - q.WinProbability.Estimate, 1 - q.WinProbability.High, 1 - q.WinProbability.Low), q.Significant) : "-";
                sb.Append(" | ").Append(cell);
            }
            sb.Append(" |\n");
        }
        return sb.Append('\n').ToString();

        static string Cell(Interval w, bool sig) => $"{F(w.Estimate * 100, "0")} % ({F(w.Low * 100, "0")}-{F(w.High * 100, "0")}){(sig ? " *" : "")}";
    }

    /// <summary>For organisers: one row per figure, one column per variant, every figure with its interval.</summary>
    static string Organisers(ExperimentSpec spec, IReadOnlyList<OrganiserFigures> o)
    {
        if (o.Count == 0 || o.All(x => x.Races == 0)) return "";
        var sb = new StringBuilder("## For race organisers\n\n| figure | ").Append(string.Join(" | ", o.Select(x => x.Variant)))
            .Append(" |\n|").Append(string.Concat(Enumerable.Repeat("---|", o.Count + 1))).Append('\n');
        void Row(string name, Func<OrganiserFigures, string> cell) => sb.Append("| ").Append(name).Append(" | ").Append(string.Join(" | ", o.Select(cell))).Append(" |\n");
        Row("races", x => x.Races.ToString(CultureInfo.InvariantCulture));
        Row("race duration, first finisher: median (P10-P90), min", x => Spr(x.FirstFinisherS));
        Row("race duration, last finisher: median (P10-P90), min", x => Spr(x.LastFinisherS));
        if (!double.IsNaN(spec.TargetDurationS)) Row($"first finisher within 10 % of the {F(spec.TargetDurationS / 60)}-min target", x => Pct(x.WithinTarget));
        Row("longer than the time limit: a board not finished", x => Pct(x.SomeNotFinished));
        Row("longer than the time limit: no finisher", x => Pct(x.NoFinisher));
        for (int k = 0; k < o.Max(x => x.Legs.Count); k++)
            Row($"leg {k + 1}, mean time of finishers, min", x => k < x.Legs.Count ? $"{x.Legs[k].Label}: {Iv(x.Legs[k].MinutesT, "0.00")}" : "-");
        Row("line bias over the start sequence, mean deg (+ right end)", x => Iv(x.LineBiasDeg));
        Row("line advantage of the right end, mean m", x => Iv(x.LineBiasM, "0"));
        Row("right (boat) end favoured, share of races", x => Pct(x.RightEndFavoured));
        Row("first beat: share of boards going left, all races", x => Pct(x.ShareLeft));
        Row("first beat, races with both sides sailed: first finisher went left", x => $"{Pct(x.WinnerLeft)} of {x.SideRaces} ({F(100 * x.LeftInSplitRaces, "0")} % of their boards went left)");
        Row("first beat: mean place right minus left (+ left paid), no interval", x => F(x.SidePlaceDiff.Estimate, "0.00"));
        Row("contacts per race", x => Iv(Count(x.ContactsPerRace), "0.00"));
        Row("of which avoidable, per race", x => Iv(Count(x.AvoidablePerRace), "0.00"));
        Row("peak boards within 30 m of a mark, mean", x => F(x.PeakAtMark));
        Row("roundings within 5 s of the one before, per race", x => F(x.CloseArrivals));
        sb.Append("\nIntervals are 95 %: means over races take Student's t (leg times the studentised bootstrap); shares of races the modified Wilson interval (Brown, Cai and DasGupta 2001); the share of boards going left Wilson's with the races' clustering allowed for (Kish's effective sample size); contacts per race Garwood's exact Poisson interval. Race duration: from the signal to the first and to the last finisher. ")
          .Append("Line bias: the vector mean of the wind at the middle of the line over the start sequence, against the line's square; positive (veered) favours the right-hand (boat) end looking upwind, negative the left-hand (pin) end; advantage = line length x sin(bias). ")
          .Append("Side: the board's mean offset from the line to the first mark while on the first leg. Legs: beat, reach or run by their angle to the wind axis. ")
          .Append("Contacts: hulls within 1 m, judged under the racing rules (docs/tactics.md); avoidable: the keep-clear rider had seen it in time and was free to act.\n\n");
        return sb.ToString();
    }

    /// <summary>The steady-state polar crossovers of the board's set-up in two variants (docs/polar.md); none when the
    /// set-ups are the same.</summary>
    public static IReadOnlyList<CourseSim.Equilibrium.Crossover> PolarCrossovers(ExperimentSpec spec, string a, string b)
    {
        var ea = spec.Variants.First(v => v.Name == a).Setup.Boards.First(x => x.Id == spec.Board).Equipment;
        var eb = spec.Variants.First(v => v.Name == b).Setup.Boards.First(x => x.Id == spec.Board).Equipment;
        if (ea == eb) return [];
        double[] winds = Enumerable.Range(0, 14).Select(i => 6.0 + 2 * i).ToArray();
        double[] angles = Enumerable.Range(0, 31).Select(i => 30.0 + 5 * i).ToArray();
        return CourseSim.Equilibrium.PolarComparison.Of(CourseSim.Equilibrium.Polar.Compute(ea, winds, angles), CourseSim.Equilibrium.Polar.Compute(eb, winds, angles)).Crossovers;
    }

    /// <summary>For riders: the fitted difference by wind every 2 kn with its band, and the crossover.</summary>
    static string Riders(ExperimentSpec spec, IReadOnlyList<RiderFigures> riders)
    {
        var sb = new StringBuilder("## For riders\n\n");
        foreach (var r in riders)
        {
            sb.Append(CultureInfo.InvariantCulture, $"{r.A} - {r.B} by the race's mean wind (negative: {r.A} faster), spline fit with its 95 % band:\n\n");
            if (r.Fit is not { } fit) { sb.Append($"Too few races with a range of winds to fit ({r.Points.Count}; 8 needed).\n\n"); continue; }
            sb.Append("| wind (kn) | races within 1 kn | fitted difference (s) | 95 % band (s) |\n|---|---|---|---|\n");
            for (double x = Math.Ceiling(fit.Grid[0] / 2) * 2; x <= fit.Grid[^1] + 1e-9; x += 2)
            {
                int g = (int)Math.Round((x - fit.Grid[0]) / (fit.Grid[^1] - fit.Grid[0]) * (fit.Grid.Length - 1));
                g = Math.Clamp(g, 0, fit.Grid.Length - 1);
                int near = r.Points.Count(p => Math.Abs(p.WindKn - x) <= 1);
                sb.Append(CultureInfo.InvariantCulture, $"| {F(x, "0")} | {near} | {F(fit.Fit[g])} | {F(fit.Low[g])} to {F(fit.High[g])} |\n");
            }
            sb.Append('\n');
            var res = fit.Crossovers.Where(c => c.Resolved).ToList();
            sb.Append(res.Count > 0
                ? "Crossover: " + string.Join("; ", res.Select(c => $"{F(c.WindKn)} kn (95 % interval {F(c.LowKn)}-{F(c.HighKn)} kn), {(c.FasterBelowSign < 0 ? r.A : r.B)} faster below"))
                : fit.Crossovers.Count > 0 ? "Crossover not resolved: the fit changes sign at " + string.Join(", ", fit.Crossovers.Select(c => $"{F(c.WindKn)} kn (band holds zero {F(c.LowKn)}-{F(c.HighKn)} kn)"))
                : "No crossover in the winds sailed");
            sb.Append(CultureInfo.InvariantCulture, $". Natural cubic spline with knots at {string.Join(", ", fit.Knots.Select(k => F(k)))} kn, {fit.Points} races.");
            var pc = PolarCrossovers(spec, r.A, r.B);
            sb.Append(" The polars of the two set-ups cross at: ")
              .Append(pc.Count == 0 ? "none in 6-32 kn" : string.Join("; ", pc.Select(c => $"{c.Measure} {F(c.TwsKn)} kn ({c.FasterAbove} faster above)"))).Append(".\n\n");
        }
        return sb.ToString();
    }
}
