using CourseSim.Environment;
using CourseSim.Fin;
using CourseSim.Hull;
using CourseSim.Rider;
using CourseSim.Sail;
using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>Forces on the board for one trim at one speed, in the frame of the board's motion.</summary>
public readonly record struct TrimState(
    double AttackRad, double ApparentSpeed, double ApparentAngleRad,
    double Drive, double SideForce, double HeelUse, double FinDrag, double LeewayRad,
    double Lift, double Drag, bool Feasible)
{
    /// <summary>Net forward force from the rig less fin drag (hull resistance not included), N.</summary>
    public double Thrust => Drive - FinDrag;
}

/// <summary>
/// The planing fin board: the first <see cref="IBoardModel"/> (docs/physics.md, "The board model"). Sail, fin, hull and
/// rider models with the air and water they work in. Immutable and thread-safe; build once per set-up and share.
/// </summary>
public sealed class BoardPhysics : IBoardModel
{
    /// <summary>Smallest boom angle to the centreline the rider can sheet to, deg (common practice: boom near the centreline).</summary>
    public const double MinBoomAngleDeg = 2.0;
    /// <summary>
    /// Water speed (m/s) from which side force past the fin's maximum is a spin-out: the board's drop-off speed
    /// (<see cref="HullModel.DropOffFroude"/>), where the hull's lift carries most of the weight and the fin is left to
    /// hold the board alone. Below it the immersed hull takes the rest on its rails at <see cref="HullSideLiftToDrag"/>
    /// with the leeway of a stalled fin: a board off the plane slides sideways rather than spinning out (common practice:
    /// spin-out is an overpowered board's trouble at speed; slogging, it makes leeway). A fixed 3 m/s did this before,
    /// which left every board's upwind sheet capped by its fin at 3 m/s, short of the drive to reach the plane.
    /// </summary>
    public double SpinOutMinSpeed { get; }
    /// <summary>Lift-to-drag ratio of side force carried by the hull when the fin is saturated at low speed (model value).</summary>
    public const double HullSideLiftToDrag = 3.0;
    /// <summary>Height of the mast foot (deck) above the water, m.</summary>
    public const double DeckHeightM = 0.10;
    /// <summary>Drag area of the rig's spars and fittings outside the sail (boom arms, extension, uphaul), m2
    /// (from memory: two 3 cm boom tubes about 2 m long at a drag coefficient of 1.2 make 0.14 m2 broadside; the mast is
    /// in the sail's profile drag).</summary>
    public const double RigWindageM2 = 0.12;
    /// <summary>Drag coefficient of the flagging sail on its area while the rider steps round the mast in a tack (Hoerner
    /// 1965, "Fluid-Dynamic Drag", on flags, as quoted on the SEAint list (seaintarchive.org 2000b/msg00941): about 0.1
    /// for the skin friction and flutter of a flag; the battened sail held by the mast is taken to flag like one).</summary>
    public const double FlaggingSailDragCoefficient = 0.1;
    /// <summary>Drag area of a 75 kg rider standing upright while stepping round the mast, m2 (from memory: a standing adult
    /// facing the wind shows about 0.7 m2 of frontal area at a drag coefficient of about 1.2). Scaled by the rider's
    /// (mass / 75 kg)^(2/3), as frontal area scales for bodies of one shape (model choice).</summary>
    public const double StandingRiderDragAreaM2 = 0.85;
    const double FinStep = 0.05, FinMax = 40;

    public Equipment Equipment { get; }
    public SailModel Sail { get; }
    public FinModel Fin { get; }
    public HullModel Hull { get; }
    public RiderModel Rider { get; }
    public double AirDensity { get; }
    public double WaterDensity { get; }
    public double WaterViscosity { get; }
    public double MassKg { get; }
    /// <summary>Centre of effort height above the water, m: where the wind gradient is evaluated.</summary>
    public double RigHeightM { get; }
    public double MaxHeelingMomentNm => Rider.MaxHeelingMomentNm;
    /// <summary>Boom height above the mast foot, m (<see cref="RiderModel.BoomHeightM"/>).</summary>
    public double BoomHeightM { get; }
    readonly double _windage; // (rider + rig windage) / sail area
    readonly double _crossingDrag; // (flagging sail + standing rider + rig windage) / sail area
    readonly double[] _finProfile; // fin profile drag coefficient by water speed
    // Fin constants: 0.5 rho A, the ventilation lift coefficient, the induced-drag factor 1/(pi e AR), 1/slope, the leeway cap.
    readonly double _finQ, _finMaxLift, _finInduced, _finInvSlope, _finLeewayCap;

    public BoardPhysics(Equipment eq) : this(eq, null) { }

