using System.Security.Cryptography;
using CourseSim.Agents;
using CourseSim.Engine;

namespace CourseSim.Simulation;

/// <summary>
/// The whole state of a race between two steps: the world (every board component), the clock, the step snapshot and
/// neighbour grid, the rules' memory, the lookout readings, the shadows' sources, the log, the recorder and the tactics'
/// own state. Restoring it into a race of the same setup and stepping on gives exactly what stepping on from the save
/// gave (RaceTests). Everything else a race holds is fixed once built (fleet, wind field, course, settings).
/// </summary>
public sealed class RaceCheckpoint
{
    Entities.World _world = null!;
    double _time, _nextRecord; long _step; int _finished; bool _over;
    StepSnapshot _snapshot = null!; NeighbourGrid _grid = null!;
    ForeseenConflicts _foreseen = null!; PairRows<bool> _touching = null!;
    double[] _lookSpeed = null!, _lookAccel = null!;
    Wind.ShadowSource[] _sources = null!;
    RaceLog _log = null!; Recorder _recorder = null!;
    object _tactics = null!;
    int _boards;

    internal static RaceCheckpoint Take(RaceContext c, DecideSystem decide, bool over)
    {
        var cp = new RaceCheckpoint
        {
            _world = c.World.Clone(), _time = c.Time, _nextRecord = c.NextRecordS, _step = c.StepIndex, _finished = c.Finished, _over = over,
            _snapshot = new StepSnapshot(c.Fleet.Count), _grid = new NeighbourGrid(c.Fleet.Count, c.Grid.RangeM),
            _foreseen = new(c.Foreseen), _touching = new(c.Touching),
            _lookSpeed = (double[])c.LookoutSpeed.Clone(), _lookAccel = (double[])c.LookoutAccel.Clone(),
            _sources = (Wind.ShadowSource[])c.ShadowSources.Clone(),
            _log = c.Log.Copy(), _recorder = c.Recorder.Copy(), _tactics = decide.SaveState(), _boards = c.Fleet.Count,
        };
        cp._snapshot.CopyFrom(c.Snapshot); cp._grid.CopyFrom(c.Grid);
        return cp;
    }

    internal bool Restore(RaceContext c, DecideSystem decide)
    {
        if (_boards != c.Fleet.Count) throw new ArgumentException("a checkpoint restores only into a race of the same fleet");
        c.World.CopyFrom(_world);
        c.Time = _time; c.NextRecordS = _nextRecord; c.StepIndex = _step; c.Finished = _finished;
        c.Snapshot.CopyFrom(_snapshot); c.Grid.CopyFrom(_grid);
        c.Foreseen = new(_foreseen); c.Touching = new(_touching);
        Array.Copy(_lookSpeed, c.LookoutSpeed, _boards); Array.Copy(_lookAccel, c.LookoutAccel, _boards);
        Array.Copy(_sources, c.ShadowSources, _boards);
        // The shadows as they were built from these sources (they are rebuilt only at the start of a sensing cycle).
        c.Shadow.Build(c.ShadowSources);
        c.Log = _log.Copy(); c.Recorder = _recorder.Copy();
        decide.RestoreState(_tactics);
        return _over;
    }

    /// <summary>SHA-256 (hex) of a race's state: components, clock, log, incidents, splits and recorded samples.</summary>
    internal static string Hash(RaceContext c)
    {
        using var h = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        c.World.WriteState(b => h.AppendData(b));
        Span<byte> buf = stackalloc byte[16];
        BitConverter.TryWriteBytes(buf, c.Time); BitConverter.TryWriteBytes(buf[8..], c.StepIndex);
        h.AppendData(buf);
        foreach (var e in c.Log.Events) h.AppendData(System.Text.Encoding.UTF8.GetBytes($"{e.TimeS:R}|{e.Board}|{e.Kind}|{e.X:R}|{e.Y:R}|{e.Detail}\n"));
        foreach (var i in c.Log.Incidents) h.AppendData(System.Text.Encoding.UTF8.GetBytes($"{i}\n"));
        foreach (var s in c.Log.Splits) foreach (var t in s) { BitConverter.TryWriteBytes(buf, t); h.AppendData(buf[..8]); }
        h.AppendData(c.Recorder.Bytes);
        return Convert.ToHexString(h.GetHashAndReset()).ToLowerInvariant();
    }
}
