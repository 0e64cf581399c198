using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// The start (docs/tactics.md, "Start plans"): where each rider lines up, and how they sail the last minute on time and
/// distance: hold below their spot on the line, go so as to reach the line at the planned moment, ease off whenever the
/// line would come too soon.
/// </summary>
public static class StartPlanner
{
    /// <summary>How far back from the line a rider waits for the start, m (common practice: a few lengths below the line).</summary>
    public const double WaitBackM = 15;
    /// <summary>Extra time riders allow to accelerate to speed on the way to the line, s (model value).</summary>
    public const double AccelerationAllowanceS = 2;
    /// <summary>How long after the signal riders aim to reach the line, on average, s (model value).</summary>
    public const double StartMarginMeanS = 1.5;
    /// <summary>Least distance between boards where the simulation begins, m (model value: boards spread out before the sequence).</summary>
    public const double StartApartM = 10;
    /// <summary>Time a luffing board takes to coast to a stop, s, for the start approach (model value).</summary>
    public const double CoastS = 2;
    /// <summary>True wind angle a rider holds while waiting below the line, deg (common practice: luffing on a close reach).</summary>
    public const double HoldTwaDeg = 60;

    /// <summary>
    /// Lines the fleet up below the start line: each rider gets a spot on the line and a waiting point below it, and
    /// begins the sequence further back. Boards are placed in the canonical order (their ids), each rider's draws from
    /// their own stream.
    /// </summary>
    public static void PlaceFleet(RaceContext c)
    {
        var line = c.Course.Start;
        var f = c.Fleet; var w = c.World;
        double tws = Unit.KnotsToMs(c.Setup.Wind.SpeedKn);
        var placed = new List<Vec2>();
        foreach (int b in f.ByRank)
        {
            var entry = c.Setup.Boards[b];
            var spot = line.A + StartPosition(c, b, entry) * (line.B - line.A);
            // The first leg's heading from the spot, on starboard when beating.
            double h = Navigation.LegHeading(f.Polars[b], spot, c.Course.Steps[0].Target, tws, c.Setup.Wind.DirectionDeg, 1);
            var dir = Vec2.FromBearing(Unit.RadToDeg(h));
            var wait = spot - WaitBackM * dir;
            var rng = f.Stream(c.TacticRng, b, 1);
            var start = wait - (30 + 30 * rng.Uniform(0)) * dir;
            // Boards begin the sequence apart: a start spot taken by a board placed before is moved further back.
            for (int tries = 0; tries < 20 && placed.Any(o => (o - start).Length < StartApartM); tries++) start = start - 10 * dir;
            placed.Add(start);
            var e = f.Entities[b];
            // Riders aim to reach the line a little after the signal and misjudge it, the less skilled more (from memory:
            // good starters are within about a second of the signal, club riders spread over several seconds).
            w.Get<StartPlan>(e) = new StartPlan
            {
                SpotX = spot.X, SpotY = spot.Y, WaitX = wait.X, WaitY = wait.Y,
                GoMarginS = (entry.StartMarginS ?? StartMarginMeanS) + rng.Normal(1) * (0.3 + 1.5 * (1 - f.Skill[b])),
            };
            w.Get<Pose>(e) = new Pose { X = start.X, Y = start.Y, Heading = h };
            w.Get<Motion>(e) = new Motion { TrackSin = Math.Sin(h), TrackCos = Math.Cos(h) };
            w.Get<Intent>(e).Heading = h;
            ref var helm = ref w.Get<Helm>(e);
            helm.WantH = h; helm.PlannedH = h;
            w.Get<Wake>(e) = new Wake { PrevX = start.X, PrevY = start.Y, TurnStartS = double.NegativeInfinity };
        }
    }

    /// <summary>
    /// Where on the start line (0 = pin end A .. 1 = the other end B) a board lines up, by its start plan: its
    /// line_position (or a spread of the fleet); an end; or the favoured end, the end further upwind in the wind the
    /// rider reads at the line as the sequence begins (with their reading error). Riders going for the same end spread
    /// over its first fifth at random, as a fleet does.
    /// </summary>
    static double StartPosition(RaceContext c, int b, BoardEntry entry)
    {
        var line = c.Course.Start;
        var rng = c.Fleet.Stream(c.TacticRng, b, 2);
        double into = 0.03 + 0.17 * rng.Uniform(0);
        switch (entry.Start)
        {
            case "pin-end": return into;
            case "boat-end": return 1 - into;
            case "favoured-end":
            {
                var mid = line.Mid;
                var w = c.Wind.Sample(mid.X, mid.Y, -c.Settings.CountdownS);
                double read = w.FromDeg + Tuning.Lerp(Tuning.ReadingErrorExpertDeg, Tuning.ReadingErrorNoviceDeg, c.Fleet.Skill[b]) * rng.Normal(1);
                bool bUpwind = Vec2.Dot(line.B - line.A, Vec2.FromBearing(read)) > 0;
                return bUpwind ? 1 - into : into;
            }
            default: return entry.LinePosition;
        }
    }

    /// <summary>
    /// The last minutes before the signal, time on distance: hold below the line, then go so as to reach it at the
    /// planned time (the signal plus this rider's margin); on the way, ease off whenever the line would come too soon.
    /// Returns the heading (rad) and power.
    /// </summary>
    public static (double Heading, double Power) Countdown(RaceContext c, int b, ref StartPlan plan, Vec2 p, double speed, double tws, double from, int tack)
    {
        var f = c.Fleet; var rig = f.Polars[b];
        var line = c.Course.Start;
        var spot = new Vec2(plan.SpotX, plan.SpotY); var wait = new Vec2(plan.WaitX, plan.WaitY);
        double h = Navigation.LegHeading(rig, p, spot, tws, from, tack, true);
        double remaining = plan.GoMarginS - c.Time;
        double toLine = Math.Max(0, -line.Ahead(p));
        var dirH = Vec2.FromBearing(Unit.RadToDeg(h));
        double closing = Math.Max(0.3, Vec2.Dot(dirH, line.Normal));
        double vPolar = Math.Max(1.0, rig.Speed(tws, Sailing.SignedAngle(from, h)));
        double etaFull = toLine / (vPolar * closing) + (speed < 0.7 * vPolar ? AccelerationAllowanceS : 0) + f.ReactionS[b];
        if (!plan.Holding && (wait - p).Length < 8) plan.Holding = true;
        if (remaining <= etaFull || plan.Going)
        {
            plan.Going = true; plan.Holding = true;
            double heading = Navigation.LegHeading(rig, p, Navigation.AimPoint(c.Course, 0, p), tws, from, tack, false);
            // Early: luff to kill speed (a board coasts about 2 s of its speed before it stops).
            double etaNow = toLine / Math.Max(0.3, speed * closing);
            bool early = etaNow < remaining - 0.3 || toLine < CoastS * speed * closing && remaining > CoastS;
            return (heading, early ? 0 : 1);
        }
        if (!plan.Holding) return (Navigation.LegHeading(rig, p, wait, tws, from, tack, true), 0.6);
        // Holding: luffing with the board kept well off the wind on its present tack (a board left to drift head to
        // wind falls into irons and tacks by itself).
        return (Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(HoldTwaDeg)), 0);
    }
}
