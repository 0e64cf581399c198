namespace CourseSim.Entities;

/// <summary>A column of one component type inside an archetype: a plain array of structs, densely packed.</summary>
internal abstract class Column
{
    public abstract void Grow(int capacity);
    public abstract void Move(int from, int to);
    public abstract void CopyTo(int row, Column dst, int dstRow);
    public abstract Type Type { get; }
    public abstract Column Copy();
    /// <summary>The first <paramref name="rows"/> rows as bytes (components are unmanaged structs).</summary>
    public abstract ReadOnlySpan<byte> Bytes(int rows);
}

internal sealed class Column<T> : Column where T : struct
{
    public T[] Data = new T[8];
    public override Type Type => typeof(T);
    public override void Grow(int capacity) => Array.Resize(ref Data, capacity);
    public override void Move(int from, int to) => Data[to] = Data[from];
    public override void CopyTo(int row, Column dst, int dstRow) => ((Column<T>)dst).Data[dstRow] = Data[row];
    public override Column Copy() => new Column<T> { Data = (T[])Data.Clone() };
    public override ReadOnlySpan<byte> Bytes(int rows)
    {
        if (System.Runtime.CompilerServices.RuntimeHelpers.IsReferenceOrContainsReferences<T>())
            throw new EntityException($"{typeof(T).Name} holds references: components must be plain unmanaged structs");
        return System.Runtime.InteropServices.MemoryMarshal.AsBytes(new ReadOnlySpan<T>(Data, 0, rows));
    }
}

/// <summary>
/// All entities that have exactly the same set of components, stored column by column (structure of arrays), so a
/// system touches only the columns it reads. Rows are kept dense: removing a row moves the last row into the hole.
/// </summary>
public sealed class Archetype
{
    internal readonly Column[] Columns;
    readonly int[] _columnOf; // component type id -> column index, -1 if absent
    internal Entity[] Entities = new Entity[8];
    public Signature Signature { get; }
    public int Count { get; internal set; }
    public int Capacity => Entities.Length;

    internal Archetype(Signature sig, IReadOnlyList<Type> types, Func<Type, Column> makeColumn)
    {
        Signature = sig;
        _columnOf = new int[64];
        Array.Fill(_columnOf, -1);
        var cols = new List<Column>();
        for (int t = 0; t < 64; t++)
        {
            if (!sig.Has(t)) continue;
            _columnOf[t] = cols.Count;
            cols.Add(makeColumn(types[t]));
        }
        Columns = cols.ToArray();
    }

    internal int ColumnOf(int type) => _columnOf[type];

    Archetype(Archetype o)
    {
        Signature = o.Signature;
        _columnOf = o._columnOf;
        Columns = o.Columns.Select(c => c.Copy()).ToArray();
        Entities = (Entity[])o.Entities.Clone();
        Count = o.Count;
    }

    /// <summary>A deep copy (for a world's checkpoint).</summary>
    internal Archetype Copy() => new(this);

    internal int AddRow(Entity e)
    {
        if (Count == Entities.Length) EnsureCapacity(Entities.Length * 2);
        Entities[Count] = e;
        return Count++;
    }

    /// <summary>Room for at least this many rows in every column.</summary>
    internal void EnsureCapacity(int rows)
    {
        if (rows <= Entities.Length) return;
        Array.Resize(ref Entities, rows);
        foreach (var c in Columns) c.Grow(rows);
    }

    /// <summary>Removes a row by moving the last row into it; returns the entity that moved (or Null).</summary>
    internal Entity RemoveRow(int row)
    {
        int last = Count - 1;
        Entity moved = Entity.Null;
        if (row != last)
        {
            foreach (var c in Columns) c.Move(last, row);
            Entities[row] = Entities[last];
            moved = Entities[row];
        }
        Entities[last] = Entity.Null;
        Count--;
        return moved;
    }

    internal T[] ColumnArray<T>(int type) where T : struct => ((Column<T>)Columns[_columnOf[type]]).Data;
}

/// <summary>
/// One archetype's rows seen by a query: spans over the component columns, in row order. Writing through a span writes
/// the component in place.
/// </summary>
public readonly ref struct Chunk
{
    readonly Archetype _a;
    readonly World _w;
    internal Chunk(World w, Archetype a) { _w = w; _a = a; }
    public int Count => _a.Count;
    public ReadOnlySpan<Entity> Entities => new(_a.Entities, 0, _a.Count);
    /// <summary>The column of component T; the archetype must have it (queries guarantee their required components).</summary>
    public Span<T> Span<T>() where T : struct
    {
        int t = _w.TypeId<T>();
        if (_a.ColumnOf(t) < 0) throw new EntityException($"this chunk has no {typeof(T).Name} column");
        return new Span<T>(_a.ColumnArray<T>(t), 0, _a.Count);
    }
    public bool Has<T>() where T : struct => _a.ColumnOf(_w.TypeId<T>()) >= 0;
}
