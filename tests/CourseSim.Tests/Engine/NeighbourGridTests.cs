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
        // 120 boards on a 3 m spacing in a wavy line (about 66 within 100 m of a board mid-line), and the same boards
        // spread 20 m apart (at most 10 within range): distances all distinct.
        var rng = new System.Random(5);
        foreach (double spacing in new[] { 3.0, 20.0 })
        {
            var at = Enumerable.Range(0, 120).Select(i => (X: i * spacing + rng.NextDouble() * 0.5, Y: 5 * Math.Sin(i * 0.7) + rng.NextDouble())).ToList();
            var byRank = Enumerable.Range(0, at.Count).Reverse().ToArray(); // canonical order is not the index order
            var rank = new int[at.Count]; for (int r = 0; r < byRank.Length; r++) rank[byRank[r]] = r;
            var grid = new NeighbourGrid(at.Count, 100);
            grid.Build(Snap(at), byRank, 10);
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
            if (spacing == 3.0) Assert.Equal(NeighbourGrid.MaxNeighbours, grid.Neighbours(60).Length);
            else Assert.True(BruteNearest(at, rank, 60, 100, int.MaxValue).SetEquals(grid.Neighbours(60).ToArray())); // all within range (4-5 a side)
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
}
