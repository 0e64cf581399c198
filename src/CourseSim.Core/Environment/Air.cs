namespace CourseSim.Environment;

/// <summary>
/// Air properties from the ISO 2533:1975 standard atmosphere at sea level, with an optional
/// temperature: density from the ideal-gas law at the standard pressure, dynamic viscosity from
/// Sutherland's law (the constants ISO 2533 uses).
/// </summary>
public readonly record struct Air(double TemperatureK, double PressurePa)
{
    public const double StandardTemperatureK = 288.15;
    public const double StandardPressurePa = 101325.0;
    /// <summary>Specific gas constant of dry air used by ISO 2533, J/(kg K).</summary>
    public const double GasConstant = 287.05287;
    /// <summary>Standard gravity, m/s2 (ISO 2533, CGPM 1901).</summary>
    public const double Gravity = 9.80665;
    const double SutherlandBeta = 1.458e-6;
    const double SutherlandS = 110.4;

    public static Air StandardSeaLevel => new(StandardTemperatureK, StandardPressurePa);
    public static Air AtCelsius(double celsius) => new(celsius + 273.15, StandardPressurePa);

    /// <summary>Density, kg/m3.</summary>
    public double Density => PressurePa / (GasConstant * TemperatureK);
    /// <summary>Dynamic viscosity, Pa s (Sutherland).</summary>
    public double DynamicViscosity => SutherlandBeta * Math.Pow(TemperatureK, 1.5) / (TemperatureK + SutherlandS);
    /// <summary>Kinematic viscosity, m2/s.</summary>
    public double KinematicViscosity => DynamicViscosity / Density;
}
