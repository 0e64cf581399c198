using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>One point of a polar, in the units riders use (knots, degrees).</summary>
/// <remarks><c>SpeedKn</c> is the sustained speed (planing with hysteresis in a gusty wind); <c>GetPlaningSpeedKn</c> the
/// speed a rider starting off the plane at this angle reaches; <c>PlaningShare</c> the share of time on the plane behind
/// the sustained speed; <c>HarnessN</c> the harness-line force at the sustained state.</remarks>
public sealed record PolarPoint(double TwsKn, double TwaDeg, double SpeedKn, double VmgKn, double LeewayDeg, double AoaDeg,
    double HeelUse, bool Planing, double? DisplacementSpeedKn, double? PlaningSpeedKn, double AwaDeg, double AwsKn,
    double GetPlaningSpeedKn = double.NaN, double PlaningShare = 0, double HarnessN = 0);

/// <summary>Best VMG at one wind speed, upwind or downwind.</summary>
public sealed record VmgPoint(double TwsKn, double TwaDeg, double VmgKn, double SpeedKn);

/// <summary>Planing threshold as true wind speeds (kn); null where the board does not plane below the limit searched.</summary>
public sealed record PlaningThreshold(double? WithoutPumping, double? WithPumping);

/// <summary>A full polar: points on a grid of true wind speed and angle, best VMG, and the planing threshold.</summary>
public sealed record Polar(string Name, IReadOnlyList<PolarPoint> Points, IReadOnlyList<VmgPoint> Upwind,
    IReadOnlyList<VmgPoint> Downwind, PlaningThreshold Threshold)
{
    /// <summary>Highest speed at a wind speed, kn.</summary>
    public double TopSpeed(double twsKn) => Points.Where(p => p.TwsKn == twsKn).Max(p => p.SpeedKn);

    /// <summary>Wind speed up to which the planing threshold is searched, kn.</summary>
    public const double ThresholdSearchMaxKn = 45;

    // Seeds the VMG search with the best grid angle of this wind speed when the grid covers that side of the wind.
    static (double TwaRad, double VmgMs, double SpeedMs) BestVmg(VelocityPrediction vpp, double tws, bool upwind, List<PolarPoint> points, int first, IReadOnlyList<double> angles)
    {
        var side = points.Skip(first).Where(p => upwind ? p.TwaDeg is >= 25 and <= 90 : p.TwaDeg is >= 90 and <= 178).ToList();
        if (side.Count < 3) return vpp.BestVmg(tws, upwind);
        var best = upwind ? side.MaxBy(p => p.VmgKn)! : side.MinBy(p => p.VmgKn)!;
        double spacing = angles.Count > 1 ? angles.Zip(angles.Skip(1), (x, y) => y - x).Max() : 10;
        return vpp.BestVmg(tws, upwind, Unit.DegToRad(best.TwaDeg), Unit.DegToRad(spacing));
    }

    /// <summary>Computes the polar. <paramref name="progress"/> is told how many wind speeds are done.</summary>
    public static Polar Compute(Equipment eq, IReadOnlyList<double> windsKn, IReadOnlyList<double> anglesDeg, Action<int, int>? progress = null)
    {
        var vpp = new VelocityPrediction(new BoardPhysics(eq));
        var points = new List<PolarPoint>(windsKn.Count * anglesDeg.Count);
        var up = new List<VmgPoint>(); var down = new List<VmgPoint>();
        for (int w = 0; w < windsKn.Count; w++)
        {
            double tws = Unit.KnotsToMs(windsKn[w]);
            int first = points.Count;
            foreach (double a in anglesDeg)
            {
                var s = vpp.Solve(tws, Unit.DegToRad(a));
                var st = s.Sailed;
                double kn = Unit.MsToKnots(st.Speed);
                points.Add(new PolarPoint(windsKn[w], a, kn, kn * Math.Cos(Unit.DegToRad(a)),
                    Unit.RadToDeg(st.Trim.LeewayRad), Unit.RadToDeg(st.Trim.AttackRad), Math.Clamp(st.Trim.HeelUse, 0, 1),
                    st.Planing, s.Displacement is { } d ? Unit.MsToKnots(d.Speed) : null, s.Planing is { } p ? Unit.MsToKnots(p.Speed) : null,
                    Unit.RadToDeg(st.Trim.ApparentAngleRad), Unit.MsToKnots(st.Trim.ApparentSpeed),
                    Unit.MsToKnots(s.GetPlaningSpeed), Math.Round(s.PlaningShare, 4), vpp.Board.Loads(st.Trim).HarnessForceN));
            }
            var (u, dn) = (BestVmg(vpp, tws, true, points, first, anglesDeg), BestVmg(vpp, tws, false, points, first, anglesDeg));
            up.Add(new VmgPoint(windsKn[w], Unit.RadToDeg(u.TwaRad), Unit.MsToKnots(u.VmgMs), Unit.MsToKnots(u.SpeedMs)));
            down.Add(new VmgPoint(windsKn[w], Unit.RadToDeg(dn.TwaRad), Unit.MsToKnots(dn.VmgMs), Unit.MsToKnots(dn.SpeedMs)));
            progress?.Invoke(w + 1, windsKn.Count);
        }
        double maxMs = Unit.KnotsToMs(ThresholdSearchMaxKn);
        double? without = vpp.PlaningThreshold(false, maxMs), with = vpp.PlaningThresholdWithPumping;
        static double? Kn(double? ms) => ms is double v ? Math.Round(Unit.MsToKnots(v), 2) : null;
        return new Polar(eq.Name, points, up, down, new PlaningThreshold(Kn(without), Kn(with)));
    }
}

