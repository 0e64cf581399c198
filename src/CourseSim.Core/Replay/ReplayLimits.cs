namespace CourseSim.Replay;

/// <summary>
/// What a replay may hold (docs/replay.md, "Limits"): every count, index and interval checked after reading, so a
/// hand-made or damaged file is refused with what is wrong rather than freezing or crashing the viewer. The reader
/// never allocates from a count it has not checked against the bytes that follow it.
/// </summary>
public static class ReplayLimits
{
    /// <summary>Most frames in a replay (a day at 1 Hz is 86,400).</summary>
    public const int MaxFrames = 2_000_000;
    /// <summary>Widest wind grid per side (the writer uses <see cref="ReplayFile.WindCells"/>).</summary>
    public const int MaxWindCells = 256;
    /// <summary>Most wind frames.</summary>
    public const int MaxWindFrames = 100_000;

    public static int Count(long v, string field, string name) =>
        v is >= 0 and <= MaxFrames ? (int)v : throw new ReplayException($"{name}: '{field}' is {v}, out of range (0 to {MaxFrames})");

    static void Need(bool ok, string name, string what)
    {
        if (!ok) throw new ReplayException($"{name}: {what}");
    }

    static bool Finite(double d) => double.IsFinite(d);

    public static void Check(ReplayData d, string name)
    {
        int n = d.Boards.Count;
        Need(n >= 1 && n <= Storage.Limits.MaxBoards, name, $"{n} boards, expected 1 to {Storage.Limits.MaxBoards}");
        Need(Finite(d.StepHz) && d.StepHz > 0 && d.StepHz <= 1000, name, $"step_hz {d.StepHz} is out of range (above 0, at most 1000)");
        Need(Finite(d.IntervalS) && d.IntervalS > 0 && d.IntervalS <= 3600, name, $"interval_s {d.IntervalS} is out of range (above 0, at most 3600)");
        Need(Finite(d.StartS), name, "start_s is not a number");
        long samples = (long)d.Frames * n;
        foreach (var c in ReplayFile.ColumnNames)
        {
            Need(d.Columns.TryGetValue(c, out var col), name, $"column '{c}' is missing");
            Need(col!.LongLength == samples, name, $"column '{c}' holds {col.Length} samples, expected {samples} ({d.Frames} frames x {n} boards)");
        }
        Need(d.Flags.LongLength == samples, name, $"flags hold {d.Flags.Length} samples, expected {samples}");
        Need(d.NextStep.LongLength == samples, name, $"next_step holds {d.NextStep.Length} samples, expected {samples}");
        foreach (var b in d.NextStep) Need(b <= d.Steps.Count, name, $"a next_step of {b} names no course step (the course has {d.Steps.Count})");
        Need(d.StartLine.Length == 6 && d.StartLine.All(Finite), name, "the start line needs 6 finite numbers (ends and normal)");
        foreach (var st in d.Steps)
            Need(st.Points.Length is 2 or 4 && st.Points.All(Finite), name, $"course step '{st.Name}' needs 2 or 4 finite coordinates, has {st.Points.Length}");
        foreach (var e in d.Events)
            Need(e.Board >= -1 && e.Board < n && Finite(e.TimeS), name, $"an event ({e.Kind} at {e.TimeS} s) names board {e.Board}; boards are 0 to {n - 1}");
        foreach (var i in d.Incidents)
            Need(i.KeepClear >= -1 && i.KeepClear < n && i.RightOfWay >= -1 && i.RightOfWay < n, name,
                $"an incident at {i.TimeS} s names boards {i.KeepClear} and {i.RightOfWay}; boards are 0 to {n - 1}");
        foreach (var r in d.Results)
            Need(r.Board >= 0 && r.Board < n && (r.Place is null || r.Place >= 1 && r.Place <= n), name,
                $"a result names board {r.Board} in place {r.Place}; boards are 0 to {n - 1}, places 1 to {n}");
        if (d.Wind is { } w)
        {
            Need(w.Nx is >= 1 and <= MaxWindCells && w.Ny is >= 1 and <= MaxWindCells, name, $"the wind grid is {w.Nx} x {w.Ny}; at most {MaxWindCells} a side");
            Need(w.Frames is >= 1 and <= MaxWindFrames, name, $"the wind has {w.Frames} frames; 1 to {MaxWindFrames}");
            Need(Finite(w.CellM) && w.CellM > 0 && Finite(w.IntervalS) && w.IntervalS > 0 && Finite(w.X0) && Finite(w.Y0) && Finite(w.StartS), name,
                "the wind grid's cell size and interval must be above 0, its origin and start finite");
            long cells = (long)w.Nx * w.Ny * w.Frames;
            Need(w.SpeedMs.LongLength == cells && w.FromDeg.LongLength == cells, name,
                $"the wind holds {w.SpeedMs.Length} speeds and {w.FromDeg.Length} directions, expected {cells} ({w.Frames} frames of {w.Nx} x {w.Ny})");
        }
    }
}

/// <summary>Reading a replay file from disk within the size limit (<see cref="Storage.Limits.MaxReplayMb"/>).</summary>
public static class ReplayInput
{
    public static ReplayData Load(string path)
    {
        var bytes = Storage.InputFile.TryRead(path, Storage.Limits.MaxReplayMb, "COURSESIM_MAX_REPLAY_MB", out string problem)
            ?? throw new ReplayException($"replay '{path}' {problem}");
        return ReplayFile.Read(bytes, path);
    }
}
