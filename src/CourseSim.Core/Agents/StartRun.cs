using CourseSim.Equilibrium;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// How a board gets up to speed on its run to the start line, from its own force model (docs/tactics.md, "Start
/// plans"): the speed and distance against time of a board sheeting in from rest at a true wind angle, integrated from
/// the rig's steady net surge force (sail drive less fin and hull drag, <see cref="RigDynamics.SteadyNetForce"/>) plus
/// the rider's pumping thrust while pumping is allowed, over the board's mass. Nothing here is a fixed number of
/// seconds: a change to the board's physics changes the time and distance the rider allows.
/// Curves are built on first use per rig, wind speed (whole knots) and angle (5 deg), and shared by every race holding
/// the same rig tables (they are a pure function of them, so sharing changes no result).
/// </summary>
public sealed class StartRun
{
    /// <summary>Time step of the curves, s.</summary>
    public const double StepS = 0.1;
    /// <summary>Longest curve, s: a board not up to speed by then holds the speed it has.</summary>
    const double MaxS = 60;
    /// <summary>The curve ends at this share of the rig's polar speed (the last few per cent come slowly and matter little).</summary>
    const double UpToSpeedShare = 0.97;

    readonly double[] _v, _x;
    // Coasting sheeted out: distance to a crawl (m) against the speed it starts from, in steps of CoastDv.
    readonly double[] _coast;
    const double CoastDv = 0.1, CrawlMs = 0.3;
    /// <summary>The speed the board holds at the end of the curve, m/s.</summary>
    public double FullSpeed { get; }
    /// <summary>Time from rest to the end of the curve (up to speed), s.</summary>
    public double TimeToSpeedS => (_v.Length - 1) * StepS;
    /// <summary>Distance sailed from rest until up to speed, m.</summary>
    public double DistanceToSpeedM => _x[^1];

    StartRun(double[] v, double[] x, double[] coast) { _v = v; _x = x; _coast = coast; FullSpeed = v[^1]; }

    /// <summary>Distance (m) a board sheeted out coasts from speed <paramref name="v0"/> before it slows to a crawl.</summary>
    public double CoastDistance(double v0)
    {
        double q = Math.Max(0, v0 - CrawlMs) / CoastDv;
        int n = _coast.Length;
        if (q >= n - 1) return _coast[n - 1];
        int k = (int)q;
        return _coast[k] + (q - k) * (_coast[k + 1] - _coast[k]);
    }

    /// <summary>Integrates the run from rest (semi-implicit Euler at <see cref="StepS"/>).</summary>
    public static StartRun Build(RigPolar polar, double twsMs, double twaRad, bool pumping)
    {
        var rig = polar.Rig;
        double atRig = twsMs * rig.GradientFactor(twsMs);
        double target = polar.Speed(twsMs, twaRad);
        double burst = rig.Physics.Rider.PowerFor(VelocityPrediction.PumpBurstS);
        var v = new List<double> { 0 }; var x = new List<double> { 0 };
        double vi = 0, xi = 0;
        for (double t = 0; t < MaxS && vi < UpToSpeedShare * target; t += StepS)
        {
            // The fin holds no side force at rest: the force model is read from a walking pace up.
            double vs = Math.Max(vi, 0.5);
            double net = rig.SteadyNetForce(atRig, twaRad, vs);
            if (pumping && vi < Engine.Sailing.PumpBelowShare * target) net += rig.Physics.Rider.PumpThrust(burst, vs);
            if (net <= 0) break;
            vi += net / rig.MassKg * StepS;
            xi += vi * StepS;
            v.Add(vi); x.Add(xi);
        }
        // Coasting sheeted out (no drive but the rig's windage): distance from each speed to a crawl, integrated
        // upwards from the crawl (the distance from v is the distance from v - dv plus the stretch between).
        var coast = new List<double> { 0 };
        for (double u = CrawlMs + CoastDv; u <= 1.3 * target + CoastDv; u += CoastDv)
        {
            double decel = -rig.SteadyNetForce(atRig, twaRad, u - 0.5 * CoastDv, 0) / rig.MassKg;
            // Where the sheeted-out rig still drives (broad angles) the board does not slow: count a long way.
            coast.Add(coast[^1] + (decel > 1e-3 ? (u - 0.5 * CoastDv) * CoastDv / decel : 100));
        }
        return new StartRun([.. v], [.. x], [.. coast]);
    }

    /// <summary>
    /// Time (s) to sail <paramref name="distanceM"/> from speed <paramref name="v0"/> at full power: along the curve
    /// from the point where it has that speed, then at the full speed.
    /// </summary>
    public double TimeToCover(double distanceM, double v0)
    {
        if (distanceM <= 0) return 0;
        int n = _v.Length;
        if (v0 >= FullSpeed) return distanceM / Math.Max(v0, 0.1);
        int k0 = Array.BinarySearch(_v, v0);
        if (k0 < 0) k0 = Math.Max(0, ~k0 - 1);
        double x1 = _x[k0] + distanceM;
        if (x1 >= _x[n - 1]) return (n - 1 - k0) * StepS + (x1 - _x[n - 1]) / Math.Max(FullSpeed, 0.1);
        int k1 = Array.BinarySearch(_x, x1);
        if (k1 >= 0) return (k1 - k0) * StepS;
        k1 = ~k1; // _x[k1 - 1] < x1 < _x[k1]
        double u = (x1 - _x[k1 - 1]) / (_x[k1] - _x[k1 - 1]);
        return (k1 - 1 - k0 + u) * StepS;
    }

    /// <summary>Distance (m) sailed in <paramref name="timeS"/> from rest at full power.</summary>
    public double DistanceFromRest(double timeS)
    {
        double q = timeS / StepS;
        int n = _x.Length;
        if (q >= n - 1) return _x[n - 1] + (timeS - (n - 1) * StepS) * FullSpeed;
        int k = (int)q;
        return _x[k] + (q - k) * (_x[k + 1] - _x[k]);
    }

    /// <summary>Speed (m/s) after <paramref name="timeS"/> from rest at full power.</summary>
    public double SpeedFromRest(double timeS)
    {
        int k = (int)Math.Clamp(timeS / StepS, 0, _v.Length - 1);
        return _v[k];
    }

    // Curves per rig tables, kept with the polar (RigPolar.Derived: dropped with it, no process-wide table), lazily
    // built by (whole knots, 5 deg, pumping).
    sealed class Table { public readonly StartRun?[] Runs = new StartRun?[2 * 41 * 37]; }

    /// <summary>The curve for this rig at the wind speed (m/s) and true wind angle (rad) rounded to the table's steps.</summary>
    public static StartRun For(RigPolar polar, double twsMs, double twaRad, bool pumping)
    {
        int w = (int)Math.Clamp(Math.Round(Unit.MsToKnots(twsMs)), 1, 40);
        int a = (int)Math.Clamp(Math.Round(Unit.RadToDeg(Math.Abs(Unit.WrapRadPi(twaRad))) / 5), 0, 36);
        int i = ((pumping ? 1 : 0) * 41 + w) * 37 + a;
        var t = polar.Derived(static _ => new Table());
        var run = Volatile.Read(ref t.Runs[i]);
        if (run is not null) return run;
        run = Build(polar, Unit.KnotsToMs(w), Unit.DegToRad(Math.Max(a * 5, 25)), pumping);
        // Two threads may both build it: the curves are equal, either may stay.
        Interlocked.CompareExchange(ref t.Runs[i], run, null);
        return t.Runs[i]!;
    }
}
