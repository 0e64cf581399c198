namespace CourseSim.Engine;

/// <summary>
/// The fleet's neighbour grid: square cells of <see cref="CellM"/> hashed into about twice as many buckets as boards and
/// filled by counting sort, so a rebuild is O(N) however far the fleet spreads, with no allocation once sized. Boards go
/// in in the canonical order (<see cref="Fleet.ByRank"/>), so every bucket lists them in that order and every pair list
/// built from the grid has one order whatever the order of the scenario file. From the grid come the pairs within the
/// lookout range (with each board's neighbour list, compressed rows), the pairs close enough to touch before the next
/// rebuild, and each board's nearest neighbour.
/// </summary>
public sealed class NeighbourGrid
{
    public double CellM { get; }
    readonly int _n;
    // The boards in cells of the lookout range (counting sort; see CellHash), rebuilt at each lookout.
    readonly CellHash _cells;
    int[] _fill;

    /// <summary>Pairs (a, b) within <see cref="RangeM"/>, in canonical order.</summary>
    public readonly List<(int A, int B)> Near;
    /// <summary>Pairs within the contact watch distance.</summary>
    public readonly List<(int A, int B)> Close;
    /// <summary>Each board's distance to its nearest live neighbour, m (+infinity when none within range).</summary>
    public readonly double[] NearestM;
    int[] _adjStart, _adj;

    public double RangeM { get; }

    public NeighbourGrid(int boards, double rangeM)
    {
        _n = boards; RangeM = rangeM; CellM = rangeM;
        _cells = new CellHash(rangeM);
        NearestM = new double[boards];
        _adjStart = new int[boards + 1];
        _fill = new int[boards];
        // Room up front for a bunched start (the 40-board demo's countdown grew these to about 25 pairs a board), so
        // the step does not grow them; they still grow, once, for a denser fleet.
        Near = new(32 * Math.Max(1, boards)); Close = new(4 * Math.Max(1, boards));
        _adj = new int[Math.Max(64, 64 * boards)];
    }

    /// <summary>The neighbours of board b within range (canonical order).</summary>
    public ReadOnlySpan<int> Neighbours(int b) => new(_adj, _adjStart[b], _adjStart[b + 1] - _adjStart[b]);

    /// <summary>Rebuilds from the snapshot's live boards and lists the pairs within range and within <paramref name="closeM"/>.</summary>
    public void Build(StepSnapshot s, int[] byRank, double closeM)
    {
        _cells.Build(s, byRank);
        Near.Clear(); Close.Clear();
        double range2 = RangeM * RangeM;
        for (int r = 0; r < byRank.Length; r++) NearestM[byRank[r]] = double.PositiveInfinity;
        for (int r = 0; r < byRank.Length; r++)
        {
            int a = byRank[r];
            if (!s.Live[a]) continue;
            double xa = s.X[a], ya = s.Y[a];
            int ai = _cells.CellI(a), aj = _cells.CellJ(a);
            for (int dj = -1; dj <= 1; dj++)
                for (int di = -1; di <= 1; di++)
                {
                    int ci = ai + di, cj = aj + dj;
                    var bucket = _cells.Bucket(ci, cj);
                    // Each pair once: from the board earlier in the canonical order. A bucket lists its boards in rank
                    // order, so those at or before a in that order are a prefix, skipped by bisection (the same pairs
                    // in the same order as testing each rank).
                    int lo = 0, hi = bucket.Length;
                    while (lo < hi) { int mid = (lo + hi) >> 1; if (bucket[mid].Rank <= r) lo = mid + 1; else hi = mid; }
                    foreach (ref readonly var e in bucket[lo..])
                    {
                        if (e.Ci != ci || e.Cj != cj) continue;
                        double dx = xa - e.X, dy = ya - e.Y, d2 = dx * dx + dy * dy;
                        if (d2 > range2) continue;
                        int c = e.Board;
                        double d = Math.Sqrt(d2);
                        Near.Add((a, c));
                        if (d < closeM) Close.Add((a, c));
                        if (d < NearestM[a]) NearestM[a] = d;
                        if (d < NearestM[c]) NearestM[c] = d;
                    }
                }
        }
        // Each board's neighbours (compressed rows), so a rider's lookout walks only its own pairs.
        Array.Clear(_adjStart);
        var near = System.Runtime.InteropServices.CollectionsMarshal.AsSpan(Near);
        foreach (var (a, c) in near) { _adjStart[a + 1]++; _adjStart[c + 1]++; }
        for (int b = 0; b < _n; b++) _adjStart[b + 1] += _adjStart[b];
        if (_adj.Length < 2 * near.Length) _adj = new int[Math.Max(64, 4 * near.Length)];
        Array.Copy(_adjStart, _fill, _n);
        foreach (var (a, c) in near) { _adj[_fill[a]++] = c; _adj[_fill[c]++] = a; }
    }

    /// <summary>Copies the pair lists and distances of another grid of the same fleet (for a checkpoint).</summary>
    public void CopyFrom(NeighbourGrid o)
    {
        Near.Clear(); Near.AddRange(o.Near); Close.Clear(); Close.AddRange(o.Close);
        Array.Copy(o.NearestM, NearestM, _n);
        _adjStart = (int[])o._adjStart.Clone(); _adj = (int[])o._adj.Clone();
    }
}
