using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// The start (docs/tactics.md, "Start plans"): where each rider lines up, and how they sail the last minute on time and
/// distance with their board's own acceleration (<see cref="StartRun"/>): hold a spot one acceleration run below the
/// line, luffing; sheet in when the time to the line from the present speed equals the time left; ease off (luff, or
/// bear away along the line when too close to coast) whenever the line would come too soon. Riders misjudge the line
/// by a distance that depends on their skill (<see cref="LineErrorExpertM"/>); that misjudgement is what puts a few
/// boards over early.
/// </summary>
public static class StartPlanner
{
    /// <summary>Least and greatest distance a rider holds below the line, m (common practice: one to a dozen lengths).</summary>
    public const double HoldBackMinM = 5, HoldBackMaxM = 40;
    /// <summary>How long after the signal riders aim to put the bow on the line, on average, s (model value, calibrated: see docs/tactics.md).</summary>
    public const double StartMarginMeanS = 1.5;
    /// <summary>Spread of a rider's timing of the run (s, one standard deviation) at skill 1 and skill 0 (model values, calibrated).</summary>
    public const double TimingErrorExpertS = 0.3, TimingErrorNoviceS = 0.8;
    /// <summary>
    /// Standard deviation of a rider's misjudgement of their distance to the line (m; positive: they think they are
    /// further back than they are) at skill 1 and skill 0. Model values, calibrated so that early starters are the
    /// minority docs/tactics.md gives (common practice: judging a line from the water is hard, a few metres' error is usual).
    /// </summary>
    public const double LineErrorExpertM = 1.0, LineErrorNoviceM = 4.0;
    /// <summary>Least distance between boards where the simulation begins, m (model value: boards spread out before the sequence).</summary>
    public const double StartApartM = 10;
    /// <summary>Least distance along the line between two riders' spots, m (model value: about two board lengths, a
    /// rig's width either side; riders lined up on a start line sit a few metres apart, common practice).</summary>
    public const double SpotApartM = 5;
    /// <summary>True wind angle a rider holds while waiting below the line, deg (common practice: luffing on a close reach).</summary>
    public const double HoldTwaDeg = 60;
    /// <summary>Distance from an end of the line within which a rider making room does not bear away towards that end, m
    /// (model value: a board's length or so inside the end, plus what bearing away covers in a few seconds).</summary>
    public const double EndRoomM = 20;
    /// <summary>True wind angle and power a rider too close to the line bears away on to make room, deg and 0..1 (common practice: reach off below the line).</summary>
    public const double BackOffTwaDeg = 125, BackOffPower = 0.4;
    /// <summary>How long a rider means to hold their spot before going, s (common practice: settle a little before the run).</summary>
    public const double HoldS = 15;
    /// <summary>Power on the way to the holding point (model value: a controlled approach, not flat out).</summary>
    public const double ApproachPower = 0.6;
    /// <summary>How far beyond the line a rider steering for their spot aims, m (model value: a few lengths).</summary>
    public const double BeyondM = 10;
    /// <summary>How far inside an end of the line a rider aims, m (common practice: close to the mark, not at it).</summary>
    public const double EndInsetM = 5;
    /// <summary>Least distance, m, from a rider's spot to the end of the line the start tack sails towards (model value:
    /// about what a rider luffing on that tack drifts along the line while holding, 13-15 m over 25-30 s in the
    /// forty-board demo; docs/tactics.md).</summary>
    public const double EndDriftM = 15;
    /// <summary>Early by more than this, s, the rider eases off (model value: half a decision interval's worth).</summary>
    public const double EarlyToleranceS = 0.25;

