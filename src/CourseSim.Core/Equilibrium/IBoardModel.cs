using CourseSim.Environment;

namespace CourseSim.Equilibrium;

/// <summary>Rig force coefficients normalised by q A (q = 0.5 rho AWS^2, A the sail area), in the frame of motion.</summary>
/// <param name="Drive">forward force along the motion (sail and the windage of rider and rig)</param>
/// <param name="Side">total side force (sail and windage), towards leeward</param>
/// <param name="SailSide">the sail's own side force, whose moment about the mast foot the rider holds</param>
public readonly record struct RigCoefficients(double Drive, double Side, double SailSide);

/// <summary>What the fin (and, when it is saturated at low speed, the rails) costs to carry a side force.</summary>
public readonly record struct FinLoad(double Drag, double LeewayRad, bool SpunOut);

/// <summary>
/// The physics of one board: every force the velocity prediction, the polar and the race's rig tables use comes from
/// here, so there is one force recipe (docs/physics.md, "The board model"). All forces are in the frame of the board's
/// motion (x along the track, y towards the wind), SI units. Today's implementation is the planing fin board
/// (<see cref="BoardPhysics"/>); a foiling board would be a second one with its own resistance and lift state.
/// </summary>
public interface IBoardModel
{
    Equipment Equipment { get; }
    double AirDensity { get; }
    double WaterDensity { get; }
    /// <summary>Total mass that the forces accelerate (rider, board, rig), kg.</summary>
    double MassKg { get; }
    /// <summary>Centre of effort height above the water, m: where the wind gradient is evaluated.</summary>
    double RigHeightM { get; }
    /// <summary>Largest heeling moment of the sail's side force about the mast foot that the rider can hold, N m.</summary>
    double MaxHeelingMomentNm { get; }

    /// <summary>Wind speed at the rig (m/s) for a 10 m wind speed (m/s).</summary>
    double WindAtRig(double u10);

    /// <summary>Rig force coefficients at apparent wind angle beta and attack angle alpha (rad).</summary>
    RigCoefficients Rig(double betaRad, double alphaRad);

    /// <summary>
    /// Rig force coefficients (per q A) while the rider steps round the mast in a tack: the sail flagging and the rider
    /// standing upright, pure drag along the apparent wind at angle beta (rad) to the motion (docs/physics.md, "The board
    /// model"). SailSide is 0: the flagging sail makes no heeling moment the rider must hold.
    /// </summary>
    RigCoefficients CrossingRig(double betaRad);

    /// <summary>Least and largest attack angle (rad) the rider can sheet to at apparent wind angle beta (rad); hi &lt;= lo means head to wind.</summary>
    (double Lo, double Hi) SheetingRange(double betaRad);

    /// <summary>Fin drag and leeway carrying side force <paramref name="side"/> (N) at water speed V (m/s).</summary>
    FinLoad FinLoadAt(double side, double speed);

    /// <summary>Largest side force (N) the fin carries at water speed V before it ventilates.</summary>
    double FinCapacity(double speed);

    /// <summary>Hull resistance (N) at speed V on the branch the board is on: <paramref name="planing"/> false while getting
    /// going (displacement trim, the hump), true once on the plane (it stays planing down to its drop-off speed).</summary>
    double Resistance(double speed, bool planing);

    /// <summary>Whether a board on the given branch at speed V is (still) planing: the lift-state criterion with hysteresis.</summary>
    bool IsPlaning(double speed, bool wasPlaning);

    /// <summary>Loads on the rider and the board for a trim state (docs/physics.md, "Rider and rig loads").</summary>
    RiderLoads Loads(in TrimState trim);

    /// <summary>Forces at attack angle alpha (rad) in apparent wind <paramref name="aw"/> at board speed V (m/s).</summary>
    TrimState Evaluate(in ApparentWind aw, double speed, double alpha);
}
