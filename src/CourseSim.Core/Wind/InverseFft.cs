using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace CourseSim.Wind;

/// <summary>
/// Unscaled inverse discrete Fourier transform of a power-of-two length n, x_j = sum_k X_k e^(+2 pi i jk/n), run down
/// the columns of an n x n single-precision array held row-major, real and imaginary parts apart: each column is one
/// sequence, and <see cref="Vector{T}"/> transforms neighbouring columns together (8 at a time with AVX2), reading
/// whole rows, so the array is walked in memory order and never transposed to make columns contiguous. The iterative
/// radix-2 Cooley-Tukey algorithm: the bit-reversal permutation (of whole rows), then butterflies level by level, with
/// the twiddle factors worked out once per length in double precision and rounded.
/// <para>
/// Single precision is enough here (the engine issue asks for float32 where precision allows, argued): the gust tiles
/// store their values as float anyway; a transform of length 512 is 9 levels of butterflies, each adding a rounding of
/// about 6e-8 of the values' size, so the two passes of a tile leave an error of a few 1e-7 of its standard deviation
/// (the test against MathNet's double-precision transform measures it), against gusts of order 1 m/s: far below
/// anything a rider or the field's statistics could tell. The tile's mean and variance are still summed in double.
/// </para>
/// </summary>
public sealed class InverseFft
{
    readonly int _n;
    // Twiddle of level L (group size L) and index k at [L - 1 + k]: cos and sin of k pi / L.
    readonly float[] _wr, _wi;

    public InverseFft(int n)
    {
        if (n < 2 || (n & (n - 1)) != 0) throw new ArgumentException("length must be a power of two", nameof(n));
        _n = n;
        _wr = new float[n - 1]; _wi = new float[n - 1];
        for (int level = 1; level < n; level *= 2)
            for (int k = 0; k < level; k++)
            {
                var (sn, cs) = Math.SinCos(k * Math.PI / level);
                _wr[level - 1 + k] = (float)cs; _wi[level - 1 + k] = (float)sn;
            }
    }

    /// <summary>
    /// Transforms columns <paramref name="col0"/> (inclusive) to <paramref name="col1"/> (exclusive) of the n x n arrays
    /// in place, each down its n rows; the other columns are not touched. The range's width must be a multiple of
    /// <see cref="Vector{T}"/>.Count of float (a column outside a tile's band is zero and stays zero, so a caller may
    /// round its ranges out to whole vectors).
    /// </summary>
    public void Columns(float[] re, float[] im, int col0, int col1)
    {
        int n = _n, vc = Vector<float>.Count;
        if (re.Length != n * n || im.Length != n * n) throw new ArgumentException($"expected {n} x {n} values");
        if (col0 < 0 || col1 > n || col1 < col0 || (col1 - col0) % vc != 0)
            throw new ArgumentException($"columns {col0}..{col1} must lie in 0..{n} and span a multiple of {vc}");
        ref float r0 = ref MemoryMarshal.GetArrayDataReference(re);
        ref float i0 = ref MemoryMarshal.GetArrayDataReference(im);
        // Bit-reversal permutation of the rows (their segments in the range).
        for (int i = 0, j = 0; i < n - 1; i++)
        {
            if (i < j)
                for (int q = col0; q < col1; q += vc)
                {
                    nuint a = (nuint)(i * n + q), b = (nuint)(j * n + q);
                    var ra = Vector.LoadUnsafe(ref r0, a); var rb = Vector.LoadUnsafe(ref r0, b);
                    rb.StoreUnsafe(ref r0, a); ra.StoreUnsafe(ref r0, b);
                    var ia = Vector.LoadUnsafe(ref i0, a); var ib = Vector.LoadUnsafe(ref i0, b);
                    ib.StoreUnsafe(ref i0, a); ia.StoreUnsafe(ref i0, b);
                }
            int m = n;
            do { m >>= 1; j ^= m; } while ((j & m) == 0);
        }
        for (int level = 1; level < n; level *= 2)
        {
            int step = level << 1;
            for (int k = 0; k < level; k++)
            {
                var wr = new Vector<float>(_wr[level - 1 + k]); var wi = new Vector<float>(_wi[level - 1 + k]);
                for (int i = k; i < n; i += step)
                    Butterflies(ref r0, ref i0, (nuint)(i * n), (nuint)((i + level) * n), col0, col1, wr, wi);
            }
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    static void Butterflies(ref float r0, ref float i0, nuint rowA, nuint rowB, int col0, int col1, Vector<float> wr, Vector<float> wi)
    {
        for (int q = col0; q < col1; q += Vector<float>.Count)
        {
            nuint a = rowA + (nuint)q, b = rowB + (nuint)q;
            var ar = Vector.LoadUnsafe(ref r0, a); var ai = Vector.LoadUnsafe(ref i0, a);
            var br = Vector.LoadUnsafe(ref r0, b); var bi = Vector.LoadUnsafe(ref i0, b);
            var tr = wr * br - wi * bi; var ti = wi * br + wr * bi; // w times the second value
            (ar + tr).StoreUnsafe(ref r0, a); (ai + ti).StoreUnsafe(ref i0, a);
            (ar - tr).StoreUnsafe(ref r0, b); (ai - ti).StoreUnsafe(ref i0, b);
        }
    }

    /// <summary>Transposes an n x n row-major array in place (blocks of 16 x 16, so each row read and written stays in cache).</summary>
    public static void Transpose(float[] a, int n)
    {
        if (a.Length != n * n) throw new ArgumentException($"expected {n} x {n} values");
        const int B = 16;
        ref float r = ref MemoryMarshal.GetArrayDataReference(a);
        for (int bi = 0; bi < n; bi += B)
            for (int bj = bi; bj < n; bj += B)
                for (int i = bi; i < Math.Min(bi + B, n); i++)
                    for (int j = bj == bi ? i + 1 : bj; j < Math.Min(bj + B, n); j++)
                    {
                        ref float x = ref Unsafe.Add(ref r, i * n + j), y = ref Unsafe.Add(ref r, j * n + i);
                        (x, y) = (y, x);
                    }
    }
}
