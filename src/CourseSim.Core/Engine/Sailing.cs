using CourseSim.Units;

namespace CourseSim.Engine;

/// <summary>Angle conventions and board-handling constants shared by the systems and the agents.</summary>
public static class Sailing
{
    /// <summary>Signed true wind angle (rad): positive when the wind comes over the starboard side (starboard tack).</summary>
    public static double SignedAngle(double fromDeg, double headingRad) => Unit.WrapRadPi(Unit.DegToRad(fromDeg) - headingRad);

    /// <summary>Riders pump while slower than this share of their rig's steady speed at the angle sailed (model value).</summary>
    public const double PumpBelowShare = 0.95;
    /// <summary>Least angle of the bow to the true wind outside a tack, deg (common practice: a board stalls closer than about 30 deg).</summary>
    public const double MinPointDeg = 30;
    /// <summary>Speed below which <see cref="MinPointDeg"/> applies, m/s (model value: a board barely under way).</summary>
    public const double MinPointBelowMs = 2;

    /// <summary>The heading (rad) at a rig's best upwind VMG angle on the tack other than <paramref name="side"/> (+1 starboard).</summary>
    public static double CloseHauledOtherTack(Equilibrium.RigPolar rig, double fromDeg, int side, double tws) =>
        Unit.WrapRadPi(Unit.DegToRad(fromDeg) + side * rig.BestTwa(tws, true));
}
