using System.Numerics;
using CourseSim.Random;
using MathNet.Numerics.IntegralTransforms;

namespace CourseSim.Wind;

/// <summary>
/// A periodic square tile of a unit-variance Gaussian field with the von Karman spectrum, made once by an inverse FFT
/// and sampled by bilinear interpolation. The 2-D spectral density is proportional to (1 + k^2 l^2)^(-4/3): a Matern field of
/// smoothness 1/3, whose correlation along any line is the von Karman function
/// rho(r) = 2^(2/3)/Gamma(1/3) (r/l)^(1/3) K_1/3(r/l) and whose 1-D spectrum is the IEC 61400-1 von Karman form
/// S(f) = 4 sigma^2 (L/U) / (1 + 70.8 (f L/U)^2)^(5/6), slope -5/3 in the inertial range. The integral length scale is
/// L = l sqrt(pi) Gamma(5/6)/Gamma(1/3) = 0.7468 l.
/// </summary>
public sealed class GustTile
{
    /// <summary>L / l for the von Karman correlation (computed from the Gamma functions above).</summary>
    public const double IntegralToScale = 0.746834;
    public int Size { get; }
    public double SpacingM { get; }
    readonly float[] _v;
    readonly double _invSpacing;

    public GustTile(double integralLengthM, CounterRng rng, int size = 512, int pointsPerScale = 8)
    {
        Size = size;
        double l = integralLengthM / IntegralToScale;
        SpacingM = l / pointsPerScale;
        _invSpacing = 1 / SpacingM;
        var c = new Complex[size * size];
        double dk = 2 * Math.PI / (size * SpacingM);
        double resolved = 0;
        for (int i = 0; i < size; i++)
        {
            int fi = i <= size / 2 ? i : i - size;
            for (int j = 0; j < size; j++)
            {
                int fj = j <= size / 2 ? j : j - size;
                double k2 = (fi * fi + fj * fj) * dk * dk;
                double amp = (fi == 0 && fj == 0) ? 0 : Math.Pow(1 + k2 * l * l, -4.0 / 6.0);
                resolved += amp * amp * dk * dk;
                ulong n = (ulong)(i * size + j);
                // Real and imaginary parts from one Box-Muller pair (independent standard normals).
                var (re, im) = rng.NormalPair(n);
                c[i * size + j] = new Complex(amp * re, amp * im);
            }
        }
        // 2-D inverse FFT as rows then columns (MathNet's managed provider has no multi-dimensional transform).
        var line = new Complex[size];
        for (int i = 0; i < size; i++)
        {
            Array.Copy(c, i * size, line, 0, size);
            Fourier.Inverse(line, FourierOptions.Matlab);
            Array.Copy(line, 0, c, i * size, size);
        }
        for (int j = 0; j < size; j++)
        {
            for (int i = 0; i < size; i++) line[i] = c[i * size + j];
            Fourier.Inverse(line, FourierOptions.Matlab);
            for (int i = 0; i < size; i++) c[i * size + j] = line[i];
        }
        _v = new float[size * size];
        double sum = 0, sum2 = 0;
        for (int i = 0; i < c.Length; i++) { sum += c[i].Real; sum2 += c[i].Real * c[i].Real; }
        double mean = sum / c.Length, sd = Math.Sqrt(sum2 / c.Length - mean * mean);
        // The tile holds the resolved scales only. The spectrum integrates to 3 pi / l^2 over the plane; what lies beyond
        // the grid's Nyquist wavenumber (about 12% of the variance at 8 points per scale: gusts shorter than a few seconds,
        // which a sail averages out) is left out rather than folded into the resolved scales, so correlations at lags
        // beyond the grid spacing keep the von Karman values.
        ResolvedVariance = Math.Min(1.0, resolved * l * l / (3 * Math.PI));
        double scale = Math.Sqrt(ResolvedVariance) / sd;
        for (int i = 0; i < c.Length; i++) _v[i] = (float)((c[i].Real - mean) * scale);
    }

    /// <summary>Value at (a, b) metres in tile coordinates, periodic, bilinear.</summary>
    public double At(double a, double b)
    {
        double x = a * _invSpacing, y = b * _invSpacing;
        double fx = Math.Floor(x), fy = Math.Floor(y);
        double tx = x - fx, ty = y - fy;
        int n = Size, mask = n - 1;
        int i0 = (int)((long)fx & mask), j0 = (int)((long)fy & mask);
        int i1 = (i0 + 1) & mask, j1 = (j0 + 1) & mask;
        double v00 = _v[i0 * n + j0], v01 = _v[i0 * n + j1], v10 = _v[i1 * n + j0], v11 = _v[i1 * n + j1];
        return (v00 * (1 - ty) + v01 * ty) * (1 - tx) + (v10 * (1 - ty) + v11 * ty) * tx;
    }

    /// <summary>Share of the unit variance the tile resolves (the rest lies below its grid spacing).</summary>
    public double ResolvedVariance { get; }

    public long MemoryBytes => (long)_v.Length * sizeof(float);
}
