namespace CourseSim.Engine;

/// <summary>
/// The fleet's neighbour grid: square cells of <see cref="CellM"/> hashed into about twice as many buckets as boards and
/// filled by counting sort, so a rebuild is O(N) however far the fleet spreads, with no allocation once sized. Boards go
/// in in the canonical order (<see cref="Fleet.ByRank"/>), so every bucket lists them in that order and every list
/// built from the grid has one order whatever the order of the scenario file. From the grid come each board's neighbour
/// list (at most <see cref="MaxNeighbours"/>, the nearest within the lookout range), the pairs close enough to touch
/// before the next rebuild (all of them), and each board's nearest neighbour.
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

    /// <summary>Pairs within the contact watch distance (each once, from the board earlier in the canonical order).</summary>
    public readonly List<(int A, int B)> Close;
    /// <summary>Each board's distance to its nearest live neighbour, m (+infinity when none within range).</summary>
    public readonly double[] NearestM;
    /// <summary>Pairs within <see cref="RangeM"/> at the last build (each pair once), for the benchmark's work counts.</summary>
    public int PairsInRange { get; private set; }
    // The rows (each board's kept neighbours) one after another, board b's at _adjStart[b], _adjLen[b] long.
    int[] _adjStart, _adjLen, _adj, _rank;
    // Scratch for one board's candidates: the neighbour, and its key for picking the nearest (the distance in single
    // precision, whose bits order as the values do, distances being positive, above the neighbour's canonical rank:
    // unique keys, ties go by rank). Earlier-ranked candidates and later ones apart (see Build).
    int[] _eId = new int[64], _lId = new int[64];
    ulong[] _eKey = new ulong[64], _lKey = new ulong[64], _pick = new ulong[128];

    public double RangeM { get; }

    public NeighbourGrid(int boards, double rangeM)
    {
        _n = boards; RangeM = rangeM; CellM = rangeM;
        _cells = new CellHash(rangeM, boards);
        NearestM = new double[boards];
        _adjStart = new int[boards]; _adjLen = new int[boards]; _rank = new int[boards];
        // Room up front for a bunched start (the 40-board demo's countdown reached about 25 pairs a board), so the step
        // does not grow it; it still grows, once, for a denser fleet.
        Close = new(4 * Math.Max(1, boards));
        _adj = new int[MaxNeighbours * Math.Max(1, boards) + 256];
    }

    /// <summary>The neighbours of board b within range: all of them, or the nearest <see cref="MaxNeighbours"/>, in the
    /// order of <see cref="Build"/>.</summary>
    public ReadOnlySpan<int> Neighbours(int b) => new(_adj, _adjStart[b], _adjLen[b]);

    /// <summary>
    /// Rebuilds from the snapshot's live boards: each board's neighbours within range (kept to the nearest
    /// <see cref="MaxNeighbours"/>), its nearest neighbour's distance, and the pairs within <paramref name="closeM"/>.
    /// Board by board in the canonical order, each looks into the 3 x 3 cells round its own. A row lists the
    /// neighbours earlier in the canonical order first, in that order, then the later ones in the order the cells are
    /// walked (row of cells by row, each cell's boards in canonical order); the close pairs come from each board's later
    /// neighbours in the same walk. (This is the order the grid had when it listed every pair within range first and
    /// built the rows from that list, which it no longer makes: the same rows, so the same bits.) Each pair's distance
    /// is worked out from both ends, with the same bits: x_a - x_b is exactly -(x_b - x_a).
    /// </summary>
    public void Build(StepSnapshot s, int[] byRank, double closeM)
    {
        _cells.Build(s, byRank);
        Close.Clear();
        double range2 = RangeM * RangeM;
        int n = byRank.Length, fill = 0, pairs = 0;
        for (int r = 0; r < n; r++) _rank[byRank[r]] = r;
        for (int r = 0; r < n; r++)
        {
            int a = byRank[r];
            _adjStart[a] = fill; _adjLen[a] = 0; NearestM[a] = double.PositiveInfinity;
            if (!s.Live[a]) continue;
            double xa = s.X[a], ya = s.Y[a], nearest = double.PositiveInfinity;
            int ai = _cells.CellI(a), aj = _cells.CellJ(a), ne = 0, nl = 0;
            for (int dj = -1; dj <= 1; dj++)
                for (int di = -1; di <= 1; di++)
                {
                    int ci = ai + di, cj = aj + dj;
                    foreach (ref readonly var e in _cells.Bucket(ci, cj))
                    {
                        if (e.Ci != ci || e.Cj != cj || e.Rank == r) continue;
                        double dx = xa - e.X, dy = ya - e.Y, d2 = dx * dx + dy * dy;
                        if (d2 > range2) continue;
                        double d = Math.Sqrt(d2);
                        if (d < nearest) nearest = d;
                        ulong key = (ulong)BitConverter.SingleToUInt32Bits((float)d) << 32 | (uint)e.Rank;
                        if (e.Rank < r) { Room(ref _eId, ref _eKey, ne); _eId[ne] = e.Board; _eKey[ne++] = key; continue; }
                        Room(ref _lId, ref _lKey, nl); _lId[nl] = e.Board; _lKey[nl++] = key;
                        pairs++;
                        if (d < closeM) Close.Add((a, e.Board));
                    }
                }
            NearestM[a] = nearest;
            // The earlier neighbours in canonical order (the key's low half is the rank): insertion sort of a few.
            for (int i = 1; i < ne; i++)
            {
                int id = _eId[i]; ulong k = _eKey[i]; uint rk = (uint)k;
                int j = i - 1;
                for (; j >= 0 && (uint)_eKey[j] > rk; j--) { _eId[j + 1] = _eId[j]; _eKey[j + 1] = _eKey[j]; }
                _eId[j + 1] = id; _eKey[j + 1] = k;
            }
            int len = ne + nl;
            if (_adj.Length < fill + Math.Min(len, MaxNeighbours)) Array.Resize(ref _adj, 2 * (fill + len));
            ulong cut = ulong.MaxValue;
            if (len > MaxNeighbours)
            {
                if (_pick.Length < len) _pick = new ulong[2 * len];
                Array.Copy(_eKey, 0, _pick, 0, ne); Array.Copy(_lKey, 0, _pick, ne, nl);
                cut = NthSmallest(_pick, len, MaxNeighbours - 1);
            }
            for (int i = 0; i < ne; i++) if (_eKey[i] <= cut) _adj[fill++] = _eId[i];
            for (int i = 0; i < nl; i++) if (_lKey[i] <= cut) _adj[fill++] = _lId[i];
            _adjLen[a] = fill - _adjStart[a];
        }
        PairsInRange = pairs;
    }

    /// <summary>Grows a candidate buffer (both columns) so index i fits: once, for a denser fleet than any before.</summary>
    static void Room(ref int[] ids, ref ulong[] keys, int i)
    {
        if (i < ids.Length) return;
        Array.Resize(ref ids, 2 * ids.Length); Array.Resize(ref keys, 2 * keys.Length);
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

    /// <summary>Copies the rows, close pairs and distances of another grid of the same fleet (for a checkpoint).</summary>
    public void CopyFrom(NeighbourGrid o)
    {
        Close.Clear(); Close.AddRange(o.Close);
        Array.Copy(o.NearestM, NearestM, _n);
        PairsInRange = o.PairsInRange;
        _adjStart = (int[])o._adjStart.Clone(); _adjLen = (int[])o._adjLen.Clone(); _adj = (int[])o._adj.Clone();
    }
}
