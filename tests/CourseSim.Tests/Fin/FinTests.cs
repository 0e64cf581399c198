using CourseSim.Fin;
using CourseSim.Units;

namespace CourseSim.Tests.Fin;

public class FinTests
{
    // Worked fin (computed from Helmbold's formula with the end-plate image, shared/REFERENCES.md): area 0.045 m2,
    // span 0.38 m -> AR 3.21 geometric, 6.42 effective, slope 4.623/rad; at 12 m/s carrying 400 N in sea water,
    // CL 0.1204 and incidence 1.49 deg.
    [Fact]
    public void WorkedFin()
    {
        var fin = new FinModel(new FinSpec { AreaCm2 = 450, DepthCm = 38 });
        Assert.Equal(3.21, fin.GeometricAspectRatio, 2);
        Assert.Equal(6.42, fin.EffectiveAspectRatio, 2);
        Assert.Equal(4.623, fin.LiftSlope, 3);
        var st = fin.Carry(400, 12, 1025.0, 1.19e-6);
        Assert.Equal(0.1204, st.Lift, 3);
        Assert.Equal(1.49, Unit.RadToDeg(st.Incidence), 2);
        Assert.False(st.SpunOut);
    }

    // Induced drag grows with the square of side force at fixed speed (finite-wing theory), profile drag does not.
    [Fact]
    public void InducedDragQuadratic()
    {
        var fin = new FinModel(new FinSpec());
        double d0 = fin.Carry(0, 10, 1025, 1.19e-6).Drag;
        double d1 = fin.Carry(200, 10, 1025, 1.19e-6).Drag - d0;
        double d2 = fin.Carry(400, 10, 1025, 1.19e-6).Drag - d0;
        Assert.Equal(4.0, d2 / d1, 9);
    }

    // Spin-out begins at about 9 to 13 deg of fin incidence (common practice): the default fin's maximum lift lies there.
    [Fact]
    public void SpinOutIncidenceInTradeRange()
    {
        var fin = new FinModel(new FinSpec());
        Assert.InRange(Unit.RadToDeg(fin.Spec.MaxLift / fin.LiftSlope), 9.0, 13.0);
        var slow = fin.Carry(900, 4, 1025, 1.19e-6);
        Assert.True(slow.SpunOut);
    }
}