/// <summary>One row of a side-by-side comparison of two set-ups at one wind speed.</summary>
public sealed record ComparisonRow(double TwsKn, double TopSpeedA, double TopSpeedB, double UpVmgA, double UpVmgB, double DownVmgA, double DownVmgB);

/// <summary>A wind speed where one set-up overtakes the other on a measure.</summary>
public sealed record Crossover(string Measure, double TwsKn, string FasterAbove);

/// <summary>Side-by-side comparison of two polars.</summary>
public sealed record PolarComparison(Polar A, Polar B, IReadOnlyList<ComparisonRow> Rows, IReadOnlyList<Crossover> Crossovers)
{
    public static PolarComparison Of(Polar a, Polar b)
    {
        var winds = a.Upwind.Select(u => u.TwsKn).ToList();
        var rows = new List<ComparisonRow>();
        for (int i = 0; i < winds.Count; i++)
            rows.Add(new ComparisonRow(winds[i], a.TopSpeed(winds[i]), b.TopSpeed(winds[i]), a.Upwind[i].VmgKn, b.Upwind[i].VmgKn,
                a.Downwind[i].VmgKn, b.Downwind[i].VmgKn));
        var cross = new List<Crossover>();
        Find("top speed", r => r.TopSpeedA - r.TopSpeedB);
        Find("upwind VMG", r => r.UpVmgA - r.UpVmgB);
        Find("downwind VMG", r => r.DownVmgA - r.DownVmgB);
        // A windward-leeward lap (one beat and one run of equal length) at the best VMGs: what decides a course race, so
        // the measure to hold against a paired batch's crossover. In per cent of A's lap time (positive: A's lap is shorter).
        Find("windward-leeward lap", r => 100 * ((1 / r.UpVmgB + 1 / r.DownVmgB) / (1 / r.UpVmgA + 1 / r.DownVmgA) - 1));
        return new PolarComparison(a, b, rows, cross);

        // A sign change of (A - B) between two listed wind speeds, located by linear interpolation. Differences under
        // 0.05 kn are treated as ties so that rounding noise does not create crossovers.
        void Find(string measure, Func<ComparisonRow, double> diff)
        {
            for (int i = 0; i + 1 < rows.Count; i++)
            {
                double d0 = diff(rows[i]), d1 = diff(rows[i + 1]);
                if (Math.Abs(d0) < 0.05 || Math.Abs(d1) < 0.05 || Math.Sign(d0) == Math.Sign(d1)) continue;
                double t = d0 / (d0 - d1);
                double tws = rows[i].TwsKn + t * (rows[i + 1].TwsKn - rows[i].TwsKn);
                cross.Add(new Crossover(measure, Math.Round(tws, 1), d1 > 0 ? a.Name : b.Name));
            }
        }
    }
}
