using CourseSim.Equilibrium;
using CourseSim.Random;
using CourseSim.Units;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.Optimization;

namespace CourseSim.RigFit;

/// <summary>Not enough in the tracks to fit: the message says what is missing.</summary>
public sealed class ThinDataException(string message) : Exception(message);

/// <summary>A bin of steady stretches at one true wind angle and speed: observed and modelled mean speeds (m/s).</summary>
public sealed record SpeedBin(double TwaDeg, double TwsMs, int Count, double ObservedMs, double ModelBeforeMs, double ModelFittedMs, bool Used = true);

/// <summary>A fitted equipment key: original and fitted value with its 95 % interval.</summary>
public sealed record FittedKey(string Key, double Original, double Value, double Low, double High, string Note);

public sealed class RigFitResult
{
    public required IReadOnlyList<(Stretch S, double TwaDeg, double TwsMs)> Stretches { get; init; }
    public required IReadOnlyList<SpeedBin> Bins { get; init; }
    public required IReadOnlyList<FittedKey> Keys { get; init; }
    public required Equipment Fitted { get; init; }
    public required double RmsBeforePct { get; init; }
    public required double RmsAfterPct { get; init; }
    public required double Correlation { get; init; }
    public required IReadOnlyList<string> Notes { get; init; }
}

/// <summary>
/// Fits two of the board model's parameters to a rider's steady speeds (docs/rig-fit.md): <c>rider.lever_m</c> (how
/// much sail the rider can hold: it sets the power-limited speed on reaches in a breeze) and
/// <c>conditions.chop_drag_area_cm2</c> (spray and chop drag: it sets how fast a planing board goes for its power).
/// The model's speed at each bin is computed on a 3 x 3 grid of the two and interpolated (quadratic in each), so the
/// weighted nonlinear least squares (MathNet's Levenberg-Marquardt; Marquardt 1963, J. SIAM 11) and its bootstrap
/// cost no further solves. Intervals: percentile bootstrap resampling whole runs of steady sailing (a cluster
/// bootstrap: stretches of one run share its gusts and its rider's mood).
/// </summary>
public static class RigFitter
{
    public const string LeverKey = "rider.lever_m", ChopKey = "conditions.chop_drag_area_cm2";
    const double LeverStep = 0.2, ChopStep = 12;

