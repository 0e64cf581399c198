using System.Text.Json;
using CourseSim.Random;
using CourseSim.Tests.Settings;
using CourseSim.Units;
using CourseSim.Wind;

namespace CourseSim.Tests.Wind;

public class WindFieldTests
{
    static readonly WindSettings GustOnly = new()
    {
        SpeedKn = 14, DirectionDeg = 270, ShiftAmplitudeDeg = 0, ShiftIrregularity = 0, GustIntensity = 0.12, GustLengthM = 150,
    };

    static double Correlation(double[] a, double[] b)
    {
        double ma = a.Average(), mb = b.Average(), s = 0, sa = 0, sb = 0;
        for (int i = 0; i < a.Length; i++) { s += (a[i] - ma) * (b[i] - mb); sa += (a[i] - ma) * (a[i] - ma); sb += (b[i] - mb) * (b[i] - mb); }
        return s / Math.Sqrt(sa * sb);
    }

    // Sampled mean speed and turbulence intensity match the inputs (mean within 2%, intensity within 15%).
    [Fact]
    public void TheTabulatedShiftFollowsTheSumOfItsSines()
    {
        // The table is filled by rotating each component's phasor (re-anchored every 256 entries): it must match the
        // direct sum of sines (OscillatingShift) to the table's single precision, everywhere a race can read it.
        var f = new WindField(new WindSettings { ShiftAmplitudeDeg = 12, ShiftPeriodS = 300, ShiftIrregularity = 0.5 }, 4);
        double worst = 0;
        for (double tau = -7000; tau < 21000; tau += 0.73)
        {
            double exact = f.OscillatingShift(tau);
            // Linear interpolation of a 0.5 s table of a 300 s oscillation: the chord error is below
            // amp (w dt)^2 / 8 = 12 x (2 pi 0.5 / 300)^2 / 8 = 1.6e-4 deg with the shortest period present (x4 for irregularity).
            worst = Math.Max(worst, Math.Abs(f.TabulatedShift(tau) - exact));
        }
        Assert.True(worst < 3e-3, $"largest difference {worst:E2} deg");
    }

    [Fact]
    public void MeanAndIntensityMatchInputs()
    {
        var f = new WindField(GustOnly, 11);
        var (_, s, _) = WindStatistics.Series(f, 0, 0, 4 * 3600, 2.0);
        double mean = s.Average(), sd = Math.Sqrt(s.Select(v => (v - mean) * (v - mean)).Average());
        Assert.Equal(14, mean, 14 * 0.02);
        Assert.Equal(0.12, sd / mean, 0.12 * 0.15);
    }

    // docs/scenario.md (the contract) and the keys' help: pressure_kn_per_km is extra speed towards the right of the
    // course looking upwind, per km across; bend_deg is the direction on the right (looking upwind) minus the left over
    // 1 km across. Read on each side, 300 m from the axis, for winds from several directions; the right is found here
    // from the compass (looking upwind towards D, the right hand points to D + 90), not from the field's own vectors.
    [Theory]
    [InlineData(0.0)]
    [InlineData(90.0)]
    [InlineData(225.0)]
    [InlineData(300.0)]
    public void PressureAndBendActOnTheDocumentedSide(double fromDeg)
    {
        var f = new WindField(new WindSettings { SpeedKn = 12, DirectionDeg = fromDeg, ShiftAmplitudeDeg = 0, ShiftIrregularity = 0,
            PersistentDegPerMin = 0, GustIntensity = 0, PressureKnPerKm = 6, BendDeg = 20 }, 3);
        double right = Unit.DegToRad(fromDeg + 90);
        double x = 300 * Math.Sin(right), y = 300 * Math.Cos(right);   // x east, y north
        var r = f.Sample(x, y, 0); var l = f.Sample(-x, -y, 0);
        Assert.Equal(6 * 0.6, r.SpeedKn - l.SpeedKn, 1e-6);            // more wind on the right: +6 kn/km over 0.6 km
        Assert.Equal(20 * 0.6, Unit.WrapDeg180(r.FromDeg - l.FromDeg), 1e-6); // right minus left = +bend per km
        // The demo's sign: korrin-bay.toml says "a little more pressure on the right of the course" with +1.0 kn/km.
        var demo = new WindField(new WindSettings { DirectionDeg = fromDeg, ShiftAmplitudeDeg = 0, GustIntensity = 0, PressureKnPerKm = 1.0 }, 3);
        Assert.True(demo.Sample(x, y, 0).SpeedKn > demo.Sample(-x, -y, 0).SpeedKn);
    }

