using CourseSim.Courses;
using CourseSim.Units;

namespace CourseSim.Rules;

/// <summary>
/// A board as the right-of-way rules see it: position of its centre (m), heading (deg), hull length (m). The heading's
/// unit vector is worked out once, when the heading is set (the rules ask for it, the bow and the stern several times per
/// pair: it was most of a verdict's cost); the same expression, so the same bits.
/// </summary>
public readonly record struct RuleBoard
{
    readonly double _headingDeg;
    readonly Vec2 _forward;

    public RuleBoard(double X, double Y, double HeadingDeg, double LengthM, bool Tacking = false)
        : this(X, Y, HeadingDeg, LengthM, Tacking, Vec2.FromBearing(HeadingDeg)) { }

    /// <summary>With the heading's unit vector given: only for <paramref name="forward"/> equal to the bit to
    /// Vec2.FromBearing(headingDeg), as the step snapshot holds it (Judge).</summary>
    internal RuleBoard(double x, double y, double headingDeg, double lengthM, bool tacking, Vec2 forward)
    {
        X = x; Y = y; _headingDeg = headingDeg; LengthM = lengthM; Tacking = tacking; _forward = forward;
    }

    public double X { get; init; }
    public double Y { get; init; }
    public double HeadingDeg { get => _headingDeg; init { _headingDeg = value; _forward = Vec2.FromBearing(value); } }
    public double LengthM { get; init; }
    public bool Tacking { get; init; }

    public void Deconstruct(out double X, out double Y, out double HeadingDeg, out double LengthM, out bool Tacking)
    {
        X = this.X; Y = this.Y; HeadingDeg = this.HeadingDeg; LengthM = this.LengthM; Tacking = this.Tacking;
    }

    public Vec2 Centre => new(X, Y);
    public Vec2 Forward => _forward;
    public Vec2 Bow => Centre + 0.5 * LengthM * Forward;
    public Vec2 Stern => Centre - 0.5 * LengthM * Forward;
}

public enum Tack { Starboard, Port }

/// <summary>Which rule of Part 2 decides between two boards, and which one must keep clear.</summary>
public enum RuleNumber { None = 0, Rule10 = 10, Rule11 = 11, Rule12 = 12, Rule13 = 13 }

/// <summary>The board that must keep clear (0 = the first, 1 = the second, -1 = neither) and the rule that says so.</summary>
public readonly record struct Verdict(int KeepClear, RuleNumber Rule);

/// <summary>
/// The geometry of the Racing Rules of Sailing (World Sailing, RRS 2025-2028, Definitions and Part 2, Section A), in
/// our own terms: tack from the side the wind comes over; clear astern, clear ahead and overlap from lines abeam of the
/// hulls; windward and leeward between overlapped boards on the same tack; and the rule that decides who keeps clear
/// (rules 10 to 13). The equipment in normal position is taken as the hull (the rig adds no length here).
/// </summary>
public static class RightOfWay
{
    /// <summary>The tack: starboard when the wind comes over the starboard side (the wind's true angle on the bow is positive).</summary>
    public static Tack TackOf(double headingDeg, double windFromDeg) =>
        Unit.WrapDeg180(windFromDeg - headingDeg) >= 0 ? Tack.Starboard : Tack.Port;

    /// <summary>
    /// Whether <paramref name="a"/> is clear astern of <paramref name="b"/>: all of a's hull behind the line abeam from
    /// the aftermost point of b's hull (RRS Definitions, "Clear Astern and Clear Ahead; Overlap").
    /// </summary>
    public static bool ClearAstern(in RuleBoard a, in RuleBoard b)
    {
        var fwd = b.Forward;
        var stern = b.Stern;
        double bow = Vec2.Dot(a.Bow - stern, fwd), aft = Vec2.Dot(a.Stern - stern, fwd);
        return Math.Max(bow, aft) < 0;
    }

    /// <summary>Overlap: neither board is clear astern of the other.</summary>
    public static bool Overlapped(in RuleBoard a, in RuleBoard b) => !ClearAstern(a, b) && !ClearAstern(b, a);

