using System.Runtime.Intrinsics;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Rules;

/// <summary>
/// Who keeps clear between two boards, and the predictions a rider's lookout makes (closest approach, the hull gap over
/// the next seconds, the track that ducks astern). Everything reads the step snapshot: the same instant for every board.
/// </summary>
public static class Judge
{
    /// <summary>Rule numbers as text, for codes 0..31 (a rule is kept as its number in a byte).</summary>
    public static readonly string[] RuleText = Enumerable.Range(0, 32).Select(i => i == 0 ? "" : i.ToString(System.Globalization.CultureInfo.InvariantCulture)).ToArray();

    public const byte Rule13 = 13, Rule14 = 14, Rule16 = 16, Rule18 = 18, Rule22 = 22;
    /// <summary>Rule 16.1 (a right-of-way board changing course gives the other room to keep clear), as a code.</summary>
    public const byte Rule161 = 161;

    /// <summary>A rule code as text ("16.1" for <see cref="Rule161"/>).</summary>
    public static string RuleName(byte rule) => rule == Rule161 ? "16.1" : RuleText[rule];

    /// <summary>
    /// A right-of-way board's change of course counts under rule 16.1 from this many degrees (model value: the judge's
    /// old "changed course" threshold), and the keep-clear rider needs their reaction time plus this long to respond to
    /// it (model value: a bear-away or a luff of a board takes one to two seconds to open a gap), s.
    /// </summary>
    public const double AlterDeg = 15, RoomActS = 2;

