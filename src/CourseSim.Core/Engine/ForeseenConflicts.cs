namespace CourseSim.Engine;

/// <summary>
/// The rules' memory of conflicts a rider has seen as theirs to keep clear of, keyed (keep-clear board, other) (<see
/// cref="RaceContext.PairKey"/>), with a count of each board's entries as keeper: a rider's lookout asks about every
/// neighbour it sees no conflict with whether it had foreseen one, and most riders have none foreseen at all, so the
/// count answers without a look-up (the same answers: a count of 0 means no key of that keeper is held). Never
/// enumerated, so neither the hash nor the order of insertion can change a result.
/// </summary>
public sealed class ForeseenConflicts
{
    readonly Dictionary<long, Foreseen> _map;
    readonly int[] _byKeeper;

    public ForeseenConflicts(int boards)
    {
        // Room up front (capacity changes no result), so the step does not grow it.
        _map = new(16 * Math.Max(1, boards), PairKeys.Instance);
        _byKeeper = new int[boards];
    }

    /// <summary>A copy (for a checkpoint).</summary>
    public ForeseenConflicts(ForeseenConflicts o)
    {
        _map = new(o._map, PairKeys.Instance);
        _byKeeper = (int[])o._byKeeper.Clone();
    }

    public bool ContainsKey(long key) => _byKeeper[Keeper(key)] != 0 && _map.ContainsKey(key);

    public bool TryGetValue(long key, out Foreseen f)
    {
        if (_byKeeper[Keeper(key)] == 0) { f = default; return false; }
        return _map.TryGetValue(key, out f);
    }

    /// <summary>Adds or replaces the conflict under key.</summary>
    public void Set(long key, Foreseen f)
    {
        ref var slot = ref System.Runtime.InteropServices.CollectionsMarshal.GetValueRefOrAddDefault(_map, key, out bool held);
        if (!held) _byKeeper[Keeper(key)]++;
        slot = f;
    }

    public bool Remove(long key)
    {
        if (!_map.Remove(key)) return false;
        _byKeeper[Keeper(key)]--;
        return true;
    }

    static int Keeper(long key) => (int)(key >> 32);
}
