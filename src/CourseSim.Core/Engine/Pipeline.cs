using System.Diagnostics;
using CourseSim.Entities;

namespace CourseSim.Engine;

/// <summary>What a system may touch while it runs (docs/engine.md, "The pipeline").</summary>
public enum SystemScope
{
    /// <summary>
    /// Reads and writes only the components of the board it is given, plus what is fixed for the step (the snapshot,
    /// the grid, the fleet's cold data, the wind field, the settings). Such systems may run fused, board by board.
    /// </summary>
    OwnBoard,
    /// <summary>Works across boards (builds the snapshot, judges contacts, records): runs alone, over the whole fleet.</summary>
    Fleet,
}

/// <summary>The rows of one block of boards: spans over every board component, all of one length.</summary>
public ref struct BoardBlock
{
    public int Count;
    public ReadOnlySpan<Entity> Entities;
    public Span<BoardId> Id;
    public Span<Pose> Pose;
    public Span<Motion> Motion;
    public Span<SensedWind> Wind;
    public Span<Trim> Trim;
    public Span<RiderState> Rider;
    public Span<Intent> Intent;
    public Span<ManoeuvreState> Manoeuvre;
    public Span<RaceStatus> Status;
    public Span<Helm> Helm;
    public Span<Perception> Perception;
    public Span<StartPlan> Start;
    public Span<GiveWay> GiveWay;
    public Span<Penalty> Penalty;
    public Span<Wake> Wake;

    internal static BoardBlock Of(in Chunk c, int start, int count) => new()
    {
        Count = count,
        Entities = c.Entities.Slice(start, count),
        Id = c.Span<BoardId>().Slice(start, count), Pose = c.Span<Pose>().Slice(start, count), Motion = c.Span<Motion>().Slice(start, count),
        Wind = c.Span<SensedWind>().Slice(start, count), Trim = c.Span<Trim>().Slice(start, count), Rider = c.Span<RiderState>().Slice(start, count),
        Intent = c.Span<Intent>().Slice(start, count), Manoeuvre = c.Span<ManoeuvreState>().Slice(start, count),
        Status = c.Span<RaceStatus>().Slice(start, count), Helm = c.Span<Helm>().Slice(start, count),
        Perception = c.Span<Perception>().Slice(start, count), Start = c.Span<StartPlan>().Slice(start, count),
        GiveWay = c.Span<GiveWay>().Slice(start, count), Penalty = c.Span<Penalty>().Slice(start, count), Wake = c.Span<Wake>().Slice(start, count),
    };
}

/// <summary>
/// One system of the race step: a small type with one job (docs/engine.md lists them with what each reads and writes).
/// An <see cref="SystemScope.OwnBoard"/> system implements <see cref="RunBoards"/>, called with a block of boards; a
/// <see cref="SystemScope.Fleet"/> system implements <see cref="RunFleet"/>. <see cref="Prepare"/> runs once per step
/// before the boards, and may read only what is fixed for the step.
/// </summary>
public abstract class RaceSystem
{
    public abstract string Name { get; }
    public abstract SystemScope Scope { get; }
    /// <summary>The data the system reads and writes, for docs/engine.md and the pipeline picture.</summary>
    public abstract string Reads { get; }
    public abstract string Writes { get; }
    public virtual void Prepare(RaceContext c) { }
    public virtual void RunBoards(RaceContext c, ref BoardBlock b) => throw new InvalidOperationException($"{Name} has no per-board part");
    public virtual void RunFleet(RaceContext c) => throw new InvalidOperationException($"{Name} has no fleet part");
}

