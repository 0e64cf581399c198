using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Course;

/// <summary>
/// Marks are rounded by passing them on the required side (Racing Rules of Sailing, definition "Sail the Course" and
/// rule 28: a boat leaves each mark on the required side in the correct order); finishing is crossing the finish line
/// from the course side (definition "Finish").
/// </summary>
public class CourseTests
{
    static CourseSim.Courses.Course Build(string body) =>
        CourseBuilder.Build(SettingsFile.Parse(body, "course.toml", ScenarioFile.Schema), 0);

    static int Walk(CourseSim.Courses.Course c, int step, params (double X, double Y)[] pts)
    {
        int result = 0;
        for (int i = 1; i < pts.Length; i++)
        {
            int r = c.Check(step, new Vec2(pts[i - 1].X, pts[i - 1].Y), new Vec2(pts[i].X, pts[i].Y));
            if (r != 0) { result = r; if (r > 0) break; }
        }
        return result;
    }

    [Fact]
    public void WindwardMarkLeftToPortIsRoundedAndToStarboardIsTheWrongSide()
    {
        // Wind from the north: mark 1 is 600 m up the course at (0, 600); the next step is the leeward gate.
        var c = Build("[course]\nkind = \"windward-leeward\"\nlaps = 2\nbeat_m = 600\n");
        Assert.Equal(new Vec2(0, 600), c.Steps[0].Target);
        // Up the right side, across above the mark heading west, then down: the mark stays on the board's left.
        Assert.Equal(1, Walk(c, 0, (20, 500), (12, 590), (10, 605), (0, 612), (-12, 605), (-15, 580)));
        // Up the left side past the mark with it on the right (starboard): wrong side, not rounded.
        Assert.Equal(-1, Walk(c, 0, (-20, 500), (-12, 590), (-12, 620)));
        // Turning back clockwise round it from the left never counts as a rounding.
        Assert.NotEqual(1, Walk(c, 0, (-20, 500), (-12, 605), (0, 612), (12, 605), (15, 580)));
    }

    [Fact]
    public void AStarboardMarkOfASlalomIsRoundedClockwise()
    {
        var c = Build("[course]\nkind = \"slalom\"\nslalom_marks = 2\nslalom_leg_m = 200\nslalom_angle_deg = 135\n");
        Assert.Equal(Rounding.Starboard, c.Steps[0].Side);
        var m = c.Steps[0].Target; // down and to the east of the start (wind from the north)
        Assert.True(m.X > 0 && m.Y < 0);
        var o = c.Outside(0);
        // Approach along the leg, pass outside the mark, turn right (clockwise) across the rounding ray.
        var din = c.Incoming(0);
        var before = m - 30 * din + 8 * new Vec2(-din.Y, din.X);
        Assert.Equal(1, Walk(c, 0, (before.X, before.Y), ((m + 10 * o).X + 3 * din.X, (m + 10 * o).Y + 3 * din.Y), ((m + 10 * o - 6 * din).X, (m + 10 * o - 6 * din).Y)));
    }

    [Fact]
    public void FinishingIsCrossingTheLineFromTheCourseSide()
    {
        var c = Build("[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 600\ngate_m = 60\n");
        var fin = c.Steps[^1];
        Assert.Equal(StepKind.Finish, fin.Kind);
        var mid = fin.Line!.Mid;
        // Coming down from the windward mark through the line: finished.
        Assert.Equal(1, c.Check(c.Steps.Count - 1, mid + new Vec2(0, 10), mid + new Vec2(0, -10)));
        // Crossing it the other way, or passing outside its ends, is not finishing.
        Assert.Equal(0, c.Check(c.Steps.Count - 1, mid + new Vec2(0, -10), mid + new Vec2(0, 10)));
        Assert.Equal(0, c.Check(c.Steps.Count - 1, mid + new Vec2(45, 10), mid + new Vec2(45, -10)));
    }

    [Fact]
    public void TrapezoidLoopsAndWaypointCoursesAreLaidInOrder()
    {
        var outer = Build("[course]\nkind = \"trapezoid\"\nloop = \"outer\"\nlaps = 2\n");
        Assert.Equal(["1", "2", "3", "4", "1", "2", "3", "4", "finish"], outer.Steps.Select(s => s.Name));
        var inner = Build("[course]\nkind = \"trapezoid\"\nloop = \"inner\"\nlaps = 2\n");
        Assert.Equal(["1", "2", "3", "2", "3", "4", "finish"], inner.Steps.Select(s => s.Name));
        var wp = Build("[course]\nkind = \"waypoints\"\norder = \"a b c\"\n[course.marks.a]\nx_m = 0\ny_m = 1000\n[course.marks.b]\nx_m = 1000\ny_m = 1000\nrounding = \"starboard\"\n[course.marks.c]\nx_m = 1000\ny_m = 0\n");
        Assert.Equal(["a", "b", "finish"], wp.Steps.Select(s => s.Name));
        Assert.Equal(Rounding.Starboard, wp.Steps[1].Side);
        Assert.Equal(new Vec2(1000, 0), wp.Steps[2].Line!.Mid);
    }

    [Fact]
    public void UnknownWaypointNamesTheLineAndTheKnownMarks()
    {
        var e = Assert.Throws<SettingsException>(() => Build("[course]\nkind = \"waypoints\"\norder = \"a zz\"\n[course.marks.a]\nx_m = 0\ny_m = 1000\n"));
        Assert.Equal(3, e.Line);
        Assert.Contains("zz", e.Message);
        Assert.Contains("marks defined: a", e.Message);
    }

    [Fact]
    public void WaypointsCanBeLaidByBearingAndDistanceFromTheWindAxis()
    {
        // Axis 270 (wind from the west): bearing 0 is straight upwind (west), 90 to the right looking upwind (north).
        var c = Build("[course]\nkind = \"waypoints\"\naxis_deg = 270\norder = \"up right\"\n[course.marks.up]\nbearing_deg = 0\ndistance_m = 1000\n" +
            "[course.marks.right]\nbearing_deg = 90\ndistance_m = 500\n");
        Assert.Equal(-1000, c.Steps[0].Target.X, 6);
        Assert.Equal(0, c.Steps[0].Target.Y, 6);
        Assert.Equal(500, c.Steps[1].Line!.Mid.Y, 6);
        Assert.Equal(0, c.Steps[1].Line!.Mid.X, 6);
        var both = Assert.Throws<SettingsException>(() => Build("[course]\nkind = \"waypoints\"\norder = \"a\"\n[course.marks.a]\nx_m = 0\ny_m = 10\nbearing_deg = 5\ndistance_m = 10\n"));
        Assert.Contains("not both", both.Message);
    }
}
