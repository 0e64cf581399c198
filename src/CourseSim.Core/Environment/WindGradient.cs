namespace CourseSim.Environment;

/// <summary>
/// Neutral logarithmic wind profile over open water, U(z) = (u*/kappa) ln(z/z0), with the sea
/// surface roughness from Charnock's relation z0 = alpha u*^2 / g. Wind speeds in CourseSim are
/// given at the 10 m reference height (the meteorological standard) and taken to the rig's centre
/// of effort with this profile. kappa = 0.41; alpha = 0.0144 (Garratt 1977, "Review of drag
/// coefficients over oceans and continents", Mon. Wea. Rev. 105). Valid for a neutral surface layer,
/// open water, U10 above about 2 m/s; below that z0 is held at its 2 m/s value (smooth-flow regime
/// not modelled).
/// </summary>
public static class WindGradient
{
    public const double Kappa = 0.41;
    public const double Charnock = 0.0144;
    public const double ReferenceHeightM = 10.0;

    /// <summary>Friction velocity u* (m/s) for a 10 m wind speed, solved by fixed-point iteration.</summary>
    public static double FrictionVelocity(double u10)
    {
        double u = Math.Max(u10, 2.0);
        double ustar = 0.04 * u;
        for (int i = 0; i < 50; i++)
        {
            double z0 = Charnock * ustar * ustar / Air.Gravity;
            double next = Kappa * u / Math.Log(ReferenceHeightM / z0);
            if (Math.Abs(next - ustar) < 1e-12) { ustar = next; break; }
            ustar = next;
        }
        return u10 < 2.0 ? ustar * u10 / 2.0 : ustar;
    }

    /// <summary>Roughness length z0 (m) for a 10 m wind speed.</summary>
    public static double Roughness(double u10)
    {
        double ustar = FrictionVelocity(Math.Max(u10, 2.0));
        return Charnock * ustar * ustar / Air.Gravity;
    }

    /// <summary>Ratio U(z)/U(10 m) for the given 10 m speed (independent of speed when below 2 m/s).</summary>
    public static double Factor(double u10, double heightM)
    {
        double z0 = Roughness(u10);
        double z = Math.Max(heightM, 10 * z0);
        return Math.Log(z / z0) / Math.Log(ReferenceHeightM / z0);
    }

    /// <summary>Wind speed (m/s) at the given height for a 10 m wind speed (m/s).</summary>
    public static double SpeedAt(double u10, double heightM) => u10 * Factor(u10, heightM);
}
