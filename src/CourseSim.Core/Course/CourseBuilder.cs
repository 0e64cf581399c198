using CourseSim.Settings;

namespace CourseSim.Courses;

/// <summary>
/// Lays a course from the [course] table of a scenario (docs/engine.md, "Courses"). Positions are in metres from the
/// course origin (the middle of the start line), either in the course's own frame (metres up the wind axis and to the
/// right looking upwind) or, for free waypoints, east and north. Every mark is rounded to port unless said otherwise.
/// </summary>
public static class CourseBuilder
{
    public static readonly string[] Kinds = ["windward-leeward", "trapezoid", "slalom", "waypoints"];

    /// <summary>Shortest leg of a waypoints course, m (common practice: a few board lengths to round and bear away).</summary>
    public const double MinLegM = 20;

    public static IEnumerable<KeySpec> Keys =>
    [
        KeySpec.Text("course.kind", "trapezoid", "the course layout", Kinds),
        KeySpec.Derived("course.axis_deg", 0, 360, "direction the course is laid to (wind from), deg; default: the mean wind direction"),
        KeySpec.Number("course.laps", 1, 10, 1, "laps of the course"),
        KeySpec.Text("course.loop", "outer", "trapezoid: sail the outer loop (1-2-3-4) or the inner one (2-3 repeated)", ["outer", "inner"]),
        KeySpec.Number("course.beat_m", 100, 5000, 800, "start line to the windward mark, m"),
        KeySpec.Number("course.reach_m", 50, 3000, 450, "trapezoid: length of the first reach, m"),
        KeySpec.Number("course.reach_angle_deg", 60, 150, 120, "trapezoid: true wind angle of the first reach, deg"),
        KeySpec.Number("course.run_m", 100, 5000, 700, "trapezoid: length of the run from mark 2 to mark 3, m"),
        KeySpec.Number("course.start_line_m", 20, 10000, 250, "length of the start line, m"),
        KeySpec.Number("course.gate_m", 20, 500, 60, "width of a leeward gate and of the finish line, m"),
        KeySpec.Number("course.slalom_marks", 2, 12, 5, "downwind slalom: number of gybe marks"),
        KeySpec.Number("course.slalom_leg_m", 50, 2000, 250, "downwind slalom: length of each leg, m"),
        KeySpec.Number("course.slalom_angle_deg", 100, 170, 135, "downwind slalom: true wind angle of the legs, deg"),
        KeySpec.Text("course.order", "", "waypoints: the marks to pass, in order, separated by spaces; the last is the finish"),
        KeySpec.Number("course.marks.*.x_m", -50000, 50000, double.NaN, "waypoint: metres east of the origin"),
        KeySpec.Number("course.marks.*.y_m", -50000, 50000, double.NaN, "waypoint: metres north of the origin"),
        KeySpec.Number("course.marks.*.bearing_deg", -360, 360, double.NaN, "waypoint, instead of x/y: bearing from the origin relative to the course axis (0 = straight upwind, 90 = to the right looking upwind), deg"),
        KeySpec.Number("course.marks.*.distance_m", 0, 50000, double.NaN, "waypoint, with bearing_deg: distance from the origin, m"),
        KeySpec.Text("course.marks.*.rounding", "port", "waypoint: side the mark is left on", ["port", "starboard"]),
    ];

