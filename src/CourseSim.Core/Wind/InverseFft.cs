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
}
