using System.Runtime.CompilerServices;

namespace CourseSim.Units;

/// <summary>Arithmetic-only approximations for the race step, deterministic on every platform (no library calls).</summary>
public static class FastMath
{
    /// <summary>
    /// atan2(y, x) in [-pi, pi] to within 1.2e-5 rad: octant reduction and the odd degree-9 polynomial of the form given by
    /// Abramowitz and Stegun (1964), Handbook of Mathematical Functions, eq. 4.4.49, whose stated bound is 1e-5 rad on
    /// [0, 1]; the coefficients here are from memory and measure 1.15e-5 rad against System.Math (tests). The step needs
    /// the apparent wind angle to index 1-degree tables, so this is over 1000 times finer than it needs.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Atan2(double y, double x)
    {
        double ax = Math.Abs(x), ay = Math.Abs(y);
        double mx = Math.Max(ax, ay);
        if (mx == 0) return 0;
        double z = Math.Min(ax, ay) / mx;
        double z2 = z * z;
        double a = z * (0.9998660 + z2 * (-0.3302995 + z2 * (0.1801410 + z2 * (-0.0851330 + z2 * 0.0208351))));
        if (ay > ax) a = Math.PI / 2 - a;
        if (x < 0) a = Math.PI - a;
        return y < 0 ? -a : a;
    }
}
