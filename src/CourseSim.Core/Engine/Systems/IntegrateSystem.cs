using CourseSim.Units;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Integrate: surge from the net force on the whole mass (semi-implicit Euler); sway as the fin's leeway (the side force
/// is balanced within a step at these speeds); yaw rate-limited towards the wanted heading, at the larger of the
/// rig-steering rate and the carving rate V/R.
/// </summary>
public sealed class IntegrateSystem : RaceSystem
{
    public override string Name => "integrate";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Trim, Intent, ManoeuvreState";
    public override string Writes => "Pose, Motion";

    static readonly double RigYawRad = Unit.DegToRad(Tuning.RigSteerDegPerS), MaxYawRad = Unit.DegToRad(Tuning.MaxYawDegPerS);

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        var f = c.Fleet;
        double dt = c.Dt;
        bool counting = c.Time >= 0;
        for (int i = 0; i < blk.Count; i++)
        {
            int b = blk.Id[i].Value;
            ref var p = ref blk.Pose[i]; ref var m = ref blk.Motion[i];
            ref readonly var t = ref blk.Trim[i]; ref readonly var man = ref blk.Manoeuvre[i];
            double v = m.Speed;
            double water = man.Kind == Manoeuvre.Fallen ? 0.5 * 1025 * v * v * Tuning.InWaterDragAreaM2 : 0;
            double net = t.Drive + t.PumpThrust - t.FinDrag - t.HullDrag - water;
            v = Math.Max(0, v + net * f.DtOverMass[b]);
            m.Speed = v;
            double rate = man.Kind == Manoeuvre.Tack && man.Phase == 1 ? f.CrossYaw[b] : Math.Min(MaxYawRad, Math.Max(RigYawRad, v * f.InvCarveRadius[b]));
            double want = man.Kind == Manoeuvre.None ? blk.Intent[i].Heading : man.Phase >= 2 ? man.ExitHeading : p.Heading;
            // The tactic's heading is the course to make good through the water: steer the track (heading less leeway) onto it.
            double side = FastMath.Sign(t.TrueAngleRad);
            double d = Unit.WrapRadPi(want - (p.Heading - side * m.Leeway));
            if (man.Kind is Manoeuvre.Tack or Manoeuvre.Gybe && man.Phase < 2) d = man.TurnSign * Math.PI; // keep turning the chosen way
            if (man.Kind == Manoeuvre.Fallen) d = 0;
            double turn = Math.Clamp(d, -rate * dt, rate * dt);
            if (man.Kind == Manoeuvre.None && v < Sailing.MinPointBelowMs)
            {
                // Slow and out of a tack, a rider never lets the bow come closer to the wind than MinPointDeg (with the
                // large leeway of a slow board, holding the track would otherwise pinch it into irons and round onto the other tack).
                double minPoint = Unit.DegToRad(Sailing.MinPointDeg), twa = t.TrueAngleRad;
                if (side > 0 && twa - turn < minPoint) turn = Math.Min(turn, Math.Max(0, twa - minPoint));
                else if (side < 0 && twa - turn > -minPoint) turn = Math.Max(turn, Math.Min(0, twa + minPoint));
            }
            m.YawRate = turn * c.StepHz;
            p.Heading = Unit.WrapRadPi(p.Heading + turn);
            double track = p.Heading - side * m.Leeway;
            (m.TrackSin, m.TrackCos) = FastMath.SinCos(track);
            p.X += v * dt * m.TrackSin;
            p.Y += v * dt * m.TrackCos;
            if (counting) m.Distance += v * dt;
        }
    }
}
