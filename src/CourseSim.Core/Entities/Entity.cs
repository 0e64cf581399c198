namespace CourseSim.Entities;

/// <summary>
/// A handle to an entity: a slot index and the generation of that slot when the entity was created. When an entity is
/// destroyed its slot's generation rises, so an old handle to a reused slot is detected as stale, never silently aliased.
/// </summary>
public readonly record struct Entity(int Id, int Generation)
{
    /// <summary>The null handle (never alive).</summary>
    public static readonly Entity Null = new(-1, 0);
    public override string ToString() => $"Entity({Id}v{Generation})";
}

/// <summary>A set of component types as a bit mask (up to 64 component types per world).</summary>
public readonly record struct Signature(ulong Bits)
{
    public bool Contains(Signature other) => (Bits & other.Bits) == other.Bits;
    public bool Overlaps(Signature other) => (Bits & other.Bits) != 0;
    public Signature With(int type) => new(Bits | (1UL << type));
    public Signature Without(int type) => new(Bits & ~(1UL << type));
    public bool Has(int type) => (Bits & (1UL << type)) != 0;
}

/// <summary>Thrown for operations on dead or stale entities, or a missing component.</summary>
public sealed class EntityException(string message) : InvalidOperationException(message);
