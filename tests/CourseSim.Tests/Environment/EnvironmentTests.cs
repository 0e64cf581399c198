using CourseSim.Environment;
using CourseSim.Units;

namespace CourseSim.Tests.Environment;

public class AirTests
{
    // ISO 2533:1975 Standard Atmosphere, sea-level values (table 1): rho 1.2250 kg/m3, mu 1.7894e-5 Pa s, nu 1.4607e-5 m2/s.
    [Fact]
    public void StandardSeaLevelMatchesIso2533()
    {
        var air = Air.StandardSeaLevel;
        Assert.Equal(1.2250, air.Density, 4);
        Assert.Equal(1.7894e-5, air.DynamicViscosity, 8);
        Assert.Equal(1.4607e-5, air.KinematicViscosity, 8);
    }

    // Sutherland's law with the ISO 2533 constants (beta 1.458e-6, S 110.4 K) at 20 C and standard pressure:
    // rho 1.2041, mu 1.8134e-5, nu 1.5060e-5 (computed from the published formulas; shared/REFERENCES.md).
    [Fact]
    public void TwentyDegreesFollowsSutherland()
    {
        var air = Air.AtCelsius(20);
        Assert.Equal(1.2041, air.Density, 4);
        Assert.Equal(1.8134e-5, air.DynamicViscosity, 8);
        Assert.Equal(1.5060e-5, air.KinematicViscosity, 8);
    }

    // Warmer air is thinner: ideal gas at fixed pressure (common practice).
    [Fact]
    public void DensityFallsWithTemperature() => Assert.True(Air.AtCelsius(30).Density < Air.AtCelsius(0).Density);
}

public class WaterTests
{
    // ITTC Recommended Procedure 7.5-02-01-03 (2011), fresh water at 15 C: rho 999.1026 kg/m3, nu 1.13858e-6 m2/s.
    [Fact]
    public void FreshWaterAt15CMatchesIttc()
    {
        var w = Water.Fresh(15);
        Assert.Equal(999.1026, w.Density, 0.01);
        Assert.Equal(1.13858e-6, w.KinematicViscosity, 1.13858e-6 * 0.001);
    }

    // ITTC 7.5-02-01-03 (2011), sea water at 15 C, salinity 35.16504 g/kg: rho 1026.021 kg/m3, nu 1.1883e-6..1.1892e-6 m2/s.
    [Fact]
    public void SeaWaterAt15CMatchesIttc()
    {
        var w = Water.Sea(15);
        Assert.Equal(1026.021, w.Density, 1026.021 * 0.0005);
        Assert.InRange(w.KinematicViscosity, 1.1883e-6 * 0.999, 1.1892e-6 * 1.001);
    }

    // Fresh water is densest near 4 C (Kell 1975, J. Chem. Eng. Data 20(1)).
    [Fact]
    public void FreshWaterDensestNearFourDegrees()
    {
        Assert.True(Water.Fresh(4).Density > Water.Fresh(0).Density);
        Assert.True(Water.Fresh(4).Density > Water.Fresh(8).Density);
        Assert.Equal(999.975, Water.Fresh(4).Density, 0.01);
    }
}

public class UnitTests
{
    // The international knot is exactly 1852 m per hour (BIPM SI Brochure, 9th ed., table 8).
    [Fact]
    public void KnotIsExact()
    {
        Assert.Equal(1852.0 / 3600.0, Unit.KnotsToMs(1), 15);
        Assert.Equal(10.0, Unit.MsToKnots(Unit.KnotsToMs(10)), 12);
    }

    [Theory]
    [InlineData(370, 10)]
    [InlineData(-90, 270)]
    [InlineData(720, 0)]
    public void WrapsBearings(double input, double expected) => Assert.Equal(expected, Unit.WrapDeg360(input), 12);
}

public class WindGradientTests
{
    // Neutral log law with Charnock's roughness, kappa 0.41, alpha 0.0144 (Garratt 1977, Mon. Wea. Rev. 105:915-929):
    // U10 10 m/s -> z0 2.13e-4 m, u* 0.381 m/s, U(2 m) 8.50 m/s; U10 5 -> U(2 m) 4.35; U10 15 -> 12.52 (computed,
    // shared/REFERENCES.md).
    [Fact]
    public void CharnockProfileMatchesWorkedValues()
    {
        Assert.Equal(0.381, WindGradient.FrictionVelocity(10), 3);
        Assert.Equal(2.13e-4, WindGradient.Roughness(10), 6);
        Assert.Equal(8.50, WindGradient.SpeedAt(10, 2), 2);
        Assert.Equal(4.35, WindGradient.SpeedAt(5, 2), 2);
        Assert.Equal(12.52, WindGradient.SpeedAt(15, 2), 2);
    }

    [Fact]
    public void ReferenceHeightIsIdentity() => Assert.Equal(7.0, WindGradient.SpeedAt(7, 10), 10);
}

public class ApparentWindTests
{
    // Vector composition (common practice; shared/REFERENCES.md): 10 kn true at 90 deg with the board at 10 kn gives
    // 14.1421 kn at 45 deg; 18 kn at 60 deg, board 14.2 -> 27.95 kn at 33.9 deg; 10 kn at 135 deg, board 15 -> 10.62 kn
    // at 41.7 deg (computed).
    [Theory]
    [InlineData(10, 90, 10, 14.1421, 45.0)]
    [InlineData(18, 60, 14.2, 27.95, 33.9)]
    [InlineData(10, 135, 15, 10.62, 41.7)]
    public void ComposesVectors(double tws, double twa, double boat, double aws, double awa)
    {
        var a = ApparentWind.From(tws, Unit.DegToRad(twa), boat);
        Assert.Equal(aws, a.Speed, 0.01);
        Assert.Equal(awa, a.AngleDeg, 0.1);
    }

    // Head to wind the speeds add; dead downwind they subtract, and faster than the wind the apparent wind turns ahead.
    [Fact]
    public void HeadOnAndDeadDownwind()
    {
        var head = ApparentWind.From(10, 0, 5);
        Assert.Equal(15, head.Speed, 10); Assert.Equal(0, head.AngleDeg, 10);
        var down = ApparentWind.From(10, Math.PI, 4);
        Assert.Equal(6, down.Speed, 10); Assert.Equal(180, down.AngleDeg, 10);
        var past = ApparentWind.From(10, Math.PI, 12);
        Assert.Equal(2, past.Speed, 10); Assert.Equal(0, past.AngleDeg, 6);
    }
}