    // The gust tiles (the coarse band and the fine band above it, WindField's layout) sampled over the whole tile: the
    // correlation along a line is the von Karman function for the integral scale L: rho(0.5 L) 0.5445, rho(L) 0.3470,
    // rho(2 L) 0.1504 (computed from 2^(2/3)/Gamma(1/3) x^(1/3) K_1/3(x); von Karman 1948, Proc. Natl Acad. Sci. 34;
    // IEC 61400-1 ed. 3, annex B; shared/REFERENCES.md), here as covariance over the tiles' unit variance. Within 0.03.
    [Fact]
    public void TileBandsTogetherGiveVonKarmanCovariance()
    {
        const double L = 100;
        var (coarse, _) = GustTile.Band(L, L / 3, new CounterRng(5, CounterRng.Streams.Tiles), 512, 8, 0, 128);
        var (fine, _) = GustTile.Band(L, L / 3, new CounterRng(6, CounterRng.Streams.Tiles), 512, 64, 16, 128);
        Assert.InRange(coarse.Variance + fine.Variance, 0.94, 0.97); // all but k l > 100: (1 + 100^2)^(-1/3) = 4.6%
        double At(double a, double b) => coarse.At(a, b) + fine.At(a, b);
        foreach (var (lag, expected) in new[] { (0.0, 1.0), (0.5, 0.5445), (1.0, 0.3470), (2.0, 0.1504) })
        {
            double sum = 0, n = 0;
            for (int row = 0; row < 512; row += 4)
                for (int col = 0; col < 512; col++)
                {
                    double a = (col + 0.3) * coarse.SpacingM, b = (row + 0.7) * coarse.SpacingM;
                    sum += At(a, b) * At(a + lag * L, b); n++;
                }
            Assert.Equal(expected, sum / n, lag == 0 ? 0.06 : 0.03);
        }
    }

    // A pure sinusoidal shift: amplitude (sqrt 2 x sd) and period are recovered from a long sample within 5%.
    [Fact]
    public void ShiftAmplitudeAndPeriodRecovered()
    {
        var s = new WindSettings { ShiftAmplitudeDeg = 10, ShiftPeriodS = 300, ShiftIrregularity = 0, GustIntensity = 0 };
        var (_, _, d) = WindStatistics.Series(new WindField(s, 2), 0, 0, 7200);
        var rel = WindStatistics.Unwrap(d, out _);
        double m = rel.Average(), sd = Math.Sqrt(rel.Select(v => (v - m) * (v - m)).Average());
        Assert.Equal(10, Math.Sqrt(2) * sd, 0.5);
        Assert.Equal(300.0, WindStatistics.ShiftPeriod(rel, 1.0)!.Value, 15.0);
    }

    // A persistent shift is recovered by linear regression of direction on time within 2%.
    [Fact]
    public void PersistentTrendRecovered()
    {
        var s = new WindSettings { ShiftAmplitudeDeg = 4, ShiftPeriodS = 240, PersistentDegPerMin = 0.2, GustIntensity = 0.1 };
        var (t, _, d) = WindStatistics.Series(new WindField(s, 4), 0, 0, 3600);
        var rel = WindStatistics.Unwrap(d, out _);
        var (_, slope) = MathNet.Numerics.Fit.Line(t, rel);
        Assert.Equal(0.2, slope * 60, 0.2 * 0.02 + 0.004);
    }

    // Taylor's frozen turbulence (Taylor 1938, Proc. R. Soc. A 164): the cross-correlation between a point and one 300 m
    // downwind peaks at lag distance / mean speed.
    [Fact]
    public void GustsTravelDownwind()
    {
        var f = new WindField(GustOnly, 8);
        // Wind from 270 blows towards east: the downwind point is at +x.
        var (_, up, _) = WindStatistics.Series(f, 0, 0, 3600);
        var (_, down, _) = WindStatistics.Series(f, 300, 0, 3600);
        double expectedLag = 300 / Unit.KnotsToMs(14);
        int best = 0; double bestC = -1;
        for (int lag = 0; lag <= 80; lag++)
        {
            double c = Correlation(up[..^lag].AsSpan().ToArray(), down[lag..]);
            if (c > bestC) { bestC = c; best = lag; }
        }
        Assert.Equal(expectedLag, best, 2.0);
        Assert.True(bestC > 0.8);
    }

