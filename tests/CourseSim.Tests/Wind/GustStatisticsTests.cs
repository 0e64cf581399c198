using System.Numerics;
using CourseSim.Units;
using CourseSim.Wind;
using MathNet.Numerics.IntegralTransforms;

namespace CourseSim.Tests.Wind;

/// <summary>
/// The gust field's statistics as a user sees them: time series at fixed points of <see cref="WindField"/> (gusts carried
/// downwind over the point), several seeds and several points 1.6 km apart across the wind (each a separate line through
/// the periodic tiles), against the configured intensity and length scale (issue 12; docs/wind.md "Gusts and lulls").
/// Fixed seeds: each test is deterministic; the sample sizes keep the sampling error a fraction of the tolerance.
/// </summary>
public class GustStatisticsTests
{
    const double LengthM = 150, SpeedKn = 14;
    static double U => Unit.KnotsToMs(SpeedKn);

    static WindSettings Gusts(double intensity) => new()
    {
        SpeedKn = SpeedKn, DirectionDeg = 270, RampKnPerHour = 0, ShiftAmplitudeDeg = 0, ShiftIrregularity = 0,
        PersistentDegPerMin = 0, GustIntensity = intensity, GustLengthM = LengthM,
    };

    /// <summary>Speed series (kn) at <paramref name="points"/> places across the wind for each of <paramref name="seeds"/> seeds.</summary>
    static IEnumerable<double[]> Series(double intensity, int seeds, int points, double durationS, double dt, ulong firstSeed)
    {
        for (int s = 0; s < seeds; s++)
        {
            var f = new WindField(Gusts(intensity), firstSeed + (ulong)s);
            for (int p = 0; p < points; p++) yield return WindStatistics.Series(f, 0, p * 1600.0, durationS, dt).speedKn;
        }
    }

    static (double Mean, double Sd) Moments(double[] x)
    {
        double m = x.Average();
        return (m, Math.Sqrt(x.Select(v => (v - m) * (v - m)).Average()));
    }

    // Turbulence intensity is the standard deviation of the speed over its mean, from the same samples (IEC 61400-1
    // ed. 3, 3.62 "turbulence intensity"). Issue 12's acceptance: within 5% of the input. The field holds the von Karman
    // spectrum up to k l = 100, so (1 + 100^2)^(-1/3) = 4.6% of the variance (gusts under about 1.7 s at 14 kn) is left out,
    // and the lateral component lifts the mean speed by about 0.32 I^2: expect 2.5-4% below the input.
    [Theory]
    [InlineData(0.10)]
    [InlineData(0.15)]
    public void SampledIntensityIsWithinFivePercentOfTheInput(double intensity)
    {
        var ratios = Series(intensity, 8, 4, 2 * 3600, 1.0, 500).Select(s => { var (m, sd) = Moments(s); return sd / m; }).ToArray();
        double sampled = ratios.Average();
        Assert.InRange(sampled / intensity, 0.95, 1.05);
    }

