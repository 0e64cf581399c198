using System.Globalization;
using CourseSim.Experiments;
using Spectre.Console;

namespace CourseSim.Cli.Output;

/// <summary>summary.json, the report's charts by section, and the terminal summary of a batch (headline first).</summary>
public static class BatchSummary
{
    static string F(double v, string fmt = "0.0") => double.IsFinite(v) ? v.ToString(fmt, CultureInfo.InvariantCulture) : "-";
    static double? N(double v) => double.IsFinite(v) ? v : null;
    static object Iv(Interval i) => new { estimate = N(i.Estimate), low = N(i.Low), high = N(i.High) };
    static object Sp(Spread s) => new { median = N(s.Median), p10 = N(s.P10), p90 = N(s.P90) };

    public static string Json(BatchFindings b, string experimentPath, IReadOnlyList<string> experimentSet, int looks)
    {
        var spec = b.Spec;
        return Output.Json.Serialize(new
        {
            experiment = spec.Name,
            experiment_file = Path.GetFullPath(experimentPath),
            experiment_set = experimentSet,
            seed = spec.MasterSeed,
            focus = spec.Focus,
            board = spec.Board,
            races_per_variant = spec.Races,
            complete = b.Complete,
            looks,
            peeking_warning = b.PeekingWarning,
            headlines = b.Headlines.Select(h => new { user = h.User, text = h.Text }),
            variants = b.Variants.Select(v => new { name = v.Name, races = v.Races, mean_elapsed_s = v.MeanElapsedS, win_share = v.WinShare.Estimate,
                win_share_low = v.WinShare.Low, win_share_high = v.WinShare.High, mean_place = v.MeanPlace }),
            pairs = b.Pairs.Select(p => new { a = p.A, b = p.B, races = p.Pairs, mean_diff_s = p.MeanDiffT.Estimate, ci_low_s = p.MeanDiffT.Low, ci_high_s = p.MeanDiffT.High,
                bootstrap_t_low_s = p.MeanDiffBootstrap.Low, bootstrap_t_high_s = p.MeanDiffBootstrap.High, p_value = N(p.P), p_holm = N(p.PHolm),
                p_a_beats_b = p.WinProbability.Estimate, p_a_beats_b_low = p.WinProbability.Low, p_a_beats_b_high = p.WinProbability.High,
                significant = p.Significant, races_needed = N(p.Needed.Estimate), races_needed_low = N(p.Needed.Low), races_needed_high = N(p.Needed.High),
                resolvable_diff_s = N(p.Needed.ResolvableS.Estimate), resolvable_diff_low_s = N(p.Needed.ResolvableS.Low), resolvable_diff_high_s = N(p.Needed.ResolvableS.High),
                mean_place_diff = p.PlaceDiffT?.Estimate, place_ci_low = p.PlaceDiffT?.Low, place_ci_high = p.PlaceDiffT?.High }),
            organisers = b.Organisers.Select(o => new
            {
                variant = o.Variant, races = o.Races, first_finisher_s = Sp(o.FirstFinisherS), last_finisher_s = Sp(o.LastFinisherS),
                share_within_target = o.WithinTarget is Interval w ? Iv(w) : null, share_board_not_finished = Iv(o.SomeNotFinished), share_no_finisher = Iv(o.NoFinisher),
                line_bias_deg = Iv(o.LineBiasDeg), line_bias_m = Iv(o.LineBiasM), share_right_end_favoured = Iv(o.RightEndFavoured),
                share_left = Iv(o.ShareLeft), place_right_minus_left = o.SidePlaceDiff.Estimate is var sd && double.IsFinite(sd) ? sd : (double?)null, share_winner_left = Iv(o.WinnerLeft),
                share_left_in_split_races = double.IsFinite(o.LeftInSplitRaces) ? o.LeftInSplitRaces : (double?)null, split_races = o.SideRaces, legs = o.Legs.Select(l => new { leg = l.Label, minutes = Iv(l.MinutesT) }),
                contacts_per_race = Iv(o.ContactsPerRace), avoidable_contacts_per_race = Iv(o.AvoidablePerRace),
                peak_boards_at_mark = N(o.PeakAtMark), close_arrivals_per_race = N(o.CloseArrivals),
            }),
            riders = b.Riders.Select(r => new
            {
                a = r.A, b = r.B, races = r.Points.Count, spline_knots_kn = r.Fit?.Knots,
                crossovers = (r.Fit?.Crossovers ?? []).Select(c => new { wind_kn = c.WindKn, low_kn = c.LowKn, high_kn = c.HighKn, resolved = c.Resolved,
                    faster_below = c.FasterBelowSign < 0 ? r.A : r.B }),
            }),
            caution = Caution.Text,
        });
    }