    // Determinism: the same seed gives identical samples whatever the query order or thread count; another seed differs.
    [Fact]
    public void DeterministicAcrossOrderAndThreads()
    {
        var s = new WindSettings();
        var pts = Enumerable.Range(0, 400).Select(i => (x: (i * 37 % 101) * 20.0 - 1000, y: (i * 53 % 97) * 20.0 - 900, t: i * 7.3)).ToArray();
        var a = new WindField(s, 42);
        var forward = pts.Select(p => a.Sample(p.x, p.y, p.t)).ToArray();
        var b = new WindField(s, 42);
        var backward = new WindSample[pts.Length];
        for (int i = pts.Length - 1; i >= 0; i--) backward[i] = b.Sample(pts[i].x, pts[i].y, pts[i].t);
        var parallel = new WindSample[pts.Length];
        Parallel.For(0, pts.Length, new ParallelOptions { MaxDegreeOfParallelism = 4 }, i => parallel[i] = b.Sample(pts[i].x, pts[i].y, pts[i].t));
        Assert.Equal(forward, backward);
        Assert.Equal(forward, parallel);
        var c = new WindField(s, 43);
        Assert.NotEqual(forward, pts.Select(p => c.Sample(p.x, p.y, p.t)).ToArray());
    }

    // The counter-based generator: uniform mean 1/2 and normal sd 1 over many counters; streams differ.
    [Fact]
    public void CounterRngMoments()
    {
        var r = new CounterRng(1, 2);
        double mu = Enumerable.Range(0, 100000).Average(i => r.Uniform((ulong)i));
        double sd = Math.Sqrt(Enumerable.Range(0, 100000).Average(i => r.Normal((ulong)i) * r.Normal((ulong)i)));
        Assert.Equal(0.5, mu, 0.005);
        Assert.Equal(1.0, sd, 0.01);
        Assert.NotEqual(r.Bits(5), new CounterRng(1, 3).Bits(5));
        Assert.NotEqual(r.For(1).Bits(0), r.For(2).Bits(0));
    }
}

public class WindShadowTests
{
    static readonly WindSettings S = new();

    // The documented wake (Jensen 1983, Riso-M-2411, top-hat form): strength (r0/(r0 + k x))^2 (1 - x/Lw) inside
    // |lateral| <= r0 + k x, written out here independently of the code.
    [Fact]
    public void DeficitFollowsDocumentedModel()
    {
        var sh = new WindShadow(S);
        // Source at the origin, apparent wind from the north (blowing south), 5 m mast, 14 kn.
        sh.Build([new ShadowSource(0, 0, 0, 5.0, Unit.KnotsToMs(14))]);
        double lw = WindShadow.WakeLength(5.0, Unit.KnotsToMs(14));
        foreach (double x in new[] { 2.0, 10, 20 })
        {
            double r = S.ShadowHalfWidthM + S.ShadowSpread * x;
            double expected = Math.Pow(S.ShadowHalfWidthM / r, 2) * (1 - x / lw);
            var w = sh.Apply(new WindSample(7, 0), 0, -x);
            Assert.Equal(7 * (1 - S.ShadowDeficit * expected), w.SpeedMs, 9);
            Assert.Equal(0.0, sh.Apply(new WindSample(7, 0), r + 0.5, -x).SpeedMs - 7, 12);
        }
    }

    // No effect upwind of the sail, nor beyond the end of the wake.
    [Fact]
    public void NoEffectUpwindOrBeyond()
    {
        var sh = new WindShadow(S);
        sh.Build([new ShadowSource(0, 0, 0, 5.0, 7)]);
        Assert.Equal(new WindSample(7, 0), sh.Apply(new WindSample(7, 0), 0, 5));
        Assert.Equal(new WindSample(7, 0), sh.Apply(new WindSample(7, 0), 0, -WindShadow.WakeLength(5, 7) - 1));
    }

    // Wake length about 8 mast heights in light wind and 4 in strong wind (common practice).
    [Fact]
    public void WakeLengthByWind()
    {
        Assert.Equal(40, WindShadow.WakeLength(5, Unit.KnotsToMs(6)), 9);
        Assert.Equal(20, WindShadow.WakeLength(5, Unit.KnotsToMs(25)), 9);
    }

    // The header turns the air towards the source's apparent wind direction.
    [Fact]
    public void HeaderTurnsTowardsApparentWind()
    {
        var sh = new WindShadow(S);
        sh.Build([new ShadowSource(0, 0, 30, 5.0, 7)]);
        var w = sh.Apply(new WindSample(7, 0), 2 * Math.Sin(Math.PI / 6) * -1, -2 * Math.Cos(Math.PI / 6));
        Assert.True(w.FromDeg > 0 && w.FromDeg < 30);
    }

