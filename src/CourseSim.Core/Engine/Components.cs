namespace CourseSim.Engine;

// The board's components: plain unmanaged structs, stored densely by the entity store (so a checkpoint copies them as
// bytes and a state hash reads them as bytes). Hot data, touched every step by the physics, comes first; the agent's
// and the rules' state (touched at the decision and lookout rates) after it. Names, rigs, hull lengths and other
// constants of a board live once in the race's Fleet, indexed by BoardId.

/// <summary>Index of the board in the race's fleet arrays (names, equipment, splits, records).</summary>
public struct BoardId { public int Value; }

/// <summary>Position (m, x east, y north) and heading (rad, clockwise from north).</summary>
public struct Pose { public double X, Y, Heading; }

/// <summary>
/// Motion through the water: speed along the track (m/s), leeway (rad, to leeward), yaw rate (rad/s), distance sailed (m),
/// and the sine and cosine of the track direction (kept by the integrator, read by the force system).
/// </summary>
public struct Motion { public double Speed, Leeway, YawRate, Distance, TrackSin, TrackCos; }

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

/// <summary>
/// The rider's helm: the decision in force (want: heading rad, power 0..1, target speed m/s), one made but still within
/// the rider's reaction time (pending, acted on at PendAt s; +infinity when none), and the heading the plan steers
/// before any give-way (Planned). HoldTwaDeg pins the board to a true wind angle (NaN: free), for the engine's polar checks.
/// </summary>
public struct Helm
{
    public double WantH, WantP, WantV, PendH, PendP, PendV, PendAt, PlannedH, HoldTwaDeg;
    /// <summary>The course step (RaceStatus.NextStep) the pending decision was made for.</summary>
    public int PendStep;
    public readonly bool HasPending => !double.IsPositiveInfinity(PendAt);
    public readonly bool Pinned => !double.IsNaN(HoldTwaDeg);
}

/// <summary>
/// What the rider reads of the wind for deciding: the slowly varying error of their reading (standard normal states of
/// two Ornstein-Uhlenbeck processes, direction and speed), the reading itself (deg, m/s) and the time of their last tack
/// or gybe (s).
/// </summary>
public struct Perception { public double NoiseDir, NoiseSpeed, ReadFromDeg, ReadSpeed, LastTurnS; }

/// <summary>
/// The start plan: the spot on the line (m), the holding point below it (m), the planned arrival of the bow after the
/// signal (s), the rider's misjudgement of their distance to the line (m, positive: they think they are further back),
/// and its phase (waiting further back, approaching the holding point, holding, going).
/// </summary>
public struct StartPlan { public double SpotX, SpotY, WaitX, WaitY, GoMarginS, LineErrorM; public bool Approaching, Holding, Going; }

/// <summary>
/// Keeping clear (the rules' lookout): whether the rider is giving way, to which board, under which rule (a code of
/// <c>Rules.RuleCodes</c>), from when (s, after their reaction time), on which heading (rad) and power; since when a
/// wanted gybe has been put off (s, NaN when none).
/// </summary>
public struct GiveWay { public bool On; public int Other; public byte Rule; public double AtS, Heading, Power; public int Episodes; public double DeferS; }

/// <summary>One-turn penalties: owed, taken, and the stage of the one being served (0 none, 1-4) with its turning sign;
/// when the present wait for clear water before its tack or gybe began (s, stages 2 and 4).</summary>
public struct Penalty
{
    public int Owed, Taken, Stage, Sign;
    public double WaitFromS;
    /// <summary>In a stage that waits for clear water before its tack (2) or gybe (4).</summary>
    public readonly bool InWaitStage => Stage is 2 or 4;
}

/// <summary>
/// Book-keeping of the board's own past: where it was at the last step (m, for line and rounding crossings), when it last
/// began a tack or gybe and how near the nearest board was then (for the judge's "begun too close"); its recent headings.
/// </summary>
public struct Wake
{
    public double PrevX, PrevY, TurnStartS, TurnStartNearestM;
    /// <summary>The heading (rad) sampled about once a second by the lookout (H0 newest, taken at HistS; HistN samples so far), for the judge's rule 16.1.</summary>
    public double H0, H1, H2, H3, HistS;
    public int HistN;
}
