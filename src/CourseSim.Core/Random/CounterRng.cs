namespace CourseSim.Random;

/// <summary>
/// A counter-based random generator: every number is a pure function of (seed, stream, counter), so results do not depend
/// on thread count or query order. The mixing function is SplitMix64's finaliser (Steele, Lea and Flood 2014, "Fast
/// splittable pseudorandom number generators", OOPSLA), applied to a combination of the three keys.
/// </summary>
public readonly record struct CounterRng(ulong Seed, ulong Stream)
{
    /// <summary>Well-known streams, so variants of an experiment can share one (the wind) while differing in others.</summary>
    public static class Streams
    {
        public const ulong WindShifts = 0x5717_0001, WindGustU = 0x5717_0002, WindGustV = 0x5717_0003, Tiles = 0x5717_0004;
        public const ulong Sensing = 0x5E45_0000, Tactics = 0x7AC7_0000, Falls = 0xFA11_0000;
    }

    /// <summary>A sub-stream for one board or purpose: (seed, stream, index).</summary>
    public CounterRng For(ulong index) => new(Seed, Mix(Stream ^ Mix(index + 0x632BE59BD9B4E019UL)));

    public static ulong Mix(ulong z)
    {
        z += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    public ulong Bits(ulong counter) => BitsOf(StreamKey, counter);

    /// <summary>What <see cref="Bits"/> mixes each counter with: the seed and stream, combined.</summary>
    ulong StreamKey => Mix(Seed ^ 0xD1B54A32D192ED03UL) ^ Mix(Stream + 0x8CB92BA72F3D8DD7UL);

    static ulong BitsOf(ulong streamKey, ulong counter) => Mix(streamKey ^ counter * 0x9E3779B97F4A7C15UL);

    /// <summary>Uniform on [0, 1) with 53 random bits.</summary>
    public double Uniform(ulong counter) => ToUniform(Bits(counter));

    static double ToUniform(ulong bits) => (bits >> 11) * (1.0 / 9007199254740992.0);

    /// <summary>Two independent standard normals from one Box-Muller pair (uniforms at counters 2c and 2c+1): half the cost of two <see cref="Normal"/> calls.</summary>
    public (double A, double B) NormalPair(ulong counter)
    {
        double u1 = 1.0 - Uniform(2 * counter), u2 = Uniform(2 * counter + 1);
        double r = Math.Sqrt(-2.0 * Math.Log(u1));
        var (sn, cs) = Math.SinCos(2 * Math.PI * u2);
        return (r * cs, r * sn);
    }

    /// <summary>
    /// <see cref="NormalPair"/> for many counters at once: pair k from <paramref name="counters"/>[k] into
    /// <paramref name="a"/>[k] and <paramref name="b"/>[k]. The same uniforms and the same Box-Muller transform, four at
    /// a time with .NET's vectorised logarithm, sine and cosine (<see cref="System.Runtime.Intrinsics.Vector256"/>), not
    /// the C library's: the values agree with <see cref="NormalPair"/>'s to rounding (the test measures it), not bit for
    /// bit, and each value depends on its counter alone, never on its neighbours in the batch.
    /// </summary>
    public void NormalPairs(ReadOnlySpan<ulong> counters, Span<double> a, Span<double> b)
    {
        if (a.Length < counters.Length || b.Length < counters.Length) throw new ArgumentException("output spans shorter than the counters");
        ulong key = StreamKey; // worked out once for the batch
        Span<double> u1 = stackalloc double[4], u2 = stackalloc double[4];
        for (int k0 = 0; k0 < counters.Length; k0 += 4)
        {
            int n = Math.Min(4, counters.Length - k0);
            for (int q = 0; q < 4; q++)
            {
                ulong c = counters[k0 + Math.Min(q, n - 1)]; // a short last block repeats its last counter
                u1[q] = 1.0 - ToUniform(BitsOf(key, 2 * c));
                u2[q] = ToUniform(BitsOf(key, 2 * c + 1));
            }
            var v1 = System.Runtime.Intrinsics.Vector256.Create<double>(u1);
            var v2 = System.Runtime.Intrinsics.Vector256.Create<double>(u2);
            var r = System.Runtime.Intrinsics.Vector256.Sqrt(System.Runtime.Intrinsics.Vector256.Log(v1) * -2.0);
            var (sn, cs) = System.Runtime.Intrinsics.Vector256.SinCos(v2 * (2 * Math.PI));
            var va = r * cs; var vb = r * sn;
            for (int q = 0; q < n; q++) { a[k0 + q] = va[q]; b[k0 + q] = vb[q]; }
        }
    }

    /// <summary>Standard normal (Box-Muller on counters 2c and 2c+1).</summary>
    public double Normal(ulong counter)
    {
        double u1 = 1.0 - Uniform(2 * counter), u2 = Uniform(2 * counter + 1);
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
