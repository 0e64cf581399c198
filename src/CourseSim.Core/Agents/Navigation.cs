using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// The rider's navigation (docs/tactics.md): where to aim for a course step, and the heading that makes good the rig's
/// best VMG towards it (laylines). Pure functions of what the rider knows: their position, the wind as they read it,
/// their rig's polar and the course.
/// </summary>
public static class Navigation
{
    /// <summary>Least time between two tacks or gybes the simple tactic allows, s (model value: keeps it from dithering in shifts).</summary>
    public const double MinTimeBetweenTurnsS = 12;
    /// <summary>Distance off a mark, towards the outside of the turn, that a rider aims at, m (common practice: round close but clear).</summary>
    public const double RoundingOffsetM = 8;
    /// <summary>Overstand allowed past the layline before tacking or gybing, deg (model value).</summary>
    public const double LaylineMarginDeg = 2;
    /// <summary>
    /// Deepest true wind angle a rider runs at, deg: off the plane a rig's best downwind VMG can be within a degree or two
    /// of dead downwind, where a few degrees of wind shift (or of the rider's misreading of it) put the board by the lee
    /// and back, and riders keep off it by this much to stay clear of an unwanted gybe (common practice; the VMG given up
    /// is a few per cent: cos 165 deg is 0.966 of cos 180 deg). The polar itself still reports the best angle.
    /// </summary>
    public const double RunMaxTwaDeg = 165;
    /// <summary>Within this distance of the aim point a running rider steers straight at it, m (model value).</summary>
    public const double CloseRunM = 40;
    /// <summary>How far ahead a rider checks which side of the next mark the present course passes it, m (model value).</summary>
    public const double MarkSideLookM = 60;
    /// <summary>Share of a finish line's length, at each end, a rider keeps off when choosing where to cross it (model value).</summary>
    public const double FinishEndInset = 0.15;

    /// <summary>
    /// The heading (rad) to make good towards <paramref name="target"/>: straight at it when it lies between the best
    /// upwind and downwind VMG angles; otherwise at the best VMG angle on the present tack (or gybe), turning onto the
    /// other when the target can be fetched from it (the layline), if turning is allowed now.
    /// </summary>
    public static double LegHeading(RigPolar rig, Vec2 p, Vec2 target, double tws, double fromDeg, int tack, bool mayTurn = true)
    {
        var d = target - p;
        double wind = Unit.DegToRad(fromDeg);
        if (d.Length < 1e-6) return wind - tack * Math.PI / 2;
        double bearing = Unit.DegToRad(d.Bearing);
        double direct = Unit.WrapRadPi(wind - bearing); // signed TWA of the direct course
        double up = rig.BestTwa(tws, true), down = Math.Min(rig.BestTwa(tws, false), Unit.DegToRad(RunMaxTwaDeg));
        double margin = Unit.DegToRad(LaylineMarginDeg);
        // The target is on the layline of the other tack (or gybe) when its direct TWA, on that side, has reached the
        // best VMG angle; until then the present one is held.
        bool otherSide = -tack * direct > 0;
        if (Math.Abs(direct) < up)
        {
            bool fetchOther = otherSide && Math.Abs(direct) >= up - margin;
            return Unit.WrapRadPi(wind - (fetchOther && mayTurn ? -tack : tack) * up);
        }
        // Close to the aim point on a run the rider steers straight at it: gybing angles gain nothing over a few lengths.
        if (Math.Abs(direct) > down && d.Length > CloseRunM)
        {
            bool fetchOther = otherSide && Math.Abs(direct) <= down + margin;
            return Unit.WrapRadPi(wind - (fetchOther && mayTurn ? -tack : tack) * down);
        }
        return bearing;
    }

    /// <summary>
    /// Where a rider aims for step i. A mark is approached by an entry point beside it on the side it is to be left
    /// (outside the incoming leg), then an exit point just outside it on the rounding ray, so the track goes round it the
    /// required way; close to the exit point the rider already looks to the step after. Finishing off the wind, the
    /// rider picks the point of the line (upwind, the laylines to its middle rule).
    /// </summary>
    public static Vec2 AimPoint(Course course, int step, Vec2 p, double headingRad = double.NaN, double fromDeg = double.NaN)
    {
        var s = course.Steps[step];
        if (s.Kind == StepKind.Finish && s.Line is { } finish && !double.IsNaN(headingRad)
            && Math.Abs(Sailing.SignedAngle(fromDeg, Unit.DegToRad((finish.Mid - p).Bearing))) > Math.PI / 2)
            return FinishAim(finish, p, headingRad);
        if (s.Kind != StepKind.Mark) return s.Target;
        var mark = s.Target;
        var din = course.Incoming(step);
        var sideDir = s.Side == Rounding.Port ? new Vec2(din.Y, -din.X) : new Vec2(-din.Y, din.X);
        var rel = p - mark;
        bool correctSide = Vec2.Dot(rel, sideDir) > 0;
        // The turn for the exit begins half the offset short of abeam (model value). From the full offset short of it a
        // board at planing speed cut across the mark's wrong side (the 12-board demo, seeds 1-10: 13 wrong-side passes,
        // 5 of them at the mark after the run at about 20 kn); from abeam, boards turned late into others at the mark
        // (contacts 6 -> 11, 5 of them a turn begun too close). Half the offset: 5 wrong-side passes and 5 contacts.
        bool reached = Vec2.Dot(rel, din) >= -0.5 * RoundingOffsetM;
        if (!reached || !correctSide) return mark + RoundingOffsetM * sideDir;
        var exit = mark + RoundingOffsetM * course.Outside(step);
        if ((exit - p).Length > 4 || step + 1 >= course.Steps.Count) return exit;
        return course.Steps[step + 1].Target;
    }

