namespace CourseSim.Environment;

/// <summary>
/// Water properties. Fresh-water density from Kell's (1975) polynomial; sea-water density and the
/// viscosity of both from the correlations of Sharqawy, Lienhard and Zubair (2010), the basis the
/// ITTC Recommended Procedure 7.5-02-01-03 (2011) adopted. Valid 0..40 C, salinity 0..0.12 kg/kg.
/// </summary>
public readonly record struct Water(double TemperatureC, double SalinityKgPerKg)
{
    /// <summary>Reference salinity of standard sea water, 35.16504 g/kg.</summary>
    public const double StandardSeaSalinity = 0.03516504;

    public static Water Fresh(double celsius = 15.0) => new(celsius, 0.0);
    public static Water Sea(double celsius = 15.0) => new(celsius, StandardSeaSalinity);

    static double FreshDensity(double t) =>
        (999.83952 + 16.945176 * t - 7.9870401e-3 * t * t - 46.170461e-6 * t * t * t
         + 105.56302e-9 * Math.Pow(t, 4) - 280.54253e-12 * Math.Pow(t, 5)) / (1.0 + 16.879850e-3 * t);

    static double PureViscosity(double t) => 4.2844e-5 + 1.0 / (0.157 * (t + 64.993) * (t + 64.993) - 91.296);

    /// <summary>Density, kg/m3.</summary>
    public double Density
    {
        get
        {
            double t = TemperatureC, s = SalinityKgPerKg;
            if (s <= 0) return FreshDensity(t);
            // Sharqawy et al. (2010) eq. (8): pure-water part plus a salinity term.
            double rhoW = 9.999e2 + 2.034e-2 * t - 6.162e-3 * t * t + 2.261e-5 * t * t * t - 4.657e-8 * Math.Pow(t, 4);
            double d = s * (8.020e2 - 2.001 * t + 1.677e-2 * t * t - 3.060e-5 * t * t * t - 1.613e-5 * s * t * t);
            return rhoW + d;
        }
    }

    /// <summary>Dynamic viscosity, Pa s.</summary>
    public double DynamicViscosity
    {
        get
        {
            double t = TemperatureC, s = SalinityKgPerKg;
            double muW = PureViscosity(t);
            if (s <= 0) return muW;
            double a = 1.541 + 1.998e-2 * t - 9.52e-5 * t * t;
            double b = 7.974 - 7.561e-2 * t + 4.724e-4 * t * t;
            return muW * (1 + a * s + b * s * s);
        }
    }

    /// <summary>Kinematic viscosity, m2/s.</summary>
    public double KinematicViscosity => DynamicViscosity / Density;
}
