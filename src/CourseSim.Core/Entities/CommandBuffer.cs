namespace CourseSim.Entities;

/// <summary>
/// Structural changes recorded during a step and applied later, in the order they were recorded. Entities created
/// through the buffer are referred to by a placeholder until playback gives them real handles.
/// </summary>
public sealed class CommandBuffer
{
    readonly List<Action<World, List<Entity>>> _ops = new();
    int _pending;

    public int Count => _ops.Count;

    /// <summary>Records the creation of an entity; the returned placeholder can be used in later commands of this buffer.</summary>
    public Entity Create()
    {
        int index = _pending++;
        _ops.Add((w, created) => created.Add(w.Create()));
        return new Entity(-2 - index, 0);
    }

    public void Destroy(Entity e) => _ops.Add((w, c) => w.Destroy(Resolve(e, c)));
    public void Add<T>(Entity e, T value) where T : struct => _ops.Add((w, c) => w.Add(Resolve(e, c), value));
    public void Remove<T>(Entity e) where T : struct => _ops.Add((w, c) => w.Remove<T>(Resolve(e, c)));

    static Entity Resolve(Entity e, List<Entity> created) => e.Id <= -2 ? created[-2 - e.Id] : e;

    /// <summary>Applies every command in recorded order, then clears the buffer. Returns the handles of created entities.</summary>
    public IReadOnlyList<Entity> Playback(World world)
    {
        if (_ops.Count == 0) return [];
        var created = new List<Entity>(_pending);
        foreach (var op in _ops) op(world, created);
        _ops.Clear();
        _pending = 0;
        return created;
    }
}
