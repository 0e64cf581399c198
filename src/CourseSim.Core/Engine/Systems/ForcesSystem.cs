namespace CourseSim.Engine.Systems;

/// <summary>
/// Forces on the board besides the sail's: the fin's drag and leeway for the side force, the hull's resistance and
/// whether it planes (stepping round the mast puts the rider's weight on the nose: the board drops off the plane), and
/// pumping: a racer pumps while below the speed their rig should make at this angle (to get onto the plane, or back onto
/// it after a manoeuvre or a lull), driving, not manoeuvring, while the anaerobic reserve lasts (W' balance).
/// </summary>
public sealed class ForcesSystem : RaceSystem
{
    public override string Name => "forces";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Motion, Trim, Intent, ManoeuvreState; rig tables";
    public override string Writes => "Trim (fin and hull drag, planing, pump thrust), Motion.Leeway, RiderState";

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        var f = c.Fleet;
        bool pumping = c.Settings.Pumping;
        for (int i = 0; i < blk.Count; i++)
        {
            int b = blk.Id[i].Value;
            ref var mo = ref blk.Motion[i]; ref var t = ref blk.Trim[i]; ref var rider = ref blk.Rider[i];
            ref readonly var man = ref blk.Manoeuvre[i];
            var rig = f.Rigs[b];
            double v = mo.Speed;
            bool noDrive = TrimSystem.NoDrive(in man);
            double finDrag = rig.Fin(t.Side, v, out double leeway, out _);
            var hull = rig.Hull;
            double hullDrag = hull.ResistanceAt(v, out double lift);
            if (man.Kind == Manoeuvre.Tack && man.Phase == 1) { hullDrag = Math.Max(hullDrag, hull.CrossingResistance(v)); lift = 0; }
            t.FinDrag = finDrag; t.HullDrag = hullDrag;
            // Planing with hysteresis (docs/physics.md): on the plane from the planing Froude number, off it below the
            // drop-off one; stepping round the mast in a tack takes the board off the plane.
            t.Planing = lift > 0 && hull.IsPlaning(v, t.Planing);
            mo.Leeway = leeway;
            var rm = rig.Rider;
            // Out of breath at the floor, the rider rests until the reserve is back to RestUntil (hysteresis).
            if (rider.ReserveJ <= Tuning.ReserveFloor * rm.ReserveJ) rider.Resting = true;
            else if (rider.ReserveJ >= Tuning.RestUntil * rm.ReserveJ) rider.Resting = false;
            bool pump = pumping && !noDrive && man.Kind == Manoeuvre.None && blk.Intent[i].Power >= 0.99
                        && !rider.Resting && t.ApparentSpeed > 2
                        && v < Sailing.PumpBelowShare * blk.Intent[i].TargetSpeed;
            double power = pump ? rm.PowerFor(Equilibrium.VelocityPrediction.PumpBurstS) : 0;
            rider.PumpPowerW = power;
            if (power > 0) rider.ReserveJ = rm.StepReserve(rider.ReserveJ, power, c.Dt);
            else if (rider.ReserveJ < rm.ReserveJ) rider.ReserveJ = rm.ReserveJ - (rm.ReserveJ - rider.ReserveJ) * f.RestDecay[b];
            t.Pumping = pump;
            t.PumpThrust = pump ? rm.PumpThrust(power, v) : 0;
        }
    }
}