    /// <summary>
    /// Where a rider finishing off the wind crosses the line: where the present heading meets it, kept off its ends (so
    /// a fleet finishes along the whole line rather than all converging on its middle; common practice: any point of
    /// the line will do, sail the shortest way to it); the middle when the heading does not meet the line ahead.
    /// </summary>
    public static Vec2 FinishAim(CourseLine line, Vec2 p, double headingRad)
    {
        var along = line.B - line.A;
        var dir = Vec2.Of(Math.SinCos(headingRad));
        double den = Vec2.Cross(dir, along);
        if (Math.Abs(den) < 1e-9) return line.Mid;
        // p + s dir = A + u along: s = cross(A - p, along) / den, u = cross(A - p, dir) / den.
        var ap = line.A - p;
        double ahead = Vec2.Cross(ap, along) / den, u = Vec2.Cross(ap, dir) / den;
        if (ahead <= 0) return line.Mid;
        u = Math.Clamp(u, FinishEndInset, 1 - FinishEndInset);
        return line.A + u * along;
    }

    /// <summary>
    /// Whatever the tactic, a rider does not sail past a mark on the wrong side: when the mark is ahead within
    /// <see cref="MarkSideLookM"/> and the course would leave it on the wrong hand (or closer than a board length), a
    /// beating rider tacks onto the best VMG angle of the other tack (on a reach or a run the aim point already steers
    /// round it).
    /// </summary>
    public static double MarkSideGuard(Course course, RigPolar rig, int step, Vec2 p, double heading, double tws, double fromDeg, int tack)
    {
        if (!course.LeavesOnWrongHand(step, p, Vec2.FromBearing(Unit.RadToDeg(heading)), 3, MarkSideLookM, 3)) return heading;
        double twa = Math.Abs(Sailing.SignedAngle(fromDeg, heading));
        int side = Math.Sign(Sailing.SignedAngle(fromDeg, heading)); if (side == 0) side = tack;
        // Beating only: running, the rider already steers straight at the aim point within CloseRunM of it.
        return twa < Unit.DegToRad(75) ? Sailing.CloseHauledOtherTack(rig, fromDeg, side, tws) : heading;
    }

    /// <summary>The sustained polar must beat what the board makes off the plane at the wanted angle by this share before
    /// a rider off the plane detours to get planing (model value: a detour for a few per cent is not worth it).</summary>
    public const double PlaningDetourGain = 1.15;

    /// <summary>
    /// Getting planing (docs/engine.md, "Getting planing"): a rider off the plane whose wanted angle only pays when
    /// planing, and who cannot get planing at that angle, heads to the nearest angle on the same tack or gybe at which
    /// the board does get planing (downwind: heads up; upwind: bears away) and returns to the wanted angle once
    /// planing (common practice: head up to get going, bear away once planing, head up again when the board drops).
    /// </summary>
    public static double PlaningGuard(RigPolar rig, double heading, double tws, double fromDeg, bool planing)
    {
        if (planing) return heading;
        double twa = Sailing.SignedAngle(fromDeg, heading), a = Math.Abs(twa);
        int side = twa >= 0 ? 1 : -1;
        double sustained = rig.Speed(tws, a), getting = rig.GetPlaningSpeed(tws, a);
        if (sustained < PlaningDetourGain * getting) return heading;
        bool downwind = a > Math.PI / 2;
        double g = rig.GetPlaningTwa(tws, !downwind);
        if (double.IsNaN(g)) return heading;
        double to = downwind ? Math.Min(a, g) : Math.Max(a, g);
        return Unit.WrapRadPi(Unit.DegToRad(fromDeg) - side * to);
    }
}

/// <summary>The engine's navigation for tactics, set up for one board's decision (the arithmetic of <see cref="Navigation"/>).</summary>
public sealed class Navigator : INavigator
{
    RigPolar _rig = null!; Vec2 _p; double _tws, _from; int _tack;
    public void Set(RigPolar rig, Vec2 p, double tws, double from, int tack) { _rig = rig; _p = p; _tws = tws; _from = from; _tack = tack; }
    public double ToTarget(Vec2 target, bool mayTurn = true) =>
        Unit.WrapDeg360(Unit.RadToDeg(Navigation.LegHeading(_rig, _p, target, _tws, _from, _tack, mayTurn)));
    public double AtTrueWindAngle(double twaDeg) => Unit.WrapDeg360(_from - twaDeg);
    public double BestAngle(bool upwind) => Unit.RadToDeg(_rig.BestTwa(_tws, upwind));
}