    /// <summary>
    /// Davenport's gust factor for the configured spectrum: G = 1 + g I sigma_(tau,T) / sigma_u (Harper, Kepert and Ginger
    /// 2010, WMO/TD-No. 1555, eq. 14, G = 1 + g I_u, with the spectral method of its appendix D), peak factor
    /// g = sqrt(2 ln(nu T)) + 0.5772 / sqrt(2 ln(nu T)) (Davenport 1964, Proc. ICE 28, 187-196), nu = sqrt(m2 / m0) the
    /// mean frequency of the tau-averaged speed within a T record, m_i = integral of f^i S(f) |H_tau(f)|^2 (1 - |H_T(f)|^2),
    /// H the moving average's response sin(pi f tau)/(pi f tau), S the IEC 61400-1 ed. 3 (annex B) von Karman spectrum
    /// 4 sigma^2 (L/U) / (1 + 70.8 (f L/U)^2)^(5/6). Integrated here on a log grid, independently of the field's code.
    /// </summary>
    static double DavenportGustFactor(double intensity, double tau = 3, double record = 600)
    {
        double m0 = 0, m2 = 0, lo = Math.Log(1e-6), hi = Math.Log(200);
        const int n = 40000;
        double h = (hi - lo) / n;
        for (int i = 0; i <= n; i++)
        {
            double f = Math.Exp(lo + i * h), w = i == 0 || i == n ? 0.5 : 1;
            double s = 4 * (LengthM / U) / Math.Pow(1 + 70.8 * Math.Pow(f * LengthM / U, 2), 5.0 / 6.0);
            double x = Math.PI * f * tau, y = Math.PI * f * record;
            double filtered = s * Math.Pow(Math.Sin(x) / x, 2) * (1 - Math.Pow(Math.Sin(y) / y, 2)) * f * h * w; // df = f dln f
            m0 += filtered; m2 += filtered * f * f;
        }
        double a = Math.Sqrt(2 * Math.Log(Math.Sqrt(m2 / m0) * record));
        return 1 + (a + 0.5772 / a) * intensity * Math.Sqrt(m0);
    }

    // Gust factor G(3 s, 600 s) (WindStatistics.GustFactor: peak 3-s mean over the 10-min mean, averaged over the 10-min
    // windows, the WMO usage) within the band of the published relation: Davenport's G above, with the peak factor g
    // within +-10% (from memory: observed and simulated peak factors scatter about that much around Davenport's expected
    // value). At L = 150 m and 14 kn the relation gives 1.250 at I = 0.10 and 1.374 at I = 0.15.
    [Theory]
    [InlineData(0.10)]
    [InlineData(0.15)]
    public void GustFactorIsWithinDavenportsBand(double intensity)
    {
        double published = DavenportGustFactor(intensity);
        Assert.InRange(published, 1 + 2.2 * intensity, 1 + 3.2 * intensity); // the relation itself: g near 2.7 here
        double sampled = Series(intensity, 8, 4, 3 * 3600, 1.0, 700).Average(s => WindStatistics.GustFactor(s, 1.0));
        Assert.InRange(sampled - 1, 0.9 * (published - 1), 1.1 * (published - 1));
    }

    // Autocorrelation of the speed at lags 0.5 L, L and 2 L (as times lag / U: gusts are carried over the point at the
    // mean speed, Taylor 1938) within 10% of von Karman's: rho(0.5 L) 0.5445, rho(L) 0.3470, rho(2 L) 0.1504
    // (2^(2/3)/Gamma(1/3) x^(1/3) K_1/3(x), x = r / (L / 0.7468); von Karman 1948, Proc. Natl Acad. Sci. 34; IEC 61400-1
    // ed. 3, annex B; shared/REFERENCES.md). Three-hour records: removing each record's mean biases the estimate by about
    // 2 L / (U T) = 0.004 only. The tiles leave out 4.7% of the variance at the smallest scales, which lifts the
    // correlations at these lags by about that much; the rest is the spread of the large scales between seeds (a seed's
    // rho(2 L) varies by about 0.015), hence 32 seeds.
    [Fact]
    public void AutocorrelationIsVonKarmanAtHalfOneAndTwoLengthScales()
    {
        const int perL = 20;
        double dt = LengthM / (perL * U);
        double[] lags = [0.5, 1, 2], vonKarman = [0.5445, 0.3470, 0.1504];
        var sum = new double[3]; int count = 0;
        foreach (var s in Series(0.12, 32, 6, 3 * 3600, dt, 900))
        {
            var (m, sd) = Moments(s);
            for (int k = 0; k < 3; k++)
            {
                int lag = (int)Math.Round(lags[k] * perL);
                double c = 0;
                for (int i = 0; i + lag < s.Length; i++) c += (s[i] - m) * (s[i + lag] - m);
                sum[k] += c / (s.Length - lag) / (sd * sd);
            }
            count++;
        }
        var ratio = Enumerable.Range(0, 3).Select(k => sum[k] / count / vonKarman[k]).ToArray();
        Assert.True(ratio.All(r => r >= 0.90 && r <= 1.10), $"sampled / von Karman at 0.5 L, L, 2 L: {string.Join(", ", ratio.Select(r => r.ToString("0.000")))}");
    }

