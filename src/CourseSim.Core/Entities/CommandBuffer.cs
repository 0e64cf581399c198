namespace CourseSim.Entities;

/// <summary>
/// Structural changes recorded during a step and applied later, in the order they were recorded. Entities created
/// through the buffer are referred to by a placeholder until playback gives them real handles. A tag (a component
/// without data) added or removed is recorded without allocating: the command is a value naming a delegate made once
/// per tag type, so a race's step records its boards finishing with nothing allocated.
/// </summary>
public sealed class CommandBuffer
{
    // A command: a closure over its arguments (Run), or a shared per-type delegate on a target entity (OnEntity).
    readonly record struct Op(Action<World, List<Entity>>? Run, Action<World, Entity>? OnEntity, Entity Target);

    readonly List<Op> _ops = new(64);
    int _pending;
    // Handed to the commands of a playback that creates nothing: they never add to it (one per buffer: no
    // process-wide mutable object, even an empty one).
    readonly List<Entity> _noneCreated = new(0);

    public int Count => _ops.Count;

    /// <summary>Records the creation of an entity; the returned placeholder can be used in later commands of this buffer.</summary>
    public Entity Create()
    {
        int index = _pending++;
        _ops.Add(new((w, created) => created.Add(w.Create()), null, default));
        return new Entity(-2 - index, 0);
    }

    public void Destroy(Entity e) => _ops.Add(new((w, c) => w.Destroy(Resolve(e, c)), null, default));
    public void Add<T>(Entity e, T value) where T : struct => _ops.Add(new((w, c) => w.Add(Resolve(e, c), value), null, default));
    public void Remove<T>(Entity e) where T : struct => _ops.Add(new(null, Tag<T>.Remove, e));

    /// <summary>Records adding component T with its default value (a tag): nothing allocated.</summary>
    public void AddTag<T>(Entity e) where T : struct => _ops.Add(new(null, Tag<T>.Add, e));

    static class Tag<T> where T : struct
    {
        internal static readonly Action<World, Entity> Add = (w, e) => w.Add(e, default(T));
        internal static readonly Action<World, Entity> Remove = (w, e) => w.Remove<T>(e);
    }

    static Entity Resolve(Entity e, List<Entity> created) => e.Id <= -2 ? created[-2 - e.Id] : e;

    /// <summary>Applies every command in recorded order, then clears the buffer. Returns the handles of created entities.</summary>
    public IReadOnlyList<Entity> Playback(World world)
    {
        if (_ops.Count == 0) return [];
        // Only a buffer that creates entities needs a list of them (a step's usual commands, tags added, make none).
        var created = _pending == 0 ? _noneCreated : new List<Entity>(_pending);
        foreach (var op in _ops)
        {
            if (op.OnEntity is not null) op.OnEntity(world, Resolve(op.Target, created));
            else op.Run!(world, created);
        }
        _ops.Clear();
        _pending = 0;
        return created;
    }
}
