using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CourseSim.Random;

namespace CourseSim.Wind;

/// <summary>
/// A periodic square tile holding one wavenumber band of a unit-variance Gaussian field with the von Karman spectrum,
/// made once by an inverse FFT and sampled by bilinear interpolation. The 2-D spectral density is proportional to
/// (1 + k^2 l^2)^(-4/3): a Matern field of smoothness 1/3, whose correlation along any line is the von Karman function
/// rho(r) = 2^(2/3)/Gamma(1/3) (r/l)^(1/3) K_1/3(r/l) and whose 1-D spectrum is the IEC 61400-1 von Karman form
/// S(f) = 4 sigma^2 (L/U) / (1 + 70.8 (f L/U)^2)^(5/6), slope -5/3 in the inertial range. The integral length scale is
/// L = l sqrt(pi) Gamma(5/6)/Gamma(1/3) = 0.7468 l.
/// <para>
/// A tile holds the modes whose larger index |i| or |j| lies in (lo, hi]. With hi at half the grid's Nyquist index, bilinear
/// interpolation passes the band with a known loss, sinc^2(pi i/N) sinc^2(pi j/N) in amplitude, which the synthesis divides
/// out (a spectral correction), and its images beyond the band stay near 1.5% of the band's power. <see cref="WindField"/>
/// adds a coarse tile (the large scales) and a fine one (the band above it) so the sum keeps the von Karman spectrum,
/// variance and correlation down to a few metres (docs/wind.md).
/// </para>
/// </summary>
public sealed class GustTile
{
    /// <summary>L / l for the von Karman correlation (computed from the Gamma functions above).</summary>
    public const double IntegralToScale = 0.746834;
    public int Size { get; }
    public double SpacingM { get; }
    /// <summary>Share of the unit variance the tile's band holds (the integral of the spectrum over its modes).</summary>
    public double Variance { get; }
    readonly float[] _v;
    readonly double _invSpacing;

    GustTile(float[] values, int size, double spacingM, double variance)
    {
        _v = values; Size = size; SpacingM = spacingM; _invSpacing = 1 / spacingM; Variance = variance;
    }

