using System.Numerics;

namespace CourseSim.Wind;

/// <summary>
/// In-place inverse discrete Fourier transform of a power-of-two length, scaled by 1/n (x_j = 1/n sum_k X_k e^(+2 pi i jk/n)):
/// the iterative radix-2 Cooley-Tukey algorithm (bit-reversal permutation, then butterflies level by level). The twiddle
/// factors are worked out once per length (a gust tile's synthesis runs about a thousand transforms of one length; working
/// them out inside each transform was most of its cost). Each butterfly and twiddle is the same arithmetic, in the same
/// order, as the managed radix-2 provider of MathNet.Numerics (<c>Fourier.Inverse</c> with <c>FourierOptions.Matlab</c>),
/// so the tiles keep their bits (the demos' golden hashes guard this).
/// </summary>
public sealed class InverseFft
{
    readonly int _n;
    // Twiddle of level L (group size L) and index k at _w[L - 1 + k]: cos and sin of k pi / L.
    readonly Complex[] _w;
    readonly double _scale;

    public InverseFft(int n)
    {
        if (n < 2 || (n & (n - 1)) != 0) throw new ArgumentException("length must be a power of two", nameof(n));
        _n = n;
        _w = new Complex[n - 1];
        for (int level = 1; level < n; level *= 2)
            for (int k = 0; k < level; k++)
            {
                double e = k * Math.PI / level;
                _w[level - 1 + k] = new Complex(Math.Cos(e), Math.Sin(e));
            }
        _scale = 1.0 / n;
    }

    public int Length => _n;

    /// <summary>Transforms <paramref name="x"/> (length n) in place.</summary>
    public void Transform(Span<Complex> x)
    {
        if (x.Length != _n) throw new ArgumentException($"expected {_n} values, got {x.Length}", nameof(x));
        // Bit-reversal permutation.
        for (int i = 0, j = 0; i < _n - 1; i++)
        {
            if (i < j) (x[i], x[j]) = (x[j], x[i]);
            int m = _n;
            do { m >>= 1; j ^= m; } while ((j & m) == 0);
        }
        for (int level = 1; level < _n; level *= 2)
        {
            int step = level << 1;
            for (int k = 0; k < level; k++)
            {
                var w = _w[level - 1 + k];
                for (int i = k; i < _n; i += step)
                {
                    var a = x[i];
                    var t = w * x[i + level];
                    x[i] = a + t;
                    x[i + level] = a - t;
                }
            }
        }
        for (int i = 0; i < _n; i++) x[i] *= _scale;
    }

    /// <summary>
    /// Transforms <paramref name="lanes"/> sequences at once, held interleaved: value j of sequence q at index j * lanes + q,
    /// real and imaginary parts apart. Each sequence goes through exactly the operations of <see cref="Transform"/> (the
    /// same permutation, the same products, sums and differences per butterfly, no fused multiply-add), so each gives the
    /// same bits; <see cref="Vector{T}"/> does several sequences per instruction. lanes must be a multiple of
    /// Vector&lt;double&gt;.Count.
    /// </summary>
    public void TransformInterleaved(Span<double> re, Span<double> im, int lanes)
    {
        int vc = Vector<double>.Count;
        if (lanes % vc != 0) throw new ArgumentException($"lanes must be a multiple of {vc}", nameof(lanes));
        if (re.Length != _n * lanes || im.Length != _n * lanes) throw new ArgumentException($"expected {_n * lanes} values");
        for (int i = 0, j = 0; i < _n - 1; i++)
        {
            if (i < j)
                for (int q = 0; q < lanes; q++)
                {
                    int a = i * lanes + q, b = j * lanes + q;
                    (re[a], re[b]) = (re[b], re[a]);
                    (im[a], im[b]) = (im[b], im[a]);
                }
            int m = _n;
            do { m >>= 1; j ^= m; } while ((j & m) == 0);
        }
        ref double r0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(re);
        ref double i0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(im);
        for (int level = 1; level < _n; level *= 2)
        {
            int step = level << 1;
            for (int k = 0; k < level; k++)
            {
                var w = _w[level - 1 + k];
                var wr = new Vector<double>(w.Real); var wi = new Vector<double>(w.Imaginary);
                for (int i = k; i < _n; i += step)
                    for (int q = 0; q < lanes; q += vc)
                    {
                        nuint a = (nuint)(i * lanes + q), b = (nuint)((i + level) * lanes + q);
                        var ar = Vector.LoadUnsafe(ref r0, a); var ai = Vector.LoadUnsafe(ref i0, a);
                        var br = Vector.LoadUnsafe(ref r0, b); var bi = Vector.LoadUnsafe(ref i0, b);
                        // Complex product w * x as System.Numerics.Complex forms it: (wr xr - wi xi, wi xr + wr xi).
                        var tr = wr * br - wi * bi; var ti = wi * br + wr * bi;
                        (ar + tr).StoreUnsafe(ref r0, a); (ai + ti).StoreUnsafe(ref i0, a);
                        (ar - tr).StoreUnsafe(ref r0, b); (ai - ti).StoreUnsafe(ref i0, b);
                    }
            }
        }
        var sc = new Vector<double>(_scale);
        for (int a = 0; a < _n * lanes; a += vc)
        {
            (Vector.LoadUnsafe(ref r0, (nuint)a) * sc).StoreUnsafe(ref r0, (nuint)a);
            (Vector.LoadUnsafe(ref i0, (nuint)a) * sc).StoreUnsafe(ref i0, (nuint)a);
        }
    }
}
