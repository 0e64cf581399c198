namespace CourseSim.Entities;

/// <summary>
/// The entity store: entities with generation-checked handles, components as plain structs stored densely per
/// archetype (one archetype per distinct component set), queries over component sets, and structural changes that are
/// refused while a query is being iterated (record them in a <see cref="CommandBuffer"/> and play it back between steps).
/// Iteration order is deterministic: archetypes in creation order, rows in insertion order as modified by swap-removal,
/// so the same sequence of operations always gives the same order. No global state: each world owns its registries.
/// </summary>
public sealed class World
{
    struct Slot { public int Generation; public Archetype? Archetype; public int Row; }

    readonly Dictionary<Type, int> _typeIds = new();
    readonly List<Type> _types = new();
    readonly List<Archetype> _archetypes = new();
    readonly Dictionary<ulong, Archetype> _bySignature = new();
    Slot[] _slots = new Slot[16];
    int _slotCount;
    readonly Queue<int> _free = new(); // FIFO: a freed slot is reused as late as possible
    internal int Iterating;

    public int Count { get; private set; }
    /// <summary>Changes whenever a new archetype appears or the world is restored, so queries know to refresh their match list.</summary>
    internal int ArchetypeVersion => _archetypes.Count + (_restores << 16);
    int _restores;
    internal IReadOnlyList<Archetype> Archetypes => _archetypes;

    /// <summary>The world-local id of a component type (registered on first use; at most 64 types per world).</summary>
    public int TypeId<T>() where T : struct
    {
        // Fast path: a process-wide index per type (assigned once, it carries no world state) into this world's table.
        int g = TypeIndex<T>.Value;
        if (g < _localByGlobal.Length && _localByGlobal[g] > 0) return _localByGlobal[g] - 1;
        int id = TypeId(typeof(T));
        if (g >= _localByGlobal.Length) Array.Resize(ref _localByGlobal, Math.Max(g + 1, _localByGlobal.Length * 2));
        _localByGlobal[g] = id + 1;
        return id;
    }

    int[] _localByGlobal = new int[16];

    static class TypeIndex
    {
        static int _next = -1;
        public static int Next() => Interlocked.Increment(ref _next);
    }

    static class TypeIndex<T> where T : struct
    {
        public static readonly int Value = TypeIndex.Next();
    }

    int TypeId(Type t)
    {
        if (_typeIds.TryGetValue(t, out int id)) return id;
        if (_types.Count == 64) throw new EntityException("a world holds at most 64 component types");
        id = _types.Count;
        _types.Add(t);
        _typeIds[t] = id;
        return id;
    }

    public Query Query() => new(this);

    /// <summary>A deep copy of every entity and component: a checkpoint of the world.</summary>
    public World Clone()
    {
        var w = new World();
        w.CopyFrom(this);
        return w;
    }

    /// <summary>
    /// Makes this world a deep copy of <paramref name="src"/> (same entities, handles, components and iteration order).
    /// Queries made on this world stay valid and see the copied entities.
    /// </summary>
    public void CopyFrom(World src)
    {
        if (Iterating > 0 || src.Iterating > 0) throw new EntityException("a world cannot be copied while a query is iterating");
        _typeIds.Clear(); foreach (var kv in src._typeIds) _typeIds[kv.Key] = kv.Value;
        _types.Clear(); _types.AddRange(src._types);
        _localByGlobal = (int[])src._localByGlobal.Clone();
        var map = new Dictionary<Archetype, Archetype>();
        _archetypes.Clear(); _bySignature.Clear();
        foreach (var a in src._archetypes)
        {
            var c = a.Copy();
            map[a] = c;
            _archetypes.Add(c);
            _bySignature[c.Signature.Bits] = c;
        }
        _slots = (Slot[])src._slots.Clone();
        for (int i = 0; i < _slots.Length; i++)
            if (_slots[i].Archetype is { } a) _slots[i].Archetype = map[a];
        _slotCount = src._slotCount;
        _free.Clear(); foreach (int f in src._free) _free.Enqueue(f);
        Count = src.Count;
        _restores = Math.Max(_restores, src._restores) + 1;
    }

    /// <summary>
    /// Feeds every component of every entity, archetype by archetype in creation order, to <paramref name="sink"/> as
    /// bytes (for a state hash).
    /// </summary>
    public void WriteState(Action<ReadOnlySpan<byte>> sink)
    {
        foreach (var a in _archetypes)
        {
            sink(System.Runtime.InteropServices.MemoryMarshal.AsBytes(new ReadOnlySpan<Entity>(a.Entities, 0, a.Count)));
            foreach (var c in a.Columns) sink(c.Bytes(a.Count));
        }
    }

    public bool IsAlive(Entity e) => e.Id >= 0 && e.Id < _slotCount && _slots[e.Id].Generation == e.Generation && _slots[e.Id].Archetype is not null;

