using CourseSim.Engine;
using Xunit;

namespace CourseSim.Tests.Engine;

/// <summary>The rules' pair rows (foreseen conflicts, boards touching), which replaced a dictionary in the lookout's per-neighbour loop (issue 17, item 6).</summary>
public class PairRowsTests
{
    /// <summary>
    /// 20,000 random adds, sets, removes and row trims over 12 boards, from rows with room for 2 (so rows fill and grow several
    /// times), answer every look-up as a dictionary keyed by the pair does; a copy taken midway keeps its own entries.
    /// </summary>
    [Fact]
    public void RandomOperationsAnswerAsADictionaryDoesThroughGrowthAndCopies()
    {
        const int n = 12;
        var rows = new PairRows<int>(n, 2);
        var model = new Dictionary<(int, int), int>();
        var rng = new System.Random(17);
        PairRows<int>? copy = null; Dictionary<(int, int), int>? copyModel = null;
        for (int step = 0; step < 20_000; step++)
        {
            int a = rng.Next(n), b = rng.Next(n), v = rng.Next(1000);
            switch (rng.Next(5))
            {
                case 0: rows.Set(a, b, v); model[(a, b)] = v; break;
                case 1: Assert.Equal(model.TryAdd((a, b), v), rows.Add(a, b, v)); break;
                case 2: Assert.Equal(model.Remove((a, b)), rows.Remove(a, b)); break;
                case 3 when step % 7 == 0:
                {
                    // Keep only the entries of row a whose other board is in a random set (the lookout's neighbours).
                    int[] keep = Enumerable.Range(0, n).Where(_ => rng.Next(3) != 0).ToArray();
                    var gone = model.Keys.Where(k => k.Item1 == a && !keep.Contains(k.Item2)).ToList();
                    foreach (var k in gone) model.Remove(k);
                    Assert.Equal(gone.Count, rows.KeepOnly(a, keep));
                    break;
                }
                default:
                    Assert.Equal(model.TryGetValue((a, b), out int want), rows.TryGet(a, b, out int got));
                    Assert.Equal(want, got);
                    Assert.Equal(model.ContainsKey((a, b)), rows.Contains(a, b));
                    break;
            }
            Assert.Equal(model.Count, rows.Count);
            if (step == 10_000) { copy = new PairRows<int>(rows); copyModel = new(model); }
        }
        for (int a = 0; a < n; a++)
        {
            Assert.Equal(model.Keys.Count(k => k.Item1 == a), rows.RowCount(a));
            for (int b = 0; b < n; b++)
            {
                Assert.Equal(copyModel!.TryGetValue((a, b), out int want), copy!.TryGet(a, b, out int got));
                Assert.Equal(want, got);
            }
        }
    }
}