    /// <summary>
    /// Whether <paramref name="a"/> is to windward of <paramref name="b"/>: on the side of b the wind comes from (the
    /// windward side is the side of b's own tack: starboard tack, its starboard side).
    /// </summary>
    public static bool Windward(in RuleBoard a, in RuleBoard b, double windFromDeg)
    {
        var f = b.Forward;
        var right = new Vec2(f.Y, -f.X); // starboard of b
        double side = Vec2.Dot(a.Centre - b.Centre, right);
        return TackOf(b.HeadingDeg, windFromDeg) == Tack.Starboard ? side > 0 : side < 0;
    }

    /// <summary>
    /// Who must keep clear (rules 10-13): a board tacking (past head to wind, not yet close-hauled) keeps clear of one
    /// that is not (13); on opposite tacks, port keeps clear of starboard (10); on the same tack and overlapped, the
    /// windward board keeps clear (11); not overlapped, the one clear astern keeps clear (12). Rule 13 is checked first
    /// because it applies whatever the tacks; if both are tacking, neither is given way to here.
    /// </summary>
    public static Verdict Decide(in RuleBoard a, in RuleBoard b, double windFromDeg)
    {
        if (a.Tacking != b.Tacking) return new Verdict(a.Tacking ? 0 : 1, RuleNumber.Rule13);
        if (a.Tacking && b.Tacking) return new Verdict(-1, RuleNumber.None);
        var ta = TackOf(a.HeadingDeg, windFromDeg);
        var tb = TackOf(b.HeadingDeg, windFromDeg);
        if (ta != tb) return new Verdict(ta == Tack.Port ? 0 : 1, RuleNumber.Rule10);
        if (Overlapped(a, b)) return new Verdict(Windward(a, b, windFromDeg) ? 0 : 1, RuleNumber.Rule11);
        return new Verdict(ClearAstern(a, b) ? 0 : 1, RuleNumber.Rule12);
    }

    /// <summary>Zone lengths: three hull lengths of the board nearer the mark (RRS Definitions, "Zone").</summary>
    public const double ZoneHullLengths = 3;

    /// <summary>Whether any part of the board's hull is within the zone of a mark for boards of this hull length.</summary>
    public static bool InZone(in RuleBoard a, Vec2 mark, double hullLengthM)
    {
        double r = ZoneHullLengths * hullLengthM;
        // Nearest point of the hull segment to the mark.
        var s = a.Stern; var d = a.Bow - s;
        double t = Math.Clamp(Vec2.Dot(mark - s, d) / Math.Max(Vec2.Dot(d, d), 1e-12), 0, 1);
        return (s + t * d - mark).Length <= r;
    }

    /// <summary>Closest distance (m) between the hulls of two boards, each taken as the segment from stern to bow.</summary>
    public static double HullDistance(in RuleBoard a, in RuleBoard b) => SegmentDistance(a.Stern, a.Bow, b.Stern, b.Bow);

    /// <summary>Closest distance (m) between segments p1-q1 and p2-q2 (0 when they cross).</summary>
    public static double SegmentDistance(Vec2 p1, Vec2 q1, Vec2 p2, Vec2 q2)
    {
        if (Segment.Crosses(p1, q1, p2, q2, out _)) return 0;
        // The square root is correctly rounded and never decreasing, so the least of the four distances is the root of the
        // least squared distance: one root instead of four, the same bits (the look-ahead calls this for every sample).
        return Math.Sqrt(Math.Min(Math.Min(PointToSegment2(p1, p2, q2), PointToSegment2(q1, p2, q2)), Math.Min(PointToSegment2(p2, p1, q1), PointToSegment2(q2, p1, q1))));
    }

    /// <summary>
    /// Contact: the hulls come closer than <paramref name="clearanceM"/> (the half-widths of the two boards and their rigs
    /// swung out; about 1 m for two boards side by side, model value). RRS rule 14 asks every board to avoid it.
    /// </summary>
    public static bool Contact(in RuleBoard a, in RuleBoard b, double clearanceM = 1.0) => HullDistance(a, b) < clearanceM;

    /// <summary>The squared distance from p to segment a-b (the square of what <see cref="Vec2.Length"/> would take the root of).</summary>
    static double PointToSegment2(Vec2 p, Vec2 a, Vec2 b)
    {
        var d = b - a;
        double t = Math.Clamp(Vec2.Dot(p - a, d) / Math.Max(Vec2.Dot(d, d), 1e-12), 0, 1);
        var e = a + t * d - p;
        return e.X * e.X + e.Y * e.Y;
    }
}