    // Grid neighbour look-up gives the same answer as checking every source (many boards spread over a course).
    [Fact]
    public void GridMatchesBruteForce()
    {
        var rng = new CounterRng(3, 9);
        var src = Enumerable.Range(0, 300).Select(i => new ShadowSource(rng.Uniform((ulong)(3 * i)) * 800, rng.Uniform((ulong)(3 * i + 1)) * 800,
            200 + 40 * rng.Uniform((ulong)(3 * i + 2)), 5, 6)).ToArray();
        var sh = new WindShadow(S);
        sh.Build(src);
        for (int q = 0; q < 2000; q++)
        {
            double x = rng.Uniform((ulong)(10000 + 2 * q)) * 800, y = rng.Uniform((ulong)(10001 + 2 * q)) * 800;
            double factor = 1;
            for (int s = 0; s < src.Length; s++) factor *= 1 - S.ShadowDeficit * sh.Strength(s, x, y);
            Assert.Equal(6 * factor, sh.Apply(new WindSample(6, 220), x, y).SpeedMs, 9);
        }
    }
}

public class WindCliTests
{
    static (int, string, string) Run(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        return (CourseSim.Cli.Program.Run(args, o, e), o.ToString(), e.ToString());
    }

    static string Scenario => Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay.toml");

    [Fact]
    public void JsonHasDocumentedFieldsAndChartsAreWritten()
    {
        string dir = Directory.CreateTempSubdirectory("cs-wind-").FullName;
        var (code, stdout, _) = Run("wind", Scenario, "--seed", "7", "--at", "100,-200", "--format", "json", "--out", dir, "--duration", "1800");
        Assert.Equal(0, code);
        var root = JsonDocument.Parse(stdout).RootElement;
        foreach (var k in new[] { "speed_mean_kn", "speed_sigma_kn", "direction_mean_deg", "direction_sigma_deg", "gust_factor", "samples" })
            Assert.True(root.TryGetProperty(k, out _), k);
        Assert.Equal(1801, root.GetProperty("samples").GetInt32());
        Assert.True(new FileInfo(Path.Combine(dir, "wind-series.png")).Length > 10000);
        Assert.True(new FileInfo(Path.Combine(dir, "wind-map.png")).Length > 10000);
        var (_, again, _) = Run("wind", Scenario, "--seed", "7", "--at", "100,-200", "--format", "json", "--out", dir, "--duration", "1800");
        Assert.Equal(stdout, again);
    }

    // `coursesim wind SCENARIO` without --seed shows the wind of the scenario's races: race.seed (docs/wind.md), the seed
    // RaceContext gives the race's WindField; --seed overrides it.
    [Fact]
    public void WithoutSeedTheScenarioRaceSeedIsUsed()
    {
        string dir = Directory.CreateTempSubdirectory("cs-wind-").FullName;
        string f = Path.Combine(dir, "seeded.toml");
        File.WriteAllText(f, "name = \"seeded\"\n[wind]\nspeed_kn = 12\ngust_intensity = 0.15\n[race]\nseed = 7\n");
        string[] common = ["--format", "json", "--out", dir, "--duration", "600"];
        var (code, byScenario, _) = Run(["wind", f, .. common]);
        Assert.Equal(0, code);
        var (_, seven, _) = Run(["wind", f, "--seed", "7", .. common]);
        var (_, one, _) = Run(["wind", f, "--seed", "1", .. common]);
        Assert.Equal(7UL, JsonDocument.Parse(byScenario).RootElement.GetProperty("seed").GetUInt64());
        Assert.Equal(seven, byScenario);
        Assert.NotEqual(JsonDocument.Parse(one).RootElement.GetProperty("speed_mean_kn").GetDouble(),
            JsonDocument.Parse(byScenario).RootElement.GetProperty("speed_mean_kn").GetDouble());
        // And it is the race's own field: the summary equals one made from WindField(settings, 7).
        var field = new WindField(WindFile.From(CourseSim.Simulation.ScenarioFile.Load(f, [])), 7);
        var (_, sp, d) = WindStatistics.Series(field, 0, 0, 600);
        Assert.Equal(WindStatistics.Summarise(sp, d, 1.0).SpeedMeanKn,
            JsonDocument.Parse(byScenario).RootElement.GetProperty("speed_mean_kn").GetDouble(), 2); // JSON rounds to 3 decimals
    }

    [Fact]
    public void BadValueNamesFileLineKeyRange()
    {
        string dir = Directory.CreateTempSubdirectory("cs-wind-").FullName;
        string f = Path.Combine(dir, "bad.toml");
        File.WriteAllText(f, "name = \"x\"\n[wind]\nspeed_kn = 12\ngust_intensity = 0.9\n");
        var (code, _, err) = Run("wind", f, "--out", dir);
        Assert.Equal(2, code);
        Assert.Contains("bad.toml:4", err);
        Assert.Contains("wind.gust_intensity", err);
        Assert.Contains("0 to 0.4", err);
        var (code2, _, err2) = Run("wind", Scenario, "--set", "wind.sped_kn=10", "--out", dir);
        Assert.Equal(2, code2);
        Assert.Contains("wind.speed_kn", err2);
    }
}