    /// <summary>
    /// Lines the fleet up below the start line: each rider gets a spot on the line and a holding point one acceleration
    /// run below it, and begins the sequence further back. Boards are placed in the canonical order (their ids), each
    /// rider's draws from their own stream.
    /// </summary>
    public static void PlaceFleet(RaceContext c)
    {
        var line = c.Course.Start;
        var f = c.Fleet; var w = c.World;
        double tws = Unit.KnotsToMs(c.Setup.Wind.SpeedKn);
        var placed = new List<Vec2>();
        var spots = new List<double>(); // the spots taken, as shares of the line
        // Least shares of the line kept from its ends (drift at most 1 - inset: the clamp's bounds below never cross).
        double inset = Math.Min(0.5, EndInsetM / Math.Max(line.Length, 1e-9));
        double drift = Math.Min(1 - inset, EndDriftM / Math.Max(line.Length, 1e-9));
        foreach (int b in f.ByRank)
        {
            var entry = c.Setup.Boards[b];
            double share = StartPosition(c, b, entry);
            var spot = line.A + Math.Clamp(share, inset, 1 - inset) * (line.B - line.A);
            // The first leg's heading from the spot, on starboard when beating.
            double h = Navigation.LegHeading(f.Polars[b], spot, c.Course.Steps[0].Target, tws, c.Setup.Wind.DirectionDeg, 1);
            var dir = Vec2.FromBearing(Unit.RadToDeg(h));
            // Holding on the start tack, a board drifts along the line towards the end that tack sails to: a spot near
            // that end is taken far enough in that the drift leaves the line still fetchable on the start tack.
            bool towardB = Vec2.Dot(dir, line.B - line.A) > 0;
            double lo = towardB ? inset : drift, hi = towardB ? 1 - drift : 1 - inset;
            share = Math.Clamp(share, lo, hi);
            // A spot on top of one taken by a board placed before (the ends' clamps put every rider who wanted the end
            // on the same point, and two riders holding on one point collide) moves along the line towards its middle,
            // a spacing at a time, to the first free place (or the nearest while the line has none).
            double apart = SpotApartM / Math.Max(line.Length, 1e-9), toward = share < 0.5 ? 1 : -1;
            for (int tries = 0; tries < 40 && spots.Any(o => Math.Abs(o - share) < apart * (1 - 1e-9)); tries++)
            {
                double next = share + toward * apart;
                if (next < lo || next > hi) break;
                share = next;
            }
            spots.Add(share);
            spot = line.A + share * (line.B - line.A);
            // Hold one acceleration run below the line: from rest there, the board is up to speed at the line.
            var run = StartRun.For(f.Polars[b], tws, Sailing.SignedAngle(c.Setup.Wind.DirectionDeg, h), c.Settings.Pumping);
            double back = Math.Clamp(run.DistanceToSpeedM, HoldBackMinM, HoldBackMaxM);
            var wait = spot - back * dir;
            var rng = f.Stream(c.TacticRng, b, 1);
            var start = wait - (30 + 30 * rng.Uniform(0)) * dir;
            // Boards begin the sequence apart: a start spot taken by a board placed before is moved further back.
            for (int tries = 0; tries < 20 && placed.Any(o => (o - start).Length < StartApartM); tries++) start = start - 10 * dir;
            placed.Add(start);
            var e = f.Entities[b];
            double skill = f.Skill[b];
            w.Get<StartPlan>(e) = new StartPlan
            {
                SpotX = spot.X, SpotY = spot.Y, WaitX = wait.X, WaitY = wait.Y,
                GoMarginS = (entry.StartMarginS ?? StartMarginMeanS) + rng.Normal(1) * Tuning.Lerp(TimingErrorExpertS, TimingErrorNoviceS, skill),
                LineErrorM = rng.Normal(3) * Tuning.Lerp(LineErrorExpertM, LineErrorNoviceM, skill),
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
    /// The last minutes before the signal, time on distance (docs/tactics.md, "Start plans"). The rider reckons the
    /// distance from their bow to the line along the run-in (with their misjudgement of it) and the time their board
    /// takes to sail it at full power from the speed it has now (<see cref="StartRun"/>), plus their reaction and
    /// sheeting-in time. Until that time equals the time left to their planned arrival they sail to their holding point
    /// and hold it, luffing; then they go. Going, whenever full power would bring them to the line too soon they ease
    /// off: luff on course while coasting cannot carry them over, otherwise bear away along the line, sheeted out.
    /// Returns the heading (rad) and power.
    /// </summary>
    public static (double Heading, double Power) Countdown(RaceContext c, int b, ref StartPlan plan, Vec2 p, double headingNow, double speed, double tws, double from, int tack)
    {
        var f = c.Fleet; var rig = f.Polars[b];
        var line = c.Course.Start;
        var spot = new Vec2(plan.SpotX, plan.SpotY); var wait = new Vec2(plan.WaitX, plan.WaitY);
        double runH = RunHeading(c, rig, p, spot, tws, from, tack);
        var dirRun = Vec2.FromBearing(Unit.RadToDeg(runH));
        double half = 0.5 * f.LengthM[b];
        var bow = p + half * Vec2.FromBearing(Unit.RadToDeg(headingNow));
        double toLine = Math.Max(0, -line.Ahead(bow) + plan.LineErrorM);
        double closing = Math.Max(0.3, Vec2.Dot(dirRun, line.Normal));
        double along = toLine / closing;
        var run = StartRun.For(rig, tws, Sailing.SignedAngle(from, runH), c.Settings.Pumping);
        double sheetLag = Tuning.Lerp(Tuning.SheetLagExpertS, Tuning.SheetLagNoviceS, f.Skill[b]);
        double need = run.TimeToCover(along, speed) + f.ReactionS[b] + (speed < 0.7 * run.FullSpeed ? sheetLag : 0);
        double remaining = plan.GoMarginS - c.Time;
        // Wait further back until it is time to sail to the holding point and hold it for a while.
        double toWait = (wait - p).Length;
        if (!plan.Approaching && remaining <= toWait / (ApproachPower * run.FullSpeed) + run.TimeToSpeedS + need + HoldS) plan.Approaching = true;
        double coast = run.CoastDistance(speed) + half;
        double holdBack = (wait - spot).Length;
        // Holding from the holding point, or as soon as coasting would carry the board to its depth below the line
        // (an approach deflected by other boards need not find the point itself).
        if (!plan.Holding && plan.Approaching && (toWait < 8 || toLine - coast * closing <= holdBack * closing)) plan.Holding = true;
        if (remaining <= need + 0.5 * c.Settings.DecisionIntervalS) plan.Going = plan.Approaching = plan.Holding = true;
        if (plan.Going)
        {
            plan.Holding = true;
            if (need >= remaining - EarlyToleranceS) return (runH, 1);
            // Early: luff on course while coasting cannot carry the bow to the line, else bear away along it.
            if (along > coast) return (runH, 0);
            return (AlongLine(line, from, tack), 0);
        }
        if (!plan.Approaching) return (Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(HoldTwaDeg)), 0);
        if (!plan.Holding) return (Navigation.LegHeading(rig, p, wait, tws, from, tack, true), ApproachPower);
        // Holding: luffing with the board kept well off the wind on its present tack (a board left to drift head to
        // wind falls into irons and tacks by itself). Too close to the line (within half the holding distance, or
        // where coasting would carry it over), the rider bears away on the same tack, sheeted in a little, to make
        // room again: no tack or gybe.
        if (toLine < 0.5 * holdBack * closing || along < coast) return BackOff(c, b, p, wait, tws, from, tack);
        return (Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(HoldTwaDeg)), 0);
    }

    /// <summary>
    /// Making room below the line (returning after an early start, or too close while holding): bear away on the
    /// present tack, part sheeted, when that takes the board back from the line (an upwind start); otherwise (a line
    /// whose course side is off the wind) sail to the holding point. Heading rad, power.
    /// </summary>
    public static (double Heading, double Power) BackOff(RaceContext c, int b, Vec2 p, Vec2 wait, double tws, double from, int tack)
    {
        double h = Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(BackOffTwaDeg));
        var line = c.Course.Start;
        var dir = Vec2.FromBearing(Unit.RadToDeg(h));
        // Bearing away along the line towards one of its ends, within EndRoomM of it (or past it), would take the board
        // outside the line, from where it can only start by tacking or gybing back: there it luffs and drifts back instead.
        var ab = line.B - line.A;
        double len = Math.Max(ab.Length, 1e-9), u = Vec2.Dot(p - line.A, ab) / (len * len), room = EndRoomM / len;
        double outward = Vec2.Dot(dir, ab);
        // Returning after the signal, the board sails back to its holding point instead (luffing there it would stay).
        if ((u < room && outward < 0) || (u > 1 - room && outward > 0))
            return c.Time < 0 ? (Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(HoldTwaDeg)), 0)
                : (Navigation.LegHeading(c.Fleet.Polars[b], p, wait, tws, from, tack, true), ApproachPower);
        if (Vec2.Dot(dir, line.Normal) < -0.3) return (h, BackOffPower);
        return (Navigation.LegHeading(c.Fleet.Polars[b], p, wait, tws, from, tack, true), ApproachPower);
    }

    /// <summary>
    /// The heading of the run to the line: the first leg's heading on the present tack (close-hauled on a beat), unless
    /// it would cross the line outside its ends (less the inset), when the rider steers for the spot (when it can be
    /// fetched) or takes the other tack.
    /// </summary>
    public static double RunHeading(RaceContext c, RigPolar rig, Vec2 p, Vec2 spot, double tws, double from, int tack)
    {
        var line = c.Course.Start;
        double h = Navigation.LegHeading(rig, p, Navigation.AimPoint(c.Course, 0, p), tws, from, tack, false);
        double u = CrossingShare(line, p, h);
        double inset = Math.Min(0.5, EndInsetM / Math.Max(line.Length, 1e-9));
        if (u >= inset && u <= 1 - inset) return h;
        // Steer for a point just beyond the line at the spot, so the course crosses the line rather than ends on it.
        double toSpot = Unit.DegToRad((spot + BeyondM * line.Normal - p).Bearing);
        double twa = Sailing.SignedAngle(from, toSpot);
        if (Math.Sign(twa) == tack && Math.Abs(twa) >= rig.BestTwa(tws, true) && Math.Abs(twa) <= Math.PI / 2 + 0.35) return toSpot;
        double other = Sailing.CloseHauledOtherTack(rig, from, tack, tws);
        double uo = CrossingShare(line, p, other);
        return uo >= inset && uo <= 1 - inset ? other : toSpot;
    }

    /// <summary>Where along the line (0 at A, 1 at B) a course from p on heading h meets it; NaN when it does not ahead.</summary>
    static double CrossingShare(CourseLine line, Vec2 p, double h)
    {
        var along = line.B - line.A;
        var dir = Vec2.FromBearing(Unit.RadToDeg(h));
        double den = Vec2.Cross(dir, along);
        if (Math.Abs(den) < 1e-9) return double.NaN;
        var ap = line.A - p;
        double ahead = Vec2.Cross(ap, along) / den;
        return ahead < 0 ? double.NaN : Vec2.Cross(ap, dir) / den;
    }

    /// <summary>The heading along the line on the present tack (the way of the line's two directions nearer the tack's side), rad.</summary>
    static double AlongLine(CourseLine line, double from, int tack)
    {
        double hb = Unit.DegToRad((line.B - line.A).Bearing);
        double ha = Unit.WrapRadPi(hb + Math.PI);
        return Math.Sign(Sailing.SignedAngle(from, hb)) == tack ? hb : ha;
    }
}
