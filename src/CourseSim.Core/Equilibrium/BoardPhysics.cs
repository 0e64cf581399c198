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
/// The resolved physics of one set-up: sail, fin, hull and rider models with the air and water they work in.
/// Immutable and thread-safe; build once per set-up and share.
/// </summary>
public sealed class BoardPhysics
{
    /// <summary>Smallest boom angle to the centreline the rider can sheet to, deg (common practice: boom near the centreline).</summary>
    public const double MinBoomAngleDeg = 2.0;
    /// <summary>Below this water speed (m/s) side force the fin cannot carry goes to the rails; spin-out is not possible.</summary>
    public const double SpinOutMinSpeed = 3.0;
    /// <summary>Lift-to-drag ratio of side force carried by the hull when the fin is saturated at low speed (model value).</summary>
    public const double HullSideLiftToDrag = 3.0;
    /// <summary>Height of the mast foot (deck) above the water, m.</summary>
    public const double DeckHeightM = 0.10;

    public Equipment Equipment { get; }
    public SailModel Sail { get; }
    public FinModel Fin { get; }
    public HullModel Hull { get; }
    public RiderModel Rider { get; }
    public double AirDensity { get; }
    public double WaterDensity { get; }
    public double WaterViscosity { get; }
    /// <summary>Centre of effort height above the water, m: where the wind gradient is evaluated.</summary>
    public double RigHeightM { get; }

    public BoardPhysics(Equipment eq)
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
        Hull = new HullModel(eq.Board, eq.TotalMassKg, WaterDensity, WaterViscosity);
        RigHeightM = DeckHeightM + Sail.CentreOfEffortM;
    }

    /// <summary>Wind speed at the rig (m/s) for a 10 m wind speed (m/s).</summary>
    public double WindAtRig(double u10) => WindGradient.SpeedAt(u10, RigHeightM);

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
        double q = 0.5 * AirDensity * aw.Speed * aw.Speed;
        double lift = q * Sail.AreaM2 * c.Lift;
        double drag = q * Sail.AreaM2 * c.Drag;
        double riderDrag = q * Equipment.Rider.DragAreaM2;
        double s = Math.Sin(aw.AngleRad), co = Math.Cos(aw.AngleRad);
        double drive = lift * s - (drag + riderDrag) * co;
        double sailSide = lift * co + drag * s;
        double side = sailSide + riderDrag * s;
        double heelUse = Math.Abs(sailSide) * Sail.CentreOfEffortM / Rider.MaxHeelingMomentNm;
        var fin = Fin.Carry(side, speed, WaterDensity, WaterViscosity);
        double finDrag = fin.Drag;
        bool spun = false;
        if (fin.Lift > Fin.Spec.MaxLift)
        {
            if (speed >= SpinOutMinSpeed) spun = true;
            // Saturated fin: it carries its maximum, the rails carry the rest at a poor lift-to-drag ratio.
            double qf = 0.5 * WaterDensity * speed * speed * Fin.AreaM2;
            double carried = Fin.Spec.MaxLift * qf;
            finDrag = qf * (Fin.ProfileDrag(speed, WaterViscosity) + Wings.WingTheory.InducedDrag(Fin.Spec.MaxLift, Fin.EffectiveAspectRatio, FinModel.SpanEfficiency))
                      + (Math.Abs(side) - carried) / HullSideLiftToDrag;
        }
        double leeway = Math.Min(fin.Incidence, Fin.Spec.MaxLift / Fin.LiftSlope * 1.5);
        bool feasible = heelUse <= 1.0 + 1e-9 && !spun;
        return new TrimState(alpha, aw.Speed, aw.AngleRad, drive, side, heelUse, finDrag, leeway, lift, drag, feasible);
    }

    /// <summary>
    /// The rider's trim: the attack angle giving the most thrust (drive less fin drag) whose heeling moment the rider can
    /// hold and whose side force the fin can carry. Overpowered, this sheets out below the stall angle.
    /// A coarse scan over the sheeting range then a golden-section refinement (allocation-free: it runs in the race step).
    /// </summary>
    public TrimState BestTrim(double windAtRig, double twaRad, double speed)
    {
        var aw = ApparentWind.From(windAtRig, twaRad, speed);
        double minBoom = Unit.DegToRad(MinBoomAngleDeg);
        double lo = Math.Max(Sail.LuffAngle - Unit.DegToRad(2), aw.AngleRad - Unit.DegToRad(95));
        double hi = Math.Min(aw.AngleRad - minBoom, Math.PI / 2);
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
        return thrust - Hull.At(speed).Resistance;
    }
}
