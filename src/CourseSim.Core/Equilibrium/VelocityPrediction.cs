using CourseSim.Units;
using MathNet.Numerics.Optimization;
using MathNet.Numerics.RootFinding;

namespace CourseSim.Equilibrium;

/// <summary>One steady state (an equilibrium of surge force) at one true wind speed and angle.</summary>
public readonly record struct SteadyState(double Speed, TrimState Trim, double LiftFraction)
{
    /// <summary>Planing: dynamic lift carries at least half the weight (volume Froude number 2 or more).</summary>
    public bool Planing => LiftFraction >= 0.5;
}

/// <summary>All steady states at one true wind speed and angle, and which one the rider sails at.</summary>
public sealed record PointSolution(double TwsMs, double TwaRad, SteadyState? Displacement, SteadyState? Planing,
    SteadyState Sailed, bool PlanesWithoutPumping, bool PlanesWithPumping);

/// <summary>
/// Velocity prediction: for a true wind speed (10 m height) and angle, finds every speed where the rig's thrust with the
/// rider's best trim equals the hull's resistance (docs/physics.md, "Equilibrium"). Stable equilibria are where the net
/// force crosses from positive to negative. Below planing there may be a displacement equilibrium under the resistance
/// hump and a planing one above it: both are reported. The board reaches the planing one on its own if the net force is
/// positive all the way up from rest; with pumping if the rider's short-burst pumping thrust closes the gap.
/// </summary>
public sealed class VelocityPrediction
{
    /// <summary>How long the rider can pump hard to get over the hump, s (the burst uses CP + W'/t).</summary>
    public const double PumpBurstS = 30.0;
    const double SpeedStep = 0.5;
    const double MaxSpeed = 30.0;

    public BoardPhysics Board { get; }
    readonly double _burstPower;

    public VelocityPrediction(BoardPhysics board)
    {
        Board = board;
        _burstPower = board.Rider.PowerFor(PumpBurstS);
    }

    /// <summary>Pumping thrust available at speed V during a burst, N.</summary>
    public double PumpThrust(double speed) => Board.Rider.PumpThrust(_burstPower, speed);

    double? _thresholdPumping;
    bool _thresholdKnown;

    /// <summary>
    /// Wind at which the rider can get planing at some reaching angle with pumping (cached). Above it a rider sailing at any
    /// angle where a planing equilibrium exists is taken to be planing there: riders get going on a reach and then bear
    /// away or head up, so the planing branch is the one sailed.
    /// </summary>
    public double? PlaningThresholdWithPumping
    {
        get
        {
            if (!_thresholdKnown) { _thresholdPumping = PlaningThreshold(true, Unit.KnotsToMs(45)); _thresholdKnown = true; }
            return _thresholdPumping;
        }
    }

    public PointSolution Solve(double twsMs, double twaRad) => Solve(twsMs, twaRad, true);

    PointSolution Solve(double twsMs, double twaRad, bool useThreshold)
    {
        // Port and starboard are mirror images: the physics sees only the angle off the wind, 0..pi.
        twaRad = Math.Abs(Math.IEEERemainder(twaRad, 2 * Math.PI));
        double w = Board.WindAtRig(twsMs);
        // No board sails much faster than about twice the true wind: scanning beyond 2.2 TWS + 5 m/s finds no equilibrium.
        int n = (int)(Math.Min(MaxSpeed, 2.2 * twsMs + 5.0) / SpeedStep);
        Span<double> v = stackalloc double[n + 1];
        Span<double> f = stackalloc double[n + 1];
        for (int i = 0; i <= n; i++)
        {
            v[i] = Math.Max(i * SpeedStep, 0.05);
            f[i] = Board.NetForce(w, twaRad, v[i], out _);
        }
        SteadyState? disp = null, plan = null;
        double? planRoot = null, dispRoot = null;
        for (int i = 0; i < n; i++)
        {
            if (f[i] > 0 && f[i + 1] <= 0)
            {
                double root = RefineRoot(w, twaRad, v[i], v[i + 1]);
                double phi = Board.Hull.LiftFraction(root);
                Board.NetForce(w, twaRad, root, out var trim);
                var st = new SteadyState(root, trim, phi);
                if (st.Planing) { plan = st; planRoot = root; } // the fastest stable planing root
                else if (disp is null) { disp = st; dispRoot = root; }
            }
        }
        if (disp is null && plan is null)
        {
            // No drive at all (head to wind, or no wind): the board stops.
            Board.NetForce(w, twaRad, 0.05, out var trim0);
            var st = new SteadyState(0, trim0, 0);
            return new PointSolution(twsMs, twaRad, st, null, st, false, false);
        }
        bool withoutPump = plan is not null && disp is null;
        bool withPump = withoutPump;
        if (plan is not null && disp is not null)
        {
            withPump = true;
            for (int i = 0; i <= n && v[i] < planRoot!.Value; i++)
                if (v[i] >= dispRoot!.Value && f[i] + PumpThrust(v[i]) <= 0) { withPump = false; break; }
        }
        bool onPlane = plan is not null && (withPump || (useThreshold && PlaningThresholdWithPumping is double t && t <= twsMs));
        var sailed = onPlane ? plan!.Value : (disp ?? plan!.Value);
        return new PointSolution(twsMs, twaRad, disp, plan, sailed, withoutPump, withPump);
    }

