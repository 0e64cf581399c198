using CourseSim.Engine;
using Xunit;

namespace CourseSim.Tests.Engine;

/// <summary>The neighbour grid's bounded lists (issue 17: the rules' per-rider work must stop growing with fleet density).</summary>
public class NeighbourGridTests
{
    /// <summary>A snapshot of n live boards at the given positions.</summary>
    static StepSnapshot Snap(IReadOnlyList<(double X, double Y)> at)
    {
        var s = new StepSnapshot(at.Count);
        for (int b = 0; b < at.Count; b++) { s.X[b] = at[b].X; s.Y[b] = at[b].Y; s.Live[b] = true; }
        return s;
    }

    static double Dist(IReadOnlyList<(double X, double Y)> at, int a, int b) =>
        Math.Sqrt((at[a].X - at[b].X) * (at[a].X - at[b].X) + (at[a].Y - at[b].Y) * (at[a].Y - at[b].Y));

    static HashSet<int> BruteNearest(IReadOnlyList<(double X, double Y)> at, int[] rank, int b, double range, int k) =>
        Enumerable.Range(0, at.Count).Where(j => j != b)
            .Select(j => (j, d: Dist(at, j, b)))
            .Where(p => p.d <= range).OrderBy(p => p.d).ThenBy(p => rank[p.j]).Take(k).Select(p => p.j).ToHashSet();

    [Fact]
    public void ADenseFleetKeepsEachRidersNearestSixteenAndASparseOneKeepsAll()
    {
        // 120 boards on a 3 m spacing in a wavy line (about 66 within 100 m of a board mid-line: the first look, over half
        // the range, finds the nearest 16), on 7 m (about 14 within half the range, 28 within all of it: the second look
        // finds them) and 20 m apart (at most 10 within range): distances all distinct.
        var rng = new System.Random(5);
        foreach (double spacing in new[] { 3.0, 7.0, 20.0 })
        {
            var at = Enumerable.Range(0, 120).Select(i => (X: i * spacing + rng.NextDouble() * 0.5, Y: 5 * Math.Sin(i * 0.7) + rng.NextDouble())).ToList();
            var byRank = Enumerable.Range(0, at.Count).Reverse().ToArray(); // canonical order is not the index order
            var rank = new int[at.Count]; for (int r = 0; r < byRank.Length; r++) rank[byRank[r]] = r;
            var grid = new NeighbourGrid(at.Count, 100);
            // Built twice: the first build looks over the whole range; the second, where the nearest 16 were well within
            // half of it, looks there first. The lists must be the same either way.
            grid.Build(Snap(at), byRank, 10);
            var firstRows = Enumerable.Range(0, at.Count).Select(b => grid.Neighbours(b).ToArray()).ToList();
            var firstClose = grid.Close.ToList();
            int firstExamined = grid.CandidatesExamined;
            grid.Build(Snap(at), byRank, 10);
            Assert.Equal(firstClose, grid.Close);
            for (int b = 0; b < at.Count; b++) Assert.Equal(firstRows[b], grid.Neighbours(b).ToArray());
            if (spacing == 3.0) Assert.True(grid.CandidatesExamined < 0.7 * firstExamined, $"the first look over half the range examined {grid.CandidatesExamined} boards against {firstExamined}");
            else Assert.True(grid.CandidatesExamined >= firstExamined, "a sparse fleet looks over the whole range");
            for (int b = 0; b < at.Count; b++)
            {
                var want = BruteNearest(at, rank, b, 100, NeighbourGrid.MaxNeighbours);
                var got = grid.Neighbours(b).ToArray();
                Assert.Equal(got.Length, got.Distinct().Count());
                Assert.True(want.SetEquals(got), $"spacing {spacing}, board {b}: got {string.Join(",", got.Order())}, want {string.Join(",", want.Order())}");
                // The nearest neighbour distance is every board's within range, not only the kept ones'.
                double nearest = Enumerable.Range(0, at.Count).Where(j => j != b).Min(j => Dist(at, j, b));
                Assert.Equal(nearest, grid.NearestM[b], 9);
            }
            // Rows in canonical order, whichever look found them (half the range or all of it).
            for (int b = 0; b < at.Count; b++)
            {
                var row = grid.Neighbours(b).ToArray();
                Assert.True(row.Select(j => rank[j]).SequenceEqual(row.Select(j => rank[j]).Order()), $"spacing {spacing}, board {b}: row not in canonical order");
            }
            // The close pairs are every pair within the watch distance, each once, from the earlier-ranked board.
            var wantClose = new HashSet<(int, int)>();
            for (int a = 0; a < at.Count; a++)
                for (int b = 0; b < at.Count; b++)
                    if (a != b && rank[a] < rank[b] && Dist(at, a, b) < 10) wantClose.Add((a, b));
            Assert.Equal(wantClose.Count, grid.Close.Count);
            Assert.True(wantClose.SetEquals(grid.Close), $"spacing {spacing}: close pairs differ");
            if (spacing == 3.0) Assert.Equal(NeighbourGrid.MaxNeighbours, grid.Neighbours(60).Length);
            else if (spacing == 20.0) Assert.True(BruteNearest(at, rank, 60, 100, int.MaxValue).SetEquals(grid.Neighbours(60).ToArray())); // all within range (4-5 a side)
        }
    }

