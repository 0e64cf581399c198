using CourseSim.Units;

namespace CourseSim.Engine;

/// <summary>
/// The boards of a step snapshot in square cells hashed into about twice as many buckets as boards, filled by counting
/// sort: O(N) to build however far the fleet spreads, no allocation once sized, each bucket in the canonical board order
/// (<see cref="Fleet.ByRank"/>). A look-up walks the buckets of the 3 x 3 cells round a point, so every board within
/// one cell size of it is found (and some farther ones: the caller checks the distance). The neighbour grid's cells are
/// the lookout range; the riders' sight uses the same structure with cells of the sight range.
/// </summary>
public sealed class CellHash
{
    /// <summary>A board in bucket order, with its rank in the canonical order, its cell (a bucket may hold several cells) and position (packed so a look-up walks contiguous memory).</summary>
    public readonly record struct Entry(int Board, int Rank, int Ci, int Cj, double X, double Y);

    readonly double _cellM;
    int[] _bucketStart = [], _fill = [];
    Entry[] _sorted = [];
    int[] _ci = [], _cj = [];
    /// <summary>The cell of board b at the last build (live boards only).</summary>
    public int CellI(int b) => _ci[b];
    public int CellJ(int b) => _cj[b];
    int _mask;

    /// <summary>Cells of <paramref name="cellM"/>, with room for <paramref name="boards"/> boards made now (so no step allocates).</summary>
    public CellHash(double cellM, int boards = 0)
    {
        _cellM = cellM;
        if (boards > 0) Size(boards);
    }

    /// <summary>Room for n boards (grown only, never shrunk).</summary>
    void Size(int n)
    {
        int buckets = CellBuckets.CountFor(n);
        if (_bucketStart.Length < buckets + 1) { _bucketStart = new int[buckets + 1]; _fill = new int[buckets]; }
        if (_sorted.Length < n) { _sorted = new Entry[n]; _ci = new int[n]; _cj = new int[n]; }
    }

    public double CellM => _cellM;

    /// <summary>The cell index of a coordinate (m).</summary>
    public int Cell(double v) => (int)Math.Floor(Math.Clamp(v / _cellM, -1e9, 1e9));

    /// <summary>Rebuilds from the snapshot's live boards, put in in canonical order.</summary>
    public void Build(StepSnapshot s, int[] byRank)
    {
        int n = byRank.Length;
        int buckets = CellBuckets.CountFor(n);
        _mask = buckets - 1;
        Size(n);
        Array.Clear(_bucketStart, 0, buckets + 1);
        for (int r = 0; r < n; r++)
        {
            int b = byRank[r];
            if (!s.Live[b]) continue;
            _ci[b] = Cell(s.X[b]); _cj[b] = Cell(s.Y[b]);
            _bucketStart[CellBuckets.Hash(_ci[b], _cj[b], _mask) + 1]++;
        }
        for (int k = 0; k < buckets; k++) _bucketStart[k + 1] += _bucketStart[k];
        Array.Copy(_bucketStart, _fill, buckets);
        for (int r = 0; r < n; r++)
        {
            int b = byRank[r];
            if (s.Live[b]) _sorted[_fill[CellBuckets.Hash(_ci[b], _cj[b], _mask)]++] = new Entry(b, r, _ci[b], _cj[b], s.X[b], s.Y[b]);
        }
    }

    /// <summary>The entries of the bucket holding cell (ci, cj): the caller skips those whose cell is another.</summary>
    public ReadOnlySpan<Entry> Bucket(int ci, int cj)
    {
        int h = CellBuckets.Hash(ci, cj, _mask);
        return new(_sorted, _bucketStart[h], _bucketStart[h + 1] - _bucketStart[h]);
    }
}
