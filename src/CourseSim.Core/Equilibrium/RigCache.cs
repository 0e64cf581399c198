using System.Collections.Concurrent;

namespace CourseSim.Equilibrium;

/// <summary>
/// Rig tables and polars by set-up, built once and shared by every race that holds this cache (a batch holds one for all
/// its races; a lone race makes its own). An instance, not a process-wide table: two batches never share hidden state,
/// and a cache is dropped with its owner. Thread-safe: races of a batch resolve their set-ups concurrently; a set-up is
/// built once (set-ups compare by value), and the tables are immutable.
/// With a <see cref="RigTableStore"/> (the command line's default; none by default here, so tests stay hermetic) a
/// set-up's tables are first read from disk, and <see cref="Save"/> writes back what this cache's races built.
/// </summary>
public sealed class RigCache
{
    /// <summary>A set-up's polar and what the disk holds of it (as loaded, then as saved).</summary>
    sealed class Entry(RigPolar polar, ulong onDisk, bool tablesOnDisk)
    {
        public RigPolar Polar { get; } = polar;
        public ulong OnDisk = onDisk;
        public bool TablesOnDisk = tablesOnDisk;
    }

    readonly ConcurrentDictionary<Equipment, Lazy<Entry>> _rigs = new();

    public RigCache() { }

    /// <param name="store">the disk cache to read set-ups from and <see cref="Save"/> to; null for none</param>
    public RigCache(RigTableStore? store) { Store = store; }

    /// <summary>The disk cache, if any.</summary>
    public RigTableStore? Store { get; }

    public RigPolar For(Equipment eq) => _rigs.GetOrAdd(eq, e => new Lazy<Entry>(() => Make(e))).Value.Polar;

    Entry Make(Equipment eq)
    {
        if (Store is null) return new Entry(RigPolar.Build(eq), 0, false);
        var (polar, rows, tables) = Store.Load(eq);
        return new Entry(polar, rows, tables);
    }

    public int Count => _rigs.Count;

    /// <summary>Writes to the disk cache every set-up's tables that gained rows since they were read (call once, when the
    /// races are done: a batch saves once, not per race). Returns how many files were written; 0 without a store.</summary>
    public int Save()
    {
        if (Store is null) return 0;
        int written = 0;
        lock (_rigs)
        {
            foreach (var lazy in _rigs.Values)
            {
                if (!lazy.IsValueCreated) continue;
                var e = lazy.Value;
                if (!Store.Save(e.Polar, e.OnDisk, e.TablesOnDisk, out ulong saved)) continue;
                e.OnDisk |= saved; e.TablesOnDisk = true;
                written++;
            }
        }
        return written;
    }
}