    /// <summary>
    /// How far (deg) board b's heading has turned over the last <paramref name="windowS"/> seconds (at most four): the
    /// largest difference between its heading now and the lookout's once-a-second samples within the window.
    /// </summary>
    public static double Altered(RaceContext c, int b, double windowS)
    {
        ref readonly var w = ref c.World.Get<Wake>(c.Fleet.Entities[b]);
        double h = c.Snapshot.Heading[b], age = c.Time - w.HistS, turned = 0;
        ReadOnlySpan<double> hist = [w.H0, w.H1, w.H2, w.H3];
        for (int i = 0; i < Math.Min(w.HistN, 4) && age + i <= windowS; i++)
            turned = Math.Max(turned, Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(h - hist[i]))));
        return turned;
    }

    /// <summary>The window within which a right-of-way board's change of course leaves keep-clear board k no room (s).</summary>
    public static double RoomWindowS(RaceContext c, int k) => Math.Min(4, c.Fleet.ReactionS[k] + RoomActS);

    static RuleBoard Of(RaceContext c, int b, double headingRad, bool tacking)
    {
        var s = c.Snapshot;
        double deg = Unit.RadToDeg(headingRad);
        // At a lookout the snapshot holds each board's heading vector, FromBearing of exactly this expression of its
        // heading: taken from there when the heading asked about is the board's own (the same bits, no sine and cosine).
        if (s.HeadsReady && BitConverter.DoubleToInt64Bits(headingRad) == BitConverter.DoubleToInt64Bits(s.Heading[b]))
            return new RuleBoard(s.X[b], s.Y[b], deg, c.Fleet.LengthM[b], tacking, new Vec2(s.HeadX[b], s.HeadY[b]));
        return new RuleBoard(s.X[b], s.Y[b], deg, c.Fleet.LengthM[b], tacking);
    }

    /// <summary>
    /// Who keeps clear between boards a and b, a sailing <paramref name="headingA"/> (a heading on the other tack counts
    /// as tacking: rule 13). A capsized board is given way to by everyone and owes nothing (rule 22). Rule 18 (mark-room,
    /// Appendix B: while rounding or passing, within rules.mark_room_m of the mark) puts the outside overlapped board to
    /// keep clear, except between boards on opposite tacks on a beat (18.1(a)). Returns -1 when nobody keeps clear.
    /// </summary>
    public static (int KeepClear, byte Rule) Decide(RaceContext c, int a, double headingA, int b)
    {
        var s = c.Snapshot;
        if (s.Capsized[a] && s.Capsized[b]) return (-1, 0);
        if (s.Capsized[b]) return (a, Rule22);
        if (s.Capsized[a]) return (b, Rule22);
        double from = s.FromDeg[a];
        bool aTurning = s.Tacking[a] || FastMath.Sign(Sailing.SignedAngle(from, headingA)) != FastMath.Sign(Sailing.SignedAngle(from, s.Heading[a])) && Math.Abs(Sailing.SignedAngle(from, headingA)) < Math.PI / 2;
        var ra = Of(c, a, headingA, aTurning);
        var rb = Of(c, b, s.Heading[b], s.Tacking[b]);
        if (ra.Tacking && rb.Tacking)
        {
            // Appendix B 13: both tacking, the one on the other's port side or astern keeps clear.
            var f = rb.Forward; var port = new Vec2(-f.Y, f.X);
            return (Vec2.Dot(ra.Centre - rb.Centre, port) > 0 ? a : b, Rule13);
        }
        var v = RightOfWay.Decide(ra, rb, from);
        int keep = v.KeepClear == 0 ? a : v.KeepClear == 1 ? b : -1;
        byte rule = (byte)v.Rule;
        // Mark-room: both rounding or passing the same mark, overlapped (a single mark, either mark of a gate, or an
        // end of the finishing line: Appendix B's rule 18 applies at each; the mark is the one nearer the pair).
        var steps = c.Course.Steps;
        if (s.NextStep[a] == s.NextStep[b] && s.NextStep[a] < steps.Count && v.Rule != RuleNumber.Rule13)
        {
            var mark = MarkOf(steps[s.NextStep[a]], 0.5 * (ra.Centre + rb.Centre));
            double da = (ra.Centre - mark).Length, db = (rb.Centre - mark).Length;
            bool beatOpposite = v.Rule == RuleNumber.Rule10 && (Math.Abs(Sailing.SignedAngle(from, headingA)) < Math.PI / 2 || Math.Abs(Sailing.SignedAngle(from, s.Heading[b])) < Math.PI / 2);
            if (da < c.Rules.MarkRoomM && db < c.Rules.MarkRoomM && RightOfWay.Overlapped(ra, rb) && !beatOpposite)
            {
                // Inside: the board on the mark's side of the other (abeam), not merely the nearer one.
                var fb = rb.Forward; var right = new Vec2(fb.Y, -fb.X);
                bool aInside = FastMath.Sign(Vec2.Dot(ra.Centre - rb.Centre, right)) == FastMath.Sign(Vec2.Dot(mark - rb.Centre, right));
                return (aInside ? b : a, Rule18);
            }
        }
        return (keep, rule);
    }

    /// <summary>The mark of a course step that boards near <paramref name="p"/> round or pass: the mark itself, the nearer mark of a gate, the nearer end of the finishing line.</summary>
    public static Vec2 MarkOf(CourseStep step, Vec2 p)
    {
        switch (step.Kind)
        {
            case StepKind.Gate:
                var m1 = step.Mark!.Position; var m2 = step.Second!.Position;
                return (m1 - p).Length <= (m2 - p).Length ? m1 : m2;
            case StepKind.Finish when step.Line is { } line:
                return (line.A - p).Length <= (line.B - p).Length ? line.A : line.B;
            default:
                return step.Target;
        }
    }

    /// <summary>
    /// Math.Sin and Math.Cos of <paramref name="h"/> (rad), taken from the snapshot's track of board k when h is that
    /// track to the bit (the snapshot holds exactly Math.Sin and Math.Cos of it): the look-ahead asks for the present
    /// track's sine and cosine again and again.
    /// </summary>
    public static (double Sin, double Cos) TrackSinCos(StepSnapshot s, int k, double h) =>
        BitConverter.DoubleToInt64Bits(h) == BitConverter.DoubleToInt64Bits(s.Track[k]) ? (s.TrackSin[k], s.TrackCos[k]) : Math.SinCos(h);

    /// <summary>
    /// Closest point of approach within the lookahead: time (s) and centre distance (m), a making good the track whose
    /// sine and cosine are given, at va (m/s), b holding its present track and speed (tracks, not headings: leeway is
    /// large at low speed); and the closing speed (<see cref="ClosingSpeed"/>, from the same relative velocity).
    /// </summary>
    public static (double T, double D, double Closing) CpaAndClosing(StepSnapshot s, int a, double sinHa, double cosHa, double va, int b)
    {
        double rx = s.X[b] - s.X[a], ry = s.Y[b] - s.Y[a];
        double vx = s.Speed[b] * s.TrackSin[b] - va * sinHa, vy = s.Speed[b] * s.TrackCos[b] - va * cosHa;
        double vv = vx * vx + vy * vy;
        double t = vv < 1e-9 ? 0 : Math.Clamp(-(rx * vx + ry * vy) / vv, 0, Lookout.LookaheadS);
        double dx = rx + vx * t, dy = ry + vy * t;
        return (t, Math.Sqrt(dx * dx + dy * dy), Math.Sqrt(vv));
    }

    /// <summary>
    /// <see cref="CpaAndClosing"/> against each of <paramref name="others"/>, into <paramref name="t"/>,
    /// <paramref name="d"/> and <paramref name="closing"/> (as long as others at least): four boards per
    /// <see cref="Vector256{T}"/> (the engine issue's SIMD across boards), with the same operations in the same order
    /// and no fused multiply-add, so each value has the bits of the one-at-a-time version (the test compares them).
    /// </summary>
    public static void CpaAndClosingAll(StepSnapshot s, int a, double sinHa, double cosHa, double va, ReadOnlySpan<int> others,
        Span<double> t, Span<double> d, Span<double> closing)
    {
        int n = others.Length;
        if (t.Length < n || d.Length < n || closing.Length < n) throw new ArgumentException("output spans shorter than the boards");
        if (n == 0) return;
        double[] X = s.X, Y = s.Y, V = s.Speed, TS = s.TrackSin, TC = s.TrackCos;
        var xa = Vector256.Create(X[a]); var ya = Vector256.Create(Y[a]);
        var sa = Vector256.Create(va * sinHa); var ca = Vector256.Create(va * cosHa);
        var tiny = Vector256.Create(1e-9); var zero = Vector256<double>.Zero; var ahead = Vector256.Create(Lookout.LookaheadS);
        Span<double> bt = stackalloc double[4], bd = stackalloc double[4], bc = stackalloc double[4];
        for (int q0 = 0; q0 < n; q0 += 4)
        {
            // A short last block repeats its last board (its lanes are worked out and dropped).
            int b0 = others[q0], b1 = others[Math.Min(q0 + 1, n - 1)], b2 = others[Math.Min(q0 + 2, n - 1)], b3 = others[Math.Min(q0 + 3, n - 1)];
            var rx = Vector256.Create(X[b0], X[b1], X[b2], X[b3]) - xa;
            var ry = Vector256.Create(Y[b0], Y[b1], Y[b2], Y[b3]) - ya;
            var vb = Vector256.Create(V[b0], V[b1], V[b2], V[b3]);
            var vx = vb * Vector256.Create(TS[b0], TS[b1], TS[b2], TS[b3]) - sa;
            var vy = vb * Vector256.Create(TC[b0], TC[b1], TC[b2], TC[b3]) - ca;
            var vv = vx * vx + vy * vy;
            var raw = -(rx * vx + ry * vy) / vv;
            // Math.Clamp(raw, 0, LookaheadS), and 0 when the boards hardly move against each other.
            var tt = Vector256.ConditionalSelect(Vector256.LessThan(raw, zero), zero, Vector256.ConditionalSelect(Vector256.GreaterThan(raw, ahead), ahead, raw));
            tt = Vector256.ConditionalSelect(Vector256.LessThan(vv, tiny), zero, tt);
            var dx = rx + vx * tt; var dy = ry + vy * tt;
            var dd = Vector256.Sqrt(dx * dx + dy * dy); var cc = Vector256.Sqrt(vv);
            int m = Math.Min(4, n - q0);
            if (m == 4) { tt.CopyTo(t[q0..]); dd.CopyTo(d[q0..]); cc.CopyTo(closing[q0..]); continue; }
            tt.CopyTo(bt); dd.CopyTo(bd); cc.CopyTo(bc);
            bt[..m].CopyTo(t[q0..]); bd[..m].CopyTo(d[q0..]); bc[..m].CopyTo(closing[q0..]);
        }
    }

    /// <summary>Relative speed of b seen from a board making good the track whose sine and cosine are given, at v, m/s.</summary>
    public static double ClosingSpeed(StepSnapshot s, double sinH, double cosH, double v, int b)
    {
        double vx = s.Speed[b] * s.TrackSin[b] - v * sinH, vy = s.Speed[b] * s.TrackCos[b] - v * cosH;
        return Math.Sqrt(vx * vx + vy * vy);
    }

    /// <summary>The hull-to-hull gap a give-way rider aims to keep when passing, m.</summary>
    public static double PassClear(StepSnapshot s, double sinH, double cosH, double v, int b) => Lookout.PassClearM + Lookout.PassClearPerMs * ClosingSpeed(s, sinH, cosH, v, b);

    /// <summary>The track (rad) from board a at speed v that meets the point astern of board b where b will then be.</summary>
    public static double DuckTrack(RaceContext c, int a, int b, double v)
    {
        var s = c.Snapshot;
        double back = 0.5 * c.Fleet.LengthM[b] + Lookout.PassClearM + 2;
        var (hs, hc) = Math.SinCos(s.Heading[b]);
        double px = s.X[b] - back * hs, py = s.Y[b] - back * hc;
        double vx = s.Speed[b] * s.TrackSin[b], vy = s.Speed[b] * s.TrackCos[b];
        // Lead: two passes of the fixed-point estimate of the meeting time.
        double t = 0;
        for (int i = 0; i < 2; i++)
        {
            double dx = px + vx * t - s.X[a], dy = py + vy * t - s.Y[a];
            t = Math.Min(Lookout.LookaheadS, Math.Sqrt(dx * dx + dy * dy) / Math.Max(v, 0.5));
        }
        return Math.Atan2(px + vx * t - s.X[a], py + vy * t - s.Y[a]);
    }

    /// <summary>
    /// Smallest gap between the two hulls over the next seconds (sampled every half second to 6 s), board a making
    /// good track h at speed v and b holding its track and speed (with the acceleration read at the lookout), each hull
    /// along its heading. Exact when the gap is below <paramref name="below"/>; otherwise some value not below it (an
    /// instant whose centres are too far apart for the hulls to come within it is not worked out: the look-ahead's
    /// callers only use the gap when it falls short of the clearance they want).
    /// </summary>
    public static double PredictedHullGap(RaceContext c, int a, double h, double sinH, double cosH, double v, int b, double below = double.PositiveInfinity, double horizonS = 6)
        => new GapProbe(c, a, h, sinH, cosH, v).Gap(c, b, below, horizonS);

    /// <summary>
    /// What <see cref="PredictedHullGap"/> works out once for board a making good track h at v (its turn onto h, its
    /// heading's unit vector), shared by every board it is checked against: a candidate course is vetted against
    /// several boards. Same arithmetic, in the same order, as computing it afresh for each (the results are the same bits).
    /// </summary>
    public readonly struct GapProbe
    {
        readonly double _ax, _ay, _sinH, _cosH, _v, _vNow, _sm, _cm, _turnS, _la, _fax, _fay, _reach;

        /// <summary>The same probe for a speed of <paramref name="v"/> along the same track (what depends on the track alone is kept).</summary>
        public GapProbe WithSpeed(double v) => new(this, v);
        /// <summary>The sine and cosine of the track the probe was made for.</summary>
        public double SinH => _sinH;
        public double CosH => _cosH;

        GapProbe(in GapProbe p, double v)
        {
            this = p;
            _v = v;
            _reach = Math.Max(_vNow, Math.Abs(v)) * 6;
        }

        public GapProbe(RaceContext c, int a, double h, double sinH, double cosH, double v)
        {
            var s = c.Snapshot;
            _ax = s.X[a]; _ay = s.Y[a]; _sinH = sinH; _cosH = cosH; _v = v;
            _la = c.Fleet.LengthM[a];
            var fa = Vec2.FromBearing(Unit.RadToDeg(h));
            _fax = fa.X; _fay = fa.Y;
            // The turn onto h takes time (a slow board turns at the rate the rig can steer it, a fast one carves quicker;
            // model value 20 + 8 deg/s per m/s, at most 70 deg/s): until it is made, a moves along the bisector.
            double turn = Unit.WrapRadPi(h - s.Track[a]);
            _turnS = Math.Abs(Unit.RadToDeg(turn)) / Math.Clamp(20 + 8 * s.Speed[a], 20, Tuning.MaxYawDegPerS);
            double mid = s.Track[a] + 0.5 * turn;
            (_sm, _cm) = TrackSinCos(s, a, mid); _vNow = Math.Max(s.Speed[a], 0.5);
            // The farthest a moves from where it is over the longest horizon (6 s), m: its speed is at most the larger of the two.
            _reach = Math.Max(_vNow, Math.Abs(v)) * 6;
        }

        /// <summary>The hull gap to board b (<see cref="PredictedHullGap"/>).</summary>
        public double Gap(RaceContext c, int b, double below = double.PositiveInfinity, double horizonS = 6)
        {
            c.Work.HullGapProbes++;
            var s = c.Snapshot;
            double lb = c.Fleet.LengthM[b], accB = c.LookoutAccel[b];
            double sb = s.TrackSin[b], cb = s.TrackCos[b];
            double halves = 0.5 * (_la + lb);
            double bx0 = s.X[b], by0 = s.Y[b], speedB = s.Speed[b];
            // Whole look-ahead at once: when the centres are now farther apart than both boards can close in 6 s (a at
            // most its reach, b at its speed and acceleration) plus the half lengths and the gap asked about, with a
            // margin far above rounding, no sample below would be worked out; the answer is the same +infinity.
            {
                double rx = bx0 - _ax, ry = by0 - _ay;
                double runB = Math.Abs(speedB) * 6 + 0.5 * Math.Abs(accB) * 36;
                double need = below + halves + _reach + runB + 1e-6;
                if (need >= 0 && rx * rx + ry * ry > need * need * (1 + 1e-9)) return double.PositiveInfinity;
            }
            double ka = 0.5 * _la, kb = 0.5 * lb;
            double gap = double.PositiveInfinity;
            int samples = (int)Math.Round(2 * Math.Min(horizonS, 6));
            for (int i = 0; i <= samples; i++)
            {
                double tau = 0.5 * i;
                double db = Math.Max(0, speedB * tau + 0.5 * accB * tau * tau); // b's run along its track, with its acceleration
                double inTurn = Math.Min(tau, _turnS), after = tau - inTurn;
                double ax = _ax + _vNow * inTurn * _sm + _v * after * _sinH, ay = _ay + _vNow * inTurn * _cm + _v * after * _cosH;
                double bx = bx0 + db * sb, by = by0 + db * cb;
                // No hull point is nearer than the centres' distance less the half lengths.
                double cx = bx - ax, cy = by - ay;
                if (Math.Sqrt(cx * cx + cy * cy) - halves >= below) continue;
                // The hulls as stern-to-bow segments (the arithmetic of RuleBoard.Stern and Bow).
                var ca = new Vec2(ax, ay); var cbv = new Vec2(bx, by);
                var fa = new Vec2(_fax, _fay);
                var p1 = ca - ka * fa; var q1 = ca + ka * fa;
                var fbv = new Vec2(s.HeadX[b], s.HeadY[b]);
                var p2 = cbv - kb * fbv; var q2 = cbv + kb * fbv;
                gap = Math.Min(gap, RightOfWay.SegmentDistance(p1, q1, p2, q2));
            }
            return gap;
        }
    }
}
