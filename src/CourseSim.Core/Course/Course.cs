namespace CourseSim.Courses;

/// <summary>Which side of the board a mark must be on as it is rounded.</summary>
public enum Rounding { Port, Starboard }

/// <summary>A buoy: its name and position.</summary>
public sealed record Mark(string Name, Vec2 Position);

/// <summary>A line between two ends, crossed in the direction of <see cref="Normal"/> (towards the course side).</summary>
public sealed record CourseLine(string Name, Vec2 A, Vec2 B, Vec2 Normal)
{
    public Vec2 Mid => 0.5 * (A + B);
    public double Length => (B - A).Length;
    /// <summary>Distance of p on the normal's side of the line (negative behind it).</summary>
    public double Ahead(Vec2 p) => Vec2.Dot(p - A, Normal);
}

public enum StepKind { Mark, Gate, Finish }

/// <summary>
/// One thing to pass in order: a mark rounded on a side, a gate (pass between two marks), or the finish line.
/// For a mark, the rounding is detected on the ray from the mark along the outer bisector of the turn (docs/engine.md).
/// </summary>
public sealed record CourseStep(StepKind Kind, string Name, Mark? Mark, Mark? Second, Rounding Side, CourseLine? Line)
{
    /// <summary>Point the board aims for (the mark, the middle of the gate or finish line).</summary>
    public Vec2 Target => Kind switch
    {
        StepKind.Mark => Mark!.Position,
        StepKind.Gate => 0.5 * (Mark!.Position + Second!.Position),
        _ => Line!.Mid,
    };
}

/// <summary>
/// A course: the start line, the steps to pass in order (the last is the finish) and the marks to draw. Built from a
/// scenario by <see cref="CourseBuilder"/>.
/// </summary>
public sealed class Course
{
    /// <summary>How far out along the rounding ray a crossing still counts, m.</summary>
    public const double RoundingRayM = 150;
    /// <summary>How far abeam of a mark on the wrong hand a pass counts as passing it on the wrong side, m.</summary>
    public const double WrongSideReachM = 60;

    public string Kind { get; }
    public CourseLine Start { get; }
    public IReadOnlyList<CourseStep> Steps { get; }
    public IReadOnlyList<Mark> Marks { get; }
    /// <summary>Direction the course is laid to (where the wind is expected from), deg.</summary>
    public double AxisDeg { get; }
    readonly Vec2[] _outer; // per step: unit outer bisector (marks only)
    readonly Vec2[] _incoming;
    readonly Vec2[] _targets;
    readonly double[] _reach2;

    public Course(string kind, CourseLine start, IReadOnlyList<CourseStep> steps, double axisDeg)
    {
        if (steps.Count == 0 || steps[^1].Kind != StepKind.Finish) throw new ArgumentException("a course ends with a finish line");
        Kind = kind; Start = start; Steps = steps; AxisDeg = axisDeg;
        var marks = new List<Mark>();
        foreach (var s in steps)
        {
            if (s.Mark is not null && !marks.Contains(s.Mark)) marks.Add(s.Mark);
            if (s.Second is not null && !marks.Contains(s.Second)) marks.Add(s.Second);
        }
        Marks = marks;
        _outer = new Vec2[steps.Count]; _incoming = new Vec2[steps.Count];
        _targets = new Vec2[steps.Count]; _reach2 = new double[steps.Count];
        for (int i = 0; i < steps.Count; i++)
        {
            _targets[i] = steps[i].Target;
            // Mark: its rounding ray and wrong-side line; gate or finish: half its width; plus 50 m for one step's travel.
            double reach = steps[i].Kind == StepKind.Mark ? Math.Max(RoundingRayM, WrongSideReachM)
                : steps[i].Kind == StepKind.Gate ? 0.5 * (steps[i].Second!.Position - steps[i].Mark!.Position).Length : 0.5 * steps[i].Line!.Length;
            _reach2[i] = (reach + 50) * (reach + 50);
        }
        for (int i = 0; i < steps.Count; i++)
        {
            var prev = i == 0 ? start.Mid : steps[i - 1].Target;
            var here = steps[i].Target;
            var next = i + 1 < steps.Count ? steps[i + 1].Target : here + (here - prev);
            var din = (here - prev).Unit(); var dout = (next - here).Unit();
            _incoming[i] = din;
            var o = (din - dout).Unit();
            // Port rounding circles the mark anticlockwise: the board passes on the mark's right of the incoming leg.
            var right = new Vec2(din.Y, -din.X);
            var outside = steps[i].Side == Rounding.Port ? right : -1 * right;
            if (o.Length < 0.5 || Vec2.Dot(o, outside) < 0) o = (o + outside).Unit().Length > 0.5 ? (o + outside).Unit() : outside;
            _outer[i] = o;
        }
    }

