using System.Collections.Concurrent;

namespace CourseSim.Equilibrium;

/// <summary>
/// Rig tables and polars by set-up, built once and shared by every race that holds this cache (a batch holds one for all
/// its races; a lone race makes its own). An instance, not a process-wide table: two batches never share hidden state,
/// and a cache is dropped with its owner. Thread-safe: races of a batch resolve their set-ups concurrently; a set-up is
/// built once (set-ups compare by value), and the tables are immutable.
/// </summary>
public sealed class RigCache
{
    readonly ConcurrentDictionary<Equipment, Lazy<RigPolar>> _rigs = new();

    public RigPolar For(Equipment eq) => _rigs.GetOrAdd(eq, e => new Lazy<RigPolar>(() => RigPolar.Build(e))).Value;

    public int Count => _rigs.Count;
}
