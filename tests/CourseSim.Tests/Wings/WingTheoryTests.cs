using CourseSim.Units;
using CourseSim.Wings;

namespace CourseSim.Tests.Wings;

public class WingTheoryTests
{
    // Prandtl lifting line a = a0/(1 + a0/(pi e AR)) and Helmbold (1942) a = a0/(sqrt(1 + (a0/(pi AR))^2) + a0/(pi AR)),
    // a0 = 2 pi: AR 6 -> 4.712 and 4.529 per rad; AR 3 -> 3.770 and 3.363; AR 1 Helmbold 1.483 (computed,
    // shared/REFERENCES.md; formulas in Anderson, Fundamentals of Aerodynamics, 5th ed., sec. 5.3).
    [Theory]
    [InlineData(6, 4.712, 4.529)]
    [InlineData(3, 3.770, 3.363)]
    public void LiftingLineSlopes(double ar, double prandtl, double helmbold)
    {
        Assert.Equal(prandtl, WingTheory.PrandtlSlope(ar), 3);
        Assert.Equal(helmbold, WingTheory.HelmboldSlope(ar), 3);
    }

    [Fact]
    public void HelmboldAtLowAspectRatio()
    {
        Assert.Equal(1.483, WingTheory.HelmboldSlope(1), 3);
        // Slender-wing limit pi AR / 2 (R. T. Jones 1946, NACA Report 835).
        Assert.Equal(Math.PI * 0.05 / 2, WingTheory.HelmboldSlope(0.05), 3);
    }

    // CDi = CL^2/(pi e AR): CL 1, AR 6 -> 0.05305 (e 1), 0.05895 (e 0.9) (computed).
    [Fact]
    public void InducedDrag()
    {
        Assert.Equal(0.05305, WingTheory.InducedDrag(1, 6, 1), 5);
        Assert.Equal(0.05895, WingTheory.InducedDrag(1, 6, 0.9), 5);
    }

    // Thin-aerofoil theory: circular-arc camber f/c 0.10 shifts the zero-lift angle to -11.46 deg (Abbott and
    // von Doenhoff 1959, sec. 4.3).
    [Fact]
    public void CamberZeroLift() => Assert.Equal(-11.46, Unit.RadToDeg(WingTheory.CircularArcZeroLift(0.10)), 2);

    // Viterna and Corrigan (1981), NASA CP-2230: CDmax = 1.11 + 0.018 AR. With stall at 15 deg, CL 1.2, CD 0.10, AR 6:
    // CDmax 1.218; at 45 deg CL 0.785, CD 0.622; at 90 deg CL 0, CD 1.218 (computed, shared/REFERENCES.md).
    [Fact]
    public void ViternaCorriganWorkedValues()
    {
        var p = PostStall.From(Unit.DegToRad(15), 1.2, 0.10, 6);
        Assert.Equal(1.218, p.CdMax, 3);
        Assert.Equal(0.785, p.Lift(Unit.DegToRad(45)), 3);
        Assert.Equal(0.622, p.Drag(Unit.DegToRad(45)), 3);
        Assert.Equal(0.0, p.Lift(Math.PI / 2), 3);
        Assert.Equal(1.218, p.Drag(Math.PI / 2), 3);
        // Continuous with the stall point it was built from.
        Assert.Equal(1.2, p.Lift(Unit.DegToRad(15)), 9);
        Assert.Equal(0.10, p.Drag(Unit.DegToRad(15)), 9);
    }
}