    public static RigFitResult Fit(Equipment eq, IReadOnlyList<Stretch> stretches, Func<double, (double SpeedMs, double FromDeg)> wind,
        int replicates = 300, Action<int, int>? progress = null)
    {
        var rows = stretches.Select(s => { var w = wind(s.T); return (S: s, Twa: Math.Abs(Unit.WrapDeg180(s.CourseDeg - w.FromDeg)), Tws: w.SpeedMs); })
            .Where(r => r.Twa is >= 35 and <= 175 && r.Tws > 1).ToList();
        var binsOf = Binner(rows);
        var bins = binsOf(rows.Select((_, i) => i));
        if (rows.Count < 6 || bins.Count(b => b.N >= 2) < 3)
            throw new ThinDataException($"only {rows.Count} steady stretches of {TrackAnalysis.StretchS:0} s in {bins.Count} angle bins; a fit needs at least 6 " +
                "stretches over three 10-deg ranges of wind angle (beats, reaches and runs of half a minute or more)");
        double twaSpan = bins.Max(b => b.Twa) - bins.Min(b => b.Twa);
        if (twaSpan < 30) throw new ThinDataException($"the steady sailing covers true wind angles of {bins.Min(b => b.Twa):0} to {bins.Max(b => b.Twa):0} deg only; sail reaches and runs as well as beats (or beats as well) so the two parameters can be told apart");
        double l0 = eq.Rider.LeverM, c0 = eq.Conditions.ChopDragAreaCm2;
        double[] levers = [Math.Max(0.4, l0 - LeverStep), l0, Math.Min(1.8, l0 + LeverStep)], chops = [Math.Max(0, c0 - ChopStep), c0, Math.Min(60, c0 + ChopStep)];
        // The grid: speed at each bin for each (lever, chop) node, solved in parallel (each node's equipment is its own).
        var keys = bins.Select(b => (b.Twa, b.Tws)).ToList();
        var binKeys = bins.Select(b => (b.KeyTwa, b.KeyTws)).ToList();
        var grid = new double[3, 3][];
        var nodes = Enumerable.Range(0, 9).ToArray();
        int done = 0;
        Parallel.ForEach(nodes, new ParallelOptions { MaxDegreeOfParallelism = System.Environment.ProcessorCount }, k =>
        {
            var e = eq with { Rider = eq.Rider with { LeverM = levers[k / 3] }, Conditions = eq.Conditions with { ChopDragAreaCm2 = chops[k % 3] } };
            var vpp = new VelocityPrediction(new BoardPhysics(e));
            grid[k / 3, k % 3] = keys.Select(q => vpp.SpeedAt(q.Tws, Unit.DegToRad(q.Twa))).ToArray();
            progress?.Invoke(Interlocked.Increment(ref done), 9);
        });
        double Model(int bin, double lv, double ch) => Lagrange(levers, lv, i => Lagrange(chops, ch, j => grid[i, j][bin]));
        // A bootstrap bin is fitted against the model at the full data's bin of the same key.
        (double L, double C) Solve(List<(double Twa, double Tws, double Obs, int N, int Index)> bs)
        {
            var x = Vector<double>.Build.Dense(bs.Select(b => (double)b.Index).ToArray());
            var y = Vector<double>.Build.Dense(bs.Select(b => b.Obs).ToArray());
            var w = Vector<double>.Build.Dense(bs.Select(b => (double)b.N).ToArray());
            var obj = ObjectiveFunction.NonlinearModel((p, xs) => Vector<double>.Build.Dense(xs.Count, i => Model((int)xs[i], p[0], p[1])), x, y, w);
            var lm = new LevenbergMarquardtMinimizer(maximumIterations: 200);
            var r = lm.FindMinimum(obj, Vector<double>.Build.Dense([l0, c0]),
                Vector<double>.Build.Dense([Math.Max(0.4, l0 - 1.5 * LeverStep), Math.Max(0, c0 - 1.5 * ChopStep)]),
                Vector<double>.Build.Dense([Math.Min(1.8, l0 + 1.5 * LeverStep), Math.Min(60, c0 + 1.5 * ChopStep)]));
            return (r.MinimizingPoint[0], r.MinimizingPoint[1]);
        }
        var full = bins.Select((b, i) => (b.Twa, b.Tws, b.Obs, b.N, i)).ToList();
        double lf, cf;
        try { (lf, cf) = Solve(full); }
        catch (Exception e) when (e is MaximumIterationsException or ArgumentException or InvalidOperationException)
        { throw new ThinDataException($"the fit did not settle ({e.Message}); the steady speeds may be too scattered for the model: check the wind given"); }
        // Robust step: bins further than 3 scaled median absolute deviations from the first fit (a stretch whose wind
        // angle the log's 1-min direction misjudges, a run deep downwind where planing hangs on a gust) are set aside
        // and the fit repeated (Huber 1981, Robust Statistics, sec. 1.3: 1.4826 MAD estimates a normal sigma).
        var res = full.Select(b => (b.Obs - Model(b.Item5, lf, cf)) / b.Obs).ToArray();
        double med = res.Order().ElementAt(res.Length / 2);
        double mad = 1.4826 * res.Select(x => Math.Abs(x - med)).Order().ElementAt(res.Length / 2);
        var kept = full.Where((b, i) => Math.Abs(res[i] - med) <= 3 * Math.Max(mad, 0.02)).ToList();
        int aside = full.Count - kept.Count;
        if (aside > 0 && kept.Count >= 3)
        {
            try { (lf, cf) = Solve(kept); }
            catch (Exception e) when (e is MaximumIterationsException or ArgumentException or InvalidOperationException) { kept = full; }
        }
        else kept = full;
        var keptKeys = kept.Select(b => binKeys[b.Item5]).ToHashSet();
        // Cluster bootstrap over runs.
        var runs = rows.Select((r, i) => (r.S.Run, i)).GroupBy(p => p.Run).Select(g => g.Select(p => p.i).ToArray()).ToArray();
        var rng = new CounterRng(1, 0x816_F17);
        var bl = new List<double>(); var bc = new List<double>();
        for (int r = 0; r < replicates; r++)
        {
            var g = rng.For((ulong)r);
            var idx = Enumerable.Range(0, runs.Length).SelectMany(q => runs[(int)(g.Uniform((ulong)q) * runs.Length)]).ToList();
            var rb = binsOf(idx);
            var use = rb.Where(b => keptKeys.Contains((b.KeyTwa, b.KeyTws))).Select(b => (b.Twa, b.Tws, b.Obs, b.N, binKeys.IndexOf((b.KeyTwa, b.KeyTws)))).ToList();
            if (use.Count < 3) continue;
            try
            {
                var (a, c) = Solve(use);
                bl.Add(a); bc.Add(c);
            }
            catch (Exception e) when (e is MaximumIterationsException or ArgumentException or InvalidOperationException) { /* a replicate that does not settle is left out */ }
        }
        static (double, double) Pct(List<double> v) { var s = v.Order().ToArray(); return s.Length < 20 ? (double.NaN, double.NaN) : (s[(int)(0.025 * (s.Length - 1))], s[(int)Math.Ceiling(0.975 * (s.Length - 1))]); }
        var (llo, lhi) = Pct(bl); var (clo, chi) = Pct(bc);
        double rho = Corr(bl, bc);
        var notes = new List<string>();
        if (aside > 0) notes.Add($"{aside} of {full.Count} bins set aside as outliers (more than 3 scaled MADs from the first fit); the table marks them");
        if (Math.Abs(rho) > 0.97)
            notes.Add($"{LeverKey} and {ChopKey} are not separately identifiable from these tracks (bootstrap correlation {rho:0.00}): " +
                "their combination is; sail more angles or in another wind strength to tell them apart");
        else if (Math.Abs(rho) > 0.85)
            notes.Add($"{LeverKey} and {ChopKey} trade off against each other in these tracks (bootstrap correlation {rho:0.00}): " +
                "each interval holds the other's uncertainty; tracks in a second wind strength would narrow both");
        bool edge(double v, double lo, double hi) => Math.Abs(v - lo) < 1e-6 || Math.Abs(v - hi) < 1e-6;
        if (edge(lf, Math.Max(0.4, l0 - 1.5 * LeverStep), Math.Min(1.8, l0 + 1.5 * LeverStep)) || edge(cf, Math.Max(0, c0 - 1.5 * ChopStep), Math.Min(60, c0 + 1.5 * ChopStep)))
            notes.Add("a fitted value reached the edge of the range searched around the original; the set-up may differ from the file in more than these two keys (sail size, board, fin?)");
        var binsOut = bins.Select((b, i) => new SpeedBin(b.Twa, b.Tws, b.N, b.Obs, Model(i, l0, c0), Model(i, lf, cf), keptKeys.Contains(binKeys[i]))).ToList();
        double Rms(Func<SpeedBin, double> m) => 100 * Math.Sqrt(binsOut.Where(b => b.Used).Sum(b => b.Count * Math.Pow((b.ObservedMs - m(b)) / b.ObservedMs, 2)) / binsOut.Where(b => b.Used).Sum(b => b.Count));
        var fitted = eq with { Rider = eq.Rider with { LeverM = Math.Round(lf, 3) }, Conditions = eq.Conditions with { ChopDragAreaCm2 = Math.Round(cf, 1) } };
        return new RigFitResult
        {
            Stretches = rows.Select(r => (r.S, r.Twa, r.Tws)).ToList(), Bins = binsOut, Fitted = fitted, Correlation = rho, Notes = notes,
            RmsBeforePct = Rms(b => b.ModelBeforeMs), RmsAfterPct = Rms(b => b.ModelFittedMs),
            Keys =
            [
                new FittedKey(LeverKey, l0, lf, llo, lhi, "power-limited speed on reaches in a breeze"),
                new FittedKey(ChopKey, c0, cf, clo, chi, "drag of the planing board (spray, chop)"),
            ],
        };
    }

