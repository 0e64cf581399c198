using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;

namespace CourseSim.Experiments;

/// <summary>A wind where the fitted difference changes sign, and its 95 % interval (the winds where the band holds zero).</summary>
public readonly record struct WindCrossover(double WindKn, double LowKn, double HighKn, bool Resolved, int FasterBelowSign);

/// <summary>
/// For riders: the paired difference of a board's time regressed on the race's wind by a natural cubic spline
/// (Hastie, Tibshirani and Friedman 2009, The Elements of Statistical Learning, 2nd ed., eq. 5.4-5.5: cubic between
/// the knots, straight beyond the outer ones), fitted by least squares. The knots sit at fixed quantiles of the winds
/// sailed, three to five by the number of races (Harrell 2015, Regression Modeling Strategies, 2nd ed., table 2.3), so
/// the model is chosen without looking at the differences and its band is exact for normal errors of constant spread:
/// fit +- t(n - k) s sqrt(b(x)' (X'X)^-1 b(x)), pointwise 95 %.
/// A crossover is a sign change of the fit; its interval is the run of winds around it where the band holds zero
/// (inverting the band, as Fieller's interval inverts a test). It is "resolved" only when the band excludes zero on both
/// sides with opposite signs inside the range of winds sailed.
/// </summary>
public sealed class CrossoverFit
{
    public double[] Grid { get; }
    public double[] Fit { get; }
    public double[] Low { get; }
    public double[] High { get; }
    /// <summary>The spline's knots, kn.</summary>
    public double[] Knots { get; }
    public int Points { get; }
    public IReadOnlyList<WindCrossover> Crossovers { get; }

    CrossoverFit(double[] grid, double[] fit, double[] lo, double[] hi, double[] knots, int n, IReadOnlyList<WindCrossover> cross)
    {
        Grid = grid; Fit = fit; Low = lo; High = hi; Knots = knots; Points = n; Crossovers = cross;
    }

    /// <summary>Knot quantiles by number of knots (Harrell 2015, table 2.3).</summary>
    static double[] KnotQuantiles(int k) => k switch
    {
        3 => [0.10, 0.50, 0.90],
        4 => [0.05, 0.35, 0.65, 0.95],
        _ => [0.05, 0.275, 0.50, 0.725, 0.95],
    };

    /// <summary>Knots for n points: 3 below 30, 4 below 100, else 5 (a spline of k knots spends k degrees of freedom).</summary>
    public static int KnotsFor(int n) => n < 30 ? 3 : n < 100 ? 4 : 5;

    /// <summary>Fits the differences <paramref name="y"/> against winds <paramref name="x"/>; null with fewer than 8 points or no spread of winds.</summary>
    public static CrossoverFit? Of(IReadOnlyList<double> x, IReadOnlyList<double> y, int gridPoints = 241, double confidence = 0.95)
    {
        int n = x.Count;
        if (n != y.Count) throw new ArgumentException("winds and differences must pair up");
        if (n < 8) return null;
        double xmin = x.Min(), xmax = x.Max(), range = xmax - xmin;
        if (range <= 0) return null;
        var sorted = x.Order().ToArray();
        var knots = KnotQuantiles(KnotsFor(n)).Select(q => Statistics.Quantile(sorted, q)).Distinct().ToArray();
        if (knots.Length < 3) knots = [xmin + 0.1 * range, xmin + 0.5 * range, xmin + 0.9 * range];
        int k = knots.Length;
        var X = Matrix<double>.Build.Dense(n, k, (i, j) => Basis(x[i], knots, j));
        var Y = Vector<double>.Build.Dense(n, i => y[i]);
        var xtxInv = (X.TransposeThisAndMultiply(X)).Inverse();
        var beta = xtxInv * X.TransposeThisAndMultiply(Y);
        var resid = Y - X * beta;
        int df = n - k;
        double s = Math.Sqrt(resid.DotProduct(resid) / df);
        double t = StudentT.InvCDF(0, 1, df, 1 - (1 - confidence) / 2);
        var grid = new double[gridPoints]; var fit = new double[gridPoints]; var lo = new double[gridPoints]; var hi = new double[gridPoints];
        for (int g = 0; g < gridPoints; g++)
        {
            double x0 = xmin + range * g / (gridPoints - 1);
            var b = Vector<double>.Build.Dense(k, j => Basis(x0, knots, j));
            double f = b.DotProduct(beta), half = t * s * Math.Sqrt(Math.Max(0, b.DotProduct(xtxInv * b)));
            grid[g] = x0; fit[g] = f; lo[g] = f - half; hi[g] = f + half;
        }
        return new CrossoverFit(grid, fit, lo, hi, knots, n, FindCrossovers(grid, fit, lo, hi));
    }

    /// <summary>The j-th natural cubic spline basis function (ESL eq. 5.4-5.5): 1, x, then d_j(x) - d_(K-1)(x) with
    /// d_j(x) = ((x - knot_j)^3_+ - (x - knot_K)^3_+) / (knot_K - knot_j); x is scaled by the knot span for conditioning.</summary>
    static double Basis(double x, double[] knots, int j)
    {
        double span = knots[^1] - knots[0];
        if (j == 0) return 1;
        if (j == 1) return (x - knots[0]) / span;
        double D(int m) => (Cube((x - knots[m]) / span) - Cube((x - knots[^1]) / span)) / ((knots[^1] - knots[m]) / span);
        return D(j - 2) - D(knots.Length - 2);
    }

    static double Cube(double v) => v > 0 ? v * v * v : 0;

    static List<WindCrossover> FindCrossovers(double[] grid, double[] fit, double[] lo, double[] hi)
    {
        var list = new List<WindCrossover>();
        for (int g = 1; g < grid.Length; g++)
        {
            if (fit[g - 1] == 0 || Math.Sign(fit[g - 1]) == Math.Sign(fit[g])) continue;
            double root = grid[g - 1] + (grid[g] - grid[g - 1]) * fit[g - 1] / (fit[g - 1] - fit[g]);
            // Walk out from the root while the band holds zero.
            int a = g - 1, b = g;
            while (a >= 0 && lo[a] <= 0 && hi[a] >= 0) a--;
            while (b < grid.Length && lo[b] <= 0 && hi[b] >= 0) b++;
            bool resolved = a >= 0 && b < grid.Length && Math.Sign(fit[a]) != Math.Sign(fit[b]);
            double low = a >= 0 ? Edge(grid, lo, hi, a, a + 1) : grid[0];
            double high = b < grid.Length ? Edge(grid, lo, hi, b, b - 1) : grid[^1];
            // The first variant is faster (negative difference) below the crossover when the fit goes from - to +.
            list.Add(new WindCrossover(root, low, high, resolved, fit[g - 1] < 0 ? -1 : 1));
            if (b > g) g = b - 1;
        }
        return list;
    }

    /// <summary>Where the band's edge crosses zero between grid points <paramref name="i"/> (zero outside the band) and
    /// <paramref name="j"/> (zero inside): the lower edge if the band is above zero at i, else the upper one.</summary>
    static double Edge(double[] grid, double[] lo, double[] hi, int i, int j)
    {
        var e = lo[i] > 0 ? lo : hi;
        double a = e[i], b = e[j];
        if (a == b || Math.Sign(a) == Math.Sign(b)) return 0.5 * (grid[i] + grid[j]);
        return grid[i] + (grid[j] - grid[i]) * a / (a - b);
    }
}
