using System.Diagnostics;
using BenchmarkDotNet.Attributes;
using CourseSim.Engine;
using CourseSim.Entities;

namespace CourseSim.Benchmarks;

/// <summary>Entity store: entities visited per second by a 3-component query, as a struct job and as chunk spans.</summary>
[MemoryDiagnoser]
public class EntityStoreBenchmarks
{
    public struct Pos { public double X, Y; }
    public struct Vel { public double X, Y; }
    public struct Acc { public double X, Y; }

    struct Step : IForEach<Pos, Vel, Acc>
    {
        public void Update(Entity e, ref Pos p, ref Vel v, ref Acc a) { v.X += a.X * 0.05; v.Y += a.Y * 0.05; p.X += v.X * 0.05; p.Y += v.Y * 0.05; }
    }

    const int N = 100_000;
    World _w = null!;
    Query _q = null!;

    [GlobalSetup]
    public void Setup()
    {
        _w = new World();
        for (int i = 0; i < N; i++) _w.Create(new Pos { X = i }, new Vel { X = 1 }, new Acc { Y = -1 });
        // Other archetypes the query must skip or include.
        for (int i = 0; i < N / 10; i++) _w.Create(new Pos(), new Vel());
        _q = _w.Query().With<Pos>().With<Vel>().With<Acc>();
    }

    [Benchmark(OperationsPerInvoke = N, Description = "3-component query, struct job (ns/entity)")]
    public void Job() { var j = new Step(); _q.ForEach<Pos, Vel, Acc, Step>(ref j); }

    [Benchmark(OperationsPerInvoke = N, Description = "3-component query, chunk spans (ns/entity)")]
    public void Spans()
    {
        foreach (var c in _q)
        {
            var p = c.Span<Pos>(); var v = c.Span<Vel>(); var a = c.Span<Acc>();
            for (int i = 0; i < p.Length; i++) { v[i].X += a[i].X * 0.05; v[i].Y += a[i].Y * 0.05; p[i].X += v[i].X * 0.05; p[i].Y += v[i].Y * 0.05; }
        }
    }
}

/// <summary>Fleets for the engine benchmarks: the demo fleet's rigs and wind, repeated to N boards, on a 40 km beat, shadows on.</summary>
public static class Fleets
{
    public static string ScenarioPath()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "CourseSim.sln"))) dir = dir.Parent;
        return Path.Combine(dir?.FullName ?? ".", "scenarios", "korrin-bay-race.toml");
    }

    public static Race Make(int boards)
    {
        // Constant density along the line (4 m per board), so the scaling shows cost per board, not crowding.
        double line = Math.Min(10000, Math.Max(260, 4.0 * boards));
        // A far waypoint 40 km up the wind: the fleet races (beating, tacking on the laylines) and never finishes. The time
        // limit and a 10 s record interval keep the recorder's up-front room (sized to the race) small at 2,000 boards.
        var setup = ScenarioFile.LoadRace(ScenarioPath(), ["race.time_limit_s=7200", "race.record_interval_s=10", "course.kind=waypoints", "course.order=far",
            "course.marks.far.x_m=-28000", "course.marks.far.y_m=-28000", $"course.start_line_m={line}"]);
        var list = new List<BoardEntry>();
        for (int i = 0; i < boards; i++)
        {
            var b = setup.Boards[i % setup.Boards.Count];
            list.Add(b with { Id = $"b{i}", Name = $"{b.Name} {i}", LinePosition = (i + 0.5) / boards });
        }
        return new Race(setup with { Boards = list });
    }
}

/// <summary>
/// The race step on one core with wind shadows on: nanoseconds per board-step (every system, recording included),
/// from 10 to 2,000 boards. The fleet is past its start and sailing a long beat.
/// </summary>
[MemoryDiagnoser]
public class RaceStepBenchmarks
{
    [Params(10, 40, 200, 2000)]
    public int Boards { get; set; }

    Race _race = null!;
    const int Steps = 20;

    [GlobalSetup]
    public void Setup()
    {
        _race = Fleets.Make(Boards);
        while (_race.Time < 30) _race.Step();
    }

    /// <summary>20 steps of the whole fleet: divide the mean by 20 x Boards for ns per board-step (or use 'report').</summary>
    [Benchmark(Description = "20 race steps of the fleet")]
    public void Step()
    {
        // A fresh race before the fleet nears the far mark (so it is always racing, never finished); rare enough that
        // building it (wind tiles, fleet) adds little to the mean.
        if (_race.IsOver || _race.Time > 7000) Setup();
        for (int i = 0; i < Steps; i++) _race.Step();
    }
}

/// <summary>Memory figures and the entity store's raw speed (printed at the end of `report`).</summary>
public static class MemoryFigures
{
    public static void Run()
    {
        Console.WriteLine();
        Console.WriteLine("== memory and entity store");
        // Heap growth per board (world, components, cold arrays, shadow grid and the recorder's room).
        GC.Collect(); GC.WaitForPendingFinalizers(); GC.Collect();
        var warm = Fleets.Make(12); warm.Step();
        long m0 = GC.GetTotalMemory(true);
        var small = Fleets.Make(100);
        long m1 = GC.GetTotalMemory(true);
        var big = Fleets.Make(1100);
        long m2 = GC.GetTotalMemory(true);
        Console.WriteLine($"  memory per board: {(m2 - m1) / 1000.0 / 1024:F1} KiB (recorder room sized to the race: {small.Recorder.MemoryBytes / 100.0 / 1024:F1} KiB a board for this 7,200 s limit at one sample per 10 s)");
        Console.WriteLine($"  memory per recorded sample: {Recorder.BytesPerSample} B (one board at one instant; 0.5 s default interval)");
        Console.WriteLine($"  heap for a 100-board race: {(m1 - m0) / 1024.0 / 1024:F1} MiB (wind field, tables shared by set-up, boards)");
        GC.KeepAlive(small); GC.KeepAlive(big); GC.KeepAlive(warm);
        var w = new World();
        for (int i = 0; i < 1_000_000; i++) w.Create(new EntityStoreBenchmarks.Pos { X = i }, new EntityStoreBenchmarks.Vel { X = 1 }, new EntityStoreBenchmarks.Acc { Y = -1 });
        var q = w.Query().With<EntityStoreBenchmarks.Pos>().With<EntityStoreBenchmarks.Vel>().With<EntityStoreBenchmarks.Acc>();
        var esw = Stopwatch.StartNew();
        int rounds = 50;
        for (int r = 0; r < rounds; r++)
            foreach (var c in q)
            {
                var p = c.Span<EntityStoreBenchmarks.Pos>(); var v = c.Span<EntityStoreBenchmarks.Vel>(); var a = c.Span<EntityStoreBenchmarks.Acc>();
                for (int i = 0; i < p.Length; i++) { v[i].Y += a[i].Y * 0.05; p[i].X += v[i].X * 0.05; }
            }
        Console.WriteLine($"  entity store: {rounds * 1e6 / esw.Elapsed.TotalSeconds / 1e6:F0} M entities/s for a 3-component query (chunk spans, 1 M entities, wall clock)");
    }
}
