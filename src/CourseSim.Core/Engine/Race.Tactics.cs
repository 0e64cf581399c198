using CourseSim.Courses;
using CourseSim.Units;

namespace CourseSim.Engine;

public sealed partial class Race
{
    /// <summary>Least time between two tacks or gybes the simple tactic allows, s (model value: keeps it from dithering in shifts).</summary>
    public const double MinTimeBetweenTurnsS = 12;
    /// <summary>Distance off a mark, towards the outside of the turn, that a rider aims at, m (common practice: round close but clear).</summary>
    public const double RoundingOffsetM = 8;
    /// <summary>Overstand allowed past the layline before tacking or gybing, deg (model value).</summary>
    public const double LaylineMarginDeg = 2;
    /// <summary>Within this distance of the aim point a running rider steers straight at it, m (model value).</summary>
    public const double CloseRunM = 40;
    /// <summary>Time a luffing board takes to coast to a stop, s, for the start approach (model value).</summary>
    public const double CoastS = 2;

    double[] _lastTurn = [];
    bool[] _holding = [], _going = [];
    double[] _holdTwa = [];

    /// <summary>
    /// Pins a board to a true wind angle (deg, positive = starboard tack) at full power, whatever its tactic: the engine's
    /// own polar check. Before the first step the board is placed on that heading; under way it turns (tacking or
    /// gybing if the angle is on the other side). NaN releases it.
    /// </summary>
    public void HoldTrueWindAngle(int board, double twaDeg)
    {
        if (_holdTwa.Length != BoardCount) { _holdTwa = new double[BoardCount]; Array.Fill(_holdTwa, double.NaN); }
        _holdTwa[board] = twaDeg;
        if (StepIndex > 0 || double.IsNaN(twaDeg)) return; // under way: the manoeuvre system turns the board
        var e = _entities[board];
        double h = Unit.WrapRadPi(Unit.DegToRad(Setup.Wind.DirectionDeg - twaDeg));
        World.Get<Pose>(e).Heading = h;
        World.Get<Intent>(e).Heading = h;
        ref var m = ref World.Get<Motion>(e);
        m.TrackSin = Math.Sin(h); m.TrackCos = Math.Cos(h);
    }

