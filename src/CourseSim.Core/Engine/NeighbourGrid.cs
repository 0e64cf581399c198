namespace CourseSim.Engine;

/// <summary>
/// The fleet's neighbour grid: square cells of <see cref="CellM"/> hashed into about twice as many buckets as boards and
/// filled by counting sort, so a rebuild is O(N) however far the fleet spreads, with no allocation once sized. Boards go
/// in in the canonical order (<see cref="Fleet.ByRank"/>), so every bucket lists them in that order and every pair list
/// built from the grid has one order whatever the order of the scenario file. From the grid come the pairs within the
/// lookout range, each board's neighbour list (compressed rows: at most <see cref="MaxNeighbours"/>, the nearest), the
/// pairs close enough to touch before the next rebuild (all of them), and each board's nearest neighbour.
/// </summary>
public sealed class NeighbourGrid
{
    public double CellM { get; }
    /// <summary>
    /// Most boards a rider's neighbour list holds: the nearest this many within range (distance, then the canonical
    /// order on a tie), so the rules' per-rider work stops growing with how densely the fleet packs. Crowd models bound
    /// each agent's neighbours the same way (the RVO2 library's maxNeighbors, default 10; from memory). Model value: 16
    /// is about the mean count within range in the 40-board demo's countdown (17.6) and first minute (15.4), and about
    /// twice the mean later in its race (7.5); the 2,000-board benchmark fleet on a 5 m spacing has about 38.
    /// </summary>
    public const int MaxNeighbours = 16;
    readonly int _n;
    // The boards in cells of the lookout range (counting sort; see CellHash), rebuilt at each lookout.
    readonly CellHash _cells;
    int[] _fill;

    /// <summary>Pairs (a, b) within <see cref="RangeM"/>, in canonical order.</summary>
    public readonly List<(int A, int B, double D)> Near;
    /// <summary>Pairs within the contact watch distance.</summary>
    public readonly List<(int A, int B)> Close;
    /// <summary>Each board's distance to its nearest live neighbour, m (+infinity when none within range).</summary>
    public readonly double[] NearestM;
    int[] _adjStart, _adjLen, _adj, _rank;
    // Each row entry's key for picking the nearest: the distance in single precision (its bits order as the values
    // do, distances being positive) above the neighbour's canonical rank (unique keys; ties go by rank).
    ulong[] _adjK;
    // Scratch for picking the nearest of a long row.
    ulong[] _pick = new ulong[64];

    public double RangeM { get; }

    public NeighbourGrid(int boards, double rangeM)
    {
        _n = boards; RangeM = rangeM; CellM = rangeM;
        _cells = new CellHash(rangeM);
        NearestM = new double[boards];
        _adjStart = new int[boards + 1]; _adjLen = new int[boards]; _rank = new int[boards];
        _fill = new int[boards];
        // Room up front for a bunched start (the 40-board demo's countdown grew these to about 25 pairs a board), so
        // the step does not grow them; they still grow, once, for a denser fleet.
        Near = new(32 * Math.Max(1, boards)); Close = new(4 * Math.Max(1, boards));
        _adj = new int[Math.Max(64, 64 * boards)]; _adjK = new ulong[_adj.Length];
    }

    /// <summary>The neighbours of board b within range: all of them, or the nearest <see cref="MaxNeighbours"/> (in the order the pairs were found, rank order).</summary>
    public ReadOnlySpan<int> Neighbours(int b) => new(_adj, _adjStart[b], _adjLen[b]);

    /// <summary>Rebuilds from the snapshot's live boards and lists the pairs within range and within <paramref name="closeM"/>.</summary>
    public void Build(StepSnapshot s, int[] byRank, double closeM)
    {
        _cells.Build(s, byRank);
        Near.Clear(); Close.Clear();
        double range2 = RangeM * RangeM;
        for (int r = 0; r < byRank.Length; r++) { NearestM[byRank[r]] = double.PositiveInfinity; _rank[byRank[r]] = r; }
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
                        Near.Add((a, c, d));
                        if (d < closeM) Close.Add((a, c));
                        if (d < NearestM[a]) NearestM[a] = d;
                        if (d < NearestM[c]) NearestM[c] = d;
                    }
                }
        }
        // Each board's neighbours (compressed rows), so a rider's lookout walks only its own pairs.
        Array.Clear(_adjStart);
        var near = System.Runtime.InteropServices.CollectionsMarshal.AsSpan(Near);
        foreach (var (a, c, _) in near) { _adjStart[a + 1]++; _adjStart[c + 1]++; }
        for (int b = 0; b < _n; b++) _adjStart[b + 1] += _adjStart[b];
        if (_adj.Length < 2 * near.Length) { _adj = new int[Math.Max(64, 4 * near.Length)]; _adjK = new ulong[_adj.Length]; }
        Array.Copy(_adjStart, _fill, _n);
        for (int p = 0; p < near.Length; p++)
        {
            var (a, c, d) = near[p];
            ulong dk = (ulong)BitConverter.SingleToUInt32Bits((float)d) << 32;
            _adjK[_fill[a]] = dk | (uint)_rank[c]; _adj[_fill[a]++] = c;
            _adjK[_fill[c]] = dk | (uint)_rank[a]; _adj[_fill[c]++] = a;
        }
        for (int b = 0; b < _n; b++) _adjLen[b] = Keep(_adjStart[b], _adjStart[b + 1] - _adjStart[b]);
    }

    /// <summary>
    /// Cuts a row longer than <see cref="MaxNeighbours"/> to its nearest, in place and in its order; returns its length.
    /// Nearest by one 64-bit key: the distance rounded to single precision (its bits order as the values do, distances
    /// being positive) above the board's canonical rank, so ties (within a few micrometres at 100 m) go by rank and the
    /// keys are unique: a deterministic choice whatever the file's order.
    /// </summary>
    int Keep(int start, int len)
    {
        if (len <= MaxNeighbours) return len;
        if (_pick.Length < len) _pick = new ulong[2 * len];
        Array.Copy(_adjK, start, _pick, 0, len);
        ulong cut = NthSmallest(_pick, len, MaxNeighbours - 1);
        int w = start;
        for (int i = start; i < start + len; i++)
        {
            if (_adjK[i] > cut) continue;
            _adjK[w] = _adjK[i]; _adj[w++] = _adj[i];
        }
        return w - start;
    }

    /// <summary>The k-th smallest (0-based) of the first n keys (Hoare's selection, middle pivot; reorders them): O(n) on average.</summary>
    static ulong NthSmallest(ulong[] a, int n, int k)
    {
        int lo = 0, hi = n - 1;
        while (lo < hi)
        {
            ulong pivot = a[(lo + hi) >> 1];
            int i = lo, j = hi;
            while (i <= j)
            {
                while (a[i] < pivot) i++;
                while (a[j] > pivot) j--;
                if (i <= j) { (a[i], a[j]) = (a[j], a[i]); i++; j--; }
            }
            if (k <= j) hi = j; else if (k >= i) lo = i; else break;
        }
        return a[k];
    }

    /// <summary>Copies the pair lists and distances of another grid of the same fleet (for a checkpoint).</summary>
    public void CopyFrom(NeighbourGrid o)
    {
        Near.Clear(); Near.AddRange(o.Near); Close.Clear(); Close.AddRange(o.Close);
        Array.Copy(o.NearestM, NearestM, _n);
        _adjStart = (int[])o._adjStart.Clone(); _adjLen = (int[])o._adjLen.Clone(); _adj = (int[])o._adj.Clone(); _adjK = (ulong[])o._adjK.Clone();
    }
}