    /// <summary>The board model with the hull's resistance table read back from the disk cache (<see cref="RigTableStore"/>).</summary>
    internal BoardPhysics(Equipment eq, Hull.HullState[]? hullTable)
    {
        Equipment = eq;
        Sail = new SailModel(eq.Sail);
        Fin = new FinModel(eq.Fin);
        var air = Air.AtCelsius(eq.Conditions.AirTemperatureC);
        var water = new Water(eq.Conditions.WaterTemperatureC, eq.Conditions.SalinityGPerKg / 1000.0);
        AirDensity = air.Density;
        WaterDensity = water.Density;
        WaterViscosity = water.KinematicViscosity;
        Rider = new RiderModel(eq.Rider);
        MassKg = eq.TotalMassKg;
        Hull = new HullModel(eq.Board, eq.TotalMassKg, WaterDensity, WaterViscosity, Air.Gravity, eq.Conditions.ChopDragAreaCm2 * 1e-4, hullTable);
        SpinOutMinSpeed = Hull.SpeedAtFroude(HullModel.DropOffFroude);
        RigHeightM = DeckHeightM + Sail.CentreOfEffortM;
        BoomHeightM = Math.Min(RiderModel.BoomHeightM, Sail.CentreOfEffortM);
        _windage = (eq.Rider.DragAreaM2 + RigWindageM2) / Sail.AreaM2;
        double standing = StandingRiderDragAreaM2 * Math.Pow(eq.Rider.MassKg / 75.0, 2.0 / 3.0);
        _crossingDrag = FlaggingSailDragCoefficient + (standing + RigWindageM2) / Sail.AreaM2;
        _finProfile = new double[(int)(FinMax / FinStep) + 2];
        for (int i = 0; i < _finProfile.Length; i++) _finProfile[i] = Fin.ProfileDrag(i * FinStep, WaterViscosity);
        _finQ = 0.5 * WaterDensity * Fin.AreaM2;
        _finMaxLift = Fin.Spec.MaxLift;
        _finInduced = Wings.WingTheory.InducedDrag(1, Fin.EffectiveAspectRatio, FinModel.SpanEfficiency);
        _finInvSlope = 1 / Fin.LiftSlope;
        _finLeewayCap = Fin.Spec.MaxLift / Fin.LiftSlope * 1.5;
    }

    /// <summary>Wind speed at the rig (m/s) for a 10 m wind speed (m/s).</summary>
    public double WindAtRig(double u10) => WindGradient.SpeedAt(u10, RigHeightM);

    /// <summary>Sail lift and drag with the windage of rider and rig resolved along and across the motion, per q A.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public RigCoefficients Rig(double betaRad, double alphaRad)
    {
        var c = Sail.At(alphaRad);
        double s = Math.Sin(betaRad), co = Math.Cos(betaRad);
        double sailSide = c.Lift * co + c.Drag * s;
        return new RigCoefficients(c.Lift * s - (c.Drag + _windage) * co, sailSide + _windage * s, Math.Abs(sailSide));
    }

    /// <summary>The flagging sail and the upright rider while crossing in a tack: drag along the apparent wind (per q A).</summary>
    public RigCoefficients CrossingRig(double betaRad) =>
        new(-_crossingDrag * Math.Cos(betaRad), _crossingDrag * Math.Sin(betaRad), 0);

    /// <summary>The rider sheets between just below luffing and 95 deg past the apparent wind, the boom no closer than <see cref="MinBoomAngleDeg"/>.</summary>
    public (double Lo, double Hi) SheetingRange(double betaRad)
    {
        double lo = Math.Max(Sail.LuffAngle - Unit.DegToRad(2), betaRad - Unit.DegToRad(95));
        double hi = Math.Min(betaRad - Unit.DegToRad(MinBoomAngleDeg), Math.PI / 2);
        return (lo, hi);
    }

    /// <summary>
    /// Fin drag and leeway for side force <paramref name="side"/> (N) at water speed V (m/s). A fin asked for more than its
    /// ventilation lift carries its maximum and the rails carry the rest at <see cref="HullSideLiftToDrag"/>; above
    /// <see cref="SpinOutMinSpeed"/> that is a spin-out. Profile drag is tabulated by speed (0.05 m/s steps).
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public FinLoad FinLoadAt(double side, double speed)
    {
        double x = Math.Clamp(speed, 0, FinMax) * (1 / FinStep);
        int i = Math.Min((int)x, _finProfile.Length - 2);
        double cd0 = _finProfile[i] + (x - i) * (_finProfile[i + 1] - _finProfile[i]);
        double qf = _finQ * speed * speed;
        if (qf < 1e-9) return new FinLoad(0, 0, false);
        double abs = Math.Abs(side);
        double cl = abs / qf;
        // Past the fin's maximum by more than rounding: the race's trim eases the sheet to exactly the fin's capacity
        // (RigDynamics.FinSheetCap), which lands the lift coefficient on the maximum or one bit either side of it, and
        // that bit must not decide between the fin's leeway at its maximum lift and the saturated cap (6 deg apart).
        if (cl > _finMaxLift * (1 + 1e-9))
        {
            double drag = qf * (cd0 + _finInduced * _finMaxLift * _finMaxLift) + (abs - _finMaxLift * qf) * (1 / HullSideLiftToDrag);
            return new FinLoad(drag, _finLeewayCap, speed >= SpinOutMinSpeed);
        }
        return new FinLoad(qf * (cd0 + _finInduced * cl * cl), Math.Min(cl * _finInvSlope, _finLeewayCap), false);
    }

