using CourseSim.Units;
using MathNet.Numerics.Optimization;

namespace CourseSim.Equilibrium;

/// <summary>One steady state (an equilibrium of surge force) at one true wind speed and angle.</summary>
public readonly record struct SteadyState(double Speed, TrimState Trim, double LiftFraction, bool Planing);

/// <summary>All steady states at one true wind speed and angle, and which one the rider sails at.</summary>
/// <param name="TwsMs">true wind speed at 10 m, m/s</param>
/// <param name="TwaRad">true wind angle, rad (0..pi)</param>
/// <param name="Displacement">the stable speed under the hump, if any</param>
/// <param name="Planing">the fastest stable speed on the planing branch, if any</param>
/// <param name="PlanesWithoutPumping">the board accelerates from rest onto the plane at this angle</param>
/// <param name="PlanesWithPumping">pumping carries it over the hump at this angle</param>
/// <param name="Sailed">the sustained state: its speed is the planing and displacement speeds weighted by the share of
/// time the board stays planing in a gusty wind (<see cref="PlaningBranches"/>), its trim the one at that speed</param>
/// <param name="GetPlaningSpeed">the speed a rider starting off the plane at this angle ends at (m/s)</param>
/// <param name="PlaningShare">share of time on the plane behind the sustained speed</param>
/// <param name="DropOffTwsMs">least true wind (m/s) in which the planing branch exists at this angle</param>
public sealed record PointSolution(double TwsMs, double TwaRad, SteadyState? Displacement, SteadyState? Planing,
    SteadyState Sailed, bool PlanesWithoutPumping, bool PlanesWithPumping, double GetPlaningSpeed = 0, double PlaningShare = 0,
    double DropOffTwsMs = double.PositiveInfinity);

/// <summary>
/// Velocity prediction: for a true wind speed (10 m height) and angle, finds every speed where the rig's thrust with the
/// rider's best trim equals the hull's resistance (docs/physics.md, "Equilibrium"), through the board model
/// (<see cref="IBoardModel"/>, here <see cref="BoardPhysics"/>). Stable equilibria are where the net force crosses from
/// positive to negative. Below planing there may be a displacement equilibrium under the resistance hump and a planing one
/// above it: both are reported, with the get-planing speed (from a start off the plane at that angle, pumping over the
/// hump) and the sustained speed (planing with hysteresis in a gusty wind: <see cref="PlaningBranches"/>).
/// </summary>
public sealed class VelocityPrediction
{
    /// <summary>How long the rider can pump hard to get over the hump, s (the burst uses CP + W'/t).</summary>
    public const double PumpBurstS = 30.0;
    const double MaxSpeed = 30.0;

    public BoardPhysics Board { get; }
    readonly double _burstPower;
    readonly PlaningBranches _branches;

    public VelocityPrediction(BoardPhysics board)
    {
        Board = board;
        _burstPower = board.Rider.PowerFor(PumpBurstS);
        _branches = new PlaningBranches((tws, twa, v) => Board.NetForce(Board.WindAtRig(tws), twa, v, out _), PumpThrust,
            board.Hull.SpeedAtFroude(Hull.HullModel.DropOffFroude), MaxSpeed);
    }

    /// <summary>Pumping thrust available at speed V during a burst, N.</summary>
    public double PumpThrust(double speed) => Board.Rider.PumpThrust(_burstPower, speed);

    double? _thresholdPumping;
    bool _thresholdKnown;

    /// <summary>
    /// Wind at which the rider can get planing at some reaching angle with pumping (cached). Above it a rider sailing at any
    /// angle where a planing equilibrium exists can be planing there: riders get going on a reach and then bear away or
    /// head up (the sustained speed then weighs in how often a lull drops them off).
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
        bool canGet = useThreshold && PlaningThresholdWithPumping is double t && t <= twsMs;
        var br = _branches.At(twsMs, twaRad, canGet, useThreshold ? double.NaN : double.PositiveInfinity);
        double drop = br.DropOffWindMs;
        SteadyState State(double v, bool planing)
        {
            Board.NetForce(w, twaRad, v, out var trim);
            return new SteadyState(v, trim, Board.Hull.LiftFraction(v), planing);
        }
        SteadyState? disp = br.Displacement is double d ? State(d, false) : null;
        SteadyState? plan = br.Planing is double p ? State(p, true) : null;
        var sailed = State(br.Sustained, br.PlaningShare >= 0.5 && plan is not null);
        if (disp is null && plan is null) sailed = State(0, false) with { Speed = 0 };
        return new PointSolution(twsMs, twaRad, disp, plan, sailed, br.PlanesWithoutPumping, br.PlanesWithPumping,
            br.GetPlaning, br.PlaningShare, drop);
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
            // The minimiser may step outside its bracket: keep the angle within lo..hi and its value consistent.
            double x = Math.Clamp(r.MinimizingPoint, lo, hi), val = Vmg(x);
            if (val > bestV) { bestX = x; bestV = val; }
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
