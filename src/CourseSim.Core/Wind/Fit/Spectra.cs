using System.Numerics;
using CourseSim.Random;
using MathNet.Numerics.IntegralTransforms;

namespace CourseSim.Wind.Fit;

/// <summary>A one-sided power spectral density: frequencies (Hz) and density (units^2 per Hz), with how many segments were averaged.</summary>
public sealed record Spectrum(double[] F, double[] P, int Segments);

/// <summary>
/// Spectral estimation and synthesis for the wind fit (docs/wind-fit.md).
/// Welch (1967), "The use of fast Fourier transform for the estimation of power spectra", IEEE Trans. Audio
/// Electroacoust. AU-15: Hann-windowed segments overlapping by half, periodograms averaged. One-sided density
/// P_k = 2 dt |sum x_j w_j e^(-2 pi i jk/n)|^2 / sum w_j^2, so sum_k P_k df is the variance.
/// </summary>
public static class Spectra
{
    /// <summary>Welch estimate with segments of <paramref name="n"/> samples (a power of two), mean removed per segment.</summary>
    public static Spectrum Welch(double[] x, double dt, int n)
    {
        n = Math.Min(n, HighestPow2(x.Length));
        var w = new double[n]; double w2 = 0;
        for (int j = 0; j < n; j++) { w[j] = 0.5 - 0.5 * Math.Cos(2 * Math.PI * j / n); w2 += w[j] * w[j]; }
        int half = n / 2;
        var acc = new double[half];
        var buf = new Complex[n];
        int segs = 0;
        for (int s = 0; s + n <= x.Length; s += n / 2)
        {
            double m = 0; for (int j = 0; j < n; j++) m += x[s + j]; m /= n;
            for (int j = 0; j < n; j++) buf[j] = new Complex((x[s + j] - m) * w[j], 0);
            Fourier.Forward(buf, FourierOptions.Matlab);
            for (int k = 1; k < half; k++) acc[k] += buf[k].Real * buf[k].Real + buf[k].Imaginary * buf[k].Imaginary;
            segs++;
        }
        var f = new double[half - 1]; var p = new double[half - 1];
        for (int k = 1; k < half; k++) { f[k - 1] = k / (n * dt); p[k - 1] = 2 * dt * acc[k] / (w2 * segs); }
        return new Spectrum(f, p, segs);
    }

    public static int HighestPow2(int n) { int p = 1; while (p * 2 <= n) p *= 2; return p; }

    /// <summary>
    /// The von Karman longitudinal spectrum (IEC 61400-1 ed. 3, annex B): S(f) = 4 sigma^2 T / (1 + 70.8 (f T)^2)^(5/6),
    /// T = L/U the integral time scale. It is also the spectrum along any line through CourseSim's 2-D gust field
    /// (docs/wind.md: the line integral of (1 + k^2 l^2)^(-4/3) over the cross wavenumber).
    /// </summary>
    public static double VonKarman(double f, double sigma2, double tInt) => 4 * sigma2 * tInt / Math.Pow(1 + 70.8 * (f * tInt) * (f * tInt), 5.0 / 6.0);

    /// <summary>
    /// What a station sampling every <paramref name="dt"/> s sees of the von Karman spectrum: with block means over
    /// <paramref name="avgS"/> s (0: instantaneous samples) the spectrum is multiplied by sinc^2(pi f T_avg), and
    /// sampling folds everything above the Nyquist frequency back into the band (aliasing):
    /// S_obs(f) = sum_m H(f + m/dt) S(|f + m/dt|), m = -M..M (Bendat and Piersol, Random Data, 4th ed. 2010, sec. 10.3, from memory).
    /// </summary>
    public static double Observed(double f, double sigma2, double tInt, double dt, double avgS)
    {
        double fs = 1 / dt, sum = 0;
        int m = avgS > 0 ? 12 : 24;
        for (int i = -m; i <= m; i++)
        {
            double g = Math.Abs(f + i * fs);
            double h = 1;
            if (avgS > 0 && g > 0) { double a = Math.PI * g * avgS; h = Math.Sin(a) / a; h *= h; }
            sum += h * VonKarman(g, sigma2, tInt);
        }
        if (avgS <= 0)
        {
            // Tail beyond |m| = M of an f^(-5/3) spectrum, both sides: integral of the asymptote.
            double fm = (m + 0.5) * fs;
            double c = 4 * sigma2 * tInt * Math.Pow(70.8 * tInt * tInt, -5.0 / 6.0);
            sum += 2 * c * 1.5 * Math.Pow(fm, -2.0 / 3.0) / fs;
        }
        return sum;
    }

    /// <summary>
    /// A stationary Gaussian series of <paramref name="n"/> samples at <paramref name="dt"/> with one-sided density
    /// <paramref name="density"/>(f): random complex amplitudes with E|X_k|^2 = S(f_k) N / (2 dt), Hermitian, inverse FFT
    /// (Shinozuka and Deodatis 1991, Appl. Mech. Rev. 44, spectral representation). Synthesised on twice the length so
    /// the ends do not wrap onto each other.
    /// </summary>
    public static double[] Synthesise(int n, double dt, Func<double, double> density, CounterRng rng)
    {
        int N = HighestPow2(2 * n); if (N < 2 * n) N *= 2;
        var buf = new Complex[N];
        for (int k = 1; k < N / 2; k++)
        {
            double v = density(k / (N * dt)) * N / (2 * dt);
            var (a, b) = rng.NormalPair((ulong)k);
            double s = Math.Sqrt(v / 2);
            buf[k] = new Complex(s * a, s * b);
            buf[N - k] = Complex.Conjugate(buf[k]);
        }
        Fourier.Inverse(buf, FourierOptions.Matlab);
        var x = new double[n];
        for (int i = 0; i < n; i++) x[i] = buf[i].Real;
        return x;
    }
}