    /// <summary>
    /// System 2, decide: each rider decides at a human rate (every race.decision_interval_s, staggered across the fleet)
    /// from what they perceive (the lagged wind at their rig, their own rig's polar, the course). This engine ships one
    /// tactic, "vmg-layline": sail the best VMG angle on a beat or run and tack or gybe on the layline to the next mark;
    /// sail straight at the mark on a reach; line up below the start line and go on time-on-distance; return if early.
    /// </summary>
    void Decide()
    {
        EnsureTacticArrays();
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var sw = chunk.Span<SensedWind>(); var intent = chunk.Span<Intent>();
            var st = chunk.Span<RaceStatus>(); var man = chunk.Span<ManoeuvreState>(); var mo = chunk.Span<Motion>();
            for (int i = 0; i < ids.Length; i++) DecideOne(ids[i].Value, in pose[i], in sw[i], ref intent[i], in st[i], in man[i], mo[i].Speed);
        }
    }

    void EnsureTacticArrays()
    {
        if (_lastTurn.Length == BoardCount) return;
        _lastTurn = new double[BoardCount]; Array.Fill(_lastTurn, double.NegativeInfinity); _holding = new bool[BoardCount]; _going = new bool[BoardCount];
        _headerTack = new bool[BoardCount]; _headerDeg = new double[BoardCount]; _minTackS = new double[BoardCount];
        _meanS = new double[BoardCount]; _meanFrom = new double[BoardCount];
        for (int b = 0; b < BoardCount; b++)
        {
            var e = Setup.Boards[b];
            _headerTack[b] = e.Tactic == "header-tack";
            _headerDeg[b] = e.Param("header_deg", 5); _minTackS[b] = e.Param("min_tack_s", 20); _meanS[b] = e.Param("mean_s", 90);
            _meanFrom[b] = double.NaN;
        }
    }

    bool[] _headerTack = [];
    double[] _headerDeg = [], _minTackS = [], _meanS = [], _meanFrom = [];

    void DecideOne(int b, in Pose pose, in SensedWind sw, ref Intent it, in RaceStatus st, in ManoeuvreState man, double speed)
    {
        if (Time < it.NextDecisionS) return;
        it.NextDecisionS += _decisionS;
        if (man.Kind != Manoeuvre.None) return; // busy: no new decision mid-manoeuvre
        var p = new Vec2(pose.X, pose.Y);
        double tws = sw.PerceivedSpeed, from = sw.PerceivedFromDeg;
        double twaNow = SignedAngle(from, pose.Heading);
        int tack = twaNow >= 0 ? 1 : -1;
        bool mayTurn = Time - _lastTurn[b] >= MinTimeBetweenTurnsS;
        double heading, power = 1;
        if (_holdTwa.Length > b && !double.IsNaN(_holdTwa[b]))
        {
            // Pinned to a true wind angle (polar checks): steer by the true wind at the rig, full power.
            it.Heading = Unit.WrapRadPi(Unit.DegToRad(sw.TrueFromDeg - _holdTwa[b])); it.Power = 1;
            it.TargetSpeed = _rigs[b].Speed(sw.TrueSpeed, Unit.DegToRad(_holdTwa[b]));
            return;
        }
        switch (st.State)
        {
            case RaceState.PreStart when Time < 0:
                {
                    // Time on distance: hold below the line, then go so as to reach it at the planned time (the
                    // signal plus this rider's margin); on the way, ease off whenever the line would come too soon.
                    double h = LegHeading(b, p, _spot[b], tws, from, tack, true);
                    var line = Course.Start;
                    double remaining = _goMargin[b] - Time;
                    double toLine = Math.Max(0, -line.Ahead(p));
                    var dirH = Vec2.FromBearing(Unit.RadToDeg(h));
                    double closing = Math.Max(0.3, Vec2.Dot(dirH, line.Normal));
                    double vPolar = Math.Max(1.0, _rigs[b].Speed(tws, SignedAngle(from, h)));
                    double v = speed;
                    double etaFull = toLine / (vPolar * closing) + (v < 0.7 * vPolar ? AccelerationAllowanceS : 0);
                    if (!_holding[b] && (_wait[b] - p).Length < 8) _holding[b] = true;
                    if (remaining <= etaFull || _going[b])
                    {
                        _going[b] = true; _holding[b] = true;
                        heading = LegHeading(b, p, AimPoint(0, p), tws, from, tack, false);
                        // Early: luff to kill speed (a board coasts about 2 s of its speed before it stops).
                        double etaNow = toLine / Math.Max(0.3, v * closing);
                        bool early = etaNow < remaining - 0.3 || toLine < CoastS * v * closing && remaining > CoastS;
                        power = early ? 0 : 1;
                    }
                    else if (!_holding[b]) { heading = LegHeading(b, p, _wait[b], tws, from, tack, true); power = 0.6; }
                    else { heading = pose.Heading; power = 0; }
                    break;
                }
            case RaceState.PreStart:
                heading = LegHeading(b, p, _spot[b], tws, from, tack, mayTurn);
                break;
            case RaceState.Returning:
                heading = LegHeading(b, p, _wait[b], tws, from, tack, mayTurn);
                break;
            default:
            {
                var aim = AimPoint(st.NextStep, p);
                heading = LegHeading(b, p, aim, tws, from, tack, mayTurn);
                if (_headerTack[b] && HeaderTack(b, p, aim, tws, from, tack)) heading = Unit.WrapRadPi(Unit.DegToRad(from) + tack * _rigs[b].BestTwa(tws, true));
                break;
            }
        }
        if (_headerTack[b])
        {
            // The rider's running mean of the wind direction, against which a header is judged.
            double k = Math.Min(1, _decisionS / _meanS[b]);
            _meanFrom[b] = double.IsNaN(_meanFrom[b]) ? from : Unit.WrapDeg360(_meanFrom[b] + k * Unit.WrapDeg180(from - _meanFrom[b]));
        }
        if (Math.Sign(SignedAngle(from, heading)) != tack) _lastTurn[b] = Time;
        it.Heading = heading; it.Power = power;
        it.TargetSpeed = _rigs[b].Speed(tws, SignedAngle(from, heading));
    }


    /// <summary>
    /// "header-tack": on a beat, tack when the wind has headed by header_deg or more against the rider's running mean
    /// (starboard tack is headed when the wind backs, port when it veers), no sooner than min_tack_s after the last
    /// tack; laylines still apply (the heading already chosen covers them).
    /// </summary>
    bool HeaderTack(int b, Vec2 p, Vec2 aim, double tws, double fromDeg, int tack)
    {
        if (double.IsNaN(_meanFrom[b]) || Time - _lastTurn[b] < _minTackS[b]) return false;
        var d = aim - p;
        double direct = Unit.WrapRadPi(Unit.DegToRad(fromDeg) - Unit.DegToRad(d.Bearing));
        if (Math.Abs(direct) >= _rigs[b].BestTwa(tws, true)) return false; // not beating
        double shift = Unit.WrapDeg180(fromDeg - _meanFrom[b]); // positive: veered
        return tack > 0 ? shift <= -_headerDeg[b] : shift >= _headerDeg[b];
    }

    /// <summary>
    /// Where a rider aims for step i. A mark is approached by an entry point beside it on the side it is to be left
    /// (outside the incoming leg), then an exit point just outside it on the rounding ray, so the track goes round it the
    /// required way; close to the exit point the rider already looks to the step after.
    /// </summary>
    Vec2 AimPoint(int step, Vec2 p)
    {
        var s = Course.Steps[step];
        if (s.Kind != StepKind.Mark) return s.Target;
        var mark = s.Target;
        var din = Course.Incoming(step);
        var sideDir = s.Side == Rounding.Port ? new Vec2(din.Y, -din.X) : new Vec2(-din.Y, din.X);
        var rel = p - mark;
        bool correctSide = Vec2.Dot(rel, sideDir) > 0;
        bool reached = Vec2.Dot(rel, din) >= -RoundingOffsetM;
        if (!reached || !correctSide) return mark + RoundingOffsetM * sideDir;
        var exit = mark + RoundingOffsetM * Course.Outside(step);
        if ((exit - p).Length > 4 || step + 1 >= Course.Steps.Count) return exit;
        return Course.Steps[step + 1].Target;
    }

    /// <summary>
    /// The heading (rad) to make good towards <paramref name="target"/>: straight at it when it lies between the best
    /// upwind and downwind VMG angles; otherwise at the best VMG angle on the present tack (or gybe), turning onto the
    /// other when the target can be fetched from it (the layline), if turning is allowed now.
    /// </summary>
    double LegHeading(int b, Vec2 p, Vec2 target, double tws, double fromDeg, int tack, bool mayTurn = true)
    {
        var rig = _rigs[b];
        var d = target - p;
        double wind = Unit.DegToRad(fromDeg);
        if (d.Length < 1e-6) return wind - tack * Math.PI / 2;
        double bearing = Unit.DegToRad(d.Bearing);
        double direct = Unit.WrapRadPi(wind - bearing); // signed TWA of the direct course
        double up = rig.BestTwa(tws, true), down = rig.BestTwa(tws, false);
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
}
