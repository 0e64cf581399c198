using CourseSim.Entities;
using CourseSim.Courses;
using CourseSim.Units;

namespace CourseSim.Engine;

public sealed partial class Race
{
    /// <summary>How far back from the line a rider waits for the start, m (common practice: a few lengths below the line).</summary>
    public const double WaitBackM = 15;
    /// <summary>Extra time riders allow to accelerate to speed on the way to the line, s (model value).</summary>
    public const double AccelerationAllowanceS = 2;
    /// <summary>How long after the signal riders aim to reach the line, on average, s (model value).</summary>
    public const double StartMarginMeanS = 1.5;
    /// <summary>Least distance between boards where the simulation begins, m (model value: boards spread out before the sequence).</summary>
    public const double StartApartM = 10;

    Vec2[] _prev = [];

    /// <summary>Lines the fleet up below the start line: each rider has a spot on the line and a waiting point below it.</summary>
    void PlaceFleet()
    {
        _prev = new Vec2[BoardCount];
        var line = Course.Start;
        double tws = Unit.KnotsToMs(Setup.Wind.SpeedKn);
        for (int b = 0; b < BoardCount; b++)
        {
            var entry = Setup.Boards[b];
            var spot = line.A + StartPosition(b, entry) * (line.B - line.A);
            // The first leg's heading from the spot, on starboard when beating.
            double h = LegHeading(b, spot, Course.Steps[0].Target, tws, Setup.Wind.DirectionDeg, 1);
            var dir = Vec2.FromBearing(Unit.RadToDeg(h));
            _spot[b] = spot;
            _wait[b] = spot - WaitBackM * dir;
            var rng = _tacticRng.For((ulong)b);
            var start = _wait[b] - (30 + 30 * rng.Uniform(0)) * dir;
            // Boards begin the sequence apart: a start spot taken by an earlier board is moved further back.
            for (int tries = 0; tries < 20 && Enumerable.Range(0, b).Any(o => (_prev[o] - start).Length < StartApartM); tries++) start = start - 10 * dir;
            // Riders aim to reach the line a little after the signal and misjudge it, the less skilled more (from memory:
            // good starters are within about a second of the signal, club riders spread over several seconds).
            _goMargin[b] = (entry.StartMarginS ?? StartMarginMeanS) + rng.Normal(1) * (0.3 + 1.5 * (1 - _skill[b]));
            var e = _entities[b];
            World.Get<Pose>(e) = new Pose { X = start.X, Y = start.Y, Heading = h };
            World.Get<Motion>(e) = new Motion { TrackSin = Math.Sin(h), TrackCos = Math.Cos(h) };
            World.Get<Intent>(e).Heading = h;
            _prev[b] = start;
        }
    }

    /// <summary>
    /// Where on the start line (0 = pin end A .. 1 = the other end B) a board lines up, by its start plan: its
    /// line_position (or a spread of the fleet); an end; or the favoured end, the end further upwind in the wind the
    /// rider reads at the line as the sequence begins (with their reading error). Riders going for the same end spread
    /// over its first fifth at random, as a fleet does.
    /// </summary>
    double StartPosition(int b, BoardEntry entry)
    {
        var line = Course.Start;
        var rng = _tacticRng.For(0x57A7_0000UL + (ulong)b);
        double into = 0.03 + 0.17 * rng.Uniform(0);
        switch (entry.Start)
        {
            case "pin-end": return into;
            case "boat-end": return 1 - into;
            case "favoured-end":
            {
                var mid = line.Mid;
                var w = Wind.Sample(mid.X, mid.Y, -Settings.CountdownS);
                double read = w.FromDeg + Tuning.Lerp(Tuning.ReadingErrorExpertDeg, Tuning.ReadingErrorNoviceDeg, _skill[b]) * rng.Normal(1);
                bool bUpwind = Vec2.Dot(line.B - line.A, Vec2.FromBearing(read)) > 0;
                return bUpwind ? 1 - into : into;
            }
            default: return entry.LinePosition;
        }
    }

    /// <summary>
    /// System 7, course progress: the start (early starters found at the signal must return below the line), mark
    /// roundings on the required side (the wrong side is counted and does not count as rounding), gates and the finish.
    /// Finished boards get the <see cref="Done"/> tag through the command buffer, applied after the step.
    /// </summary>
    void CourseProgress()
    {
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var st = chunk.Span<RaceStatus>();
            var ents = chunk.Entities;
            for (int i = 0; i < ids.Length; i++) ProgressOne(ids[i].Value, ents[i], in pose[i], ref st[i]);
        }
    }

    void ProgressOne(int b, Entity e, in Pose pose, ref RaceStatus s)
    {
        var line = Course.Start;
        double t1 = Time + Dt;
        var p0 = _prev[b]; var p1 = new Vec2(pose.X, pose.Y);
        switch (s.State)
        {
            case RaceState.PreStart:
                if (Time < 0 && t1 >= 0 && line.Ahead(p1) > 0 && WithinLine(line, p1))
                {
                    s.State = RaceState.Returning; s.Ocs = true;
                    AddEvent(b, RaceEventKind.Ocs, pose, "on the course side at the signal");
                }
                else if (t1 >= 0 && line.Ahead(p0) <= 0 && line.Ahead(p1) > 0 && Segment.Crosses(p0, p1, line.A, line.B, out _))
                {
                    s.State = RaceState.Racing;
                    s.StartedS = Math.Max(0, CrossTime(line, p0, p1));
                    _events.Add(new RaceEvent(s.StartedS, b, RaceEventKind.Started, p1.X, p1.Y, s.Ocs ? "after returning" : ""));
                }
                break;
            case RaceState.Returning:
                if (line.Ahead(p1) < 0) { s.State = RaceState.PreStart; AddEvent(b, RaceEventKind.Cleared, pose, "back below the line"); }
                break;
            case RaceState.Racing:
                {
                    int r = Course.Check(s.NextStep, p0, p1);
                    var step = Course.Steps[s.NextStep];
                    if (r > 0)
                    {
                        bool finish = step.Kind == StepKind.Finish;
                        double at = finish ? CrossTime(step.Line!, p0, p1) : t1;
                        _splits[b].Add(at);
                        s.NextStep++;
                        if (finish)
                        {
                            s.State = RaceState.Finished; s.FinishedS = at;
                            _events.Add(new RaceEvent(at, b, RaceEventKind.Finished, p1.X, p1.Y, ""));
                            _commands.Add(e, new Done());
                            _finished++;
                        }
                        else _events.Add(new RaceEvent(t1, b, RaceEventKind.Rounded, p1.X, p1.Y, $"{step.Name}"));
                    }
                    else if (r < 0)
                    {
                        s.WrongSide++;
                        AddEvent(b, RaceEventKind.WrongSide, pose, $"passed {step.Name} on the wrong side: must go back round it");
                    }
                    break;
                }
        }
        _prev[b] = p1;
    }


    static bool WithinLine(CourseLine line, Vec2 p)
    {
        var d = (line.B - line.A).Unit();
        double along = Vec2.Dot(p - line.A, d);
        return along >= -5 && along <= line.Length + 5;
    }

    /// <summary>When (s from the signal) the step from p0 to p1, ending at Time + Dt, crossed the line (linear in the step).</summary>
    double CrossTime(CourseLine line, Vec2 p0, Vec2 p1)
    {
        double a0 = line.Ahead(p0), a1 = line.Ahead(p1);
        double u = a0 == a1 ? 1 : Math.Clamp(a0 / (a0 - a1), 0, 1);
        return Time + u * Dt;
    }
}
