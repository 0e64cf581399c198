namespace CourseSim.Equilibrium;

/// <summary>The speeds one true wind angle offers at one true wind speed (m/s), and how a rider gets and keeps them.</summary>
/// <param name="Displacement">the lowest stable speed below the planing branch, if any</param>
/// <param name="Planing">the fastest stable speed on the planing branch (volume Froude number at least the drop-off), if any</param>
/// <param name="GetPlaning">the speed a rider starting off the plane at this angle ends at: the planing one where pumping
/// (or the wind alone) carries the board over the hump, else the displacement one</param>
/// <param name="Sustained">the speed the rider holds on average in a gusty wind: planing speed weighted by the share of
/// time the wind stays above this angle's drop-off wind, displacement speed for the rest</param>
/// <param name="DropOffWindMs">the least true wind (m/s) in which the planing branch exists at this angle</param>
/// <param name="PlaningShare">share of time on the plane used for <paramref name="Sustained"/></param>
/// <param name="PlanesWithoutPumping">the board accelerates from rest onto the plane at this angle</param>
/// <param name="PlanesWithPumping">pumping carries it over the hump at this angle</param>
public readonly record struct Branches(double? Displacement, double? Planing, double GetPlaning, double Sustained,
    double DropOffWindMs, double PlaningShare, bool PlanesWithoutPumping, bool PlanesWithPumping);

/// <summary>
/// Planing with hysteresis (docs/physics.md, "Planing with hysteresis"): what it takes to get onto the plane differs from
/// what keeps the board there. Given the net surge force F(TWS, TWA, V) of a board model, this finds the stable speeds
/// (F crossing from + to -), the get-planing speed (from rest, pumping over the hump) and the sustained speed a rider
/// holds in a gusty wind. The velocity prediction (polars) and the race's rig polar both use it, each with its own
/// evaluation of the same board model's forces.
/// </summary>
public sealed class PlaningBranches
{
    /// <summary>Standard deviation of the wind a rider meets on a leg as a share of the mean (model value: about the
    /// sampled turbulence intensity of the engine's wind field, docs/wind.md; offshore turbulence intensity is 0.06-0.12
    /// by IEC 61400-3, from memory).</summary>
    public const double GustShare = 0.10;
    const double SpeedStep = 0.5;
    /// <summary>How many standard deviations of the wind either side of the mean the drop-off search looks (beyond them the
    /// share of time planing is 0 or 1 to within 3e-5).</summary>
    const double SearchSigmas = 4;

    readonly Func<double, double, double, double> _net;
    readonly Func<double, double> _pump;
    readonly double _dropOffSpeed, _maxSpeed;

    /// <param name="net">net surge force (N) at true wind speed (m/s, 10 m), true wind angle (rad, 0..pi) and board speed (m/s)</param>
    /// <param name="pumpThrust">pumping thrust (N) at board speed during a burst</param>
    /// <param name="dropOffSpeed">speed (m/s) below which a planing board drops off the plane</param>
    /// <param name="maxSpeed">highest speed searched, m/s</param>
    public PlaningBranches(Func<double, double, double, double> net, Func<double, double> pumpThrust, double dropOffSpeed, double maxSpeed = 30)
    {
        _net = net; _pump = pumpThrust; _dropOffSpeed = dropOffSpeed; _maxSpeed = maxSpeed;
    }

    /// <summary>
    /// Stable roots of F at one wind speed and angle. With two or more, the lowest is the displacement speed (under or on
    /// the front of the hump) and the fastest the planing one if it is at or above the drop-off speed; a single root is
    /// planing at or above the drop-off speed, displacement below it.
    /// </summary>
    public (double? Disp, double? Plan) Roots(double tws, double twa)
    {
        int n = (int)(Math.Min(_maxSpeed, 2.2 * tws + 5.0) / SpeedStep);
        double? lowest = null, highest = null;
        int count = 0;
        double vPrev = 0.05, fPrev = _net(tws, twa, vPrev);
        for (int i = 1; i <= n; i++)
        {
            double v = i * SpeedStep, f = _net(tws, twa, v);
            if (fPrev > 0 && f <= 0)
            {
                double root = Refine(tws, twa, vPrev, v, fPrev, f);
                lowest ??= root; highest = root; count++;
            }
            vPrev = v; fPrev = f;
        }
        if (count == 0) return (null, null);
        if (count == 1) return highest >= _dropOffSpeed ? (null, highest) : (lowest, null);
        return (lowest, highest >= _dropOffSpeed ? highest : null);
    }

    double Refine(double tws, double twa, double a, double b, double fa, double fb)
    {
        for (int i = 0; i < 30 && b - a > 1e-4; i++)
        {
            double m = 0.5 * (a + b), fm = _net(tws, twa, m);
            if (fm > 0) { a = m; fa = fm; } else { b = m; fb = fm; }
        }
        return fa == fb ? a : a + (b - a) * fa / (fa - fb);
    }

    /// <summary>Whether pumping carries the board from its displacement speed over the hump to the planing speed.</summary>
    public bool PumpsOver(double tws, double twa, double disp, double plan)
    {
        for (double v = disp; v < plan; v += SpeedStep)
            if (_net(tws, twa, v) + _pump(v) <= 0) return false;
        return true;
    }

