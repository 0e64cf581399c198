using System.Globalization;
using System.Text;
using CourseSim.Engine;
using CourseSim.Replay;

namespace CourseSim.Cli.Viewer;

/// <summary>
/// A race run for the viewer as it happens: the race thread steps the race (paced to a multiple of real time) and turns
/// each new recorded frame, event and wind frame into a JSON message; the server streams the messages to every page
/// (Server-Sent Events). Only the race thread touches the race; readers see finished strings.
/// </summary>
public sealed class LiveFeed
{
    readonly List<string> _messages = new();
    readonly object _gate = new();
    public string Setup { get; }
    public bool Ended { get; private set; }
    public RaceResult? Result { get; private set; }
    public Exception? Failure { get; private set; }
    readonly Race _race;
    readonly ReplayWind _grid;
    int _sentFrames, _sentEvents, _sentWind;

    public LiveFeed(Race race)
    {
        _race = race;
        var first = ReplayFile.Read(ReplayFile.Write(race, race.Result()), "live");
        _grid = first.Wind!;
        // The setup: boards, course and the wind grid, with no frames yet (they arrive as messages).
        var empty = new ReplayData
        {
            Version = first.Version, Engine = first.Engine, Scenario = first.Scenario, Venue = first.Venue, Seed = first.Seed,
            StepHz = first.StepHz, IntervalS = first.IntervalS, StartS = first.StartS, Frames = 0, Boards = first.Boards,
            CourseKind = first.CourseKind, CourseAxisDeg = first.CourseAxisDeg, StartLine = first.StartLine, Steps = first.Steps,
            Columns = ReplayFile.ColumnNames.ToDictionary(c => c, _ => Array.Empty<float>()),
            Wind = _grid with { Frames = 0, SpeedMs = [], FromDeg = [] },
        };
        Setup = ViewerData.Json(empty, live: true);
    }

    /// <summary>Messages from index <paramref name="from"/> on (a copy), and whether the feed has ended.</summary>
    public (IReadOnlyList<string> Messages, bool Ended) From(int from)
    {
        lock (_gate) return (_messages.Skip(from).ToArray(), Ended);
    }

    /// <summary>Runs the race to its end at <paramref name="pace"/> times real time (0: as fast as it goes), publishing as it goes.</summary>
    public void Run(double pace, CancellationToken cancel)
    {
        try
        {
            var clock = System.Diagnostics.Stopwatch.StartNew();
            double t0 = _race.Time;
            while (!_race.IsOver && !cancel.IsCancellationRequested)
            {
                _race.Step();
                if (_race.Recorder.Frames > _sentFrames) Publish(false);
                if (pace > 0)
                {
                    double ahead = (_race.Time - t0) / pace - clock.Elapsed.TotalSeconds;
                    if (ahead > 0.02) Thread.Sleep(TimeSpan.FromSeconds(Math.Min(ahead, 0.5)));
                }
            }
            Result = _race.Result();
            Publish(true);
        }
        catch (Exception e)
        {
            Failure = e;
            lock (_gate) { _messages.Add("{\"type\":\"error\",\"message\":" + Quote($"the race failed: {e.Message}") + "}"); Ended = true; }
        }
    }

    static string Quote(string s) { var sb = new StringBuilder(); ViewerData.Str(sb, s); return sb.ToString(); }

    void Publish(bool end)
    {
        var rec = _race.Recorder;
        int n = _race.BoardCount, k0 = _sentFrames, k1 = rec.Frames;
        var sb = new StringBuilder();
        sb.Append("{\"type\":\"").Append(end ? "end" : "frames").Append("\",\"from\":").Append(k0).Append(",\"to\":").Append(k1);
        sb.Append(",\"columns\":{");
        for (int c = 0; c < ReplayFile.ColumnNames.Length; c++)
        {
            if (c > 0) sb.Append(',');
            ViewerData.Str(sb, ReplayFile.ColumnNames[c]); sb.Append(":[");
            int decimals = ViewerData.Decimals(ReplayFile.ColumnNames[c]);
            bool first = true;
            for (int k = k0; k < k1; k++)
            {
                var row = rec.Frame(k);
                for (int b = 0; b < n; b++) { if (!first) sb.Append(','); first = false; ViewerData.Num(sb, ReplayFile.Pick(row[b], c), decimals); }
            }
            sb.Append(']');
        }
        sb.Append("},\"flags\":[");
        bool f1 = true;
        for (int k = k0; k < k1; k++) foreach (var s in rec.Frame(k)) { if (!f1) sb.Append(','); f1 = false; sb.Append(s.Flags); }
        sb.Append("],\"next_step\":[");
        f1 = true;
        for (int k = k0; k < k1; k++) foreach (var s in rec.Frame(k)) { if (!f1) sb.Append(','); f1 = false; sb.Append(s.NextStep); }
        sb.Append(']');
        // Wind frames due by the latest recorded time, sampled on the setup's grid.
        double tLast = rec.TimeOf(Math.Max(0, k1 - 1));
        int windDue = (int)Math.Floor((tLast - _grid.StartS) / _grid.IntervalS) + 1;
        sb.Append(",\"wind_from\":").Append(_sentWind).Append(",\"wind_speed_ms\":[");
        var dirs = new StringBuilder();
        f1 = true;
        for (int f = _sentWind; f < windDue; f++)
        {
            double t = _grid.StartS + f * _grid.IntervalS;
            for (int j = 0; j < _grid.Ny; j++)
                for (int i = 0; i < _grid.Nx; i++)
                {
                    var w = _race.Wind.Sample(_grid.X0 + (i + 0.5) * _grid.CellM, _grid.Y0 + (j + 0.5) * _grid.CellM, t);
                    if (!f1) { sb.Append(','); dirs.Append(','); }
                    f1 = false;
                    ViewerData.Num(sb, w.SpeedMs, 2); ViewerData.Num(dirs, w.FromDeg, 1);
                }
        }
        sb.Append("],\"wind_from_deg\":[").Append(dirs).Append(']');
        _sentWind = Math.Max(_sentWind, windDue);
        // Events (and, at the end, results and incidents) since the last message.
        var evs = _race.Events;
        var newEvents = new List<ReplayEvent>();
        for (int i = _sentEvents; i < evs.Count; i++)
        {
            var e = evs[i];
            newEvents.Add(new ReplayEvent(e.TimeS, e.Board, ReplayFile.KindName(e.Kind), e.X, e.Y, e.Detail));
        }
        _sentEvents = evs.Count;
        var res = end ? Result! : null;
        ViewerData.Tail(sb, newEvents,
            end ? res!.Incidents.Select(i => new ReplayIncident(i.TimeS, i.X, i.Y, i.KeepClear, i.RightOfWay, i.Rule, i.Penalty, i.Avoidable, i.Detail)).ToList() : [],
            end ? res!.Boards.Select(b => new ReplayResult(b.Board, b.Place, b.Finished, b.ElapsedS, b.DistanceM, b.Tacks, b.Gybes, b.Falls)).ToList() : [],
            live: true);
        sb.Append('}');
        _sentFrames = k1;
        lock (_gate) { _messages.Add(sb.ToString()); if (end) Ended = true; }
    }
}