    // Spectral slope of the speed within 0.2 of -5/3 (Kolmogorov 1941; the IEC 61400-1 von Karman spectrum tends to
    // f^(-5/3)) over the inertial band the tiles resolve: n = f L / U from 1 (where the von Karman form's own slope is
    // -1.64) to 6 (periods of 3.6 s at 14 kn; the fine tile holds the field to k l = 100, n near 12, and the spectrum of a
    // line through it rolls off from about half that). Welch estimate: 4 Hz samples, Hann windows of 4096, half overlap.
    [Fact]
    public void SpectralSlopeIsMinusFiveThirdsOverTheResolvedInertialBand()
    {
        const double dt = 0.25; const int seg = 4096;
        var power = Welch(Series(0.12, 4, 2, 4 * 3600, dt, 1100), seg);
        var xs = new List<double>(); var ys = new List<double>();
        for (int k = 1; k < seg / 2; k++)
        {
            double n = k / (seg * dt) * LengthM / U;
            if (n >= 1 && n <= 6) { xs.Add(Math.Log(n)); ys.Add(Math.Log(power[k])); }
        }
        var (_, slope) = MathNet.Numerics.Fit.Line(xs.ToArray(), ys.ToArray());
        Assert.InRange(slope, -5.0 / 3 - 0.2, -5.0 / 3 + 0.2);
    }

    // Gusts shorter than the old tile's 7 s exist: the power of the 2-4 s band (n = 2.5..5 at 14 kn) relative to the
    // 20-40 s band is at least 70% of what the von Karman form (IEC 61400-1 ed. 3, annex B) gives; the old field, with
    // nothing above its tile's 7 s Nyquist period and bilinear smoothing below it, held under a tenth.
    [Fact]
    public void ShortGustsCarryTheirShareOfThePower()
    {
        const double dt = 0.25; const int seg = 4096;
        var power = Welch(Series(0.12, 3, 2, 4 * 3600, dt, 1300), seg);
        double Sum(double p0, double p1, Func<int, double> w)
        {
            double sum = 0;
            for (int k = 1; k < seg / 2; k++) { double f = k / (seg * dt); if (f >= 1 / p1 && f <= 1 / p0) sum += w(k); }
            return sum;
        }
        double VonKarman(int k) => 1 / Math.Pow(1 + 70.8 * Math.Pow(k / (seg * dt) * LengthM / U, 2), 5.0 / 6.0);
        double sampled = Sum(2, 4, k => power[k]) / Sum(20, 40, k => power[k]);
        double expected = Sum(2, 4, VonKarman) / Sum(20, 40, VonKarman);
        Assert.True(sampled > 0.7 * expected, $"2-4 s over 20-40 s power: {sampled:E3}, von Karman {expected:E3}");
    }

    /// <summary>Welch power estimate summed over the series: Hann windows of <paramref name="seg"/> samples, half overlap,
    /// each window's mean removed.</summary>
    static double[] Welch(IEnumerable<double[]> series, int seg)
    {
        var power = new double[seg / 2];
        var line = new Complex[seg];
        foreach (var s in series)
            for (int start = 0; start + seg <= s.Length; start += seg / 2)
            {
                double m = 0;
                for (int i = 0; i < seg; i++) m += s[start + i];
                m /= seg;
                for (int i = 0; i < seg; i++) line[i] = (s[start + i] - m) * (0.5 - 0.5 * Math.Cos(2 * Math.PI * i / seg));
                Fourier.Forward(line, FourierOptions.Matlab);
                for (int k = 1; k < seg / 2; k++) power[k] += line[k].Magnitude * line[k].Magnitude;
            }
        return power;
    }
}
