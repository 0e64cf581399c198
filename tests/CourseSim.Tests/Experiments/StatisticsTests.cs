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
    public void TheBootstrapIsReproducibleAndAgreesWithTheTIntervalOnWellBehavedData()
    {
        double[] d = [1.2, 2.4, 1.3, 1.3, 0.0, 1.0, 1.8, 0.8, 4.6, 1.4, 1.1, 0.9, 2.0, 1.7, 1.5, 1.6, 0.7, 2.2, 1.9, 1.0];
        var a = Statistics.BootstrapMean(d, seed: 5);
        var b = Statistics.BootstrapMean(d, seed: 5);
        Assert.Equal(a, b);
        var t = Statistics.PairedT(d);
        // Percentile bootstrap intervals run a little narrower than t intervals at small n (Efron and Tibshirani 1993).
        Assert.InRange(a.Low, t.Low - 0.15, t.Low + 0.25);
        Assert.InRange(a.High, t.High - 0.25, t.High + 0.15);
        Assert.NotEqual(a, Statistics.BootstrapMean(d, seed: 6));
    }

    [Fact]
    public void PairsNeededFollowsTheNormalApproximation()
    {
        // z(0.975) + z(0.8) = 1.95996 + 0.84162 = 2.80158; for a difference of one standard deviation: 7.85 -> 8 pairs.
        Assert.Equal(8, Statistics.PairsNeeded(1, 1));
        // Half the difference needs four times the pairs: 31.4 -> 32.
        Assert.Equal(32, Statistics.PairsNeeded(0.5, 1));
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
