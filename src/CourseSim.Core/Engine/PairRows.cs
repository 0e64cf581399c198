namespace CourseSim.Engine;

/// <summary>
/// Values keyed by an ordered pair of boards (row board, other board), held as one short row per row board in flat
/// arrays: a look-up scans the few entries of its row, with no hashing and no dictionary in the rules' per-neighbour
/// loops (issue 17, item 6). A rider has a handful of conflicts foreseen at most and most have none, and a board touches
/// one or two others at most, so a row is short and an empty one is answered by its length alone. Every row has room for
/// <c>room</c> entries from the start; a row that fills doubles every row's room (once, for a crowd denser than any
/// before: the only allocation). Removing moves the row's last entry into the gap: rows are never enumerated by the
/// step, so their order cannot change a result.
/// </summary>
public sealed class PairRows<T> where T : struct
{
    readonly int _n;
    readonly int[] _len;
    int _room;
    int[] _other;
    T[] _val;

    /// <summary>Entries held in all rows.</summary>
    public int Count { get; private set; }

    public PairRows(int boards, int room)
    {
        _n = Math.Max(1, boards); _room = Math.Max(1, room);
        _len = new int[_n]; _other = new int[_n * _room]; _val = new T[_n * _room];
    }

    /// <summary>A copy (for a checkpoint).</summary>
    public PairRows(PairRows<T> o)
    {
        _n = o._n; _room = o._room; Count = o.Count;
        _len = (int[])o._len.Clone(); _other = (int[])o._other.Clone(); _val = (T[])o._val.Clone();
    }

    /// <summary>Entries in row a.</summary>
    public int RowCount(int a) => _len[a];

    int Find(int a, int b)
    {
        int o = a * _room, end = o + _len[a];
        for (int i = o; i < end; i++) if (_other[i] == b) return i;
        return -1;
    }

    public bool Contains(int a, int b) => Find(a, b) >= 0;

    public bool TryGet(int a, int b, out T value)
    {
        int i = Find(a, b);
        value = i < 0 ? default : _val[i];
        return i >= 0;
    }

    /// <summary>Adds or replaces the value of (a, b).</summary>
    public void Set(int a, int b, T value)
    {
        int i = Find(a, b);
        if (i >= 0) _val[i] = value; else Append(a, b, value);
    }

    /// <summary>Adds (a, b) unless held; whether it was added.</summary>
    public bool Add(int a, int b, T value)
    {
        if (Find(a, b) >= 0) return false;
        Append(a, b, value);
        return true;
    }

    public bool Remove(int a, int b)
    {
        int i = Find(a, b);
        if (i < 0) return false;
        int last = a * _room + --_len[a];
        _other[i] = _other[last]; _val[i] = _val[last];
        Count--;
        return true;
    }

    /// <summary>Removes from row a every entry whose other board is not in <paramref name="keep"/>; how many went.</summary>
    public int KeepOnly(int a, ReadOnlySpan<int> keep)
    {
        int o = a * _room, removed = 0;
        for (int i = o; i < o + _len[a];)
        {
            if (keep.Contains(_other[i])) { i++; continue; }
            int last = o + --_len[a];
            _other[i] = _other[last]; _val[i] = _val[last];
            Count--; removed++;
        }
        return removed;
    }

    void Append(int a, int b, T value)
    {
        if (_len[a] == _room) Grow();
        int i = a * _room + _len[a]++;
        _other[i] = b; _val[i] = value;
        Count++;
    }

    void Grow()
    {
        int room = 2 * _room;
        var other = new int[_n * room]; var val = new T[_n * room];
        for (int a = 0; a < _n; a++)
        {
            Array.Copy(_other, a * _room, other, a * room, _len[a]);
            Array.Copy(_val, a * _room, val, a * room, _len[a]);
        }
        _other = other; _val = val; _room = room;
    }
}