    /// <summary>Builds the course; <paramref name="windFromDeg"/> is the default axis.</summary>
    public static Course Build(SettingsFile f, double windFromDeg)
    {
        double axis = f.Has("course.axis_deg") ? f.Number("course.axis_deg") : windFromDeg;
        var up = Vec2.FromBearing(axis);
        var right = new Vec2(up.Y, -up.X);
        Vec2 P(double u, double r) => u * up + r * right;
        string kind = f.Text("course.kind");
        int laps = (int)f.Number("course.laps");
        double half = f.Number("course.start_line_m") / 2, gate = f.Number("course.gate_m") / 2, beat = f.Number("course.beat_m");
        CourseLine StartLine(Vec2 toCourse) => new("start", P(0, -half), P(0, half), toCourse);
        var steps = new List<CourseStep>();
        CourseStep M(Mark m, Rounding side = Rounding.Port) => new(StepKind.Mark, m.Name, m, null, side, null);
        CourseStep FinishAcross(string name, Vec2 centre, Vec2 dir)
        {
            var n = dir.Unit(); var t = new Vec2(n.Y, -n.X);
            return new(StepKind.Finish, name, null, null, Rounding.Port, new CourseLine("finish", centre - gate * t, centre + gate * t, n));
        }
        switch (kind)
        {
            case "windward-leeward":
            {
                if (f.Has("course.loop")) throw f.ErrorAt("course.loop", "only a trapezoid course has loops");
                var w = new Mark("1", P(beat, 0));
                var g1 = new Mark("2p", P(0.08 * beat, -gate)); var g2 = new Mark("2s", P(0.08 * beat, gate));
                for (int lap = 0; lap < laps; lap++)
                {
                    steps.Add(M(w));
                    if (lap < laps - 1) steps.Add(new CourseStep(StepKind.Gate, "2", g1, g2, Rounding.Port, null));
                }
                steps.Add(FinishAcross("finish", P(0.08 * beat, 0), -1 * up));
                return new Course(kind, StartLine(up), steps, axis);
            }
            case "trapezoid":
            {
                double reach = f.Number("course.reach_m"), run = f.Number("course.run_m");
                double ra = f.Number("course.reach_angle_deg") * Math.PI / 180;
                var m1 = new Mark("1", P(beat, 0));
                // The first reach bears away to the left looking upwind (the side a port rounding turns to).
                var m2 = new Mark("2", m1.Position + reach * (Math.Cos(ra) * up + (-Math.Sin(ra)) * right));
                var m3 = new Mark("3", m2.Position - run * up);
                var m4 = new Mark("4", m3.Position + Vec2.Dot(-1 * (m3.Position), right) * right);
                bool inner = f.Text("course.loop") == "inner";
                steps.Add(M(m1)); steps.Add(M(m2)); steps.Add(M(m3));
                for (int lap = 1; lap < laps; lap++)
                {
                    if (inner) { steps.Add(M(m2)); steps.Add(M(m3)); }
                    else { steps.Add(M(m4)); steps.Add(M(m1)); steps.Add(M(m2)); steps.Add(M(m3)); }
                }
                steps.Add(M(m4));
                // Finish: a beam reach on from mark 4, a line across it 150 m on.
                steps.Add(FinishAcross("finish", m4.Position + 150 * right, right));
                return new Course(kind, StartLine(up), steps, axis);
            }
            case "slalom":
            {
                int n = (int)f.Number("course.slalom_marks");
                double leg = f.Number("course.slalom_leg_m"), a = f.Number("course.slalom_angle_deg") * Math.PI / 180;
                // Downwind: the course side of the start line is downwind; legs alternate either side of dead downwind.
                var pos = new Vec2(0, 0);
                double side = 1;
                for (int i = 0; i < n; i++)
                {
                    pos += leg * (Math.Cos(a) * up + side * Math.Sin(a) * right);
                    // Leg heads to the right (looking upwind) then gybes to the left: a clockwise turn, mark to starboard.
                    steps.Add(M(new Mark($"{i + 1}", pos), side > 0 ? Rounding.Starboard : Rounding.Port));
                    side = -side;
                }
                var last = leg * (Math.Cos(a) * up + side * Math.Sin(a) * right);
                steps.Add(FinishAcross("finish", pos + 0.5 * last, last));
                return new Course(kind, StartLine(-1 * up), steps, axis);
            }
            default:
            {
                var names = f.Text("course.order").Split(' ', StringSplitOptions.RemoveEmptyEntries);
                if (names.Length < 1) throw f.ErrorAt("course.order", "a waypoints course needs course.order, the marks to pass in order (names of [course.marks.NAME] tables)");
                var known = f.Names("course.marks");
                var marks = new Dictionary<string, Mark>();
                foreach (var m in known)
                {
                    bool xy = f.Has($"course.marks.{m}.x_m") || f.Has($"course.marks.{m}.y_m");
                    bool polar = f.Has($"course.marks.{m}.bearing_deg") || f.Has($"course.marks.{m}.distance_m");
                    if (xy && polar) throw f.ErrorAt($"course.marks.{m}.bearing_deg", $"mark '{m}': give x_m and y_m, or bearing_deg and distance_m, not both");
                    if (polar)
                    {
                        if (!f.Has($"course.marks.{m}.bearing_deg") || !f.Has($"course.marks.{m}.distance_m"))
                            throw f.ErrorAt($"course.marks.{m}.distance_m", $"mark '{m}' needs both bearing_deg and distance_m");
                        // Relative to the course axis: the bearing is measured from straight upwind, clockwise.
                        var dir = Vec2.FromBearing(axis + f.Number($"course.marks.{m}.bearing_deg"));
                        marks[m] = new Mark(m, f.Number($"course.marks.{m}.distance_m") * dir);
                        continue;
                    }
                    if (!f.Has($"course.marks.{m}.x_m") || !f.Has($"course.marks.{m}.y_m"))
                        throw f.ErrorAt($"course.marks.{m}.x_m", $"mark '{m}' needs both x_m and y_m (or bearing_deg and distance_m)");
                    marks[m] = new Mark(m, new Vec2(f.Number($"course.marks.{m}.x_m"), f.Number($"course.marks.{m}.y_m")));
                }
                if (names.Length > Storage.Limits.MaxList)
                    throw f.ErrorAt("course.order", $"{names.Length} marks, over the limit of {Storage.Limits.MaxList} {Storage.Limits.Override("COURSESIM_MAX_LIST")}");
                Vec2 prev = new(0, 0);
                for (int i = 0; i < names.Length; i++)
                {
                    if (!marks.TryGetValue(names[i], out var mk))
                        throw f.ErrorAt("course.order", $"unknown mark '{names[i]}'; marks defined: {(known.Count == 0 ? "none" : string.Join(", ", known))}");
                    // A leg too short to sail (or none: the same mark twice, a mark on the start) makes a course nobody can
                    // finish: the finish line has no direction to lie across.
                    double leg = (mk.Position - prev).Length;
                    if (leg < MinLegM)
                        throw f.ErrorAt("course.order", $"the leg to '{names[i]}' from {(i == 0 ? "the start line's middle" : $"'{names[i - 1]}'")} is {leg:0.#} m long; " +
                            $"every leg must be at least {MinLegM} m");
                    if (i == names.Length - 1) steps.Add(FinishAcross("finish", mk.Position, mk.Position - prev));
                    else steps.Add(M(mk, f.Text($"course.marks.{names[i]}.rounding") == "starboard" ? Rounding.Starboard : Rounding.Port));
                    prev = mk.Position;
                }
                var first = steps[0].Target;
                var n0 = first.Length < 1 ? up : first.Unit();
                var t0 = new Vec2(n0.Y, -n0.X);
                return new Course(kind, new CourseLine("start", -half * t0, half * t0, n0), steps, axis);
            }
        }
    }
}
