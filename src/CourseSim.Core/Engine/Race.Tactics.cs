using CourseSim.Agents;
using CourseSim.Courses;
using CourseSim.Random;
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
    /// <summary>True wind angle a rider holds while waiting below the line, deg (common practice: luffing on a close reach).</summary>
    public const double HoldTwaDeg = 60;

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
        EnsureTacticArrays(); _wantH[board] = h; _desH[board] = h;
        ref var m = ref World.Get<Motion>(e);
        m.TrackSin = Math.Sin(h); m.TrackCos = Math.Cos(h);
    }

    /// <summary>
    /// Puts a board somewhere under way, racing towards its next course step (<paramref name="nextStep"/>): for scripted
    /// encounters (the rules' tests, docs/tactics.md) and for studies that start mid-race. Heading in compass degrees,
    /// speed along the heading in m/s. Call between steps.
    /// </summary>
    public void Place(int board, double x, double y, double headingDeg, double speedMs, int nextStep = 0)
    {
        EnsureTacticArrays();
        var e = _entities[board];
        double h = Unit.WrapRadPi(Unit.DegToRad(headingDeg));
        World.Get<Pose>(e) = new Pose { X = x, Y = y, Heading = h };
        ref var m = ref World.Get<Motion>(e);
        m.Speed = speedMs; m.Leeway = 0; m.YawRate = 0; m.TrackSin = Math.Sin(h); m.TrackCos = Math.Cos(h);
        ref var it = ref World.Get<Intent>(e);
        it.Heading = h; it.Power = 1;
        _wantH[board] = h; _wantP[board] = 1; _desH[board] = h; _pendAt[board] = double.PositiveInfinity;
        World.Get<ManoeuvreState>(e) = new ManoeuvreState();
        ref var st = ref World.Get<RaceStatus>(e);
        st.State = RaceState.Racing; st.Ocs = false; st.NextStep = nextStep; st.StartedS = Time;
        _prev[board] = new Vec2(x, y);
    }

    /// <summary>
    /// System 2, decide: each rider decides at a human rate (every race.decision_interval_s, staggered across the fleet)
    /// from what they perceive (docs/tactics.md). Before the start and when returning from an early start the board
    /// follows its start plan (line up below its spot on the line, go on time-on-distance, return if early); racing, it
    /// asks its tactic (<see cref="ITactic"/>). A decision takes effect after the rider's reaction time; the rules'
    /// lookout (give-way) and a penalty turn being served override it (<see cref="ApplyIntent"/>).
    /// </summary>
    void Decide()
    {
        EnsureTacticArrays();
        foreach (var chunk in _active)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var sw = chunk.Span<SensedWind>(); var intent = chunk.Span<Intent>();
            var st = chunk.Span<RaceStatus>(); var man = chunk.Span<ManoeuvreState>(); var mo = chunk.Span<Motion>();
            for (int i = 0; i < ids.Length; i++)
            {
                DecideOne(ids[i].Value, in pose[i], in sw[i], ref intent[i], in st[i], in man[i], mo[i].Speed);
                ApplyIntent(ids[i].Value, ref intent[i], in pose[i], in sw[i], in man[i], in st[i]);
            }
        }
    }

    ITactic[] _tactics = [];
    double[] _reactionS = [], _wantH = [], _wantP = [], _wantV = [], _pendH = [], _pendP = [], _pendV = [], _pendAt = [];
    double[] _noiseDir = [], _noiseSpd = [];
    readonly Observation _obs = new();
    Navigator? _nav;
    List<SeenBoard> _seen = new();

    void EnsureTacticArrays()
    {
        if (_lastTurn.Length == BoardCount) return;
        int n = BoardCount;
        _lastTurn = new double[n]; Array.Fill(_lastTurn, double.NegativeInfinity); _holding = new bool[n]; _going = new bool[n];
        _tactics = new ITactic[n];
        _reactionS = new double[n]; _wantH = new double[n]; _wantP = new double[n]; _wantV = new double[n];
        _pendH = new double[n]; _pendP = new double[n]; _pendV = new double[n]; _pendAt = new double[n]; Array.Fill(_pendAt, double.PositiveInfinity);
        _noiseDir = new double[n]; _noiseSpd = new double[n];
        _nav = new Navigator(this);
        var names = Setup.Boards.Select(x => x.Name).ToArray();
        _obs.FleetNames = names;
        for (int b = 0; b < n; b++)
        {
            var e = Setup.Boards[b];
            if (!TacticRegistry.TryGet(e.Tactic, out var spec))
                throw new InvalidOperationException($"board '{e.Id}': no tactic '{e.Tactic}' (known: {string.Join(", ", TacticRegistry.Names)})");
            var prm = spec.Params.ToDictionary(q => q.Name, q => e.Param(q.Name, q.Default));
            _tactics[b] = spec.Create(new TacticArgs(b, e.Name, prm, e.RivalIndex, Seed));
            _reactionS[b] = Tuning.Lerp(Tuning.ReactionExpertS, Tuning.ReactionNoviceS, _skill[b]);
            ref var it = ref World.Get<Intent>(_entities[b]);
            _wantH[b] = it.Heading; _wantP[b] = it.Power; _wantV[b] = it.TargetSpeed;
        }
        EnsureRuleArrays();
        Array.Copy(_wantH, _desH, n);
    }

    /// <summary>
    /// A decision takes effect after the rider's reaction time. A newer one made while the last is still pending
    /// replaces it at the same moment (the rider is already acting and adjusts what they do).
    /// </summary>
    void Submit(int b, double heading, double power, double target, double fromDeg)
    {
        // A pending decision already due is acted on first; a new tack or gybe always takes a full reaction time.
        if (_pendAt[b] <= Time) { _wantH[b] = _pendH[b]; _wantP[b] = _pendP[b]; _wantV[b] = _pendV[b]; _pendAt[b] = double.PositiveInfinity; }
        bool newSide = Math.Sign(SignedAngle(fromDeg, heading)) != Math.Sign(SignedAngle(fromDeg, double.IsPositiveInfinity(_pendAt[b]) ? _wantH[b] : _pendH[b]));
        _pendH[b] = heading; _pendP[b] = power; _pendV[b] = target;
        if (double.IsPositiveInfinity(_pendAt[b]) || newSide) _pendAt[b] = Time + _reactionS[b];
    }

    /// <summary>
    /// What the board is steered by this step: the rider's last decision once their reaction time has passed, unless a
    /// penalty turn is being served or the lookout has the rider keeping clear of another board.
    /// </summary>
    void ApplyIntent(int b, ref Intent it, in Pose pose, in SensedWind sw, in ManoeuvreState man, in RaceStatus st)
    {
        if (_pendAt[b] <= Time) { _wantH[b] = _pendH[b]; _wantP[b] = _pendP[b]; _wantV[b] = _pendV[b]; _pendAt[b] = double.PositiveInfinity; }
        double h = _wantH[b], pw = _wantP[b];
        if (_penaltyOwed[b] > 0 && _penaltyStage[b] == 0) MaybeStartPenalty(b, in pose, in sw, in man, in st);
        if (_penaltyStage[b] > 0) PenaltyIntent(b, in pose, in sw, in man, ref h, ref pw);
        _desH[b] = h;
        if (_avoidOn[b] && Time >= _avoidAt[b]) { h = _avoidH[b]; pw = _avoidP[b]; }
        it.Heading = h; it.Power = pw; it.TargetSpeed = _wantV[b];
    }

    void DecideOne(int b, in Pose pose, in SensedWind sw, ref Intent it, in RaceStatus st, in ManoeuvreState man, double speed)
    {
        if (Time < it.NextDecisionS) return;
        it.NextDecisionS += _decisionS;
        // Busy: no new decision mid-manoeuvre, or once committed to a tack or gybe not yet begun (pinned boards excepted).
        bool pinned = _holdTwa.Length > b && !double.IsNaN(_holdTwa[b]);
        var p = new Vec2(pose.X, pose.Y);
        double tws = sw.PerceivedSpeed, from = sw.PerceivedFromDeg;
        double twaNow = SignedAngle(from, pose.Heading);
        int tack = twaNow >= 0 ? 1 : -1;
        if (man.Kind != Manoeuvre.None) return;
        if (!pinned && !double.IsPositiveInfinity(_pendAt[b]) && Math.Sign(SignedAngle(from, _pendH[b])) != tack) return;
        bool mayTurn = Time - _lastTurn[b] >= MinTimeBetweenTurnsS;
        double heading, power = 1;
        if (pinned)
        {
            // Pinned to a true wind angle (polar checks): steer by the true wind at the rig, full power, at once.
            _wantH[b] = Unit.WrapRadPi(Unit.DegToRad(sw.TrueFromDeg - _holdTwa[b])); _wantP[b] = 1;
            _wantV[b] = _rigs[b].Speed(sw.TrueSpeed, Unit.DegToRad(_holdTwa[b]));
            _pendAt[b] = double.PositiveInfinity;
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
                    double etaFull = toLine / (vPolar * closing) + (v < 0.7 * vPolar ? AccelerationAllowanceS : 0) + _reactionS[b];
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
                    else
                    {
                        // Holding: luffing with the board kept well off the wind on its present tack (a board left
                        // to drift head to wind falls into irons and tacks by itself).
                        heading = Unit.WrapRadPi(Unit.DegToRad(from) - tack * Unit.DegToRad(HoldTwaDeg)); power = 0;
                    }
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
                var d = AskTactic(b, in pose, in sw, in st, speed, tack);
                heading = Unit.WrapRadPi(Unit.DegToRad(d.HeadingDeg));
                power = double.IsFinite(d.Power) ? Math.Clamp(d.Power, 0, 1) : 1;
                if (!double.IsFinite(heading)) heading = pose.Heading;
                heading = MarkSideGuard(b, st.NextStep, p, heading, tws, from, tack);
                break;
            }
        }
        if (Math.Sign(SignedAngle(from, heading)) != tack) _lastTurn[b] = Time;
        Submit(b, heading, power, _rigs[b].Speed(tws, SignedAngle(from, heading)), from);
    }

    /// <summary>Fills the observation (perceived wind with the rider's reading error) and asks the board's tactic.</summary>
    Decision AskTactic(int b, in Pose pose, in SensedWind sw, in RaceStatus st, double speed, int tack)
    {
        // The rider's reading error: slowly varying (an Ornstein-Uhlenbeck process with a 10 s time constant), larger
        // for the less skilled (model values: 1 deg and 3 % at skill 1, 3 deg and 8 % at skill 0).
        var rng = _tacticRng.For(0x0B5E_0000UL + (ulong)b);
        double keep = Math.Exp(-_decisionS / Tuning.ReadingErrorTauS), fresh = Math.Sqrt(1 - keep * keep);
        ulong draw = (ulong)StepIndex * 2;
        _noiseDir[b] = keep * _noiseDir[b] + fresh * rng.Normal(draw);
        _noiseSpd[b] = keep * _noiseSpd[b] + fresh * rng.Normal(draw + 1);
        double sdDir = Tuning.Lerp(Tuning.ReadingErrorExpertDeg, Tuning.ReadingErrorNoviceDeg, _skill[b]);
        double sdSpd = Tuning.Lerp(Tuning.ReadingErrorExpertShare, Tuning.ReadingErrorNoviceShare, _skill[b]);
        double from = Unit.WrapDeg360(sw.PerceivedFromDeg + sdDir * _noiseDir[b]);
        double tws = Math.Max(0, sw.PerceivedSpeed * (1 + sdSpd * _noiseSpd[b]));
        var p = new Vec2(pose.X, pose.Y);
        var o = _obs;
        o.TimeS = Time; o.Board = b; o.Name = Setup.Boards[b].Name; o.Position = p;
        o.HeadingDeg = Unit.WrapDeg360(Unit.RadToDeg(pose.Heading)); o.SpeedMs = speed;
        o.WindSpeedMs = tws; o.WindFromDeg = from;
        double twa = Unit.RadToDeg(SignedAngle(from, pose.Heading));
        o.TrueWindAngleDeg = twa; o.Tack = twa >= 0 ? 1 : -1;
        o.Course = Course; o.NextStep = st.NextStep; o.Polar = _rigs[b]; o.LastTurnS = _lastTurn[b];
        // Riders plan from where they will be when the decision takes effect (reaction time and half a decision
        // interval ahead along their heading), so a layline or a mark is not noticed only once passed.
        double lead = _reactionS[b] + 0.5 * _decisionS;
        var pl = p + lead * speed * Vec2.FromBearing(Unit.RadToDeg(pose.Heading));
        var aim = AimPoint(st.NextStep, pl, pose.Heading, from);
        o.AimPoint = aim;
        double direct = Math.Abs(Unit.RadToDeg(SignedAngle(from, Unit.DegToRad((aim - pl).Bearing))));
        double up = Unit.RadToDeg(_rigs[b].BestTwa(tws, true)), down = Unit.RadToDeg(_rigs[b].BestTwa(tws, false));
        o.Leg = direct < up ? LegKind.Beat : direct > down && (aim - pl).Length > CloseRunM ? LegKind.Run : LegKind.Reach;
        var tactic = _tactics[b];
        o.Nearby = tactic.WantsNearby ? SeenFrom(b, p, _tacticRng.For(0x5EE0_0000UL + (ulong)b), (ulong)StepIndex * 4096) : [];
        _nav!.Set(b, pl, tws, from, o.Tack);
        return tactic.Decide(o, _nav);
    }

    /// <summary>Boards within sight of board b, nearest first, with the wind each seems to have (the rider's reading error added).</summary>
    IReadOnlyList<SeenBoard> SeenFrom(int b, Vec2 p, CounterRng rng, ulong draw)
    {
        _seen.Clear();
        double sd = Tuning.Lerp(Tuning.ReadingErrorExpertShare, Tuning.ReadingErrorNoviceShare, _skill[b]) * 2;
        for (int j = 0; j < BoardCount; j++)
        {
            if (j == b) continue;
            var e = _entities[j];
            ref var st = ref World.Get<RaceStatus>(e);
            if (st.State is RaceState.Finished or RaceState.NotFinished) continue;
            ref var q = ref World.Get<Pose>(e);
            var pj = new Vec2(q.X, q.Y);
            double d = (pj - p).Length;
            if (d > SightRangeM) continue;
            ref var w = ref World.Get<SensedWind>(e);
            double seen = Math.Max(0, w.TrueSpeed * (1 + sd * rng.Normal(draw + (ulong)j)));
            _seen.Add(new SeenBoard(j, Setup.Boards[j].Name, pj, Unit.WrapDeg360(Unit.RadToDeg(q.Heading)), World.Get<Motion>(e).Speed, seen, d, st.NextStep));
        }
        _seen.Sort((x, y) => x.DistanceM.CompareTo(y.DistanceM));
        return _seen;
    }

    /// <summary>How far a rider can see other boards and read the wind on the water, m (model value).</summary>
    public const double SightRangeM = 1000;

    /// <summary>The engine's navigation for tactics, set up for one board's decision.</summary>
    sealed class Navigator(Race race) : INavigator
    {
        int _b, _tack; Vec2 _p; double _tws, _from;
        public void Set(int b, Vec2 p, double tws, double from, int tack) { _b = b; _p = p; _tws = tws; _from = from; _tack = tack; }
        public double ToTarget(Vec2 target, bool mayTurn = true) =>
            Unit.WrapDeg360(Unit.RadToDeg(race.LegHeading(_b, _p, target, _tws, _from, _tack, mayTurn)));
        public double AtTrueWindAngle(double twaDeg) => Unit.WrapDeg360(_from - twaDeg);
        public double BestAngle(bool upwind) => Unit.RadToDeg(race._rigs[_b].BestTwa(_tws, upwind));
    }

    /// <summary>How far ahead a rider checks which side of the next mark the present course passes it, m (model value).</summary>
    public const double MarkSideLookM = 60;

    /// <summary>
    /// Whatever the tactic, a rider does not sail past a mark on the wrong side: when the mark is ahead within
    /// <see cref="MarkSideLookM"/> and the course would leave it on the wrong hand (or closer than a board length), a
    /// beating rider tacks onto the best VMG angle of the other tack (on a reach or a run the aim point already steers
    /// round it).
    /// </summary>
    double MarkSideGuard(int b, int step, Vec2 p, double heading, double tws, double fromDeg, int tack)
    {
        if (step >= Course.Steps.Count) return heading;
        var s = Course.Steps[step];
        if (s.Kind != StepKind.Mark) return heading;
        var rel = s.Target - p;
        double dist = rel.Length;
        if (dist > MarkSideLookM || dist < 3) return heading;
        var dir = Vec2.FromBearing(Unit.RadToDeg(heading));
        if (Vec2.Dot(rel, dir) <= 0) return heading; // the mark is not ahead
        double cross = Vec2.Cross(dir, rel); // positive: the mark lies to port of the course
        bool correct = (cross > 0) == (s.Side == Rounding.Port) && Math.Abs(cross) >= 3;
        if (correct) return heading;
        double twa = Math.Abs(SignedAngle(fromDeg, heading));
        int side = Math.Sign(SignedAngle(fromDeg, heading)); if (side == 0) side = tack;
        // Beating only: running, the rider already steers straight at the aim point within CloseRunM of it.
        return twa < Unit.DegToRad(75) ? CloseHauledOtherTack(b, fromDeg, side, tws) : heading;
    }

    /// <summary>The heading (rad) at board b's best upwind VMG angle on the tack other than <paramref name="side"/> (+1 starboard).</summary>
    double CloseHauledOtherTack(int b, double fromDeg, int side, double tws) =>
        Unit.WrapRadPi(Unit.DegToRad(fromDeg) + side * _rigs[b].BestTwa(tws, true));

    /// <summary>
    /// Where a rider aims for step i. A mark is approached by an entry point beside it on the side it is to be left
    /// (outside the incoming leg), then an exit point just outside it on the rounding ray, so the track goes round it the
    /// required way; close to the exit point the rider already looks to the step after.
    /// </summary>
    Vec2 AimPoint(int step, Vec2 p, double headingRad = double.NaN, double fromDeg = double.NaN)
    {
        var s = Course.Steps[step];
        // Finishing off the wind, the rider picks the point of the line (upwind, the laylines to its middle rule).
        if (s.Kind == StepKind.Finish && s.Line is { } finish && !double.IsNaN(headingRad)
            && Math.Abs(SignedAngle(fromDeg, Unit.DegToRad((finish.Mid - p).Bearing))) > Math.PI / 2)
            return FinishAim(finish, p, headingRad);
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

    /// <summary>Share of a finish line's length, at each end, a rider keeps off when choosing where to cross it (model value).</summary>
    public const double FinishEndInset = 0.15;

    /// <summary>
    /// Where a rider finishing off the wind crosses the line: where the present heading meets it, kept off its ends (so
    /// a fleet finishes along the whole line rather than all converging on its middle; common practice: any point of
    /// the line will do, sail the shortest way to it); the middle when the heading does not meet the line ahead.
    /// </summary>
    static Vec2 FinishAim(CourseLine line, Vec2 p, double headingRad)
    {
        var along = line.B - line.A;
        var dir = new Vec2(Math.Sin(headingRad), Math.Cos(headingRad));
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