    /// <summary>The charts, by the report section they follow.</summary>
    public static Dictionary<string, List<(string, byte[])>> Charts(BatchFindings b)
    {
        var c = new Dictionary<string, List<(string, byte[])>>();
        if (ExperimentCharts.Intervals(b.Pairs) is { } iv) c["Paired differences"] = [("paired differences", iv)];
        c["For race organisers"] = [("race durations", ExperimentCharts.Durations(b.Organisers, b.Rows, b.Spec)), ("side fairness", ExperimentCharts.Sides(b.Organisers))];
        var riders = new List<(string, byte[])>();
        foreach (var r in b.Riders)
            if (ExperimentCharts.Crossover(r, ExperimentReport.PolarCrossovers(b.Spec, r.A, r.B).Select(x => (x.Measure, x.TwsKn)).ToList()) is { } png)
                riders.Add(($"{r.A} - {r.B} by wind", png));
        if (riders.Count > 0) c["For riders"] = riders;
        return c;
    }

    /// <summary>The terminal summary: the headline for the experiment's user, then the variants and the pairs.</summary>
    public static void Print(BatchFindings b, IAnsiConsole console)
    {
        var spec = b.Spec;
        console.MarkupLine($"[bold]{Markup.Escape(spec.Name)}[/]: {spec.Races} races per variant, board {Markup.Escape(spec.Board)}");
        if (b.PeekingWarning is string w) console.MarkupLine("[yellow]Warning: " + Markup.Escape(w) + "[/]");
        foreach (var (user, text) in b.Headlines) console.MarkupLine($"[bold green]{Markup.Escape(ExperimentReport.Users[user])}:[/] {Markup.Escape(text)}");
        var t = new Table().Border(TableBorder.Simple);
        t.AddColumn("variant"); t.AddColumn(new TableColumn("races").RightAligned()); t.AddColumn(new TableColumn("mean time").RightAligned());
        t.AddColumn(new TableColumn("win share (95 %)").RightAligned()); t.AddColumn(new TableColumn("mean place").RightAligned());
        foreach (var v in b.Variants)
            t.AddRow(Markup.Escape(v.Name), v.Races.ToString(CultureInfo.InvariantCulture), F(v.MeanElapsedS) + " s",
                $"{F(v.WinShare.Estimate * 100, "0")} % ({F(v.WinShare.Low * 100, "0")}-{F(v.WinShare.High * 100, "0")})", F(v.MeanPlace));
        console.Write(t);
        foreach (var p in b.Pairs)
            console.MarkupLine(Markup.Escape($"{p.A} - {p.B}: {F(p.MeanDiffT.Estimate)} s (95 % t {F(p.MeanDiffT.Low)} to {F(p.MeanDiffT.High)}; studentised bootstrap " +
                $"{F(p.MeanDiffBootstrap.Low)} to {F(p.MeanDiffBootstrap.High)}){(p.Adjusted ? $", Holm-adjusted p {F(p.PHolm, "0.000")}" : "")}: " +
                (p.Significant ? "resolved" : "not resolved; " + ExperimentReport.Needed(p))));
    }
}