    /// <summary>Least true wind (m/s) in which the planing branch exists at this angle (bisection to 0.02 m/s); infinity if none below <paramref name="maxTws"/>.</summary>
    public double DropOffWind(double twa, double maxTws) => DropOffWind(twa, 0.5, maxTws);
    /// <summary>The drop-off wind searched between <paramref name="lo"/> and <paramref name="hi"/> (m/s): lo if the branch
    /// exists there already, infinity if it exists nowhere on the way up to hi. The branch need not exist at every wind
    /// above its drop-off (close-hauled in a strong wind the overpowered rider cannot hold it), so the search scans up
    /// from lo in small steps to the first wind with the branch, then bisects the last step.</summary>
    public double DropOffWind(double twa, double lo, double hi)
    {
        if (Roots(lo, twa).Plan is not null) return lo;
        double step = Math.Max(0.25, (hi - lo) / 24), prev = lo, w = lo;
        while (true)
        {
            w = Math.Min(hi, w + step);
            if (Roots(w, twa).Plan is not null) break;
            if (w >= hi) return double.PositiveInfinity;
            prev = w;
        }
        double a = prev, b = w;
        while (b - a > 0.02)
        {
            double mid = 0.5 * (a + b);
            if (Roots(mid, twa).Plan is not null) b = mid; else a = mid;
        }
        return b;
    }

    /// <summary>Whether a rider starting off the plane at this wind and angle gets planing (the wind alone or pumping
    /// carries the board over the hump): <see cref="Branches.PlanesWithPumping"/> without the sustained-speed search.</summary>
    public bool GetsPlaning(double tws, double twa)
    {
        var (disp, plan) = Roots(tws, twa);
        return plan is double p && (disp is not double d || PumpsOver(tws, twa, d, p));
    }

    /// <summary>
    /// Both branches at one wind speed and angle. <paramref name="canGetPlaning"/>: the rider can get planing somewhere
    /// in this wind (heading up to a reach if need be), so the planing branch is open to them on every angle where it exists.
    /// </summary>
    public Branches At(double tws, double twa, bool canGetPlaning, double dropOffWind = double.NaN)
    {
        var (disp, plan) = Roots(tws, twa);
        double dispSpeed = disp ?? 0;
        bool without = plan is not null && disp is null;
        bool with = without || (plan is double p && disp is double d && PumpsOver(tws, twa, d, p));
        double get = with ? plan!.Value : disp ?? plan ?? 0;
        if (!canGetPlaning && !with) return new Branches(disp, plan, get, get, dropOffWind, 0, without, with);
        double sd = GustShare * Math.Max(tws, 0.5);
        if (double.IsNaN(dropOffWind))
        {
            // Only the band where the share of time planing is neither 0 nor 1 matters: search it alone.
            dropOffWind = DropOffWind(twa, Math.Max(0.5, tws - SearchSigmas * sd), plan is not null ? tws : tws + SearchSigmas * sd);
        }
        // The wind at the rider is normal around the mean with sd GustShare x TWS. The board planes while it is above the
        // drop-off wind (share of time = the probability of that), at the planing speed of the mean wind above the
        // drop-off; in the lulls below it, it sails at the lower branch's speed of the mean wind below the drop-off. Both
        // conditional means move smoothly with the drop-off wind, so the sustained speed has no cliff where the planing
        // branch ends (the inverse Mills ratio phi(z)/Phi(z) gives the conditional means).
        if (double.IsPositiveInfinity(dropOffWind))
            return new Branches(disp, plan, get, dispSpeed, dropOffWind, 0, without, with);
        double z = (tws - dropOffWind) / sd;
        double share = NormalCdf(z);
        if (share > 1 - 1e-4 && plan is double pl)
            return new Branches(disp, plan, get, pl, dropOffWind, 1, without, with);
        double pdf = Math.Exp(-0.5 * z * z) / Math.Sqrt(2 * Math.PI);
        double above = Math.Max(tws + sd * pdf / Math.Max(share, 1e-12), dropOffWind + 0.02);
        double below = Math.Min(tws - sd * pdf / Math.Max(1 - share, 1e-12), dropOffWind - 0.02);
        double planSpeed = Roots(above, twa).Plan ?? plan ?? dispSpeed;
        var low = Roots(Math.Max(below, 0.1), twa);
        double lowSpeed = low.Disp ?? (low.Plan is null ? 0 : dispSpeed);
        double sustained = share * planSpeed + (1 - share) * lowSpeed;
        return new Branches(disp, plan, get, sustained, dropOffWind, share, without, with);
    }

    /// <summary>Standard normal distribution function (Abramowitz and Stegun 7.1.26 for erf, error below 1.5e-7).</summary>
    public static double NormalCdf(double z)
    {
        double x = Math.Abs(z) / Math.Sqrt(2);
        double t = 1 / (1 + 0.3275911 * x);
        double erf = 1 - (((((1.061405429 * t - 1.453152027) * t) + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.Exp(-x * x);
        return z >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
    }
}
