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

    /// <summary>The work arrays of a band's synthesis (size x size, real and imaginary parts): a field's bands share one,
    /// so a race allocates and collects 2 MiB less.</summary>
    public sealed class Scratch(int size)
    {
        public readonly float[] Re = new float[size * size], Im = new float[size * size];
        public int Size { get; } = size;
    }

    /// <summary>
    /// One band of the field as two independent tiles from one inverse FFT: the real and imaginary parts of the transform
    /// of complex white noise shaped by an even spectrum are independent fields with that spectrum. Both tiles have
    /// <paramref name="pointsPerScale"/> grid points per l, so their spectra are the same in grid units and the second tile
    /// is the same kind of field at the length scale <paramref name="secondLengthM"/> (the lateral component). Modes with
    /// max(|i|, |j|) at most <paramref name="lo"/> are left to a coarser tile (0: only the mean is left out), those above
    /// <paramref name="hi"/> (at most size/2) are left out. <paramref name="scratch"/>, if given, is the work space.
    /// The transform runs in single precision (<see cref="InverseFft"/>, where the precision is argued).
    /// </summary>
    public static (GustTile First, GustTile Second) Band(double firstLengthM, double secondLengthM, CounterRng rng,
        int size, int pointsPerScale, int lo, int hi, Scratch? scratch = null)
    {
        if (size < 16 || (size & (size - 1)) != 0) throw new ArgumentException("tile size must be a power of two of at least 16", nameof(size));
        if (lo < 0 || hi <= lo || hi > size / 2) throw new ArgumentException($"band ({lo}, {hi}] outside 0..{size / 2}");
        var work = scratch is { } sc && sc.Size == size ? sc : new Scratch(size);
        float[] re = work.Re, im = work.Im;
        Array.Clear(re); Array.Clear(im);
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
        // Mode (i, j) goes in at [j, i]: the first pass transforms along j, down the columns of the band's rows i. Each
        // row's normal pairs are drawn together (CounterRng.NormalPairs: four at a time), from the same counters as ever.
        var counters = new ulong[2 * hi + 1]; var js = new int[2 * hi + 1]; var amp1 = new double[2 * hi + 1];
        var nr = new double[2 * hi + 1]; var ni = new double[2 * hi + 1];
        for (int fi = -hi; fi <= hi; fi++)
        {
            int i = fi < 0 ? fi + size : fi, count = 0;
            for (int fj = -hi; fj <= hi; fj++)
            {
                if (Math.Max(Math.Abs(fi), Math.Abs(fj)) <= lo) continue;
                int j = fj < 0 ? fj + size : fj;
                double amp = amps[Math.Abs(fi) * m + Math.Abs(fj)];
                held += spec[Math.Abs(fi) * m + Math.Abs(fj)]; grid += amp * amp;
                counters[count] = (ulong)(i * size + j); js[count] = j; amp1[count++] = amp;
            }
            rng.NormalPairs(counters.AsSpan(0, count), nr, ni);
            for (int q = 0; q < count; q++)
            {
                re[js[q] * size + i] = (float)(amp1[q] * nr[q]); im[js[q] * size + i] = (float)(amp1[q] * ni[q]);
            }
        }
        // 2-D inverse FFT: along j for the band's columns i (the others are zero and stay so; the ranges are rounded out
        // to whole vectors), then, transposed, along i for every column j: the result is x[i, j] at [i, j].
        var fft = new InverseFft(size);
        int vc = System.Numerics.Vector<float>.Count, top = (hi + 1 + vc - 1) / vc * vc, bottom = (size - hi) / vc * vc;
        if (top < bottom) { fft.Columns(re, im, 0, top); fft.Columns(re, im, bottom, size); }
        else fft.Columns(re, im, 0, size);
        InverseFft.Transpose(re, size); InverseFft.Transpose(im, size);
        fft.Columns(re, im, 0, size);
        // The spectrum integrates to 3 pi / l^2 over the plane: the band holds held (dk l)^2 / (3 pi) of the unit variance.
        // Each tile is scaled so that, after the interpolation's loss, its variance is the band's: the grid values carry
        // grid / held times that (the correction above). Scaling by the realised standard deviation keeps every seed's
        // tile at exactly its share (and makes the transform's scale, left out, cancel).
        double variance = held * dkl * dkl / (3 * Math.PI);
        double gridVariance = variance * grid / held;
        var (meanR, sdR) = MeanSd(re); var (meanI, sdI) = MeanSd(im);
        double scaleR = Math.Sqrt(gridVariance) / sdR, scaleI = Math.Sqrt(gridVariance) / sdI;
        return (new GustTile(Standardised(re, meanR, scaleR), size, firstLengthM / IntegralToScale / pointsPerScale, variance),
                new GustTile(Standardised(im, meanI, scaleI), size, secondLengthM / IntegralToScale / pointsPerScale, variance));
    }

    /// <summary>(v - mean) times scale, in single precision a vector at a time (the tile keeps single precision).</summary>
    static float[] Standardised(float[] v, double mean, double scale)
    {
        var o = GC.AllocateUninitializedArray<float>(v.Length);
        var sc = new Vector<float>((float)scale); var sh = new Vector<float>((float)(mean * scale));
        int vc = Vector<float>.Count, i = 0;
        ref float r = ref MemoryMarshal.GetArrayDataReference(v); ref float w = ref MemoryMarshal.GetArrayDataReference(o);
        for (; i + vc <= v.Length; i += vc) (Vector.LoadUnsafe(ref r, (nuint)i) * sc - sh).StoreUnsafe(ref w, (nuint)i);
        for (; i < v.Length; i++) o[i] = v[i] * (float)scale - (float)(mean * scale);
        return o;
    }

    /// <summary>Mean and standard deviation of the values, summed in double precision.</summary>
    static (double Mean, double Sd) MeanSd(float[] v)
    {
        // Widened to double four lanes at a time, in two accumulators each (the adds overlap instead of waiting in turn).
        var s0 = Vector<double>.Zero; var s1 = Vector<double>.Zero; var q0 = Vector<double>.Zero; var q1 = Vector<double>.Zero;
        int vc = Vector<float>.Count, i = 0;
        ref float r = ref MemoryMarshal.GetArrayDataReference(v);
        for (; i + vc <= v.Length; i += vc)
        {
            Vector.Widen(Vector.LoadUnsafe(ref r, (nuint)i), out var lo, out var hi);
            s0 += lo; s1 += hi; q0 += lo * lo; q1 += hi * hi;
        }
        double sum = Vector.Sum(s0 + s1), sum2 = Vector.Sum(q0 + q1);
        for (; i < v.Length; i++) { double x = v[i]; sum += x; sum2 += x * x; }
        double mean = sum / v.Length;
        return (mean, Math.Sqrt(Math.Max(sum2 / v.Length - mean * mean, 1e-300)));
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
