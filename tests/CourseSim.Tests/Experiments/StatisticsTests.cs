using CourseSim.Experiments;

namespace CourseSim.Tests.Experiments;

public class StatisticsTests
{
    /// <summary>Newcombe (1998), Stat Med 17:857-872, Table II, method 3 (Wilson score): 81/263 -> 0.2553 to 0.3662 and
    /// 15/148 -> 0.0624 to 0.1605 (from memory; the formula reproduces them to 4 decimals).</summary>
    [Theory]
    [InlineData(81, 263, 0.2553, 0.3662)]
    [InlineData(15, 148, 0.0624, 0.1605)]
    public void WilsonMatchesNewcombesWorkedExamples(int k, int n, double lo, double hi)
    {
        var w = Statistics.Wilson(k, n);
        Assert.Equal(lo, w.Low, 3);
        Assert.Equal(hi, w.High, 3);
        Assert.Equal((double)k / n, w.Estimate, 12);
    }

    [Fact]
    public void WilsonStaysInsideZeroToOneAtTheEdges()
    {
        var none = Statistics.Wilson(0, 20);
        var all = Statistics.Wilson(20, 20);
        Assert.Equal(0, none.Low, 12);
        Assert.True(none.High is > 0.1 and < 0.2);
        Assert.Equal(1, all.High, 12);
        Assert.True(all.Low is > 0.8 and < 0.9);
        Assert.Throws<ArgumentOutOfRangeException>(() => Statistics.Wilson(3, 2));
    }

    /// <summary>
    /// The modified Wilson interval (Brown, Cai and DasGupta 2001, Stat Sci 16:101-133, sec. 4.1.1): for one success
    /// in n the lower bound is the Poisson one, chi2(2; 0.05) / 2n = -ln(0.95) / n (the chi-square of 2 degrees of freedom
    /// has the closed-form quantile -2 ln(1 - p)); elsewhere it is the Wilson interval.
    /// </summary>
    [Fact]
    public void TheModifiedWilsonUsesThePoissonBoundForOneOrTwoSuccesses()
    {
        var one = Statistics.WilsonModified(1, 10);
        Assert.Equal(-Math.Log(0.95) / 10, one.Low, 10);
        Assert.Equal(Statistics.Wilson(1, 10).High, one.High, 12);
        var nine = Statistics.WilsonModified(9, 10);
        Assert.Equal(1 + Math.Log(0.95) / 10, nine.High, 10);
        var five = Statistics.WilsonModified(5, 10);
        Assert.Equal(Statistics.Wilson(5, 10), five);
        Assert.Equal(Statistics.Wilson(3, 10), Statistics.WilsonModified(3, 10)); // x* = 2 for n <= 50
        Assert.NotEqual(Statistics.Wilson(3, 60).Low, Statistics.WilsonModified(3, 60).Low); // x* = 3 above
    }

    /// <summary>
    /// Exact coverage at n = 10 (a sum over the binomial outcomes) for true shares 0.001 to 0.999: plain Wilson dips far
    /// below 95 % near the ends (the dips Brown, Cai and DasGupta 2001 show in their fig. 5), the modified one does not.
    /// </summary>
    [Fact]
    public void TheModifiedWilsonRepairsTheCoverageDipsNearTheEnds()
    {
        const int n = 10;
        double Coverage(Func<int, Interval> iv, double p)
        {
            double c = 0;
            for (int k = 0; k <= n; k++)
            {
                var i = iv(k);
                if (i.Low <= p && p <= i.High) c += Binomial(n, k) * Math.Pow(p, k) * Math.Pow(1 - p, n - k);
            }
            return c;
        }
        double minPlain = 1, minModified = 1;
        for (int i = 1; i < 1000; i++)
        {
            double p = i / 1000.0;
            minPlain = Math.Min(minPlain, Coverage(k => Statistics.Wilson(k, n), p));
            minModified = Math.Min(minModified, Coverage(k => Statistics.WilsonModified(k, n), p));
        }
        Assert.True(minPlain < 0.85, $"plain Wilson's least coverage {minPlain:F3}");
        Assert.True(minModified > 0.90, $"modified Wilson's least coverage {minModified:F3}");
    }