    /// <summary>Largest side force (N) the fin carries at water speed V before it ventilates.</summary>
    public double FinCapacity(double speed) => _finMaxLift * _finQ * speed * speed;

    public double Resistance(double speed) => Hull.At(speed).Resistance;
    double IBoardModel.Resistance(double speed, bool planing) => Hull.At(speed).Resistance;

    public bool IsPlaning(double speed, bool wasPlaning) => Hull.IsPlaning(speed, wasPlaning);

    public RiderLoads Loads(in TrimState trim) => RiderLoads.For(this, trim);

    /// <summary>
    /// Forces at attack angle <paramref name="alpha"/> (rad) for wind <paramref name="windAtRig"/> (m/s, at rig height),
    /// true wind angle <paramref name="twaRad"/> and board speed <paramref name="speed"/> (m/s).
    /// </summary>
    public TrimState Evaluate(double windAtRig, double twaRad, double speed, double alpha)
    {
        var aw = ApparentWind.From(windAtRig, twaRad, speed);
        return Evaluate(aw, speed, alpha);
    }

    public TrimState Evaluate(in ApparentWind aw, double speed, double alpha)
    {
        var c = Sail.At(alpha);
        double qa = 0.5 * AirDensity * aw.Speed * aw.Speed * Sail.AreaM2;
        var r = Rig(aw.AngleRad, alpha);
        double side = qa * r.Side;
        double heelUse = qa * r.SailSide * Sail.CentreOfEffortM / Rider.MaxHeelingMomentNm;
        var fin = FinLoadAt(side, speed);
        bool feasible = heelUse <= 1.0 + 1e-9 && !fin.SpunOut;
        return new TrimState(alpha, aw.Speed, aw.AngleRad, qa * r.Drive, side, heelUse, fin.Drag, fin.LeewayRad,
            qa * c.Lift, qa * c.Drag, feasible);
    }

    /// <summary>
    /// The rider's trim: the attack angle giving the most thrust (drive less fin drag) whose heeling moment the rider can
    /// hold and whose side force the fin can carry. Overpowered, this sheets out below the stall angle.
    /// A coarse scan over the sheeting range then a golden-section refinement (allocation-free: it runs in the race step).
    /// </summary>
    public TrimState BestTrim(double windAtRig, double twaRad, double speed)
    {
        var aw = ApparentWind.From(windAtRig, twaRad, speed);
        var (lo, hi) = SheetingRange(aw.AngleRad);
        if (hi <= lo)
        {
            // Head to wind: the sail can only luff.
            var st = Evaluate(aw, speed, Sail.LuffAngle - Unit.DegToRad(2));
            return st with { Drive = Math.Min(st.Drive, 0) };
        }
        const double step = 3.0 * Math.PI / 180.0;
        int n = Math.Max(2, (int)Math.Ceiling((hi - lo) / step) + 1);
        double h = (hi - lo) / (n - 1);
        int best = -1; double bestVal = double.NegativeInfinity;
        TrimState bestState = default, first = default;
        for (int i = 0; i < n; i++)
        {
            var st = Evaluate(aw, speed, lo + i * h);
            if (i == 0) first = st;
            if (st.Feasible && st.Thrust > bestVal) { bestVal = st.Thrust; best = i; bestState = st; }
        }
        if (best < 0) return first with { Feasible = false };
        double a = lo + Math.Max(0, best - 1) * h, b = lo + Math.Min(n - 1, best + 1) * h;
        const double gr = 0.6180339887498949;
        double x1 = b - gr * (b - a), x2 = a + gr * (b - a);
        var s1 = Evaluate(aw, speed, x1); var s2 = Evaluate(aw, speed, x2);
        for (int it = 0; it < 16; it++)
        {
            double f1 = s1.Feasible ? s1.Thrust : double.NegativeInfinity;
            double f2 = s2.Feasible ? s2.Thrust : double.NegativeInfinity;
            if (f1 >= f2) { b = x2; x2 = x1; s2 = s1; x1 = b - gr * (b - a); s1 = Evaluate(aw, speed, x1); }
            else { a = x1; x1 = x2; s1 = s2; x2 = a + gr * (b - a); s2 = Evaluate(aw, speed, x2); }
        }
        if (s1.Feasible && s1.Thrust > bestState.Thrust) bestState = s1;
        if (s2.Feasible && s2.Thrust > bestState.Thrust) bestState = s2;
        return bestState;
    }

    /// <summary>Net surge force (N) at speed V with the best trim: rig thrust less hull resistance.</summary>
    public double NetForce(double windAtRig, double twaRad, double speed, out TrimState trim)
    {
        trim = BestTrim(windAtRig, twaRad, speed);
        double thrust = trim.Feasible ? trim.Thrust : Math.Min(trim.Thrust, 0);
        return thrust - Resistance(speed);
    }
}
