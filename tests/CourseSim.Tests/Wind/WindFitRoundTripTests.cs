using CourseSim.Wind;
using CourseSim.Wind.Fit;
using Xunit.Abstractions;

namespace CourseSim.Tests.Wind;

/// <summary>
/// Issue 15's round trip: wind made by the field from known parameters, logged as a station would log it (1-s means;
/// 1-min means with gusts; 10-min means with gusts), fitted again; each resolved parameter's 95 % interval must cover
/// the truth in at least 90 % of the seeds. The truth is invented (a moderate, shifty breeze); the check is the
/// coverage of a confidence interval (its definition: Efron and Tibshirani 1993, An Introduction to the Bootstrap, ch. 12).
/// </summary>
public class WindFitRoundTripTests(ITestOutputHelper output)
{
    static readonly WindSettings Truth = new()
    {
        SpeedKn = 14, DirectionDeg = 225, RampKnPerHour = 1, ShiftAmplitudeDeg = 8, ShiftPeriodS = 360, ShiftIrregularity = 0.3,
        PersistentDegPerMin = 0.05, GustIntensity = 0.12, GustLengthM = 150,
    };

    static double TruthOf(string key) => key switch
    {
        "speed_kn" => Truth.SpeedKn, "ramp_kn_per_hour" => Truth.RampKnPerHour, "direction_deg" => Truth.DirectionDeg,
        "persistent_deg_per_min" => Truth.PersistentDegPerMin, "shift_amplitude_deg" => Truth.ShiftAmplitudeDeg,
        "shift_period_s" => Truth.ShiftPeriodS, "shift_irregularity" => Truth.ShiftIrregularity, "gust_intensity" => Truth.GustIntensity,
        "gust_length_m" => Truth.GustLengthM, _ => throw new ArgumentException(key),
    };

    /// <summary>Coverage per key over the seeds; keys a sampling does not resolve must say so in every seed.</summary>
    Dictionary<string, double> Coverage(double dt, bool gusts, double durationS, int seeds, int replicates, string[] unresolved)
    {
        var hits = new Dictionary<string, int>(); var seen = new Dictionary<string, int>();
        for (ulong seed = 1; seed <= (ulong)seeds; seed++)
        {
            var rows = StationSampler.Sample(new WindField(Truth, 100 + seed), 0, 0, durationS, dt, gusts);
            var r = WindFitter.Fit(StationSampler.ToLog(rows), replicates: replicates, seed: seed);
            foreach (var v in r.Values)
            {
                if (unresolved.Contains(v.Key)) { Assert.False(v.Resolved, $"{v.Key} should not be resolved by rows every {dt} s"); continue; }
                Assert.True(v.Resolved, $"{v.Key} not resolved by rows every {dt} s, seed {seed}");
                seen[v.Key] = seen.GetValueOrDefault(v.Key) + 1;
                bool hit = TruthOf(v.Key) >= v.Low && TruthOf(v.Key) <= v.High;
                if (hit) hits[v.Key] = hits.GetValueOrDefault(v.Key) + 1;
                else output.WriteLine($"dt {dt} seed {seed}: {v.Key} {v.Value:G4} [{v.Low:G4}, {v.High:G4}] misses {TruthOf(v.Key)}");
            }
        }
        var cov = seen.ToDictionary(p => p.Key, p => hits.GetValueOrDefault(p.Key) / (double)p.Value);
        foreach (var (k, c) in cov) output.WriteLine($"dt {dt}: {k} covered in {c:P0} of {seeds} seeds");
        return cov;
    }

    static readonly string[] Coarse = ["shift_amplitude_deg", "shift_period_s", "shift_irregularity", "gust_intensity", "gust_length_m"];

    [Fact]
    public void OneMinuteMeansWithGusts()
    {
        foreach (var (k, c) in Coverage(60, true, 6 * 3600, 10, 60, [])) Assert.True(c >= 0.9, $"{k}: {c:P0}");
    }

    /// <summary>Ten seeds: at most two misses per key (seeds 104 and 109 hold the two highest 6-h mean speeds of twenty,
    /// 14.15 and 14.19 kn against 14.08 on average, and both miss speed_kn). The 90 % claim is <see cref="ManySeeds"/>'s.</summary>
    [Fact]
    public void TenMinuteMeansWithGusts()
    {
        foreach (var (k, c) in Coverage(600, true, 6 * 3600, 10, 60, Coarse)) Assert.True(c >= 0.8, $"{k}: {c:P0}");
    }

    /// <summary>A smoke check on four seeds (a fit of 1-s rows takes seconds): at most one miss per key. The 90 % claim
    /// for 1-s rows is <see cref="ManySeeds"/>'s (Slow).</summary>
    [Fact]
    public void OneSecondMeans()
    {
        foreach (var (k, c) in Coverage(1, false, 2 * 3600, 4, 40, [])) Assert.True(c >= 0.75, $"{k}: {c:P0}");
    }

    /// <summary>The 90 % claim for 1-s rows over 40 seeds: about 12 minutes on two cores, so outside CI (category Long:
    /// COURSESIM_LONG=1 dotnet test). Last run 2 Dec 2026 (docs/wind-fit.md): every key at 90 % or more.</summary>
    [Fact, Trait("Category", Slow.Long)]
    public void ManySeedsOfOneSecondRows() => ManySeeds(1.0, false, 40);

    [Theory, Trait("Category", Slow.Category)]
    [InlineData(60.0, true, 50)]
    [InlineData(600.0, true, 50)]
    public void ManySeeds(double dt, bool gusts, int seeds)
    {
        var cov = Coverage(dt, gusts, dt < 10 ? 3 * 3600 : 6 * 3600, seeds, 100, dt > WindEstimator.CoarseStepS ? Coarse : []);
        foreach (var (k, c) in cov) Assert.True(c >= 0.9, $"{k}: {c:P0}");
    }
}
