namespace CourseSim.Wings;

/// <summary>
/// Finite-wing theory shared by the sail and the fin.
/// </summary>
public static class WingTheory
{
    /// <summary>Thin-aerofoil section lift slope, 2 pi per radian (Abbott and von Doenhoff 1959, ch. 4).</summary>
    public const double ThinAerofoilSlope = 2.0 * Math.PI;

    /// <summary>Prandtl lifting-line slope a = a0 / (1 + a0/(pi e AR)), per radian.</summary>
    public static double PrandtlSlope(double aspectRatio, double a0 = ThinAerofoilSlope, double e = 1.0)
        => a0 / (1.0 + a0 / (Math.PI * e * aspectRatio));

    /// <summary>
    /// Helmbold's (1942) low-aspect-ratio correction of lifting-line theory,
    /// a = a0 / (sqrt(1 + (a0/(pi AR))^2) + a0/(pi AR)), per radian. Tends to Prandtl's slope at large AR and to
    /// slender-wing theory (pi AR / 2) at small AR, so it is used for both the sail and the fin.
    /// </summary>
    public static double HelmboldSlope(double aspectRatio, double a0 = ThinAerofoilSlope)
    {
        double k = a0 / (Math.PI * aspectRatio);
        return a0 / (Math.Sqrt(1.0 + k * k) + k);
    }

    /// <summary>Induced drag coefficient CDi = CL^2 / (pi e AR).</summary>
    public static double InducedDrag(double cl, double aspectRatio, double e)
        => cl * cl / (Math.PI * e * aspectRatio);

    /// <summary>Zero-lift angle of a circular-arc camber line of depth f/c from thin-aerofoil theory: -2 f/c radians.</summary>
    public static double CircularArcZeroLift(double camber) => -2.0 * camber;
}

/// <summary>
/// Viterna and Corrigan (1981), "Fixed pitch rotor performance of large horizontal axis wind turbines",
/// NASA CP-2230: post-stall lift and drag from the stall point (alpha_s, CL_s, CD_s) and the aspect ratio,
/// CDmax = 1.11 + 0.018 AR, CL = A1 sin 2a + A2 cos^2 a / sin a, CD = B1 sin^2 a + B2 cos a, valid from stall to 90 deg.
/// </summary>
public readonly record struct PostStall(double A1, double A2, double B1, double B2, double CdMax)
{
    public static PostStall From(double stallAngleRad, double clStall, double cdStall, double aspectRatio)
    {
        double cdMax = 1.11 + 0.018 * aspectRatio;
        double s = Math.Sin(stallAngleRad), c = Math.Cos(stallAngleRad);
        double a1 = cdMax / 2.0;
        double a2 = (clStall - cdMax * s * c) * s / (c * c);
        double b1 = cdMax;
        double b2 = (cdStall - cdMax * s * s) / c;
        return new PostStall(a1, a2, b1, b2, cdMax);
    }

    public double Lift(double alphaRad)
    {
        double s = Math.Max(Math.Sin(alphaRad), 1e-6), c = Math.Cos(alphaRad);
        return A1 * Math.Sin(2 * alphaRad) + A2 * c * c / s;
    }

    public double Drag(double alphaRad) => B1 * Math.Sin(alphaRad) * Math.Sin(alphaRad) + B2 * Math.Cos(alphaRad);
}
