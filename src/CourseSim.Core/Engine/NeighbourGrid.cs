using System.Runtime.Intrinsics;

namespace CourseSim.Engine;

/// <summary>
/// The fleet's neighbour grid: square cells hashed into about twice as many buckets as boards and filled by counting
/// sort, so a rebuild is O(N) however far the fleet spreads, with no allocation once sized. Boards go in in the
/// canonical order (<see cref="Fleet.ByRank"/>), so every bucket lists them in that order and every list built from
/// the grid has one order whatever the order of the scenario file. From the grid come each board's neighbour list (at
/// most <see cref="MaxNeighbours"/>, the nearest within the lookout range, in canonical order), the pairs close enough
/// to touch before the next rebuild (all of them), and each board's nearest neighbour.
/// <para>
/// Two cell sizes: a board first looks into the 3 x 3 cells of half the lookout range round it (a quarter of the area
/// of the full range's 3 x 3 cells). Every board within half the range is there, so when it holds at least
/// <see cref="MaxNeighbours"/> of them, those nearest are the nearest of all, and the close pairs and the nearest
/// neighbour are among them too; only a board with fewer looks again over the full range. In a packed start or a
/// dense fleet most boards stop at the first look (the full range's cells held about 180 boards a board in the
/// 2,000-board benchmark's start).
/// </para>
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
    // The same boards in cells of half the range, for the first look.
    readonly CellHash _near;
    readonly double _nearM;
    // Each board's distance to its MaxNeighbours-th nearest at the last build (+infinity when fewer): a board takes the
    // first look over half the range only when that was well inside it, so a sparse fleet does not look twice. Which
    // look finds a board's neighbours changes nothing they are or the order they are listed in (see Build).
    readonly double[] _kth;

    /// <summary>Pairs within the contact watch distance (each once, from the board earlier in the canonical order).</summary>
    public readonly List<(int A, int B)> Close;
    /// <summary>Each board's distance to its nearest live neighbour, m (+infinity when none within range).</summary>
    public readonly double[] NearestM;
    /// <summary>Boards looked at (distances worked out) in the last build, for the benchmark's work counts.</summary>
    public int CandidatesExamined { get; private set; }
    // The rows (each board's kept neighbours) one after another, board b's at _adjStart[b], _adjLen[b] long.
    int[] _adjStart, _adjLen, _adj, _rank;
    // Scratch for one board's candidates: the neighbour, and its key for picking the nearest (the distance in single
    // precision, whose bits order as the values do, distances being positive, above the neighbour's canonical rank:
    // unique keys, ties go by rank); then the kept ones (at most MaxNeighbours) sorted into canonical order.
    int[] _eId = new int[64], _lId = new int[64];
    ulong[] _eKey = new ulong[64], _lKey = new ulong[64], _pick = new ulong[128];

    public double RangeM { get; }

    /// <summary>A grid for this many boards and lookout range; fleets of at most <paramref name="allPairsMax"/> boards
    /// are measured all against all (<see cref="AllPairsMax"/>; a test sets it to compare both ways).</summary>
    public NeighbourGrid(int boards, double rangeM, int allPairsMax = AllPairsMax)
    {
        _n = boards; RangeM = rangeM; CellM = rangeM; _allPairsMax = allPairsMax;
        if (boards <= allPairsMax) SizeAllPairs(boards); // now, so no step allocates
        _cells = new CellHash(rangeM, boards);
        _nearM = rangeM / 2;
        _near = new CellHash(_nearM, boards);
        _kth = new double[boards];
        Array.Fill(_kth, double.PositiveInfinity);
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
    /// <see cref="MaxNeighbours"/>, listed in canonical order), its nearest neighbour's distance, and the pairs within
    /// <paramref name="closeM"/> (each once, from the board earlier in the canonical order, in canonical order of both).
    /// Each pair's distance is worked out from both ends, with the same bits: x_a - x_b is exactly -(x_b - x_a). Every
    /// list is the same whichever look found it, so the choice of look (from the last build) changes no result, and a
    /// checkpoint need not keep it.
    /// </summary>
    public void Build(StepSnapshot s, int[] byRank, double closeM)
    {
        int n = byRank.Length, fill = 0, examined = 0;
        bool small = n <= _allPairsMax;
        if (small)
        {
            // A small fleet: every board against every other, four at a time, from positions in canonical order.
            SizeAllPairs(n);
            _liveCount = 0;
            for (int r = 0; r < n; r++) { int b = byRank[r]; _rx[r] = s.X[b]; _ry[r] = s.Y[b]; _rLive[r] = s.Live[b]; if (s.Live[b]) _liveCount++; }
        }
        else _cells.Build(s, byRank);
        double tryNear = !small && closeM <= _nearM ? NearTryShare * _nearM : -1;
        bool anyNear = false;
        if (tryNear >= 0)
            for (int r = 0; r < byRank.Length && !anyNear; r++) anyNear = s.Live[byRank[r]] && _kth[byRank[r]] <= tryNear;
        if (anyNear) _near.Build(s, byRank);
        Close.Clear();
        for (int r = 0; r < n; r++) _rank[byRank[r]] = r;
        for (int r = 0; r < n; r++)
        {
            int a = byRank[r];
            _adjStart[a] = fill; _adjLen[a] = 0; NearestM[a] = double.PositiveInfinity;
            if (!s.Live[a]) { _kth[a] = double.PositiveInfinity; continue; }
            int closeFrom = Close.Count;
            var (ne, nearest) = small ? LookAll(byRank, a, r, n, closeM, ref examined)
                : anyNear && _kth[a] <= tryNear ? Look(_near, s, a, r, _nearM, closeM, ref examined) : (0, double.PositiveInfinity);
            if (!small && ne < MaxNeighbours)
            {
                // Fewer than the cap within half the range (or no first look): look over the whole range, its close
                // pairs from scratch.
                if (Close.Count > closeFrom) Close.RemoveRange(closeFrom, Close.Count - closeFrom);
                (ne, nearest) = Look(_cells, s, a, r, RangeM, closeM, ref examined);
            }
            // This board's close pairs in canonical order of the other board, whichever look found them.
            for (int i = closeFrom + 1; i < Close.Count; i++)
            {
                var pr = Close[i]; int rk = _rank[pr.B], j = i - 1;
                for (; j >= closeFrom && _rank[Close[j].B] > rk; j--) Close[j + 1] = Close[j];
                Close[j + 1] = pr;
            }
            NearestM[a] = nearest;
            ulong cut = ulong.MaxValue;
            if (ne >= MaxNeighbours)
            {
                if (_pick.Length < ne) _pick = new ulong[2 * ne];
                Array.Copy(_eKey, 0, _pick, 0, ne);
                cut = NthSmallest(_pick, ne, MaxNeighbours - 1);
                _kth[a] = BitConverter.UInt32BitsToSingle((uint)(cut >> 32));
            }
            else _kth[a] = double.PositiveInfinity;
            // The kept ones in canonical order (the key's low half is the rank): insertion sort of a few.
            int kept = 0;
            for (int i = 0; i < ne; i++)
            {
                if (_eKey[i] > cut) continue;
                uint rk = (uint)_eKey[i];
                int j = kept - 1;
                for (; j >= 0 && (uint)_lKey[j] > rk; j--) { _lId[j + 1] = _lId[j]; _lKey[j + 1] = _lKey[j]; }
                _lId[j + 1] = _eId[i]; _lKey[j + 1] = _eKey[i];
                kept++;
            }
            if (_adj.Length < fill + kept) Array.Resize(ref _adj, 2 * (fill + kept));
            for (int i = 0; i < kept; i++) _adj[fill++] = _lId[i];
            _adjLen[a] = kept;
        }
        CandidatesExamined = examined;
    }

    /// <summary>A board takes the first look over half the range when its nearest <see cref="MaxNeighbours"/> were last
    /// within this share of it (so the first look usually finds them; a miss costs only a second look).</summary>
    const double NearTryShare = 0.9;

    /// <summary>
    /// Board a's candidates within <paramref name="range"/> in the 3 x 3 cells of <paramref name="cells"/> round it, into
    /// the candidate buffer (neighbour and key: the distance in single precision, whose bits order as the values do,
    /// above the rank), with the close pairs to later-ranked boards; how many, and the nearest distance.
    /// </summary>
    (int Count, double Nearest) Look(CellHash cells, StepSnapshot s, int a, int r, double range, double closeM, ref int examined)
    {
        double range2 = range * range, xa = s.X[a], ya = s.Y[a], nearest = double.PositiveInfinity;
        int ai = cells.CellI(a), aj = cells.CellJ(a), ne = 0;
        for (int dj = -1; dj <= 1; dj++)
            for (int di = -1; di <= 1; di++)
            {
                int ci = ai + di, cj = aj + dj;
                foreach (ref readonly var e in cells.Bucket(ci, cj))
                {
                    if (e.Ci != ci || e.Cj != cj || e.Rank == r) continue;
                    examined++;
                    double dx = xa - e.X, dy = ya - e.Y, d2 = dx * dx + dy * dy;
                    if (d2 > range2) continue;
                    Candidate(a, r, e.Board, e.Rank, Math.Sqrt(d2), closeM, ref ne, ref nearest);
                }
            }
        return (ne, nearest);
    }

    /// <summary>
    /// Fleets of at most this many boards skip the cell hashes: each board is measured against every other, four per
    /// <see cref="Vector256{T}"/> (SIMD across boards), in canonical order. Distances are the same expressions as a
    /// look's (x_a - x_b squared plus y_a - y_b squared, no fused multiply-add, the same square root), and the keys are
    /// unique, so the rows, close pairs and nearest distances are the same bits either way (the tests compare both with
    /// brute force). Model-free: a choice of speed (the 40-board demo's countdown looked at about 28 boards a board
    /// through nine hash buckets; here 39 in ten vector steps).
    /// </summary>
    public const int AllPairsMax = 64;
    double[] _rx = [], _ry = [];
    bool[] _rLive = [];
    int _liveCount;
    readonly int _allPairsMax;

    /// <summary>Board a (rank r) against every live board of a small fleet: candidates within range into the candidate
    /// buffer in canonical order, close pairs to later-ranked boards; how many, and the nearest distance.</summary>
    (int Count, double Nearest) LookAll(int[] byRank, int a, int r, int n, double closeM, ref int examined)
    {
        double range2 = RangeM * RangeM, xa = _rx[r], ya = _ry[r], nearest = double.PositiveInfinity;
        var vxa = Vector256.Create(xa); var vya = Vector256.Create(ya); var vr2 = Vector256.Create(range2);
        ref double rx = ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(_rx);
        ref double ry = ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(_ry);
        int ne = 0;
        for (int q = 0; q < n; q += 4)
        {
            // The arrays have 4 entries of room past n: lanes beyond the fleet are masked off below.
            var dx = vxa - Vector256.LoadUnsafe(ref rx, (nuint)q); var dy = vya - Vector256.LoadUnsafe(ref ry, (nuint)q);
            var d2 = dx * dx + dy * dy;
            uint within = Vector256.LessThanOrEqual(d2, vr2).ExtractMostSignificantBits();
            for (; within != 0; within &= within - 1)
            {
                int r2 = q + System.Numerics.BitOperations.TrailingZeroCount(within);
                if (r2 >= n || r2 == r || !_rLive[r2]) continue;
                Candidate(a, r, byRank[r2], r2, Math.Sqrt(d2.GetElement(r2 - q)), closeM, ref ne, ref nearest);
            }
        }
        examined += _liveCount - 1;
        return (ne, nearest);
    }

    /// <summary>A small fleet's positions in canonical order, with a vector's room past the end (grown only).</summary>
    void SizeAllPairs(int n)
    {
        if (_rx.Length < n + 4) { _rx = new double[n + 4]; _ry = new double[n + 4]; _rLive = new bool[n + 4]; }
    }

    /// <summary>
    /// Board b (rank <paramref name="rank"/>) at distance d from board a (rank r), within range: into the candidate buffer
    /// with its key (the distance in single precision, whose bits order as the values do, above the rank), into the close
    /// pairs when later-ranked and within <paramref name="closeM"/>, and the nearest distance kept. Both looks take
    /// candidates here, so their rows are the same bits.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    void Candidate(int a, int r, int b, int rank, double d, double closeM, ref int ne, ref double nearest)
    {
        if (d < nearest) nearest = d;
        Room(ref _eId, ref _eKey, ne);
        _eId[ne] = b; _eKey[ne++] = (ulong)BitConverter.SingleToUInt32Bits((float)d) << 32 | (uint)rank;
        if (rank > r && d < closeM) Close.Add((a, b));
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
        CandidatesExamined = o.CandidatesExamined;
        _adjStart = (int[])o._adjStart.Clone(); _adjLen = (int[])o._adjLen.Clone(); _adj = (int[])o._adj.Clone();
    }
}
