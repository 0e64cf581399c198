namespace CourseSim.Experiments;

/// <summary>A spread of values: median and the 10th and 90th percentiles (Hyndman and Fan definition 7), and how many.</summary>
public readonly record struct Spread(double Median, double P10, double P90, int Count)
{
    public static Spread Of(IEnumerable<double> values)
    {
        var v = values.Where(double.IsFinite).Order().ToArray();
        return v.Length == 0 ? new Spread(double.NaN, double.NaN, double.NaN, 0)
            : new Spread(Statistics.Quantile(v, 0.5), Statistics.Quantile(v, 0.1), Statistics.Quantile(v, 0.9), v.Length);
    }
}

/// <summary>A leg of the course, its mean time over the races (each race's mean over its finishers) with its t interval.</summary>
public sealed record LegTime(string Label, Interval MinutesT);

/// <summary>
/// What a race organiser asks of one variant, every figure with its interval, races being the independent units:
/// race duration (first and last finisher), the share of races with no finisher within the time limit and with a board
/// not finishing by it, the share within 10 % of a target duration, the signed line bias over the start sequence and the
/// share of races each end was favoured, side fairness on the first beat, leg times by leg, contacts and bunching.
/// Means over races take Student's t interval (leg times the studentised bootstrap); shares of races the modified Wilson interval; the share of boards going
/// left a Wilson interval for clustered shares; contacts per race Garwood's Poisson interval (Statistics). Side fairness
/// is judged by the share of races (both sides sailed) whose first finisher went left, beside the share of boards that
/// went left in them (what it would be if the sides were even); the mean place difference is shown without an interval
/// (with a few boards a side it takes a handful of values, and a t interval over it does not hold its level).
/// </summary>
public sealed record OrganiserFigures(string Variant, int Races, Spread FirstFinisherS, Spread LastFinisherS, Interval NoFinisher, Interval SomeNotFinished,
    Interval? WithinTarget, Interval LineBiasDeg, Interval LineBiasM, Interval RightEndFavoured, Interval ShareLeft, Interval SidePlaceDiff,
    int SideRaces, Interval WinnerLeft, double LeftInSplitRaces, IReadOnlyList<LegTime> Legs, Interval ContactsPerRace, Interval AvoidablePerRace, double PeakAtMark, double CloseArrivals)
{
    /// <summary>Share of the target duration within which a race counts as on target.</summary>
    public const double TargetTolerance = 0.1;

    static readonly Interval None = new(double.NaN, double.NaN, double.NaN);

    /// <summary>Mean with its t interval; a single value gives no interval; none gives NaN.</summary>
    public static Interval MeanT(IReadOnlyList<double> x)
    {
        var v = x.Where(double.IsFinite).ToArray();
        if (v.Length == 0) return None;
        if (v.Length == 1) return new Interval(v[0], double.NaN, double.NaN);
        return Statistics.PairedT(v);
    }

    /// <summary>
    /// Mean with the symmetric studentised bootstrap interval (Statistics.BootstrapT), for per-race figures skewed by the
    /// odd slow race (leg times: a fall or a penalty turn); one value gives no interval, none NaN. On the A/A batch the
    /// t interval over leg times missed in 16 and 17 of 200 experiments, this one in about 10.
    /// </summary>
    public static Interval MeanBootstrapT(IReadOnlyList<double> x, ulong seed)
    {
        var v = x.Where(double.IsFinite).ToArray();
        if (v.Length == 0) return None;
        if (v.Length == 1) return new Interval(v[0], double.NaN, double.NaN);
        return Statistics.BootstrapT(v, seed);
    }

    static Interval Share(int k, int n) => n == 0 ? None : Statistics.WilsonModified(k, n);

    /// <summary>Events per race from the races' counts, with Garwood's Poisson interval; none gives NaN.</summary>
    public static Interval Rate(IReadOnlyList<int> perRace) => perRace.Count == 0 ? None : Statistics.PoissonRate(perRace.Sum(), perRace.Count);

    public static OrganiserFigures Of(string variant, IReadOnlyList<RaceMetrics> races, IReadOnlyList<RaceRow> rows, double targetS)
    {
        int n = races.Count;
        var first = races.Select(m => m.FirstFinisherS).ToList();
        Interval? target = double.IsNaN(targetS) ? null
            : Share(first.Count(x => double.IsFinite(x) && Math.Abs(x - targetS) <= TargetTolerance * targetS), n);
        var bias = races.Select(m => m.LineBiasDeg).ToList();
        // Side fairness, per race: the mean place (scored) of the boards that went right minus of those that went left
        // (positive: the left paid), and whether the first finisher went left; races where both sides were sailed.
        var byRace = rows.GroupBy(r => r.Race).ToList();
        var sideDiff = new List<double>();
        var leftK = new List<int>(); var sidedN = new List<int>();
        int winnerLeft = 0, split = 0; double leftShareSum = 0;
        foreach (var g in byRace)
        {
            var l = g.Where(r => r.FirstBeatSide == "left").ToList();
            var r = g.Where(r => r.FirstBeatSide == "right").ToList();
            leftK.Add(l.Count); sidedN.Add(l.Count + r.Count);
            if (l.Count == 0 || r.Count == 0) continue;
            var winner = g.Where(x => x.Finished && x.FirstBeatSide is "left" or "right").MinBy(x => x.PlaceScored);
            if (winner is null) continue;
            sideDiff.Add(r.Average(x => (double)x.PlaceScored) - l.Average(x => (double)x.PlaceScored));
            split++; leftShareSum += (double)l.Count / (l.Count + r.Count);
            if (winner.FirstBeatSide == "left") winnerLeft++;
        }
        // Leg times: each race's mean over its finishers, then the mean over races.
        var labels = races.Select(m => m.LegLabels).FirstOrDefault(x => x.Length > 0) ?? [];
        var legs = new List<LegTime>();
        for (int k = 0; k < labels.Length; k++)
        {
            var perRace = new List<double>();
            foreach (var g in byRace)
            {
                var s = g.Where(r => r.Finished).Select(r => r.Splits).Where(x => x.Length > k).Select(x => (x[k] - (k == 0 ? 0 : x[k - 1])) / 60).ToList();
                if (s.Count > 0) perRace.Add(s.Average());
            }
            legs.Add(new LegTime(labels[k], MeanBootstrapT(perRace, (ulong)k)));
        }
        return new OrganiserFigures(variant, n, Spread.Of(first), Spread.Of(races.Select(m => m.LastFinisherS)),
            Share(races.Count(m => m.Finishers == 0), n), Share(races.Count(m => m.Finishers < m.Boards), n), target,
            MeanT(bias), MeanT(races.Select(m => m.LineBiasM).ToList()), Share(bias.Count(b => b > 0), n),
            Statistics.ClusteredShare(leftK, sidedN), new Interval(sideDiff.Count == 0 ? double.NaN : sideDiff.Average(), double.NaN, double.NaN), sideDiff.Count, Share(winnerLeft, split), split == 0 ? double.NaN : leftShareSum / split, legs,
            Rate(races.Select(m => m.Contacts).ToList()), Rate(races.Select(m => m.AvoidableContacts).ToList()),
            n == 0 ? double.NaN : races.Average(m => m.PeakAtMark), n == 0 ? double.NaN : races.Average(m => (double)m.CloseArrivals));
    }
}
