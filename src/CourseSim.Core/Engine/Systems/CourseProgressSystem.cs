using CourseSim.Courses;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Course progress: the start (RRS 29.1 and the definition "Start", unchanged by Appendix B: a board with any part of
/// its hull on the course side of the line at the signal is on the course side early and must return until her whole
/// hull is below the line; a board starts when, after the signal, the first part of its hull, the bow, crosses the
/// line), mark roundings on the required side (the wrong side is counted and does not count as
/// rounding), gates and the finish (time interpolated within the step). A finished board gets the <see cref="Done"/>
/// tag through the command buffer, applied after the step.
/// </summary>
public sealed class CourseProgressSystem : RaceSystem
{
    public override string Name => "course progress";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose, Wake (last position); course; hull lengths";
    public override string Writes => "RaceStatus, Wake, splits, events, Done (deferred)";

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        for (int i = 0; i < blk.Count; i++) One(c, blk.Id[i].Value, blk.Entities[i], in blk.Pose[i], ref blk.Status[i], ref blk.Wake[i]);
    }

    static void One(RaceContext c, int b, Entities.Entity e, in Pose pose, ref RaceStatus s, ref Wake wake)
    {
        var line = c.Course.Start;
        double time = c.Time, t1 = time + c.Dt;
        var p0 = new Vec2(wake.PrevX, wake.PrevY); var p1 = new Vec2(pose.X, pose.Y);
        switch (s.State)
        {
            case RaceState.PreStart:
            {
                var half = HalfHull(c, b, pose);
                var lead = line.Ahead(p1 + half) >= line.Ahead(p1 - half) ? half : -1.0 * half; // the end further up the course
                var e0 = p0 + lead; var e1 = p1 + lead;
                if (time < 0 && t1 >= 0 && line.Ahead(e1) > 0 && WithinLine(line, e1))
                {
                    s.State = RaceState.Returning; s.Ocs = true;
                    double by = line.Ahead(e1);
                    c.AddEvent(b, RaceEventKind.Ocs, pose, by < 0.005 ? "on the course side at the signal (by under 1 cm)" : "on the course side at the signal (by {2:0.00} m)", null, null, by);
                }
                // Started: the leading end is over the line between its ends, coming from below (the trailing end was
                // below it a step ago; a turn can swing the bow over without the hull's centre moving much).
                else if (t1 >= 0 && line.Ahead(e1) > 0 && line.Ahead(p0 - lead) <= 0 && BetweenEnds(line, e1))
                {
                    s.State = RaceState.Racing;
                    s.StartedS = Math.Max(0, line.Ahead(e0) <= 0 ? CrossTime(c, line, e0, e1) : time);
                    c.Log.Add(s.StartedS, b, RaceEventKind.Started, e1.X, e1.Y, s.Ocs ? "after returning" : "");
                }
                break;
            }
            case RaceState.Returning:
            {
                var half = HalfHull(c, b, pose);
                if (Math.Max(line.Ahead(p1 + half), line.Ahead(p1 - half)) < 0) { s.State = RaceState.PreStart; c.AddEvent(b, RaceEventKind.Cleared, pose, "whole hull back below the line"); }
                break;
            }
            case RaceState.Racing:
                {
                    int r = c.Course.Check(s.NextStep, p0, p1);
                    var step = c.Course.Steps[s.NextStep];
                    if (r > 0)
                    {
                        bool finish = step.Kind == StepKind.Finish;
                        double at = finish ? CrossTime(c, step.Line!, p0, p1) : t1;
                        c.Log.Splits[b].Add(at);
                        s.NextStep++;
                        if (finish)
                        {
                            s.State = RaceState.Finished; s.FinishedS = at;
                            c.Log.Add(at, b, RaceEventKind.Finished, p1.X, p1.Y, "");
                            c.Commands.AddTag<Done>(e);
                            c.Finished++;
                        }
                        else c.Log.Add(t1, b, RaceEventKind.Rounded, p1.X, p1.Y, step.Name);
                    }
                    else if (r < 0)
                    {
                        s.WrongSide++;
                        c.AddEvent(b, RaceEventKind.WrongSide, pose, "passed {0} on the wrong side: must go back round it", step.Name, null, 0);
                    }
                    break;
                }
        }
        wake.PrevX = p1.X; wake.PrevY = p1.Y;
    }

    /// <summary>From the hull's centre to its bow: the hull is the stern-to-bow segment along the heading (as the rules
    /// see it: Rules/RightOfWay.cs).</summary>
    static Vec2 HalfHull(RaceContext c, int b, in Pose pose) => 0.5 * c.Fleet.LengthM[b] * Vec2.Of(Math.SinCos(pose.Heading));

    static bool WithinLine(CourseLine line, Vec2 p)
    {
        var d = (line.B - line.A).Unit();
        double along = Vec2.Dot(p - line.A, d);
        return along >= -5 && along <= line.Length + 5;
    }

    static bool BetweenEnds(CourseLine line, Vec2 p)
    {
        double along = Vec2.Dot(p - line.A, (line.B - line.A).Unit());
        return along >= 0 && along <= line.Length;
    }

    /// <summary>When (s from the signal) the step from p0 to p1, ending at Time + Dt, crossed the line (linear in the step).</summary>
    static double CrossTime(RaceContext c, CourseLine line, Vec2 p0, Vec2 p1)
    {
        double a0 = line.Ahead(p0), a1 = line.Ahead(p1);
        double u = a0 == a1 ? 1 : Math.Clamp(a0 / (a0 - a1), 0, 1);
        return c.Time + u * c.Dt;
    }
}
