using CourseSim.Engine;
using CourseSim.Random;
using CourseSim.Rules;

namespace CourseSim.Tests.Rules;

/// <summary>
/// The lookout's closest approaches, four boards per vector, against the one-at-a-time version: the same bits for every
/// board (so the races are the same whichever is used), including boards that hardly move against each other (the
/// 1e-9 guard), approaches already past (t clamped to 0) and beyond the look-ahead (clamped to 8 s), and short last blocks.
/// </summary>
public class BatchedApproachTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(4)]
    [InlineData(7)]
    [InlineData(16)]
    public void FourAtATimeGiveTheBitsOfOneAtATime(int count)
    {
        const int n = 40;
        var s = new StepSnapshot(n);
        var rng = new CounterRng(3, CounterRng.Streams.Tactics);
        for (int b = 0; b < n; b++)
        {
            s.X[b] = 400 * rng.Uniform((ulong)(6 * b)) - 200; s.Y[b] = 400 * rng.Uniform((ulong)(6 * b + 1)) - 200;
            double track = 2 * Math.PI * rng.Uniform((ulong)(6 * b + 2));
            (s.TrackSin[b], s.TrackCos[b]) = Math.SinCos(track);
            s.Speed[b] = b % 5 == 0 ? 0 : 12 * rng.Uniform((ulong)(6 * b + 3));
        }
        // Board 0 at rest and board 5 at rest too: their relative speed is 0 (the guard).
        int a = 0;
        var others = Enumerable.Range(1, count).Select(i => (i * 7) % n == 0 ? 5 : (i * 7) % n).ToArray();
        var t = new double[count]; var d = new double[count]; var cl = new double[count];
        int clampedLow = 0, clampedHigh = 0, still = 0;
        foreach (double va in new[] { 0.0, 3.5, 11 })
        {
            var (sin, cos) = Math.SinCos(0.7);
            Judge.CpaAndClosingAll(s, a, sin, cos, va, others, t, d, cl);
            for (int q = 0; q < count; q++)
            {
                var (t1, d1, c1) = Judge.CpaAndClosing(s, a, sin, cos, va, others[q]);
                Assert.Equal(BitConverter.DoubleToInt64Bits(t1), BitConverter.DoubleToInt64Bits(t[q]));
                Assert.Equal(BitConverter.DoubleToInt64Bits(d1), BitConverter.DoubleToInt64Bits(d[q]));
                Assert.Equal(BitConverter.DoubleToInt64Bits(c1), BitConverter.DoubleToInt64Bits(cl[q]));
                if (c1 < 1e-4) still++; else if (t1 == 0) clampedLow++; else if (t1 == Lookout.LookaheadS) clampedHigh++;
            }
        }
        if (count == 16)
        {
            // The cases above all occur in the widest batch.
            Assert.True(still > 0 && clampedLow > 0 && clampedHigh > 0, $"still {still}, past {clampedLow}, beyond {clampedHigh}");
        }
    }
}