    /// <summary>
    /// One band of the field as two independent tiles from one inverse FFT: the real and imaginary parts of the transform
    /// of complex white noise shaped by an even spectrum are independent fields with that spectrum. Both tiles have
    /// <paramref name="pointsPerScale"/> grid points per l, so their spectra are the same in grid units and the second tile
    /// is the same kind of field at the length scale <paramref name="secondLengthM"/> (the lateral component). Modes with
    /// max(|i|, |j|) at most <paramref name="lo"/> are left to a coarser tile (0: only the mean is left out), those above
    /// <paramref name="hi"/> (at most size/2) are left out. <paramref name="scratch"/>, if given, is the size x size work
    /// array (a field's bands share one: 4 MiB less to allocate and collect per race).
    /// </summary>
    public static (GustTile First, GustTile Second) Band(double firstLengthM, double secondLengthM, CounterRng rng,
        int size, int pointsPerScale, int lo, int hi, Complex[]? scratch = null)
    {
        if (size < 8 || (size & (size - 1)) != 0) throw new ArgumentException("tile size must be a power of two", nameof(size));
        if (lo < 0 || hi <= lo || hi > size / 2) throw new ArgumentException($"band ({lo}, {hi}] outside 0..{size / 2}");
        var c = scratch is { Length: var len } && len == size * size ? scratch : new Complex[size * size];
        Array.Clear(c);
        double dkl = 2 * Math.PI * pointsPerScale / size;     // grid wavenumber step times l
        double held = 0, grid = 0;
        var h = new double[hi + 1];                            // bilinear interpolation's amplitude response per index
        for (int i = 0; i <= hi; i++) { double x = Math.PI * i / size; h[i] = i == 0 ? 1 : Math.Pow(Math.Sin(x) / x, 2); }
        // The spectrum and the amplitude depend on |fi| and |fj| only (and symmetrically): worked out once per pair.
        int m = hi + 1;
        var spec = new double[m * m]; var amps = new double[m * m];
        for (int a = 0; a <= hi; a++)
            for (int b = a; b <= hi; b++)
            {
                double sp = Math.Pow(1 + (a * a + b * b) * dkl * dkl, -4.0 / 3.0);
                double am = Math.Sqrt(sp) / (h[a] * h[b]);
                spec[a * m + b] = spec[b * m + a] = sp;
                amps[a * m + b] = amps[b * m + a] = am;
            }
        for (int fi = -hi; fi <= hi; fi++)
        {
            int i = fi < 0 ? fi + size : fi;
            for (int fj = -hi; fj <= hi; fj++)
            {
                if (Math.Max(Math.Abs(fi), Math.Abs(fj)) <= lo) continue;
                int j = fj < 0 ? fj + size : fj;
                double s = spec[Math.Abs(fi) * m + Math.Abs(fj)];
                double amp = amps[Math.Abs(fi) * m + Math.Abs(fj)];
                held += s; grid += amp * amp;
                var (re, im) = rng.NormalPair((ulong)(i * size + j));
                c[i * size + j] = new Complex(amp * re, amp * im);
            }
        }
        // 2-D inverse FFT as rows then columns (InverseFft: the arithmetic of MathNet's managed radix-2 transform with the
        // twiddles worked out once); the rows beyond the band are zero and stay so.
        var fft = new InverseFft(size);
        for (int fi = -hi; fi <= hi; fi++)
        {
            int i = fi < 0 ? fi + size : fi;
            fft.Transform(c.AsSpan(i * size, size));
        }
        // Columns eight at a time, interleaved (each row read brings eight neighbouring values, two cache lines, not one),
        // transformed together lane by lane with the same arithmetic as one at a time (InverseFft.TransformInterleaved).
        const int Block = 8; // size is a power of two of at least 8, so the blocks tile the columns exactly
        var colRe = new double[Block * size]; var colIm = new double[Block * size];
        for (int j0 = 0; j0 < size; j0 += Block)
        {
            for (int i = 0; i < size; i++)
                for (int q = 0; q < Block; q++) { var v = c[i * size + j0 + q]; colRe[i * Block + q] = v.Real; colIm[i * Block + q] = v.Imaginary; }
            fft.TransformInterleaved(colRe, colIm, Block);
            for (int i = 0; i < size; i++)
                for (int q = 0; q < Block; q++) c[i * size + j0 + q] = new Complex(colRe[i * Block + q], colIm[i * Block + q]);
        }
        // The spectrum integrates to 3 pi / l^2 over the plane: the band holds held (dk l)^2 / (3 pi) of the unit variance.
        // Each tile is scaled so that, after the interpolation's loss, its variance is the band's: the grid values carry
        // grid / held times that (the correction above). Scaling by the realised standard deviation keeps every seed's
        // tile at exactly its share.
        double variance = held * dkl * dkl / (3 * Math.PI);
        double gridVariance = variance * grid / held;
        // Both tiles in the same passes over the transform (each with its own sums, in the same order as one tile at a
        // time, so the same bits): the 4 MiB array is read twice instead of four times.
        double sumR = 0, sum2R = 0, sumI = 0, sum2I = 0;
        for (int i = 0; i < c.Length; i++)
        {
            double re = c[i].Real, im = c[i].Imaginary;
            sumR += re; sum2R += re * re; sumI += im; sum2I += im * im;
        }
        double meanR = sumR / c.Length, sdR = Math.Sqrt(Math.Max(sum2R / c.Length - meanR * meanR, 1e-300));
        double meanI = sumI / c.Length, sdI = Math.Sqrt(Math.Max(sum2I / c.Length - meanI * meanI, 1e-300));
        double scaleR = Math.Sqrt(gridVariance) / sdR, scaleI = Math.Sqrt(gridVariance) / sdI;
        var first = new float[c.Length]; var second = new float[c.Length];
        for (int i = 0; i < c.Length; i++)
        {
            first[i] = (float)((c[i].Real - meanR) * scaleR);
            second[i] = (float)((c[i].Imaginary - meanI) * scaleI);
        }
        return (new GustTile(first, size, firstLengthM / IntegralToScale / pointsPerScale, variance),
                new GustTile(second, size, secondLengthM / IntegralToScale / pointsPerScale, variance));
    }

    /// <summary>
    /// Asks the processor to start loading the two rows of cells <see cref="At"/> will read at (a, b): a hint only (a
    /// prefetch never faults and changes no value), so the race step can overlap the tiles' cache misses of several boards.
    /// </summary>
    public unsafe void Prefetch(double a, double b)
    {
        if (!System.Runtime.Intrinsics.X86.Sse.IsSupported) return;
        double x = a * _invSpacing, y = b * _invSpacing;
        int n = Size, mask = n - 1;
        int i0 = (int)((long)Math.Floor(x) & mask), j0 = (int)((long)Math.Floor(y) & mask);
        int i1 = (i0 + 1) & mask;
        ref float v = ref MemoryMarshal.GetArrayDataReference(_v);
        System.Runtime.Intrinsics.X86.Sse.Prefetch0(Unsafe.AsPointer(ref Unsafe.Add(ref v, i0 * n + j0)));
        System.Runtime.Intrinsics.X86.Sse.Prefetch0(Unsafe.AsPointer(ref Unsafe.Add(ref v, i1 * n + j0)));
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
        // The masks keep every index inside the n x n array, so the reads skip the bounds checks (a quarter of a sample's
        // cost with four tiles).
        ref float v = ref MemoryMarshal.GetArrayDataReference(_v);
        double v00 = Unsafe.Add(ref v, i0 * n + j0), v01 = Unsafe.Add(ref v, i0 * n + j1);
        double v10 = Unsafe.Add(ref v, i1 * n + j0), v11 = Unsafe.Add(ref v, i1 * n + j1);
        return (v00 * (1 - ty) + v01 * ty) * (1 - tx) + (v10 * (1 - ty) + v11 * ty) * tx;
    }

    public long MemoryBytes => (long)_v.Length * sizeof(float);
}
