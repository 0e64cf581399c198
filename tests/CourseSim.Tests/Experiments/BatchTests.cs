using CourseSim.Experiments;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Experiments;

public class BatchTests
{
    /// <summary>A small experiment in a temporary folder: a three-board windward-leeward and two variants.</summary>
    internal static string MakeExperiment(string extra = "", string variantB = "boards.a.equipment=" + "\"LIGHT78\"")
    {
        string dir = Directory.CreateTempSubdirectory("cs-batch-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), EngineTestKit.SteadyWind(13).Replace("gust_intensity = 0", "gust_intensity = 0.1")
            .Replace("shift_amplitude_deg = 0", "shift_amplitude_deg = 6") +
            "[race]\ntime_limit_s = 1500\ncountdown_s = 40\n[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 400\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n" +
            $"[boards.c]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n");
        string b = variantB.Replace("\"LIGHT78\"", EngineTestKit.Equip("light-78.toml"));
        File.WriteAllText(Path.Combine(dir, "exp.toml"),
            $"name = \"test\"\nscenario = \"race.toml\"\nraces = 6\nseed = 9\nfocus = \"a\"\n{extra}[variants.base]\nset = \"\"\n[variants.other]\nset = \"{b}\"\n");
        return Path.Combine(dir, "exp.toml");
    }

    [Fact]
    public void ResultsAreTheSameWhateverTheThreadCountAndRacesArePaired()
    {
        var path = MakeExperiment();
        var spec = ExperimentFile.Load(path);
        string one = Directory.CreateTempSubdirectory("cs-b1-").FullName, two = Directory.CreateTempSubdirectory("cs-b2-").FullName;
        var a = BatchRunner.ResultsCsv(BatchRunner.Run(spec, one, 1, false));
        var b = BatchRunner.ResultsCsv(BatchRunner.Run(spec, two, 2, false));
        Assert.Equal(a, b);
        var rows = BatchRunner.Run(spec, two, 2, true);
        Assert.Equal(2 * 6 * 3, rows.Count);
        // Race i has the same seed in every variant (common random numbers), and different races differ.
        foreach (var g in rows.GroupBy(r => r.Race)) Assert.Single(g.Select(r => r.Seed).Distinct());
        Assert.Equal(6, rows.Select(r => r.Seed).Distinct().Count());
    }

    [Fact]
    public void AResumedBatchEndsWithWhatAnUninterruptedOneGives()
    {
        var spec = ExperimentFile.Load(MakeExperiment());
        string full = Directory.CreateTempSubdirectory("cs-bf-").FullName, cut = Directory.CreateTempSubdirectory("cs-bc-").FullName;
        var expected = BatchRunner.ResultsCsv(BatchRunner.Run(spec, full, 2, false));
        // A run stopped part way: cancel after the first races finish.
        using var cts = new CancellationTokenSource();
        int seen = 0;
        var partial = BatchRunner.Run(spec, cut, 1, false, p => { if (p.Done - p.Resumed >= 3 && Interlocked.Increment(ref seen) == 1) cts.Cancel(); }, cts.Token);
        int partialRaces = partial.Select(r => (r.Variant, r.Race)).Distinct().Count();
        Assert.InRange(partialRaces, 3, 11);
        // A crash can leave a half-written temporary file: it is not a finished race.
        File.WriteAllText(BatchRunner.RunFile(cut, "other", 5) + ".tmp", "half a line");
        int resumedFrom = -1;
        var rows = BatchRunner.Run(spec, cut, 2, true, p => { if (resumedFrom < 0) resumedFrom = p.Resumed; });
        Assert.Equal(partialRaces, resumedFrom);
        Assert.Equal(expected, BatchRunner.ResultsCsv(rows));
    }