    /// <summary>Creates an entity with no components.</summary>
    public Entity Create()
    {
        CheckUnlocked();
        int id;
        if (_free.Count > 0) id = _free.Dequeue();
        else
        {
            if (_slotCount == _slots.Length) Array.Resize(ref _slots, _slots.Length * 2);
            id = _slotCount++;
            _slots[id].Generation = 1;
        }
        var e = new Entity(id, _slots[id].Generation);
        var a = ArchetypeFor(new Signature(0));
        _slots[id].Archetype = a;
        _slots[id].Row = a.AddRow(e);
        Count++;
        return e;
    }

    public Entity Create<T1>(in T1 c1) where T1 : struct
    { var e = Create(); Add(e, c1); return e; }
    public Entity Create<T1, T2>(in T1 c1, in T2 c2) where T1 : struct where T2 : struct
    { var e = Create(); Add(e, c1); Add(e, c2); return e; }
    public Entity Create<T1, T2, T3>(in T1 c1, in T2 c2, in T3 c3) where T1 : struct where T2 : struct where T3 : struct
    { var e = Create(); Add(e, c1); Add(e, c2); Add(e, c3); return e; }

    public void Destroy(Entity e)
    {
        CheckUnlocked();
        ref var s = ref SlotOf(e);
        var moved = s.Archetype!.RemoveRow(s.Row);
        if (moved != Entity.Null) _slots[moved.Id].Row = s.Row;
        s.Archetype = null;
        s.Generation++;
        _free.Enqueue(e.Id);
        Count--;
    }

    public bool Has<T>(Entity e) where T : struct => SlotOf(e).Archetype!.Signature.Has(TypeId<T>());

    /// <summary>A reference to the entity's component T, valid until the next structural change.</summary>
    public ref T Get<T>(Entity e) where T : struct
    {
        ref var s = ref SlotOf(e);
        int t = TypeId<T>();
        if (s.Archetype!.ColumnOf(t) < 0) throw new EntityException($"{e} has no {typeof(T).Name}");
        return ref s.Archetype.ColumnArray<T>(t)[s.Row];
    }

    /// <summary>Adds component T (or overwrites it if present).</summary>
    public void Add<T>(Entity e, in T value) where T : struct
    {
        ref var s = ref SlotOf(e);
        int t = TypeId<T>();
        if (!s.Archetype!.Signature.Has(t))
        {
            CheckUnlocked();
            MoveTo(e, ref s, ArchetypeFor(s.Archetype.Signature.With(t)));
        }
        s.Archetype!.ColumnArray<T>(t)[s.Row] = value;
    }

    public void Set<T>(Entity e, in T value) where T : struct => Get<T>(e) = value;

    /// <summary>
    /// Makes the archetype entity <paramref name="like"/> would move to on gaining T, with room for
    /// <paramref name="rows"/> rows, so that those moves later (a race's boards finishing) allocate nothing.
    /// </summary>
    public void Reserve<T>(Entity like, int rows) where T : struct
    {
        ref var s = ref SlotOf(like);
        CheckUnlocked();
        ArchetypeFor(s.Archetype!.Signature.With(TypeId<T>())).EnsureCapacity(rows);
    }

    public void Remove<T>(Entity e) where T : struct
    {
        ref var s = ref SlotOf(e);
        int t = TypeId<T>();
        if (!s.Archetype!.Signature.Has(t)) throw new EntityException($"{e} has no {typeof(T).Name} to remove");
        CheckUnlocked();
        MoveTo(e, ref s, ArchetypeFor(s.Archetype.Signature.Without(t)));
    }

    void MoveTo(Entity e, ref Slot s, Archetype dst)
    {
        var src = s.Archetype!;
        int row = dst.AddRow(e);
        foreach (var c in src.Columns)
        {
            int t = _typeIds[c.Type];
            int dc = dst.ColumnOf(t);
            if (dc >= 0) c.CopyTo(s.Row, dst.Columns[dc], row);
        }
        var moved = src.RemoveRow(s.Row);
        if (moved != Entity.Null) _slots[moved.Id].Row = s.Row;
        s.Archetype = dst;
        s.Row = row;
    }

    Archetype ArchetypeFor(Signature sig)
    {
        if (_bySignature.TryGetValue(sig.Bits, out var a)) return a;
        a = new Archetype(sig, _types, MakeColumn);
        _archetypes.Add(a);
        _bySignature[sig.Bits] = a;
        return a;
    }

    static Column MakeColumn(Type t) => (Column)Activator.CreateInstance(typeof(Column<>).MakeGenericType(t))!;

    ref Slot SlotOf(Entity e)
    {
        if (!IsAlive(e)) throw new EntityException($"{e} is not alive (destroyed, or a stale handle to a reused slot)");
        return ref _slots[e.Id];
    }

    void CheckUnlocked()
    {
        if (Iterating > 0) throw new EntityException("structural change while a query is iterating: record it in a CommandBuffer and play it back after");
    }
}