    static double Binomial(int n, int k)
    {
        double r = 1;
        for (int i = 1; i <= k; i++) r = r * (n - k + i) / i;
        return r;
    }

    /// <summary>
    /// Garwood's exact Poisson interval: no event in one unit gives 0 to 3.689 (-ln(0.025)); 10 events give 4.795 to
    /// 18.39 (from memory: the standard table of exact Poisson limits, e.g. in Ulm 1990, Am J Epidemiol 131:373-375).
    /// </summary>
    [Fact]
    public void PoissonRateMatchesGarwoodsExactLimits()
    {
        var none = Statistics.PoissonRate(0, 1);
        Assert.Equal(0, none.Low);
        Assert.Equal(-Math.Log(0.025), none.High, 6);
        var ten = Statistics.PoissonRate(10, 1);
        Assert.Equal(4.795, ten.Low, 3);
        Assert.Equal(18.39, ten.High, 2);
        var perRace = Statistics.PoissonRate(10, 20); // the same 10 contacts over 20 races
        Assert.Equal(0.5, perRace.Estimate, 12);
        Assert.Equal(ten.High / 20, perRace.High, 12);
        Assert.Throws<ArgumentOutOfRangeException>(() => Statistics.PoissonRate(1, 0));
    }

    /// <summary>
    /// Student's (1908) sleep data (Cushny and Peebles), the hours gained by ten patients on one drug over the other:
    /// the paired differences give mean 1.58 h, t 4.062 on 9 degrees of freedom and the 95 % interval 0.700 to 2.460 h
    /// (from memory: the classic paired t-test example, as in R's datasets::sleep documentation).
    /// </summary>
    [Fact]
    public void PairedTReproducesStudentsSleepExample()
    {
        double[] d = [1.2, 2.4, 1.3, 1.3, 0.0, 1.0, 1.8, 0.8, 4.6, 1.4];
        var ci = Statistics.PairedT(d);
        Assert.Equal(1.58, ci.Estimate, 10);
        Assert.Equal(0.700, ci.Low, 3);
        Assert.Equal(2.460, ci.High, 3);
        Assert.True(ci.ExcludesZero);
        var (_, sd) = Statistics.MeanSd(d);
        Assert.Equal(4.062, 1.58 / (sd / Math.Sqrt(10)), 3);
    }

    [Fact]
    public void TheStudentisedBootstrapIsReproducibleAndAgreesWithTheTIntervalOnWellBehavedData()
    {
        double[] d = [1.2, 2.4, 1.3, 1.3, 0.0, 1.0, 1.8, 0.8, 4.6, 1.4, 1.1, 0.9, 2.0, 1.7, 1.5, 1.6, 0.7, 2.2, 1.9, 1.0];
        var a = Statistics.BootstrapT(d, seed: 5);
        var b = Statistics.BootstrapT(d, seed: 5);
        Assert.Equal(a, b);
        var t = Statistics.PairedT(d);
        // Bootstrap-t intervals follow the data's skew (this sample is right-skewed by the 4.6): near the t interval,
        // shifted up, not narrower (Efron and Tibshirani 1993, ch. 12).
        Assert.InRange(a.Low, t.Low - 0.25, t.Low + 0.25);
        Assert.InRange(a.High, t.High - 0.25, t.High + 0.6);
        Assert.NotEqual(a, Statistics.BootstrapT(d, seed: 6));
        // No spread: the interval is the point itself.
        Assert.Equal(new Interval(0, 0, 0), Statistics.BootstrapT([0, 0, 0, 0], seed: 1));
    }