    [Fact]
    public void EveryCloseEnoughPairIsStillWatchedForContactWhateverTheCap()
    {
        // 40 boards within 4 m of one another: each has 39 within range, kept to 16, but every pair within the contact
        // watch distance stays in the close list (the contact judge must see every touching pair).
        var at = Enumerable.Range(0, 40).Select(i => (X: (i % 8) * 0.5, Y: (i / 8) * 0.6)).ToList();
        var byRank = Enumerable.Range(0, at.Count).ToArray();
        var grid = new NeighbourGrid(at.Count, 100);
        grid.Build(Snap(at), byRank, 18);
        Assert.Equal(40 * 39 / 2, grid.Close.Count);
        Assert.All(Enumerable.Range(0, 40), b => Assert.Equal(NeighbourGrid.MaxNeighbours, grid.Neighbours(b).Length));
    }

    /// <summary>
    /// A fleet that spreads out between builds: the boards try the first look over half the range (their nearest 16 were
    /// within 15 m at the last build), find fewer than 16 there, and must look over the whole range: the rows are the
    /// nearest 16 within range, as a brute-force search finds them.
    /// </summary>
    [Fact]
    public void AFleetThatSpreadsOutIsLookedAtOverTheWholeRangeAgain()
    {
        var rng = new System.Random(9);
        var dense = Enumerable.Range(0, 80).Select(i => (X: i * 1.5 + rng.NextDouble() * 0.2, Y: rng.NextDouble())).ToList();
        var spread = Enumerable.Range(0, 80).Select(i => (X: i * 7.0 + rng.NextDouble() * 0.5, Y: 3 * Math.Sin(i * 0.9) + rng.NextDouble())).ToList();
        var byRank = Enumerable.Range(0, 80).ToArray();
        var grid = new NeighbourGrid(80, 100);
        grid.Build(Snap(dense), byRank, 10);
        grid.Build(Snap(spread), byRank, 10);
        for (int b = 0; b < 80; b++)
        {
            var want = BruteNearest(spread, byRank, b, 100, NeighbourGrid.MaxNeighbours);
            Assert.True(want.SetEquals(grid.Neighbours(b).ToArray()), $"board {b}: got {string.Join(",", grid.Neighbours(b).ToArray().Order())}, want {string.Join(",", want.Order())}");
        }
        Assert.Equal(NeighbourGrid.MaxNeighbours, grid.Neighbours(40).Length); // 28 within range mid-line, 14 within half of it
    }
    /// <summary>
    /// Small fleets are measured all against all, four boards per vector: the rows, their order, the close pairs in order
    /// and the nearest distances must be the very bits the cell hashes give (fleets of 1 to 64, packed, strung out and
    /// with boards out of the race, in a canonical order that is not the index order; built twice, so the hashes' first
    /// look over half the range is compared too).
    /// </summary>
    [Fact]
    public void SmallFleetsGiveTheSameBitsAllAgainstAllAsThroughTheCells()
    {
        var rng = new System.Random(17);
        int compared = 0, capped = 0;
        foreach (int n in new[] { 1, 2, 3, 5, 8, 13, 20, 33, 40, 63, 64 })
            foreach (double spread in new[] { 6.0, 40.0, 400.0 })
            {
                var s = new StepSnapshot(n);
                for (int b = 0; b < n; b++) { s.X[b] = rng.NextDouble() * spread - 3000; s.Y[b] = rng.NextDouble() * spread * 0.3 + 1200; s.Live[b] = rng.NextDouble() > 0.1; }
                var byRank = Enumerable.Range(0, n).OrderBy(_ => rng.Next()).ToArray();
                var cells = new NeighbourGrid(n, 100, allPairsMax: 0);
                var all = new NeighbourGrid(n, 100);
                for (int pass = 0; pass < 2; pass++)
                {
                    cells.Build(s, byRank, 18); all.Build(s, byRank, 18);
                    Assert.Equal(cells.Close, all.Close);
                    for (int b = 0; b < n; b++)
                    {
                        Assert.Equal(cells.Neighbours(b).ToArray(), all.Neighbours(b).ToArray());
                        Assert.Equal(BitConverter.DoubleToInt64Bits(cells.NearestM[b]), BitConverter.DoubleToInt64Bits(all.NearestM[b]));
                        if (all.Neighbours(b).Length == NeighbourGrid.MaxNeighbours) capped++;
                    }
                    compared++;
                }
            }
        Assert.Equal(66, compared);
        Assert.True(capped > 0, "some rows were cut to the nearest 16");
    }
}
