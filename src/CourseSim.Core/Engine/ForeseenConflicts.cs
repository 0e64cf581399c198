namespace CourseSim.Engine;

/// <summary>
/// The rules' memory of conflicts a rider has seen as theirs to keep clear of, keyed (keep-clear board, other) (<see
/// cref="RaceContext.PairKey"/>): one short row per keep-clear rider (<see cref="PairRows{T}"/>). A rider's lookout asks
/// about every neighbour it sees no conflict with whether it had foreseen one; most riders have none foreseen at all, and
/// an empty row answers without a scan. Never enumerated, so the order within a row cannot change a result.
/// </summary>
public sealed class ForeseenConflicts
{
    readonly PairRows<Foreseen> _rows;

    /// <summary>Room up front for the neighbours a rider sees (rows grow only for a denser crowd), so the step does not grow it.</summary>
    public ForeseenConflicts(int boards) { _rows = new(boards, NeighbourGrid.MaxNeighbours); }

    /// <summary>A copy (for a checkpoint).</summary>
    public ForeseenConflicts(ForeseenConflicts o) { _rows = new(o._rows); }

    public bool ContainsKey(long key) => _rows.Contains(Keeper(key), Other(key));

    public bool TryGetValue(long key, out Foreseen f) => _rows.TryGet(Keeper(key), Other(key), out f);

    /// <summary>Adds or replaces the conflict under key.</summary>
    public void Set(long key, Foreseen f) => _rows.Set(Keeper(key), Other(key), f);

    public bool Remove(long key) => _rows.Remove(Keeper(key), Other(key));

    /// <summary>
    /// Forgets the conflicts a rider had foreseen with boards no longer among their neighbours (out of the lookout's
    /// range, or no longer among the nearest it follows): a conflict is foreseen in an encounter, and a later one with
    /// the same board is a new encounter, whose warning is counted from when it is seen (the contact judge reads it).
    /// Before, such entries stayed for the rest of the race: a contact minutes later read as seen minutes before.
    /// </summary>
    public void KeepOnlyNeighbours(int keeper, ReadOnlySpan<int> neighbours) => _rows.KeepOnly(keeper, neighbours);

    static int Keeper(long key) => (int)(key >> 32);
    static int Other(long key) => (int)(uint)key;
}