/// <summary>Time spent in each system (Stopwatch ticks), for benchmarks.</summary>
public sealed class SystemTimings
{
    public string[] Names { get; private set; } = [];
    public long[] Ticks { get; private set; } = [];
    /// <summary>Bytes allocated on the race's thread in each system.</summary>
    public long[] Bytes { get; private set; } = [];
    public long Steps { get; private set; }
    internal void Bind(IReadOnlyList<RaceSystem> systems)
    {
        if (Ticks.Length == systems.Count) return;
        Names = systems.Select(s => s.Name).ToArray(); Ticks = new long[Names.Length]; Bytes = new long[Names.Length];
    }
    internal void EndStep() => Steps++;
    /// <summary>Nanoseconds per board-step in system i.</summary>
    public double NsPerBoardStep(int i, int boards) => Ticks[i] * 1e9 / Stopwatch.Frequency / Math.Max(1, Steps * (long)boards);
}

/// <summary>
/// The race step as one ordered list of systems. Consecutive own-board systems run fused: the fleet is walked in blocks
/// of <see cref="BlockSize"/> boards and each block goes through all of them before the next block (the data of a block
/// stays in cache); fleet systems run alone between. There is one way through: the block size changes only how the
/// work is cut, never a result, because a fused system touches only its own board (RaceTests checks block sizes 1, 7
/// and the whole fleet give identical bytes). Timings, when on, read the clock around each system's call.
/// </summary>
public sealed class Pipeline
{
    public IReadOnlyList<RaceSystem> Systems { get; }
    readonly (int From, int To, bool Fused)[] _stages;
    /// <summary>Boards per block in fused stages (default 64).</summary>
    public int BlockSize { get; set; } = 64;

    public Pipeline(IReadOnlyList<RaceSystem> systems)
    {
        Systems = systems;
        var stages = new List<(int, int, bool)>();
        for (int i = 0; i < systems.Count;)
        {
            int j = i;
            if (systems[i].Scope == SystemScope.OwnBoard) while (j + 1 < systems.Count && systems[j + 1].Scope == SystemScope.OwnBoard) j++;
            stages.Add((i, j + 1, systems[i].Scope == SystemScope.OwnBoard));
            i = j + 1;
        }
        _stages = stages.ToArray();
    }

    /// <summary>The stages: runs of fused own-board systems, and fleet systems alone.</summary>
    public IEnumerable<IReadOnlyList<RaceSystem>> Stages => _stages.Select(s => (IReadOnlyList<RaceSystem>)Systems.Skip(s.From).Take(s.To - s.From).ToArray());

    public void Step(RaceContext c, SystemTimings? timings)
    {
        timings?.Bind(Systems);
        foreach (var (from, to, fused) in _stages)
        {
            if (!fused)
            {
                long f0 = timings is null ? 0 : Stopwatch.GetTimestamp(), m0 = timings is null ? 0 : GC.GetAllocatedBytesForCurrentThread();
                Systems[from].RunFleet(c);
                if (timings is not null) { timings.Ticks[from] += Stopwatch.GetTimestamp() - f0; timings.Bytes[from] += GC.GetAllocatedBytesForCurrentThread() - m0; }
                continue;
            }
            for (int s = from; s < to; s++)
            {
                long t0 = timings is null ? 0 : Stopwatch.GetTimestamp(), m0 = timings is null ? 0 : GC.GetAllocatedBytesForCurrentThread();
                Systems[s].Prepare(c);
                if (timings is not null) { timings.Ticks[s] += Stopwatch.GetTimestamp() - t0; timings.Bytes[s] += GC.GetAllocatedBytesForCurrentThread() - m0; }
            }
            int size = Math.Max(1, BlockSize);
            foreach (var chunk in c.Active)
            {
                for (int start = 0; start < chunk.Count; start += size)
                {
                    var block = BoardBlock.Of(chunk, start, Math.Min(size, chunk.Count - start));
                    for (int s = from; s < to; s++)
                    {
                        if (timings is null) { Systems[s].RunBoards(c, ref block); continue; }
                        long t0 = Stopwatch.GetTimestamp(), m0 = GC.GetAllocatedBytesForCurrentThread();
                        Systems[s].RunBoards(c, ref block);
                        timings.Ticks[s] += Stopwatch.GetTimestamp() - t0;
                        timings.Bytes[s] += GC.GetAllocatedBytesForCurrentThread() - m0;
                    }
                }
            }
        }
        timings?.EndStep();
    }
}
