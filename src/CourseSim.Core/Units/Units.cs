namespace CourseSim.Units;

/// <summary>Unit conversions. Internally CourseSim works in SI (m, s, kg, N, rad).</summary>
public static class Unit
{
    /// <summary>One international knot is exactly 1852 m per 3600 s.</summary>
    public const double MetresPerSecondPerKnot = 1852.0 / 3600.0;

    public static double KnotsToMs(double kn) => kn * MetresPerSecondPerKnot;
    public static double MsToKnots(double ms) => ms * KnotsPerMetrePerSecond;
    /// <summary>3600 / 1852 knots in one metre per second.</summary>
    public const double KnotsPerMetrePerSecond = 3600.0 / 1852.0;
    public static double DegToRad(double deg) => deg * (Math.PI / 180.0);
    public static double RadToDeg(double rad) => rad * (180.0 / Math.PI);

    /// <summary>Wraps an angle in degrees to [0, 360).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static double WrapDeg360(double deg)
    {
        // Fast paths give exactly what the remainder gives (Sterbenz: deg - 360 is exact for 360 <= deg < 720); inlined,
        // with the remainder out of line (the step wraps angles in its inner loops).
        if (deg >= 0 && deg < 360.0) return deg;
        if (deg >= 360.0 && deg < 720.0) return deg - 360.0;
        if (deg < 0 && deg >= -360.0) { double w = deg + 360.0; return w < 360.0 ? w : 0; }
        return WrapDeg360Far(deg);
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.NoInlining)]
    static double WrapDeg360Far(double deg)
    {
        double r = deg % 360.0;
        return r < 0 ? r + 360.0 : r;
    }

    /// <summary>Wraps an angle in degrees to (-180, 180].</summary>
    public static double WrapDeg180(double deg)
    {
        double r = WrapDeg360(deg);
        return r > 180.0 ? r - 360.0 : r;
    }

    /// <summary>Wraps an angle in radians to (-pi, pi].</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static double WrapRadPi(double rad)
    {
        // Fast path for the usual case (within one turn either side), exact for it; the remainder otherwise.
        if (rad > -3 * Math.PI && rad <= 3 * Math.PI)
        {
            if (rad > Math.PI) return rad - 2 * Math.PI;
            if (rad <= -Math.PI) return rad + 2 * Math.PI;
            return rad;
        }
        double r = rad % (2 * Math.PI);
        if (r > Math.PI) r -= 2 * Math.PI;
        else if (r <= -Math.PI) r += 2 * Math.PI;
        return r;
    }
}
