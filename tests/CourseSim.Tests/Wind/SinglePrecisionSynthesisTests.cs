using System.Numerics;
using CourseSim.Random;
using CourseSim.Wind;
using MathNet.Numerics.IntegralTransforms;
using Xunit;

namespace CourseSim.Tests.Wind;

/// <summary>
/// The gust tiles' synthesis in single precision, four or eight lanes at a time, against double-precision references:
/// MathNet.Numerics' inverse FFT (a reference library) and the scalar Box-Muller pair.
/// </summary>
public class SinglePrecisionSynthesisTests
{
    // A 2-D inverse transform of a random sparse spectrum (a band, as a tile has), the column pass then, transposed, the
    // other: against MathNet's double-precision 1-D inverse transforms (FourierOptions.Matlab: exponent +, scaled by 1/n,
    // which is multiplied back: ours is unscaled) along rows and then columns. The error stays within 2e-6 of the field's
    // RMS (9 levels per pass in float: a few 1e-7 expected; the tiles themselves are stored in float).
    [Theory]
    [InlineData(64, 16)]
    [InlineData(256, 64)]
    public void ColumnTransformsMatchMathNetInDouble(int n, int hi)
    {
        var rng = new CounterRng(11, CounterRng.Streams.Tiles);
        var spec = new Complex[n * n];
        var re = new float[n * n]; var im = new float[n * n];
        for (int fi = -hi; fi <= hi; fi++)
            for (int fj = -hi; fj <= hi; fj++)
            {
                int i = (fi + n) % n, j = (fj + n) % n;
                var (a, b) = rng.NormalPair((ulong)(i * n + j));
                spec[i * n + j] = new Complex(a, b);
                re[j * n + i] = (float)a; im[j * n + i] = (float)b; // transposed, as GustTile fills it
            }
        // Reference: rows then columns in double.
        var line = new Complex[n];
        for (int i = 0; i < n; i++)
        {
            Array.Copy(spec, i * n, line, 0, n);
            Fourier.Inverse(line, FourierOptions.Matlab);
            for (int j = 0; j < n; j++) spec[i * n + j] = line[j] * n;
        }
        for (int j = 0; j < n; j++)
        {
            for (int i = 0; i < n; i++) line[i] = spec[i * n + j];
            Fourier.Inverse(line, FourierOptions.Matlab);
            for (int i = 0; i < n; i++) spec[i * n + j] = line[i] * n;
        }
        var fft = new InverseFft(n);
        fft.Columns(re, im, 0, n);
        InverseFft.Transpose(re, n); InverseFft.Transpose(im, n);
        fft.Columns(re, im, 0, n);
        double rms = Math.Sqrt(spec.Average(c => c.Real * c.Real + c.Imaginary * c.Imaginary));
        double worst = 0;
        for (int k = 0; k < n * n; k++)
            worst = Math.Max(worst, Math.Max(Math.Abs(re[k] - spec[k].Real), Math.Abs(im[k] - spec[k].Imaginary)));
        Assert.True(rms > 1);
        Assert.True(worst < 2e-6 * rms, $"worst error {worst:E2} against RMS {rms:E2}");
    }

    // Column ranges: only the columns asked for change (a tile transforms its band's columns alone first).
    [Fact]
    public void OnlyTheColumnsAskedForChange()
    {
        const int n = 32;
        var re = new float[n * n]; var im = new float[n * n];
        for (int k = 0; k < n * n; k++) { re[k] = k % 7; im[k] = k % 5; }
        var before = (float[])re.Clone();
        new InverseFft(n).Columns(re, im, 8, 16);
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
                if (j is < 8 or >= 16) Assert.Equal(before[i * n + j], re[i * n + j]);
        Assert.NotEqual(before[8], re[8]); // row 0 of a transformed column is the column's sum
        Assert.Throws<ArgumentException>(() => new InverseFft(n).Columns(re, im, 0, 3));
    }

    // The batched Box-Muller pairs against the scalar ones, counter by counter, to 1e-12 (the vectorised logarithm and
    // sine differ from the C library's by an ulp or so), including a short last block; and each pair is its counter's
    // alone: the same counter gives the same pair wherever it sits in a batch.
    [Fact]
    public void BatchedNormalPairsMatchTheScalarOnes()
    {
        var rng = new CounterRng(42, CounterRng.Streams.WindGustU);
        var counters = Enumerable.Range(0, 1003).Select(k => (ulong)(k * 37 + 5)).ToArray();
        var a = new double[counters.Length]; var b = new double[counters.Length];
        rng.NormalPairs(counters, a, b);
        for (int k = 0; k < counters.Length; k++)
        {
            var (x, y) = rng.NormalPair(counters[k]);
            Assert.Equal(x, a[k], 1e-12);
            Assert.Equal(y, b[k], 1e-12);
        }
        var a2 = new double[3]; var b2 = new double[3];
        rng.NormalPairs(counters.AsSpan(500, 3), a2, b2);
        Assert.Equal(a[500..503], a2);
        Assert.Equal(b[500..503], b2);
    }
}
