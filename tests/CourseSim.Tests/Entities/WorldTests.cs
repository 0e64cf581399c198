using CourseSim.Entities;
using CourseSim.Random;

namespace CourseSim.Tests.Entities;

public class WorldTests
{
    struct Pos { public double X, Y; }
    struct Vel { public double X, Y; }
    struct Mass { public double Kg; }
    struct Tag { }

    [Fact]
    public void ComponentsAreStoredAndKeptAcrossArchetypeMoves()
    {
        var w = new World();
        var e = w.Create(new Pos { X = 1, Y = 2 }, new Vel { X = 3 });
        Assert.True(w.Has<Pos>(e) && w.Has<Vel>(e) && !w.Has<Mass>(e));
        w.Add(e, new Mass { Kg = 90 });
        Assert.Equal(1, w.Get<Pos>(e).X); Assert.Equal(3, w.Get<Vel>(e).X); Assert.Equal(90, w.Get<Mass>(e).Kg);
        w.Remove<Vel>(e);
        Assert.False(w.Has<Vel>(e));
        Assert.Equal(2, w.Get<Pos>(e).Y); Assert.Equal(90, w.Get<Mass>(e).Kg);
        w.Get<Pos>(e).X = 7; // by reference
        Assert.Equal(7, w.Get<Pos>(e).X);
        Assert.Throws<EntityException>(() => w.Get<Vel>(e));
        Assert.Throws<EntityException>(() => w.Remove<Vel>(e));
    }

    [Fact]
    public void StaleHandlesAreDetectedAfterTheSlotIsReused()
    {
        var w = new World();
        var a = w.Create(new Pos { X = 1 });
        w.Destroy(a);
        Assert.False(w.IsAlive(a));
        Assert.Throws<EntityException>(() => w.Get<Pos>(a));
        // Reuse the slot: same id, new generation; the old handle stays dead.
        var ids = new List<Entity>();
        for (int i = 0; i < 20; i++) ids.Add(w.Create(new Pos { X = i }));
        var reused = ids.First(x => x.Id == a.Id);
        Assert.NotEqual(a.Generation, reused.Generation);
        Assert.True(w.IsAlive(reused));
        Assert.False(w.IsAlive(a));
        Assert.Throws<EntityException>(() => w.Destroy(a));
    }

    [Fact]
    public void QueriesMatchWithAndWithoutAndWriteThroughSpans()
    {
        var w = new World();
        for (int i = 0; i < 10; i++) w.Create(new Pos { X = i }, new Vel { X = 1 });
        for (int i = 0; i < 5; i++) w.Create(new Pos { X = 100 + i });
        var tagged = w.Create(new Pos { X = -1 }, new Vel { X = 1 });
        w.Add(tagged, new Tag());
        var moving = w.Query().With<Pos>().With<Vel>().Without<Tag>();
        Assert.Equal(10, moving.Count());
        Assert.Equal(16, w.Query().With<Pos>().Count());
        foreach (var chunk in moving)
        {
            var p = chunk.Span<Pos>(); var v = chunk.Span<Vel>();
            for (int i = 0; i < chunk.Count; i++) p[i].X += v[i].X;
        }
        double sum = 0;
        foreach (var chunk in w.Query().With<Pos>().With<Vel>().Without<Tag>()) foreach (var p in chunk.Span<Pos>()) sum += p.X;
        Assert.Equal(Enumerable.Range(0, 10).Sum() + 10, sum);
        Assert.Equal(-1, w.Get<Pos>(tagged).X); // excluded by Without<Tag>
    }

    struct Gravity : IForEach<Pos, Vel, Mass>
    {
        public double Dt;
        public void Update(Entity e, ref Pos p, ref Vel v, ref Mass m) { v.Y -= 9.81 * Dt; p.Y += v.Y * Dt; }
    }

    [Fact]
    public void StructJobsVisitEveryMatchingEntity()
    {
        var w = new World();
        for (int i = 0; i < 100; i++) w.Create(new Pos(), new Vel(), new Mass { Kg = 1 });
        w.Create(new Pos(), new Vel()); // no mass: not visited
        var job = new Gravity { Dt = 0.5 };
        w.Query().With<Pos>().With<Vel>().With<Mass>().ForEach<Pos, Vel, Mass, Gravity>(ref job);
        int visited = 0;
        foreach (var chunk in w.Query().With<Vel>())
            foreach (var v in chunk.Span<Vel>()) if (v.Y != 0) { visited++; Assert.Equal(-4.905, v.Y, 12); }
        Assert.Equal(100, visited);
    }