    [Fact]
    public void ComparisonPairsTheVariantsRaceByRace()
    {
        var spec = ExperimentFile.Load(MakeExperiment());
        var rows = BatchRunner.Run(spec, Directory.CreateTempSubdirectory("cs-bp-").FullName, 2, false);
        var (variants, pairs) = Comparison.Of(spec, rows, 1);
        Assert.Equal(2, variants.Count);
        Assert.All(variants, v => Assert.Equal(6, v.Races));
        var p = Assert.Single(pairs);
        Assert.Equal(("base", "other"), (p.A, p.B));
        // The mean of the paired differences is the difference of the means.
        Assert.Equal(variants[0].MeanElapsedS - variants[1].MeanElapsedS, p.MeanDiffT.Estimate, 6);
        Assert.True(p.MeanDiffT.Low <= p.MeanDiffT.Estimate && p.MeanDiffT.Estimate <= p.MeanDiffT.High);
    }

    [Fact]
    public void BadExperimentFilesNameTheFileLineAndProblem()
    {
        var typo = Assert.Throws<SettingsException>(() => ExperimentFile.Load(MakeExperiment("rces = 4\n")));
        Assert.Contains("exp.toml:6", typo.Message);
        Assert.Contains("rces", typo.Message);
        var badSet = Assert.Throws<SettingsException>(() => ExperimentFile.Load(MakeExperiment(variantB: "course.beat_m=99999")));
        Assert.Contains("variants.other.set", badSet.Message);
        Assert.Contains("course.beat_m", badSet.Message);
        string dir = Path.GetDirectoryName(MakeExperiment())!;
        File.WriteAllText(Path.Combine(dir, "e2.toml"), "scenario = \"race.toml\"\nboard = \"zz\"\n[variants.x]\nset = \"\"\n");
        var noBoard = Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "e2.toml")));
        Assert.Contains("e2.toml:2", noBoard.Message);
        Assert.Contains("no board 'zz'", noBoard.Message);
        Assert.Contains("a, b, c", noBoard.Message);
        File.WriteAllText(Path.Combine(dir, "e4.toml"), "scenario = \"race.toml\"\nfocus = \"zz\"\n[variants.x]\nset = \"\"\n");
        Assert.Contains("rider, organiser, coach, all", Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "e4.toml"))).Message);
        File.WriteAllText(Path.Combine(dir, "e3.toml"), "scenario = \"missing.toml\"\n[variants.x]\nset = \"\"\n");
        Assert.Contains("not found", Assert.Throws<SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "e3.toml"))).Message);
    }
}

