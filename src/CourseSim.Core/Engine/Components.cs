namespace CourseSim.Engine;

// The board's components: plain structs, stored densely by the entity store. Hot data (what the step touches every
// 50 ms) is here; names, splits and recorded tracks live in the race's cold arrays, indexed by BoardId.

/// <summary>Index of the board in the race's fleet arrays (names, equipment, splits, records).</summary>
public struct BoardId { public int Value; }

/// <summary>Position (m, x east, y north) and heading (rad, clockwise from north).</summary>
public struct Pose { public double X, Y, Heading; }

/// <summary>
/// Motion through the water: speed along the track (m/s), leeway (rad, to leeward), yaw rate (rad/s), distance sailed (m),
/// and the sine and cosine of the track direction (kept by the integrator, read by the force system).
/// </summary>
public struct Motion { public double Speed, Leeway, YawRate, Distance, TrackSin, TrackCos; }

/// <summary>Which resolved set-up (rig tables and polar) this board sails.</summary>
public struct RigRef { public int Index; }

/// <summary>The wind at the rig: true (10 m speed, from-direction deg) with other boards' shadows, and as the rider perceives it (lagged, noisy).</summary>
public struct SensedWind
{
    public double TrueSpeed, TrueFromDeg;
    /// <summary>The true wind at the rig's centre of effort (m/s) and its direction's angle, sine and cosine (cached at sensing).</summary>
    public double RigSpeed, FromRad, FromSin, FromCos;
    public double PerceivedSpeed, PerceivedFromDeg;
}

/// <summary>The rider's trim and the forces it makes this step.</summary>
public struct Trim
{
    /// <summary>Sheet fraction held (0 = luffing .. 1 = full power); follows the wanted value with the rider's reaction lag.</summary>
    public double Sheet;
    /// <summary>Apparent wind angle to the track (rad, 0..pi), the angle the rig tables are read at.</summary>
    public double BetaRad;
    public double HeelUse, Drive, Side, ApparentSpeed, ApparentAngleRad, TrueAngleRad;
    /// <summary>Unit vector the apparent wind blows to (NaN before the first step): the direction of this sail's wake.</summary>
    public double AppDownX, AppDownY;
    public double FinDrag, HullDrag, PumpThrust;
    public bool Planing, Pumping;
}

/// <summary>The rider's body: the anaerobic reserve W'bal (J), the current pumping power (W), and whether they are resting to recover.</summary>
public struct RiderState { public double ReserveJ, PumpPowerW; public bool Resting; }

public enum Manoeuvre : byte { None, Tack, Gybe, Fallen }

/// <summary>
/// What the tactic wants: a heading (rad) and how much power (0..1). A heading on the other tack starts a tack or gybe
/// (whichever turn is shorter); the manoeuvre system does the rest.
/// </summary>
public struct Intent
{
    public double Heading, Power;
    /// <summary>The rig's steady speed (m/s) on that heading in the wind as perceived: the rider's target.</summary>
    public double TargetSpeed;
    public double NextDecisionS;
}

/// <summary>The manoeuvre under way: kind, phase and time in the phase, the heading it ends on.</summary>
public struct ManoeuvreState
{
    public Manoeuvre Kind;
    public byte Phase;
    public double Timer, ExitHeading, TurnSign;
}

public enum RaceState : byte { PreStart, Racing, Returning, Finished, NotFinished }

/// <summary>Where the board is in the race: state, the next course step, counters and times (s from the signal).</summary>
public struct RaceStatus
{
    public RaceState State;
    public bool Ocs;
    public int NextStep;
    public int Tacks, Gybes, Falls, WrongSide;
    public double StartedS, FinishedS;
}