    double RefineRoot(double w, double twa, double a, double b)
    {
        double F(double s) => Board.NetForce(w, twa, s, out _);
        return Brent.TryFindRoot(F, a, b, 1e-4, 60, out double root) ? root : 0.5 * (a + b);
    }

    /// <summary>Steady speed of the sailed equilibrium, m/s.</summary>
    public double SpeedAt(double twsMs, double twaRad) => Solve(twsMs, twaRad).Sailed.Speed;

    /// <summary>
    /// Best VMG angle: maximises speed x cos(TWA) upwind (TWA 25..90) or -speed x cos(TWA) downwind (90..178). Without a
    /// seed a coarse scan finds the bracket; MathNet's golden-section minimiser then refines it to 0.06 deg.
    /// </summary>
    public (double TwaRad, double VmgMs, double SpeedMs) BestVmg(double twsMs, bool upwind, double? seedRad = null, double bracketRad = 0)
    {
        double sign = upwind ? 1 : -1;
        double lo = Unit.DegToRad(upwind ? 25 : 90), hi = Unit.DegToRad(upwind ? 90 : 178);
        double Vmg(double twa) => sign * SpeedAt(twsMs, twa) * Math.Cos(twa);
        double bestX, bestV, step;
        if (seedRad is double seed)
        {
            bestX = Math.Clamp(seed, lo, hi); bestV = Vmg(bestX); step = Math.Max(bracketRad, Unit.DegToRad(2));
        }
        else
        {
            int n = 10; bestX = lo; bestV = double.NegativeInfinity;
            step = (hi - lo) / n;
            for (int i = 0; i <= n; i++) { double x = lo + i * step; double val = Vmg(x); if (val > bestV) { bestV = val; bestX = x; } }
        }
        double a = Math.Max(lo, bestX - step), b = Math.Min(hi, bestX + step);
        try
        {
            var r = GoldenSectionMinimizer.Minimum(ObjectiveFunction.ScalarValue(x => -Vmg(x)), a, b, 1e-3, 200);
            if (-r.FunctionInfoAtMinimum.Value > bestV) { bestX = r.MinimizingPoint; bestV = -r.FunctionInfoAtMinimum.Value; }
        }
        catch (MathNet.Numerics.Optimization.OptimizationException) { /* keep the scan's best */ }
        return (bestX, bestV, SpeedAt(twsMs, bestX));
    }

    /// <summary>
    /// Lowest true wind speed (m/s, 10 m) at which the board gets onto the plane at its best reaching angle
    /// (TWA 60..150), with or without pumping; null if it does not plane below <paramref name="maxTwsMs"/>.
    /// </summary>
    public double? PlaningThreshold(bool withPumping, double maxTwsMs)
    {
        bool Planes(double tws)
        {
            for (int d = 60; d <= 150; d += 15)
            {
                var s = Solve(tws, Unit.DegToRad(d), false);
                if (withPumping ? s.PlanesWithPumping : s.PlanesWithoutPumping) return true;
            }
            return false;
        }
        double lo = Unit.KnotsToMs(1), hi = maxTwsMs;
        if (!Planes(hi)) return null;
        if (Planes(lo)) return lo;
        while (hi - lo > Unit.KnotsToMs(0.1))
        {
            double mid = 0.5 * (lo + hi);
            if (Planes(mid)) hi = mid; else lo = mid;
        }
        return hi;
    }
}
