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
    int[] _bucketStart = [], _fill = [];
    readonly int[] _sorted, _ci, _cj;
    int _mask, _count;

    /// <summary>Pairs (a, b) within <see cref="RangeM"/>, in canonical order.</summary>
    public readonly List<(int A, int B)> Near = new();
    /// <summary>Pairs within the contact watch distance.</summary>
    public readonly List<(int A, int B)> Close = new();
    /// <summary>Each board's distance to its nearest live neighbour, m (+infinity when none within range).</summary>
    public readonly double[] NearestM;
    int[] _adjStart, _adj = new int[64];

    public double RangeM { get; }

    public NeighbourGrid(int boards, double rangeM)
    {
        _n = boards; RangeM = rangeM; CellM = rangeM;
        _sorted = new int[boards]; _ci = new int[boards]; _cj = new int[boards];
        NearestM = new double[boards];
        _adjStart = new int[boards + 1];
    }

    /// <summary>The neighbours of board b within range (canonical order).</summary>
    public ReadOnlySpan<int> Neighbours(int b) => new(_adj, _adjStart[b], _adjStart[b + 1] - _adjStart[b]);

    static int Hash(int i, int j, int mask) => (int)(((uint)i * 0x9E3779B1u) ^ ((uint)j * 0x85EBCA77u)) & mask;
    int Cell(double v) => (int)Math.Floor(Math.Clamp(v / CellM, -1e9, 1e9));

    /// <summary>Rebuilds from the snapshot's live boards and lists the pairs within range and within <paramref name="closeM"/>.</summary>
    public void Build(StepSnapshot s, int[] byRank, double closeM)
    {
        int buckets = 64;
        while (buckets < 2 * _n) buckets *= 2;
        _mask = buckets - 1;
        if (_bucketStart.Length < buckets + 1) { _bucketStart = new int[buckets + 1]; _fill = new int[buckets]; }
        else Array.Clear(_bucketStart, 0, buckets + 1);
        _count = 0;
        for (int r = 0; r < byRank.Length; r++)
        {
            int b = byRank[r];
            NearestM[b] = double.PositiveInfinity;
            if (!s.Live[b]) continue;
            _ci[b] = Cell(s.X[b]); _cj[b] = Cell(s.Y[b]);
            _bucketStart[Hash(_ci[b], _cj[b], _mask) + 1]++;
            _count++;
        }
        for (int k = 0; k < buckets; k++) _bucketStart[k + 1] += _bucketStart[k];
        Array.Copy(_bucketStart, _fill, buckets);
        for (int r = 0; r < byRank.Length; r++)
        {
            int b = byRank[r];
            if (s.Live[b]) _sorted[_fill[Hash(_ci[b], _cj[b], _mask)]++] = b;
        }
        Near.Clear(); Close.Clear();
        double range2 = RangeM * RangeM;
        for (int r = 0; r < byRank.Length; r++)
        {
            int a = byRank[r];
            if (!s.Live[a]) continue;
            for (int dj = -1; dj <= 1; dj++)
                for (int di = -1; di <= 1; di++)
                {
                    int ci = _ci[a] + di, cj = _cj[a] + dj;
                    int h = Hash(ci, cj, _mask);
                    for (int k = _bucketStart[h], end = _bucketStart[h + 1]; k < end; k++)
                    {
                        int c = _sorted[k];
                        // Each pair once: from the board earlier in the canonical order.
                        if (_ci[c] != ci || _cj[c] != cj || Rank(c, byRank) <= r) continue;
                        double dx = s.X[a] - s.X[c], dy = s.Y[a] - s.Y[c], d2 = dx * dx + dy * dy;
                        if (d2 > range2) continue;
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
        foreach (var (a, c) in Near) { _adjStart[a + 1]++; _adjStart[c + 1]++; }
        for (int b = 0; b < _n; b++) _adjStart[b + 1] += _adjStart[b];
        if (_adj.Length < 2 * Near.Count) _adj = new int[Math.Max(64, 4 * Near.Count)];
        if (_fill.Length < _n) _fill = new int[Math.Max(_n, buckets)];
        Array.Copy(_adjStart, _fill, _n);
        foreach (var (a, c) in Near) { _adj[_fill[a]++] = c; _adj[_fill[c]++] = a; }
    }

    int[]? _rankOf;
    int Rank(int b, int[] byRank)
    {
        if (_rankOf is null || _rankOf.Length != byRank.Length)
        {
            _rankOf = new int[byRank.Length];
            for (int r = 0; r < byRank.Length; r++) _rankOf[byRank[r]] = r;
        }
        return _rankOf[b];
    }

    /// <summary>Copies the pair lists and distances of another grid of the same fleet (for a checkpoint).</summary>
    public void CopyFrom(NeighbourGrid o)
    {
        Near.Clear(); Near.AddRange(o.Near); Close.Clear(); Close.AddRange(o.Close);
        Array.Copy(o.NearestM, NearestM, _n);
        _adjStart = (int[])o._adjStart.Clone(); _adj = (int[])o._adj.Clone();
    }
}
