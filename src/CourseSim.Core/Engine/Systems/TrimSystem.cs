using CourseSim.Units;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Trim: the apparent wind from the true wind at the rig and the board's velocity along its track; the rider sheets
/// towards the power the tactic wants, capped by what the heeling limit allows in this apparent wind, and the sheet
/// follows with the rider's reaction lag (so a gust briefly loads the rider past the limit, and may topple them). When
/// the side force would ventilate the fin the rider eases at once (a reflex). No drive while crossing in a tack, flipping
/// the sail in a gybe, or in the water.
/// </summary>
public sealed class TrimSystem : RaceSystem
{
    public override string Name => "trim";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose, Motion, SensedWind, Intent, ManoeuvreState; rig tables";
    public override string Writes => "Trim (apparent wind, sheet, sail drive, side force, heel use)";

    /// <summary>Whether the sail drives in this manoeuvre phase (not while crossing, flipping or swimming).</summary>
    public static bool NoDrive(in ManoeuvreState m) =>
        m.Kind == Manoeuvre.Fallen || (m.Kind == Manoeuvre.Tack && m.Phase == 1) || (m.Kind == Manoeuvre.Gybe && m.Phase == 1);

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        var f = c.Fleet;
        for (int i = 0; i < blk.Count; i++)
        {
            int b = blk.Id[i].Value;
            ref readonly var pose = ref blk.Pose[i]; ref readonly var mo = ref blk.Motion[i]; ref readonly var sw = ref blk.Wind[i];
            ref var t = ref blk.Trim[i]; ref readonly var man = ref blk.Manoeuvre[i];
            var rig = f.Rigs[b];
            double v = mo.Speed;
            // The track (heading less leeway) as the integrator left it.
            double track = pose.Heading - FastMath.Sign(t.TrueAngleRad) * mo.Leeway;
            double ax = -sw.RigSpeed * sw.FromSin - v * mo.TrackSin, ay = -sw.RigSpeed * sw.FromCos - v * mo.TrackCos;
            double aws = Math.Sqrt(ax * ax + ay * ay);
            double appFrom = FastMath.Atan2(-ax, -ay); // to 1e-5 rad: the rig tables are in 1-degree steps
            double beta = Unit.WrapRadPi(appFrom - track);
            t.TrueAngleRad = Unit.WrapRadPi(sw.FromRad - pose.Heading);
            t.ApparentSpeed = aws;
            if (aws > 1e-9) { t.AppDownX = ax / aws; t.AppDownY = ay / aws; } else { t.AppDownX = double.NaN; t.AppDownY = double.NaN; }
            t.ApparentAngleRad = Unit.WrapRadPi(appFrom - pose.Heading);
            double absBeta = Math.Abs(beta);
            bool noDrive = NoDrive(in man);
            if (noDrive) t.Sheet = 0;
            // Stepping round the mast in a tack the sail flags and the rider stands upright: drag only (the board model's crossing rig).
            var sail = man.Kind == Manoeuvre.Tack && man.Phase == 1 ? rig.Crossing(aws, absBeta)
                : rig.Trim(aws, absBeta, noDrive ? 0 : blk.Intent[i].Power, ref t.Sheet, noDrive ? 1 : f.SheetGain[b]);
            if (!noDrive && v >= rig.Physics.SpinOutMinSpeed && Math.Abs(sail.Side) > rig.FinCapacity(v))
            {
                t.Sheet = rig.FinSheetCap(aws, absBeta, v, t.Sheet);
                sail = rig.Sail(aws, absBeta, t.Sheet);
            }
            double drive = sail.Drive, side = sail.Side, heel = sail.HeelUse;
            if (noDrive) { drive = Math.Min(drive, 0); side = 0; heel = 0; }
            t.BetaRad = absBeta; t.HeelUse = heel; t.Drive = drive; t.Side = side;
        }
    }
}
