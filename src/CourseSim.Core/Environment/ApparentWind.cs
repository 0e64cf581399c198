namespace CourseSim.Environment;

/// <summary>
/// Apparent wind from the vector composition of the true wind and the board's velocity.
/// Angle conventions used everywhere in CourseSim (docs/physics.md, "Conventions"):
/// <list type="bullet">
/// <item>Bearings and wind directions are degrees clockwise from true north; a wind direction is where the wind comes FROM.</item>
/// <item>True wind angle (TWA) and apparent wind angle (AWA) are measured from the board's direction of motion to the
/// direction the wind comes from, 0 = head to wind, 180 = dead downwind, always 0..180; the side is the tack
/// (starboard tack: wind over the starboard side).</item>
/// <item>Attack angle is measured from the apparent wind to the sail's chord at the boom.</item>
/// </list>
/// </summary>
public readonly record struct ApparentWind(double Speed, double AngleRad)
{
    /// <summary>
    /// Composes apparent wind for a board moving at <paramref name="boardSpeed"/> with the true wind
    /// <paramref name="trueSpeed"/> at true wind angle <paramref name="twaRad"/> (0..pi). Units of speed are whatever
    /// the caller uses, consistently.
    /// </summary>
    public static ApparentWind From(double trueSpeed, double twaRad, double boardSpeed)
    {
        // Board frame: x along the motion, y towards the side the wind comes from. The wind "from" vector.
        double x = trueSpeed * Math.Cos(twaRad) + boardSpeed;
        double y = trueSpeed * Math.Sin(twaRad);
        double speed = Math.Sqrt(x * x + y * y);
        double angle = speed == 0 ? 0 : Math.Atan2(y, x);
        return new ApparentWind(speed, angle);
    }

    public double AngleDeg => Units.Unit.RadToDeg(AngleRad);
}
