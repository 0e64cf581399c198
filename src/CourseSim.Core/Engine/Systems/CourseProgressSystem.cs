using CourseSim.Courses;

namespace CourseSim.Engine.Systems;

/// <summary>
/// Course progress: the start (a board on the course side of the line at the signal is on the course side early and
/// must return below the line), mark roundings on the required side (the wrong side is counted and does not count as
/// rounding), gates and the finish (time interpolated within the step). A finished board gets the <see cref="Done"/>
/// tag through the command buffer, applied after the step.
/// </summary>
public sealed class CourseProgressSystem : RaceSystem
{
    public override string Name => "course progress";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose, Wake (last position); course";
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
                if (time < 0 && t1 >= 0 && line.Ahead(p1) > 0 && WithinLine(line, p1))
                {
                    s.State = RaceState.Returning; s.Ocs = true;
                    c.AddEvent(b, RaceEventKind.Ocs, pose, "on the course side at the signal");
                }
                else if (t1 >= 0 && line.Ahead(p0) <= 0 && line.Ahead(p1) > 0 && Segment.Crosses(p0, p1, line.A, line.B, out _))
                {
                    s.State = RaceState.Racing;
                    s.StartedS = Math.Max(0, CrossTime(c, line, p0, p1));
                    c.Log.Add(s.StartedS, b, RaceEventKind.Started, p1.X, p1.Y, s.Ocs ? "after returning" : "");
                }
                break;
            case RaceState.Returning:
                if (line.Ahead(p1) < 0) { s.State = RaceState.PreStart; c.AddEvent(b, RaceEventKind.Cleared, pose, "back below the line"); }
                break;
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
                            c.Commands.Add(e, new Done());
                            c.Finished++;
                        }
                        else c.Log.Add(t1, b, RaceEventKind.Rounded, p1.X, p1.Y, step.Name);
                    }
                    else if (r < 0)
                    {
                        s.WrongSide++;
                        c.AddEvent(b, RaceEventKind.WrongSide, pose, $"passed {step.Name} on the wrong side: must go back round it");
                    }
                    break;
                }
        }
        wake.PrevX = p1.X; wake.PrevY = p1.Y;
    }

    static bool WithinLine(CourseLine line, Vec2 p)
    {
        var d = (line.B - line.A).Unit();
        double along = Vec2.Dot(p - line.A, d);
        return along >= -5 && along <= line.Length + 5;
    }

    /// <summary>When (s from the signal) the step from p0 to p1, ending at Time + Dt, crossed the line (linear in the step).</summary>
    static double CrossTime(RaceContext c, CourseLine line, Vec2 p0, Vec2 p1)
    {
        double a0 = line.Ahead(p0), a1 = line.Ahead(p1);
        double u = a0 == a1 ? 1 : Math.Clamp(a0 / (a0 - a1), 0, 1);
        return c.Time + u * c.Dt;
    }
}