public class ExperimentStatisticsTests(Xunit.Abstractions.ITestOutputHelper output)
{
    static string Folder(string scenario, string experiment)
    {
        string dir = Directory.CreateTempSubdirectory("cs-exp-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), scenario);
        File.WriteAllText(Path.Combine(dir, "exp.toml"), experiment);
        return Path.Combine(dir, "exp.toml");
    }

    static string Short(double kn, string boards) =>
        $"[wind]\nspeed_kn = {kn}\ndirection_deg = 0\nshift_amplitude_deg = 8\nshift_period_s = 240\ngust_intensity = 0\nshadows = false\n" +
        "[race]\ntime_limit_s = 1200\ncountdown_s = 30\n[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 250\n" + boards;

    [Fact]
    public void IdenticalVariantsOnCommonSeedsShowNoDifferenceAtAll()
    {
        var path = Folder(Short(12, $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n"),
            "scenario = \"race.toml\"\nraces = 8\nseed = 3\n[variants.one]\nset = \"\"\n[variants.two]\nset = \"\"\n");
        var spec = ExperimentFile.Load(path);
        var rows = BatchRunner.Run(spec, Path.Combine(Path.GetDirectoryName(path)!, "out"), 2, false);
        var (_, pairs) = Comparison.Of(spec, rows, 1);
        var p = Assert.Single(pairs);
        Assert.Equal(0, p.MeanDiffT.Estimate);
        Assert.False(p.Significant);
    }

    /// <summary>
    /// A/A with independent seeds: two identical variants raced in different winds. Split into 100 experiments of 10
    /// paired races, a 95 % interval should call about 5 % of them "significant" (the nominal false-positive rate);
    /// the observed rate's Wilson interval must contain 5 %.
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void TheFalsePositiveRateOfAaExperimentsIsNearTheNominalLevel()
    {
        // Four boards on one rig: the focus board's place varies from race to race (1 to 4), so the place difference's
        // t interval meets the data it is meant for (with two unequal boards the places hardly move and it could only be
        // conservative).
        string same = $"equipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n";
        var path = Folder(Short(12, $"[boards.a]\n{same}[boards.b]\n{same}[boards.c]\n{same}[boards.d]\n{same}"),
            "scenario = \"race.toml\"\nraces = 1000\nseed = 11\nseeds = \"independent\"\n[variants.one]\nset = \"\"\n[variants.two]\nset = \"\"\n");
        var spec = ExperimentFile.Load(path);
        var rows = BatchRunner.Run(spec, Path.Combine(Path.GetDirectoryName(path)!, "out"), System.Environment.ProcessorCount, false);
        var one = rows.Where(r => r.Variant == "one" && r.BoardId == "a").OrderBy(r => r.Race).Select(r => r.TimeOrLimitS).ToArray();
        var two = rows.Where(r => r.Variant == "two" && r.BoardId == "a").OrderBy(r => r.Race).Select(r => r.TimeOrLimitS).ToArray();
        Assert.Equal(1000, one.Length);
        Assert.NotEqual(one, two); // independent winds
        // Every interval the report shows for a pair, over 100 A/A experiments of 10 paired races: the time difference's
        // t and studentised bootstrap intervals, the place difference's t interval, and the win share's Wilson interval
        // around 1/2.
        var hits = new int[4];
        for (int k = 0; k < 100; k++)
        {
            var sub = rows.Where(r => r.Race / 10 == k).ToList();
            var p = Assert.Single(Comparison.Of(spec, sub, (ulong)k).Pairs);
            Assert.Equal(10, p.Pairs);
            if (p.MeanDiffT.ExcludesZero) hits[0]++;
            if (p.MeanDiffBootstrap.ExcludesZero) hits[1]++;
            if (p.PlaceDiffT!.Value.ExcludesZero) hits[2]++;
            if (p.WinProbability.Low > 0.5 || p.WinProbability.High < 0.5) hits[3]++;
            Assert.Equal(p.MeanDiffT.ExcludesZero, p.Significant); // two variants: no adjustment
        }
        string[] names = ["time t", "time studentised bootstrap", "place t", "win share Wilson"];
        output.WriteLine(string.Join("; ", names.Select((n, i) => $"{n}: {hits[i]} of 100")));
        for (int i = 0; i < 3; i++)
        {
            var rate = Statistics.Wilson(hits[i], 100);
            Assert.True(rate.Low <= 0.05 && 0.05 <= rate.High, $"{names[i]}: {hits[i]} of 100 A/A experiments resolved");
        }
        // The win share of 10 races is a binomial count: Wilson rejects 1/2 only at 0-1 or 9-10 wins of 10 (2.1 % of the
        // time), so it is conservative there; it must not be liberal.
        Assert.True(Statistics.Wilson(hits[3], 100).Low <= 0.05, $"{names[3]}: {hits[3]} of 100");
        OrganiserIntervalsHoldTheirLevel(spec, Path.Combine(Path.GetDirectoryName(path)!, "out"), rows);
    }

    /// <summary>
    /// The organiser's table on the same A/A batch: every figure with an interval, for each variant's 100 experiments
    /// of 10 races, against that variant's figure over all 1,000 races (the truth to within about a twentieth of a
    /// 10-race interval's width). Means over races (line bias, side fairness, legs, contacts) take the t interval: the
    /// share of intervals missing the truth must have a Wilson interval that holds 5 %. Shares of races take the Wilson
    /// interval, whose coverage at n = 10 swings with p about the nominal level and is conservative near 0, 1/2 and 1
    /// (Brown, Cai and DasGupta 2001, Stat Sci 16:101-133, fig. 4): it must not be liberal. So must Garwood's exact
    /// Poisson interval for contacts per race, conservative by construction (Garwood 1936), and the clustered Wilson
    /// interval for the share of boards going left.
    /// </summary>
    void OrganiserIntervalsHoldTheirLevel(ExperimentSpec spec, string outDir, IReadOnlyList<RaceRow> rows)
    {
        var metrics = BatchRunner.ReadMetrics(spec, outDir);
        // The target: the median winner's time, so that about a share of races is within 10 % of it (not 0 or 1).
        double target = Statistics.Quantile(metrics.Select(m => m.Metrics.FirstFinisherS).Where(double.IsFinite).Order().ToArray(), 0.5);
        var means = new Dictionary<string, (int Miss, int Of)>();
        var shares = new Dictionary<string, (int Miss, int Of)>();
        var exact = new Dictionary<string, (int Miss, int Of)>();
        void Count(Dictionary<string, (int Miss, int Of)> d, string name, Interval iv, double truth)
        {
            if (!double.IsFinite(iv.Low) || !double.IsFinite(iv.High) || !double.IsFinite(truth)) return;
            var (miss, of) = d.GetValueOrDefault(name);
            d[name] = (miss + (iv.Low <= truth && truth <= iv.High ? 0 : 1), of + 1);
        }
        foreach (var v in spec.Variants.Select(x => x.Name))
        {
            OrganiserFigures Of(Func<int, bool> take) => OrganiserFigures.Of(v,
                metrics.Where(m => m.Variant == v && take(m.Race)).OrderBy(m => m.Race).Select(m => m.Metrics).ToList(),
                rows.Where(r => r.Variant == v && take(r.Race)).ToList(), target);
            var all = Of(_ => true);
            Assert.Equal(1000, all.Races);
            for (int k = 0; k < 100; k++)
            {
                var e = Of(r => r / 10 == k);
                Assert.Equal(10, e.Races);
                Count(means, "line bias, deg", e.LineBiasDeg, all.LineBiasDeg.Estimate);
                Count(means, "line advantage, m", e.LineBiasM, all.LineBiasM.Estimate);
                Count(shares, "share of boards going left", e.ShareLeft, all.ShareLeft.Estimate);
                Count(shares, "first finisher went left", e.WinnerLeft, all.WinnerLeft.Estimate);
                Assert.True(double.IsNaN(e.SidePlaceDiff.Low), "the mean place difference is shown without an interval");
                for (int l = 0; l < all.Legs.Count; l++) Count(means, $"leg {l + 1} time", e.Legs[l].MinutesT, all.Legs[l].MinutesT.Estimate);
                Count(exact, "contacts per race", e.ContactsPerRace, all.ContactsPerRace.Estimate);
                Count(exact, "avoidable contacts per race", e.AvoidablePerRace, all.AvoidablePerRace.Estimate);
                Count(shares, "right end favoured", e.RightEndFavoured, all.RightEndFavoured.Estimate);
                Count(shares, "within 10 % of the target", e.WithinTarget!.Value, all.WithinTarget!.Value.Estimate);
                Count(shares, "a board not finished", e.SomeNotFinished, all.SomeNotFinished.Estimate);
                Count(shares, "no finisher", e.NoFinisher, all.NoFinisher.Estimate);
            }
            output.WriteLine($"{v}: over 1,000 races line bias {all.LineBiasDeg.Estimate:F2} deg, share left {all.ShareLeft.Estimate:F3}, " +
                $"right minus left {all.SidePlaceDiff.Estimate:F2}, winner left {all.WinnerLeft.Estimate:F3} in {all.SideRaces} races, contacts {all.ContactsPerRace.Estimate:F3}/race, within target {all.WithinTarget!.Value.Estimate:F3}, " +
                $"right end {all.RightEndFavoured.Estimate:F3}, not finished {all.SomeNotFinished.Estimate:F3}");
        }
        foreach (var (name, (miss, of)) in means.Concat(shares).Concat(exact)) output.WriteLine($"{name}: missed the 1,000-race figure in {miss} of {of}");
        // Means: not liberal (the miss rate's Wilson interval reaches down to 5 %) and not grossly conservative (it reaches
        // up to 2.5 %: the interval is not more than twice as safe as it says). Each of the four is checked at about 95 %,
        // so asking every one to hold 5 % exactly failed by chance alone in about one run in five; and a leg whose
        // per-race means are light-tailed makes the studentised bootstrap somewhat conservative (the run of this batch
        // after the fall and running-angle changes of 3 Dec 2026: 3 of 200, where the t interval missed 5; the t interval
        // is liberal on the beat: 20 of 200, against 13 for the bootstrap).
        foreach (var (name, (miss, of)) in means)
        {
            var rate = Statistics.Wilson(miss, of);
            Assert.True(of >= 150 && rate.Low <= 0.05 && 0.025 <= rate.High, $"{name}: missed in {miss} of {of}");
        }
        foreach (var (name, (miss, of)) in shares.Concat(exact))
            Assert.True(of >= 100 && Statistics.Wilson(miss, of).Low <= 0.05, $"{name}: missed in {miss} of {of}");
    }

    [Fact]
    public void AMuchBiggerSailInLightWindIsFoundFasterWithTheRightSign()
    {
        // The same heavy rider on 7.0 and 8.6 m2 in 8 kn: the bigger sail planes earlier and pulls harder (docs/polar.md).
        var path = Folder(Short(8, $"[boards.t]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n"),
            $"scenario = \"race.toml\"\nraces = 20\nseed = 5\n[variants.small]\nset = \"\"\n[variants.big]\nset = \"boards.t.equipment={EngineTestKit.Equip("heavy-86.toml")}\"\n");
        var spec = ExperimentFile.Load(path);
        var rows = BatchRunner.Run(spec, Path.Combine(Path.GetDirectoryName(path)!, "out"), 2, false);
        var (variants, pairs) = Comparison.Of(spec, rows, 1);
        var p = Assert.Single(pairs);
        Assert.Equal(("small", "big"), (p.A, p.B));
        Assert.True(p.Significant, $"small - big = {p.MeanDiffT.Estimate:F1} s ({p.MeanDiffT.Low:F1} to {p.MeanDiffT.High:F1})");
        Assert.True(p.MeanDiffT.Estimate > 0, "the small sail should be slower");
        Assert.True(variants[1].MeanElapsedS < variants[0].MeanElapsedS);
    }
}

public class RaceMetricsTests
{
    /// <summary>
    /// Line bias: a line laid square to 0 deg in a wind from 5 deg is 5 deg biased; the advantage of the favoured end is
    /// the line length x sin(bias): 300 m at 5 deg -> 26.15 m (computed, the project's reference notes).
    /// </summary>
    [Fact]
    public void LineBiasAndItsAdvantageInMetres()
    {
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(12, 5) + "[race]\ntime_limit_s = 900\n[course]\nkind = \"windward-leeward\"\naxis_deg = 0\nbeat_m = 300\nstart_line_m = 300\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n");
        var race = new Race(setup);
        var result = race.Run();
        var m = RaceMetrics.Of(race, result);
        Assert.Equal(5, m.LineBiasDeg, 6);
        Assert.Equal(26.15, m.LineBiasM, 2);
        Assert.Equal(2, m.FirstBeatSide.Count);
        Assert.All(m.FirstBeatSide.Values, s => Assert.Contains(s, new[] { "left", "right" }));
        Assert.True(m.PeakAtMark >= 1);
        Assert.Equal(result.Boards.Where(b => b.Finished).Min(b => b.ElapsedS!.Value), m.FirstFinisherS, 9);
        Assert.Equal(result.Boards.Where(b => b.Finished).Max(b => b.ElapsedS!.Value), m.LastFinisherS, 9);
        // Steady wind: the mean over the start sequence is the wind itself.
        Assert.Equal(5, m.StartWindFromDeg, 6);
        Assert.Equal(12, m.StartWindKn, 6);
        Assert.StartsWith("beat to ", m.LegLabels[0]);
        Assert.Equal("run to finish", m.LegLabels[^1]);
    }
}

public class WindRangeTests
{
    [Fact]
    public void ARangeOfWindsIsDrawnPerRaceAndSharedByTheVariants()
    {
        string dir = Directory.CreateTempSubdirectory("cs-wind-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), EngineTestKit.SteadyWind(12) + "[race]\ntime_limit_s = 900\n[course]\nkind = \"windward-leeward\"\nbeat_m = 200\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n");
        File.WriteAllText(Path.Combine(dir, "exp.toml"), "scenario = \"race.toml\"\nraces = 20\nwind_min_kn = 8\nwind_max_kn = 20\n[variants.x]\nset = \"\"\n[variants.y]\nset = \"\"\n");
        var spec = ExperimentFile.Load(Path.Combine(dir, "exp.toml"));
        var winds = Enumerable.Range(0, 20).Select(spec.WindFor).ToArray();
        Assert.All(winds, w => Assert.InRange(w, 8, 20));
        Assert.True(winds.Max() - winds.Min() > 6, "the races span the range");
        File.WriteAllText(Path.Combine(dir, "bad.toml"), "scenario = \"race.toml\"\nwind_min_kn = 8\n[variants.x]\nset = \"\"\n");
        Assert.Contains("both wind_min_kn and wind_max_kn", Assert.Throws<CourseSim.Settings.SettingsException>(() => ExperimentFile.Load(Path.Combine(dir, "bad.toml"))).Message);
        var rows = BatchRunner.Run(spec, Path.Combine(dir, "out"), 2, false);
        var metrics = BatchRunner.ReadMetrics(spec, Path.Combine(dir, "out"));
        foreach (var g in metrics.GroupBy(m => m.Race)) Assert.Single(g.Select(m => m.Metrics.WindKn).Distinct());
        foreach (var g in rows.GroupBy(r => r.Race)) Assert.Equal(spec.WindFor(g.Key), g.First().WindKn, 3);
        Assert.Equal(40, metrics.Count);
        Assert.Equal(40, rows.Count);
    }
}

public class ReportTests
{
    [Fact]
    public void TheHeadToHeadMatrixMirrorsEachPair()
    {
        var variants = new[] { "x", "y", "z" }.Select(n => new Variant(n, [], null!)).ToList();
        var spec = new ExperimentSpec("t", "", "", "a", variants, 10, 1, "");
        Interval W(double e) => new(e, e - 0.2, e + 0.2);
        var none = new RacesNeeded(double.NaN, double.NaN, double.NaN, new Interval(double.NaN, double.NaN, double.NaN));
        var pairs = new List<PairSummary>
        {
            new("x", "y", 10, new Interval(-5, -8, -2), new Interval(-5, -8, -2), W(0.7), true, none),
            new("x", "z", 10, new Interval(1, -2, 4), new Interval(1, -2, 4), W(0.4), false, none),
            new("y", "z", 10, new Interval(2, -1, 5), new Interval(2, -1, 5), W(0.3), false, none),
        };
        var md = CourseSim.Cli.Output.ExperimentReport.Markdown(new CourseSim.Cli.Output.BatchFindings(spec, [], pairs, [], [], [], [], true, null));
        Assert.Contains("| x | - | 70 % (50-90) * | 40 % (20-60) |", md);
        Assert.Contains("| y | 30 % (10-50) * | - | 30 % (10-50) |", md);
        Assert.Contains("| z | 60 % (40-80) | 70 % (50-90) | - |", md);
    }
}
