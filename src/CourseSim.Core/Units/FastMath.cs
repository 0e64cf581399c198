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

    /// <summary>
    /// Math.Sign of a double, to the same result (-1, 0 or 1; an ArithmeticException for NaN), but small enough for the JIT
    /// to inline: the library's version keeps its throw in the body and is called, not inlined, in the step's inner loops.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Sign(double value)
    {
        if (value < 0) return -1;
        if (value > 0) return 1;
        if (value == 0) return 0;
        return ThrowNaN();
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    static int ThrowNaN() => throw new ArithmeticException("Function does not accept floating point Not-a-Number values.");

    const double PiOver2Hi = 1.5707963267341256, PiOver2Lo = 6.077100506506192e-11; // pi/2 = Hi + Lo
    const double TwoOverPi = 0.6366197723675814;

    /// <summary>
    /// Sine and cosine of x, to about 1e-15 for |x| below 1e4: reduction by pi/2 in two parts (Cody and Waite 1980,
    /// Software Manual for the Elementary Functions) and the Taylor series to x^15 / x^16 on [-pi/4, pi/4], whose
    /// truncation is below 5e-17 there.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static (double Sin, double Cos) SinCos(double x)
    {
        double k = Math.Round(x * TwoOverPi);
        double r = x - k * PiOver2Hi - k * PiOver2Lo;
        const double S1 = 1.0 / 6, S2 = 1.0 / 20, S3 = 1.0 / 42, S4 = 1.0 / 72, S5 = 1.0 / 110, S6 = 1.0 / 156, S7 = 1.0 / 210;
        const double C1 = 1.0 / 2, C2 = 1.0 / 12, C3 = 1.0 / 30, C4 = 1.0 / 56, C5 = 1.0 / 90, C6 = 1.0 / 132, C7 = 1.0 / 182, C8 = 1.0 / 240;
        double r2 = r * r;
        double s = r * (1 - r2 * S1 * (1 - r2 * S2 * (1 - r2 * S3 * (1 - r2 * S4 * (1 - r2 * S5 * (1 - r2 * S6 * (1 - r2 * S7)))))));
        double c = 1 - r2 * C1 * (1 - r2 * C2 * (1 - r2 * C3 * (1 - r2 * C4 * (1 - r2 * C5 * (1 - r2 * C6 * (1 - r2 * C7 * (1 - r2 * C8)))))));
        return (((long)k & 3) switch { 0 => s, 1 => c, 2 => -s, _ => -c }, ((long)k & 3) switch { 0 => c, 1 => -s, 2 => -c, _ => s });
    }
}
