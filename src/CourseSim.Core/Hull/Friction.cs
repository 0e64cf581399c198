namespace CourseSim.Hull;

/// <summary>Skin friction lines.</summary>
public static class Friction
{
    /// <summary>
    /// ITTC 1957 model-ship correlation line, CF = 0.075 / (log10 Re - 2)^2 (ITTC 8th conference, 1957). Reynolds
    /// numbers below 1e5 are held at 1e5 (the line is not meant for laminar flow).
    /// </summary>
    public static double Ittc1957(double reynolds)
    {
        double re = Math.Max(reynolds, 1e5);
        double d = Math.Log10(re) - 2.0;
        return 0.075 / (d * d);
    }
}