    record struct BinAcc(double Twa, double Tws, double Obs, int N, double KeyTwa, double KeyTws);

    /// <summary>Bins of 10 deg of true wind angle and 1 kn of wind speed; each at its stretches' mean angle and speed.</summary>
    static Func<IEnumerable<int>, List<BinAcc>> Binner(List<(Stretch S, double Twa, double Tws)> rows) => idx =>
        idx.Select(i => rows[i]).GroupBy(r => (Math.Floor((r.Twa - 35) / 10), Math.Round(Unit.MsToKnots(r.Tws))))
           .OrderBy(g => g.Key.Item2).ThenBy(g => g.Key.Item1)
           .Select(g => new BinAcc(g.Average(r => r.Twa), g.Average(r => r.Tws), g.Average(r => r.S.SpeedMs), g.Count(), g.Key.Item1, g.Key.Item2))
           .ToList();

    static double Lagrange(double[] xs, double x, Func<int, double> f)
    {
        double s = 0;
        for (int i = 0; i < 3; i++)
        {
            double l = 1;
            for (int j = 0; j < 3; j++) if (j != i) l *= (x - xs[j]) / (xs[i] - xs[j]);
            s += l * f(i);
        }
        return s;
    }

    static double Corr(List<double> a, List<double> b)
    {
        if (a.Count < 3) return double.NaN;
        double ma = a.Average(), mb = b.Average(), sab = 0, saa = 0, sbb = 0;
        for (int i = 0; i < a.Count; i++) { sab += (a[i] - ma) * (b[i] - mb); saa += (a[i] - ma) * (a[i] - ma); sbb += (b[i] - mb) * (b[i] - mb); }
        return saa > 0 && sbb > 0 ? sab / Math.Sqrt(saa * sbb) : double.NaN;
    }
}