    [Fact]
    public void StructuralChangesDuringIterationAreRefusedAndDeferredThroughTheBuffer()
    {
        var w = new World();
        var es = Enumerable.Range(0, 6).Select(i => w.Create(new Pos { X = i })).ToList();
        var cb = new CommandBuffer();
        foreach (var chunk in w.Query().With<Pos>())
        {
            Assert.Throws<EntityException>(() => w.Create());
            var ents = chunk.Entities; var p = chunk.Span<Pos>();
            for (int i = 0; i < chunk.Count; i++)
            {
                if (p[i].X % 2 == 0) cb.Add(ents[i], new Tag());
                if (p[i].X == 5) cb.Destroy(ents[i]);
            }
        }
        var made = cb.Create();
        cb.Add(made, new Pos { X = 42 });
        Assert.Equal(6, w.Count);
        var created = cb.Playback(w);
        Assert.Single(created);
        Assert.Equal(6, w.Count); // one destroyed, one created
        Assert.Equal(42, w.Get<Pos>(created[0]).X);
        Assert.Equal(3, w.Query().With<Tag>().Count());
        Assert.False(w.IsAlive(es[5]));
        Assert.Equal(0, cb.Count);
    }

    /// <summary>
    /// Tags recorded through the buffer (a race's boards finishing) keep their order with the other commands, reach
    /// placeholders of entities the buffer creates, and, in an archetype reserved up front, allocate nothing when
    /// recorded and played back.
    /// </summary>
    [Fact]
    public void TagsThroughTheBufferKeepOrderAndAllocateNothingInAReservedArchetype()
    {
        var w = new World();
        var es = Enumerable.Range(0, 20).Select(i => w.Create(new Pos { X = i })).ToList();
        var cb = new CommandBuffer();
        // Order: tagged, then untagged, then tagged again, in one playback; a created entity tagged through its placeholder.
        cb.AddTag<Tag>(es[0]); cb.Remove<Tag>(es[0]); cb.AddTag<Tag>(es[0]);
        var made = cb.Create(); cb.AddTag<Tag>(made);
        var created = cb.Playback(w);
        Assert.True(w.Has<Tag>(es[0]));
        Assert.True(w.Has<Tag>(created[0]));
        Assert.Equal(2, w.Query().With<Tag>().Count());
        w.Reserve<Tag>(es[1], 20);
        cb.AddTag<Tag>(es[1]); cb.Playback(w); // the code paths once, before counting
        long before = GC.GetAllocatedBytesForCurrentThread();
        for (int i = 2; i < 20; i++) { cb.AddTag<Tag>(es[i]); cb.Playback(w); }
        long bytes = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Equal(0, bytes);
        Assert.Equal(21, w.Query().With<Tag>().Count()); // the twenty and the created one
        Assert.All(es, e => Assert.Equal(es.IndexOf(e), w.Get<Pos>(e).X));
    }

    /// <summary>
    /// Random operation sequences against a plain dictionary model: the store must agree with the model after every
    /// operation, and two worlds given the same sequence must iterate in the same order.
    /// </summary>
    [Fact]
    public void RandomOperationsAgreeWithAReferenceModelAndIterateDeterministically()
    {
        var order1 = RunOps(out var ok1);
        var order2 = RunOps(out var ok2);
        Assert.True(ok1 && ok2);
        Assert.Equal(order1, order2);
    }

    static List<int> RunOps(out bool consistent)
    {
        var rng = new CounterRng(99, 1);
        var w = new World();
        var model = new Dictionary<Entity, (double? pos, double? vel)>();
        var alive = new List<Entity>();
        consistent = true;
        for (ulong k = 0; k < 3000; k++)
        {
            double u = rng.Uniform(2 * k);
            double val = Math.Round(rng.Uniform(2 * k + 1) * 1000);
            if (alive.Count == 0 || u < 0.3)
            {
                var e = w.Create(new Pos { X = val });
                alive.Add(e); model[e] = (val, null);
            }
            else
            {
                var e = alive[(int)(val % alive.Count)];
                var (p, v) = model[e];
                if (u < 0.45) { w.Destroy(e); alive.Remove(e); model.Remove(e); }
                else if (u < 0.65) { w.Add(e, new Vel { X = val }); model[e] = (p, val); }
                else if (u < 0.8 && v is not null) { w.Remove<Vel>(e); model[e] = (p, null); }
                else if (p is not null && u < 0.9) { w.Remove<Pos>(e); model[e] = (null, v); }
                else { w.Add(e, new Pos { X = val }); model[e] = (val, v); }
            }
        }
        foreach (var (e, (p, v)) in model)
        {
            consistent &= w.IsAlive(e);
            consistent &= w.Has<Pos>(e) == p.HasValue && w.Has<Vel>(e) == v.HasValue;
            if (p is double pp) consistent &= w.Get<Pos>(e).X == pp;
            if (v is double vv) consistent &= w.Get<Vel>(e).X == vv;
        }
        consistent &= w.Count == model.Count;
        consistent &= w.Query().With<Vel>().Count() == model.Values.Count(x => x.vel.HasValue);
        var order = new List<int>();
        foreach (var chunk in w.Query().With<Pos>()) foreach (var e in chunk.Entities) order.Add(e.Id);
        return order;
    }
}