    /// <summary>
    /// Whether a course from p along <paramref name="dir"/> (a unit vector) leaves the mark of step i, ahead and between
    /// <paramref name="minM"/> and <paramref name="lookM"/> away, on the wrong hand, or passes it closer abeam than
    /// <paramref name="clearM"/>. False for a gate, a finish, or past the last step. Riders steering and riders keeping
    /// clear of other boards both ask this (Navigation.MarkSideGuard, Lookout's charge on a way of keeping clear).
    /// </summary>
    public bool LeavesOnWrongHand(int i, Vec2 p, Vec2 dir, double minM, double lookM, double clearM)
    {
        if (i >= Steps.Count || Steps[i].Kind != StepKind.Mark) return false;
        var rel = Steps[i].Target - p;
        double dist = rel.Length;
        if (dist > lookM || dist < minM) return false;
        if (Vec2.Dot(rel, dir) <= 0) return false; // the mark is not ahead
        double cross = Vec2.Cross(dir, rel); // positive: the mark lies to port of the course
        return (cross > 0) != (Steps[i].Side == Rounding.Port) || Math.Abs(cross) < clearM;
    }

    /// <summary>Direction of the leg leading to step i.</summary>
    public Vec2 Incoming(int i) => _incoming[i];
    /// <summary>Unit vector from the mark of step i to the outside of the turn.</summary>
    public Vec2 Outside(int i) => _outer[i];

    /// <summary>
    /// What the step p0 -> p1 does to step i: 1 = passed as required (rounded, through the gate, finished),
    /// -1 = went past the mark on the wrong hand (it still has to be rounded), 0 = nothing.
    /// </summary>
    public int Check(int i, Vec2 p0, Vec2 p1)
    {
        // Far from the step (beyond its rays or line and a step's travel), nothing can be crossed.
        var far = p1 - _targets[i];
        if (far.X * far.X + far.Y * far.Y > _reach2[i]) return 0;
        var s = Steps[i];
        switch (s.Kind)
        {
            case StepKind.Finish:
                return Segment.Crosses(p0, p1, s.Line!.A, s.Line.B, out _) && Vec2.Dot(p1 - p0, s.Line.Normal) > 0 ? 1 : 0;
            case StepKind.Gate:
                return Segment.Crosses(p0, p1, s.Mark!.Position, s.Second!.Position, out _) && Vec2.Dot(p1 - p0, _incoming[i]) > 0 ? 1 : 0;
            default:
            {
                var m = s.Mark!.Position;
                var o = _outer[i];
                var move = p1 - p0;
                double sense = Vec2.Cross(o, move); // > 0: anticlockwise past the ray
                bool wantAnti = s.Side == Rounding.Port;
                if (Segment.Crosses(p0, p1, m, m + RoundingRayM * o, out _) && (sense > 0) == wantAnti) return 1;
                // Wrong side: going past the mark (across the line abeam of it, in the direction of the leg) with the mark
                // on the other hand from the one required.
                var din = _incoming[i];
                var wrong = s.Side == Rounding.Port ? new Vec2(-din.Y, din.X) : new Vec2(din.Y, -din.X);
                if (Vec2.Dot(move, din) > 0 && Segment.Crosses(p0, p1, m, m + WrongSideReachM * wrong, out _)) return -1;
                return 0;
            }
        }
    }
}
