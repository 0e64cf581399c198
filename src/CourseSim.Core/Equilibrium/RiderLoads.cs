using CourseSim.Rider;

namespace CourseSim.Equilibrium;

/// <summary>
/// Loads on the rider, the rig and the board for one trim state (docs/physics.md, "Rider and rig loads"), N and N m.
/// </summary>
/// <param name="SailForceN">the sail's aerodynamic force, |lift + drag|</param>
/// <param name="HeelingMomentNm">the sail's side force times its centre-of-effort height above the mast foot</param>
/// <param name="BoomForceN">what the rider pulls on the boom: the heeling moment over the boom height (the rig balances
/// about the mast foot, which carries no moment)</param>
/// <param name="HarnessForceN">the share of the boom force the harness lines carry (<see cref="RiderModel.HarnessShare"/>)</param>
/// <param name="MastFootSideN">horizontal load of the rig on the mast foot across the board, positive to leeward: the sail's
/// side force less the rider's pull (negative when the rider pulls harder than the sail, the foot then pushes to windward)</param>
/// <param name="LiftOffBoardN">the upward component of the sail force with the rig raked to windward by
/// <see cref="RiderModel.WindwardRakeDeg"/>: weight the sail takes off the board</param>
/// <param name="HeelUse">heeling moment over the rider's largest righting moment (1 = at the limit)</param>
public readonly record struct RiderLoads(double SailForceN, double HeelingMomentNm, double BoomForceN, double HarnessForceN,
    double MastFootSideN, double LiftOffBoardN, double HeelUse)
{
    /// <summary>Harness-line force per kg of rider mass, N/kg (Walls and Gale 2001 report about 4.9 N/kg).</summary>
    public double HarnessPerKg(double riderMassKg) => HarnessForceN / riderMassKg;

    public static RiderLoads For(BoardPhysics b, in TrimState t)
    {
        double sailForce = Math.Sqrt(t.Lift * t.Lift + t.Drag * t.Drag);
        // The sail's own side force (without the windage of rider and rig) heels the rig about the mast foot.
        double sailSide = Math.Abs(t.Lift * Math.Cos(t.ApparentAngleRad) + t.Drag * Math.Sin(t.ApparentAngleRad));
        double moment = sailSide * b.Sail.CentreOfEffortM;
        double boom = moment / b.BoomHeightM;
        double rake = Units.Unit.DegToRad(RiderModel.WindwardRakeDeg);
        return new RiderLoads(sailForce, moment, boom, RiderModel.HarnessShare * boom, sailSide - boom,
            sailSide * Math.Tan(rake), moment / b.MaxHeelingMomentNm);
    }
}