    [Fact]
    public void RacesNeededFollowsTheNormalApproximationAndCannotBlowUp()
    {
        // z(0.975) + z(0.8) = 1.95996 + 0.84162 = 2.80158; for a difference of one standard deviation: 7.85 -> 8 pairs.
        Assert.Equal(8, RacesNeededPlanner.Pairs(1, 1));
        // Half the difference needs four times the pairs: 31.4 -> 32.
        Assert.Equal(32, RacesNeededPlanner.Pairs(0.5, 1));
        // A zero difference gives no estimate (not int.MaxValue); a tiny one is capped.
        Assert.True(double.IsNaN(RacesNeededPlanner.Pairs(0, 1)));
        Assert.Equal(RacesNeededPlanner.Cap, RacesNeededPlanner.Pairs(1e-9, 1));
        // Below the minimum number of pairs nothing is estimated.
        Assert.False(RacesNeededPlanner.Of(1, 1, RacesNeededPlanner.MinimumPairs - 1).Known);
        // With 20 pairs the standard deviation's 95 % chi-square interval is sd x 0.7605 to 1.4606 (chi2(0.975, 19) =
        // 32.852, chi2(0.025, 19) = 8.907: NIST/SEMATECH e-Handbook, table 1.3.6.7.4), so the races needed span
        // 0.578 to 2.133 times 31.39 and the resolvable difference 2.80158 / sqrt(20) sd times the same factors.
        var n = RacesNeededPlanner.Of(0.5, 1, 20);
        Assert.Equal(32, n.Estimate);
        Assert.Equal(Math.Ceiling(31.39 * 0.7605 * 0.7605), n.Low, 0);
        Assert.Equal(Math.Ceiling(31.39 * 1.4606 * 1.4606), n.High, 0);
        Assert.Equal(2.80158 / Math.Sqrt(20), n.ResolvableS.Estimate, 4);
        Assert.Equal(2.80158 / Math.Sqrt(20) * 0.7605, n.ResolvableS.Low, 3);
        Assert.Equal(2.80158 / Math.Sqrt(20) * 1.4606, n.ResolvableS.High, 3);
    }

    /// <summary>
    /// Holm (1979): with p-values 0.01, 0.04 and 0.03 for three comparisons the adjusted values are 0.03, 0.06 and 0.06
    /// (sorted: 0.01 x 3, then max(0.03, 0.03 x 2), then max(0.06, 0.04 x 1); R's p.adjust(c(.01,.04,.03), "holm")
    /// gives the same, from memory): only the first stays significant at 5 %, though all three are below 5 % unadjusted.
    /// </summary>
    [Fact]
    public void HolmAdjustsThreeComparisonsAsPublished()
    {
        var adj = Statistics.Holm([0.01, 0.04, 0.03]);
        Assert.Equal(0.03, adj[0], 12);
        Assert.Equal(0.06, adj[1], 12);
        Assert.Equal(0.06, adj[2], 12);
        Assert.Equal([1.0, 1.0], Statistics.Holm([0.6, 0.9]));
    }

    /// <summary>The paired t p-value on Student's sleep data: t = 4.062 on 9 df gives p = 0.002833 (as R's paired
    /// t.test on datasets::sleep prints, from memory).</summary>
    [Fact]
    public void PairedTPValueOnStudentsSleepData()
    {
        double[] d = [1.2, 2.4, 1.3, 1.3, 0.0, 1.0, 1.8, 0.8, 4.6, 1.4];
        Assert.Equal(0.002833, Statistics.PairedTP(d), 5);
        Assert.Equal(1, Statistics.PairedTP([0, 0, 0]));
    }

    [Fact]
    public void WinProbabilityCountsTiesAsHalf()
    {
        double[] a = [10, 20, 30, 40];
        double[] b = [11, 19, 30, 41];
        var w = Statistics.WinProbability(a, b);
        Assert.Equal(0.625, w.Estimate, 12); // wins 1, 0, 0.5, 1 of 4
        Assert.True(w.Low < 0.625 && w.High > 0.625);
    }
}
