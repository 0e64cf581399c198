using CourseSim.Hull;

namespace CourseSim.Tests.Hull;

public class FrictionTests
{
    // ITTC 1957 line CF = 0.075/(log10 Re - 2)^2: Re 1e7 -> 0.003000, Re 1e6 -> 0.0046875; Re 5.62e6 -> 3.325e-3 as
    // tabulated by Morrall (1970), NPL Ship Report 142.
    [Theory]
    [InlineData(1e7, 0.003000)]
    [InlineData(1e6, 0.0046875)]
    [InlineData(5.62e6, 0.003325)]
    public void Ittc1957Line(double re, double cf) => Assert.Equal(cf, Friction.Ittc1957(re), 6e-7);
}

public class SavitskyTests
{
    // Savitsky (1964), Marine Technology 1(1), worked example: 60,000 lb, 40 kn, beam 14 ft, deadrise 10 deg:
    // Cv 3.180, CLbeta 0.0675, CL0 0.0820, and at trim 2 deg lambda 3.77 (0.5%). Sea water rho 1.99 slug/ft3 as in the paper.
    [Fact]
    public void PaperWorkedExample()
    {
        double weight = 60000 * 4.4482216152605, v = 40 * 1852.0 / 3600, b = 14 * 0.3048;
        double rho = 1.99 * 515.378818;
        var s = Savitsky.At(weight, v, b, 10, 2.0, rho, 1.19e-6, 9.80665);
        Assert.Equal(3.180, s.Cv, 2);
        Assert.Equal(0.0675, s.ClBeta, 3);
        Assert.Equal(0.0820, s.Cl0, 3);
        Assert.Equal(3.77, s.Lambda, 3.77 * 0.01);
    }

    // Board scale (computed from Savitsky's equations, shared/REFERENCES.md): weight 1000 N, beam 0.45 m, 10 m/s, flat
    // bottom: Cv 4.76, CLbeta 0.0964; at trim 4 deg lambda 2.43 and drag 144.5 N; at 5 deg 141.4 N.
    [Fact]
    public void BoardScaleValues()
    {
        var s4 = Savitsky.At(1000, 10, 0.45, 0, 4, 1025, 1.19e-6);
        var s5 = Savitsky.At(1000, 10, 0.45, 0, 5, 1025, 1.19e-6);
        Assert.Equal(4.76, s4.Cv, 2);
        Assert.Equal(0.0964, s4.ClBeta, 3);
        Assert.Equal(2.43, s4.Lambda, 2.43 * 0.01);
        Assert.Equal(144.5, s4.Drag, 144.5 * 0.01);
        Assert.Equal(141.4, s5.Drag, 141.4 * 0.01);
    }
}

public class HullModelTests
{
    // A planing hull shows a resistance hump before planing and falls after it (Savitsky 1964; Radojcic et al. 2014):
    // the resistance peaks below full planing (FnV 3) and is lower just after.
    [Fact]
    public void ResistanceHasAHumpBeforePlaning()
    {
        var h = new HullModel(new BoardSpec(), 92, 1025, 1.19e-6);
        double vFull = HullModel.FullLiftFroude * Math.Sqrt(9.80665 * Math.Cbrt(h.DisplacementM3));
        double peakV = 0, peak = 0;
        for (double v = 0.5; v <= vFull; v += 0.05) { double r = h.At(v).Resistance; if (r > peak) { peak = r; peakV = v; } }
        Assert.InRange(h.VolumeFroude(peakV), 1.5, 2.9);
        Assert.True(h.At(vFull).Resistance < peak);
        Assert.Equal(1.0, h.At(vFull + 0.5).LiftFraction, 9);
        Assert.Equal(0.0, h.At(1.0).LiftFraction, 9);
    }
}
