namespace CourseSim.Entities;

/// <summary>A job run on every matching entity by <see cref="Query.ForEach{T1,T2,T3,TJob}"/>; a struct, so the JIT inlines it.</summary>
public interface IForEach<T1, T2, T3> where T1 : struct where T2 : struct where T3 : struct
{
    void Update(Entity e, ref T1 a, ref T2 b, ref T3 c);
}

/// <summary>
/// Entities that have all the "with" components and none of the "without" ones. Iterate chunk by chunk
/// (<c>foreach (var chunk in query)</c>, then <c>chunk.Span&lt;T&gt;()</c>) or run a struct job with ForEach.
/// The list of matching archetypes is cached and refreshed when the world gains an archetype.
/// </summary>
public sealed class Query
{
    readonly World _world;
    Signature _with, _without;
    readonly List<Archetype> _matches = new();
    int _seenVersion = -1;

    internal Query(World world) => _world = world;

    public Query With<T>() where T : struct { _with = _with.With(_world.TypeId<T>()); _seenVersion = -1; return this; }
    public Query Without<T>() where T : struct { _without = _without.With(_world.TypeId<T>()); _seenVersion = -1; return this; }

    List<Archetype> Matches()
    {
        if (_seenVersion != _world.ArchetypeVersion)
        {
            _matches.Clear();
            foreach (var a in _world.Archetypes)
                if (a.Signature.Contains(_with) && !a.Signature.Overlaps(_without)) _matches.Add(a);
            _seenVersion = _world.ArchetypeVersion;
        }
        return _matches;
    }

    /// <summary>Number of matching entities.</summary>
    public int Count()
    {
        int n = 0;
        foreach (var a in Matches()) n += a.Count;
        return n;
    }

    public Enumerator GetEnumerator() => new(_world, Matches());

    public void ForEach<T1, T2, T3, TJob>(ref TJob job) where T1 : struct where T2 : struct where T3 : struct where TJob : struct, IForEach<T1, T2, T3>
    {
        int t1 = _world.TypeId<T1>(), t2 = _world.TypeId<T2>(), t3 = _world.TypeId<T3>();
        _world.Iterating++;
        try
        {
            foreach (var a in Matches())
            {
                if (a.Count == 0) continue;
                var c1 = a.ColumnArray<T1>(t1); var c2 = a.ColumnArray<T2>(t2); var c3 = a.ColumnArray<T3>(t3);
                var es = a.Entities;
                for (int i = 0, n = a.Count; i < n; i++) job.Update(es[i], ref c1[i], ref c2[i], ref c3[i]);
            }
        }
        finally { _world.Iterating--; }
    }

    /// <summary>Walks matching archetypes; structural changes are refused until the loop ends (Dispose).</summary>
    public ref struct Enumerator
    {
        readonly World _w;
        readonly List<Archetype> _m;
        int _i;
        internal Enumerator(World w, List<Archetype> m) { _w = w; _m = m; _i = -1; w.Iterating++; }
        public bool MoveNext()
        {
            while (++_i < _m.Count) if (_m[_i].Count > 0) return true;
            return false;
        }
        public readonly Chunk Current => new(_w, _m[_i]);
        public void Dispose() { if (_i != int.MinValue) { _w.Iterating--; _i = int.MinValue; } }
    }
}
