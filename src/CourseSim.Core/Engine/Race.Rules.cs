using CourseSim.Courses;
using CourseSim.Rules;
using CourseSim.Units;

namespace CourseSim.Engine;

/// <summary>
/// An incident: two boards in contact. Who was to keep clear (-1 when nobody was, as with a capsized board), the rule,
/// whether a penalty was given, and whether the keep-clear board's give-way logic could have avoided it (it had seen
/// the conflict in time, was free to act, and the right-of-way board held its course).
/// </summary>
public sealed record RaceIncident(double TimeS, double X, double Y, int KeepClear, int RightOfWay, string Rule, bool Penalty,
    bool Avoidable, string Detail);

public sealed partial class Race
{
    /// <summary>How far the lookout scans for other boards, m (model value: 6 s at the closing speed of two planing boards).</summary>
    public const double LookoutRangeM = 100;
    /// <summary>Centre-to-centre passing distance below which a rider sees a conflict, m (model value: under two board lengths).</summary>
    public const double ConflictM = 6;
    /// <summary>Extra conflict distance per m/s of closing speed, m (model value).</summary>
    public const double ConflictPerMs = 0.3;
    /// <summary>A rider does not start a tack or gybe that would bring any board within this many conflict distances (RRS 13, 15, 16; model value).</summary>
    public const double TurnMarginShare = 2;
    /// <summary>A tack or gybe begun with another board this close (centre distance, m) counts as begun too close if contact follows within <see cref="TurnTooCloseS"/> (model value).</summary>
    public const double TurnTooCloseM = 12, TurnTooCloseS = 6;
    /// <summary>Time ahead a rider looks for conflicts, s (model value).</summary>
    public const double LookaheadS = 8;
    /// <summary>A right-of-way board acts (RRS 14) when contact is this close in time and the other is not keeping clear, s (model value).</summary>
    public const double LastMomentS = 1.5;
    /// <summary>Least true wind angle a give-way rider heads up to, deg (model value: a little below close-hauled).</summary>
    public const double AvoidMinTwaDeg = 38;
    /// <summary>
    /// A running give-way rider may gybe away when no turn on the present gybe keeps clear: only from a true wind angle
    /// of at least this (deg) onto one of at least this on the other gybe, a small turn through dead downwind
    /// (common practice: on a run the cheapest way out of a converging crossing is often to gybe away; model value).
    /// </summary>
    public const double GybeAwayMinTwaDeg = 140;
    /// <summary>Mean speed through a gybe away as a share of the present speed, and its score charge in degrees of turn (model values).</summary>
    public const double GybeAwaySpeedShare = 0.75, GybeAwayCharge = 40;
    /// <summary>
    /// A beating give-way rider (this close to the wind or closer, deg) may tack away onto the best VMG angle of the other
    /// tack, when no board is within <see cref="TurnAwayMinM"/>: at this share of the present speed over the look
    /// ahead, charged as this many degrees of turn (common practice: tack away rather than duck when crossing is
    /// close; RRS 13 and 15 then ask the tacker to keep clear and to give room; model values).
    /// </summary>
    public const double TackAwayMaxTwaDeg = 75, TackAwaySpeedShare = 0.3, TackAwayCharge = 60;
    /// <summary>A give-way rider does not tack or gybe away with another board's centre closer than this, m: the distance under which the judge counts a turn as begun too close.</summary>
    public const double TurnAwayMinM = TurnTooCloseM;
    /// <summary>A rider is well clear to take a penalty with no other board this close, m (model value).</summary>
    public const double WellClearM = 15;

    readonly List<RaceIncident> _incidents = new();
    public IReadOnlyList<RaceIncident> Incidents => _incidents;

    bool[] _avoidOn = [];
    int[] _avoidOther = [];
    string[] _avoidRule = [];
    double[] _avoidAt = [], _avoidH = [], _avoidP = [], _desH = [], _nearestM = [];
    int[] _penaltyOwed = [], _penaltyStage = [], _penaltySign = [], _penaltiesTaken = [], _giveWays = [];
    double[] _turnStartS = [], _turnStartNearestM = [], _lengthM = [];
    // Lookout snapshot of the fleet.
    double[] _sx = [], _sy = [], _sh = [], _st = [], _sv = [], _sa = [], _sFrom = [], _sTws = [];
    bool[] _sLive = [], _sTacking = [], _sCapsized = [], _sBusy = [];
    int[] _sNext = [];
    long[] _cellKey = [], _cellX = [], _cellY = []; int[] _cellOrder = [];
    readonly List<(int A, int B)> _near = new();
    /// <summary>
    /// The pairs close enough at the lookout to touch before the next one (8 m, the contact check's own range, plus
    /// what two boards can close in a lookout interval at up to 50 m/s between them): the only ones checked each step.
    /// </summary>
    readonly List<(int A, int B)> _close = new();
    double _contactWatchM = 8;
    readonly HashSet<long> _touching = new();
    /// <summary>Pairs whose conflict a rider has seen: when first seen, who keeps clear, the rule, the right-of-way board's heading then.</summary>
    readonly Dictionary<long, (double Since, int KeepClear, string Rule, double RowHeading)> _foreseen = new();
    int _lookoutEvery = 1;

    static long PairKey(int a, int b) => a < b ? ((long)a << 32) | (uint)b : ((long)b << 32) | (uint)a;

    void EnsureRuleArrays()
    {
        int n = BoardCount;
        _avoidOn = new bool[n]; _avoidOther = new int[n]; _avoidRule = new string[n]; _avoidAt = new double[n]; _avoidH = new double[n]; _avoidP = new double[n]; _desH = new double[n];
        _nearestM = new double[n]; Array.Fill(_nearestM, double.PositiveInfinity);
        _penaltyOwed = new int[n]; _penaltyStage = new int[n]; _penaltySign = new int[n]; _penaltiesTaken = new int[n]; _giveWays = new int[n];
        _turnStartS = new double[n]; Array.Fill(_turnStartS, double.NegativeInfinity);
        _turnStartNearestM = new double[n];
        // Hull lengths, read at every lookout and contact check.
        _lengthM = new double[n];
        for (int b = 0; b < n; b++) _lengthM[b] = _rig[b].Physics.Equipment.Board.LengthM;
        _sx = new double[n]; _sy = new double[n]; _sh = new double[n]; _st = new double[n]; _sa = new double[n]; _sv = new double[n]; _sFrom = new double[n]; _sTws = new double[n];
        _sLive = new bool[n]; _sTacking = new bool[n]; _sCapsized = new bool[n]; _sBusy = new bool[n]; _sNext = new int[n];
        _cellKey = new long[n]; _cellX = new long[n]; _cellY = new long[n]; _cellOrder = new int[n];
        _lookoutEvery = Math.Max(1, (int)Math.Round(Settings.StepHz / Math.Min(Setup.Rules.LookoutHz, Settings.StepHz)));
        _contactWatchM = ContactCheckM + 50 * _lookoutEvery * Dt;
    }

    /// <summary>Penalty turns taken by a board (served in full).</summary>
    public int PenaltiesOf(int board) => _penaltiesTaken.Length > board ? _penaltiesTaken[board] : 0;

    /// <summary>One-turn penalties a board still owes (begun or not).</summary>
    public int PenaltiesOwedBy(int board) => _penaltyOwed.Length > board ? _penaltyOwed[board] : 0;

    /// <summary>
    /// System 8, rules (docs/tactics.md). At the lookout rate each rider scans the boards within range and projects
    /// both tracks ahead (closest point of approach at present speeds, the rider on the heading they want): a conflict
    /// with a board they must keep clear of (rules 10-13, 18 as changed by Appendix B) makes them act, after their
    /// reaction time, by the least change that clears it (bear away to duck, head up, slow down, tack or gybe away, or
    /// put off a tack); a right-of-way rider holds course unless contact is imminent (rule 14). Every step the pairs that are close are
    /// checked for contact, which is judged and penalised.
    /// </summary>
    void RulesLookout()
    {
        if (StepIndex % _lookoutEvery != 0) return;
        Snapshot();
        BuildNear();
        if (!Setup.Rules.GiveWay) return;
        for (int k = 0; k < BoardCount; k++) if (_sLive[k]) LookoutOne(k);
    }

    void Snapshot()
    {
        foreach (var chunk in _all)
        {
            var ids = chunk.Span<BoardId>(); var pose = chunk.Span<Pose>(); var mo = chunk.Span<Motion>(); var sw = chunk.Span<SensedWind>();
            var man = chunk.Span<ManoeuvreState>(); var st = chunk.Span<RaceStatus>();
            for (int i = 0; i < ids.Length; i++)
            {
                int b = ids[i].Value;
                _sLive[b] = st[i].State is not (RaceState.Finished or RaceState.NotFinished);
                // The acceleration a rider reads from the other's speed since the last look (clamped: a board gathers or loses
                // speed at a few m/s per second at most).
                _sa[b] = Math.Clamp((mo[i].Speed - _sv[b]) / (_lookoutEvery * Dt), -2, 2);
                _sx[b] = pose[i].X; _sy[b] = pose[i].Y; _sh[b] = pose[i].Heading; _st[b] = Math.Atan2(mo[i].TrackSin, mo[i].TrackCos); _sv[b] = mo[i].Speed; _sFrom[b] = sw[i].TrueFromDeg; _sTws[b] = sw[i].TrueSpeed;
                ref readonly var m = ref man[i];
                // Appendix B, rule 13 as changed: from passing head to wind until the sail has filled (the crossing,
                // and the first second of sheeting in on the new tack).
                _sTacking[b] = m.Kind == Manoeuvre.Tack && (m.Phase == 1 || m.Phase == 2 && m.Timer < 1.0);
                _sCapsized[b] = m.Kind == Manoeuvre.Fallen;
                _sBusy[b] = m.Kind != Manoeuvre.None;
                _sNext[b] = st[i].NextStep;
            }
        }
    }

    /// <summary>Neighbour pairs within the lookout range, from a uniform grid (cells of the range, sorted keys): O(n log n), deterministic.</summary>
    void BuildNear()
    {
        _near.Clear(); _close.Clear();
        int n = BoardCount, live = 0;
        for (int b = 0; b < n; b++)
        {
            _nearestM[b] = double.PositiveInfinity;
            if (!_sLive[b]) continue;
            _cellX[b] = (long)Math.Floor(_sx[b] / LookoutRangeM); _cellY[b] = (long)Math.Floor(_sy[b] / LookoutRangeM);
            _cellKey[live] = CellKey(_cellX[b], _cellY[b]);
            _cellOrder[live] = b; live++;
        }
        Array.Sort(_cellKey, _cellOrder, 0, live);
        for (int i = 0; i < live; i++)
        {
            int a = _cellOrder[i];
            long cx = _cellX[a], cy = _cellY[a];
            for (long dx = -1; dx <= 1; dx++)
                for (long dy = -1; dy <= 1; dy++)
                {
                    long key = CellKey(cx + dx, cy + dy);
                    int lo = LowerBound(_cellKey, live, key);
                    for (int j = lo; j < live && _cellKey[j] == key; j++)
                    {
                        int c = _cellOrder[j];
                        if (c <= a) continue;
                        double d = Math.Sqrt((_sx[a] - _sx[c]) * (_sx[a] - _sx[c]) + (_sy[a] - _sy[c]) * (_sy[a] - _sy[c]));
                        if (d > LookoutRangeM) continue;
                        _near.Add((a, c));
                        if (d < _contactWatchM) _close.Add((a, c));
                        if (d < _nearestM[a]) _nearestM[a] = d;
                        if (d < _nearestM[c]) _nearestM[c] = d;
                    }
                }
        }
        _near.Sort(); _close.Sort();
        // Each board's neighbours (compressed rows), so a rider's lookout walks only its own pairs.
        if (_adjStart.Length != n + 1) _adjStart = new int[n + 1];
        Array.Clear(_adjStart);
        foreach (var (a, c) in _near) { _adjStart[a + 1]++; _adjStart[c + 1]++; }
        for (int b = 0; b < n; b++) _adjStart[b + 1] += _adjStart[b];
        if (_adj.Length < 2 * _near.Count) _adj = new int[Math.Max(16, 4 * _near.Count)];
        if (_adjFill.Length != n) _adjFill = new int[n];
        Array.Copy(_adjStart, _adjFill, n);
        foreach (var (a, c) in _near) { _adj[_adjFill[a]++] = c; _adj[_adjFill[c]++] = a; }
    }

    int[] _adjStart = [], _adj = [], _adjFill = [];

    static long CellKey(long cx, long cy) => (cx + (1L << 30)) * (1L << 31) + (cy + (1L << 30));

    static int LowerBound(long[] keys, int count, long key)
    {
        int lo = 0, hi = count;
        while (lo < hi) { int mid = (lo + hi) >> 1; if (keys[mid] < key) lo = mid + 1; else hi = mid; }
        return lo;
    }

    RuleBoard RuleBoardOf(int b, double headingRad, bool tacking) =>
        new(_sx[b], _sy[b], Unit.RadToDeg(headingRad), _lengthM[b], tacking);

    /// <summary>
    /// Who keeps clear between boards a and b, a sailing <paramref name="headingA"/> (a heading on the other tack counts
    /// as tacking: rule 13). A capsized board is given way to by everyone and owes nothing. Rule 18 (mark-room, Appendix
    /// B: while rounding or passing, within race.mark_room_m of the mark) puts the outside overlapped board to keep clear,
    /// except between boards on opposite tacks on a beat (18.1(a)).
    /// </summary>
    (int KeepClear, string Rule) Judge(int a, double headingA, int b)
    {
        if (_sCapsized[a] && _sCapsized[b]) return (-1, "");
        if (_sCapsized[b]) return (a, "22");
        if (_sCapsized[a]) return (b, "22");
        double from = _sFrom[a];
        bool aTurning = _sTacking[a] || Math.Sign(SignedAngle(from, headingA)) != Math.Sign(SignedAngle(from, _sh[a])) && Math.Abs(SignedAngle(from, headingA)) < Math.PI / 2;
        var ra = RuleBoardOf(a, headingA, aTurning);
        var rb = RuleBoardOf(b, _sh[b], _sTacking[b]);
        if (ra.Tacking && rb.Tacking)
        {
            // Appendix B 13: both tacking, the one on the other's port side or astern keeps clear.
            var f = rb.Forward; var port = new Vec2(-f.Y, f.X);
            return (Vec2.Dot(ra.Centre - rb.Centre, port) > 0 ? a : b, "13");
        }
        var v = RightOfWay.Decide(ra, rb, from);
        int keep = v.KeepClear == 0 ? a : v.KeepClear == 1 ? b : -1;
        string rule = ((int)v.Rule).ToString(System.Globalization.CultureInfo.InvariantCulture);
        // Mark-room: both rounding or passing the same mark, overlapped.
        if (_sNext[a] == _sNext[b] && _sNext[a] < Course.Steps.Count && Course.Steps[_sNext[a]].Kind == StepKind.Mark && v.Rule != RuleNumber.Rule13)
        {
            var mark = Course.Steps[_sNext[a]].Target;
            double da = (ra.Centre - mark).Length, db = (rb.Centre - mark).Length;
            bool beatOpposite = v.Rule == RuleNumber.Rule10 && (Math.Abs(SignedAngle(from, headingA)) < Math.PI / 2 || Math.Abs(SignedAngle(from, _sh[b])) < Math.PI / 2);
            if (da < Setup.Rules.MarkRoomM && db < Setup.Rules.MarkRoomM && RightOfWay.Overlapped(ra, rb) && !beatOpposite)
            {
                // Inside: the board on the mark's side of the other (abeam), not merely the nearer one.
                var fb = rb.Forward; var right = new Vec2(fb.Y, -fb.X);
                bool aInside = Math.Sign(Vec2.Dot(ra.Centre - rb.Centre, right)) == Math.Sign(Vec2.Dot(mark - rb.Centre, right));
                return (aInside ? b : a, "18");
            }
        }
        return (keep, rule);
    }

    /// <summary>
    /// Closest point of approach within the lookahead: time (s) and centre distance (m), a making good the track ha
    /// (rad) at va (m/s), b holding its present track and speed (tracks, not headings: leeway is large at low speed).
    /// </summary>
    (double T, double D) Cpa(int a, double ha, double va, int b)
    {
        double rx = _sx[b] - _sx[a], ry = _sy[b] - _sy[a];
        double vx = _sv[b] * Math.Sin(_st[b]) - va * Math.Sin(ha), vy = _sv[b] * Math.Cos(_st[b]) - va * Math.Cos(ha);
        double vv = vx * vx + vy * vy;
        double t = vv < 1e-9 ? 0 : Math.Clamp(-(rx * vx + ry * vy) / vv, 0, LookaheadS);
        double dx = rx + vx * t, dy = ry + vy * t;
        return (t, Math.Sqrt(dx * dx + dy * dy));
    }

    /// <summary>Hull-to-hull gap a give-way rider aims to keep when passing slowly, m, and the extra per m/s of closing speed (model values).</summary>
    public const double PassClearM = 2.5, PassClearPerMs = 0.25;

    double PassClear(int a, double h, double v, int b) => PassClearM + PassClearPerMs * ClosingSpeed(a, h, v, b);

    /// <summary>Relative speed of b seen from a (a making good track h at v), m/s.</summary>
    double ClosingSpeed(int a, double h, double v, int b)
    {
        double vx = _sv[b] * Math.Sin(_st[b]) - v * Math.Sin(h), vy = _sv[b] * Math.Cos(_st[b]) - v * Math.Cos(h);
        return Math.Sqrt(vx * vx + vy * vy);
    }

    /// <summary>Score preference for ducking astern over a fixed turn of the same size (model value, degrees of turn).</summary>
    public const double DuckPreference = 15;

    /// <summary>The track (rad) from board a at speed v that meets the point astern of board b where b will then be.</summary>
    double DuckTrack(int a, int b, double v)
    {
        double lb = _lengthM[b];
        double back = 0.5 * lb + PassClearM + 2;
        double px = _sx[b] - back * Math.Sin(_sh[b]), py = _sy[b] - back * Math.Cos(_sh[b]);
        double vx = _sv[b] * Math.Sin(_st[b]), vy = _sv[b] * Math.Cos(_st[b]);
        // Lead: two passes of the fixed-point estimate of the meeting time.
        double t = 0;
        for (int i = 0; i < 2; i++)
        {
            double dx = px + vx * t - _sx[a], dy = py + vy * t - _sy[a];
            t = Math.Min(LookaheadS, Math.Sqrt(dx * dx + dy * dy) / Math.Max(v, 0.5));
        }
        return Math.Atan2(px + vx * t - _sx[a], py + vy * t - _sy[a]);
    }

    /// <summary>
    /// Smallest gap between the two hulls over the next seconds (sampled every half second to 6 s), board a making
    /// good track h at speed v and b holding its track and speed, each hull along its heading.
    /// </summary>
    double PredictedHullGap(int a, double h, double v, int b)
    {
        double la = _lengthM[a], lb = _lengthM[b];
        double ha = Unit.RadToDeg(h), hb = Unit.RadToDeg(_sh[b]);
        double sa = Math.Sin(h), ca = Math.Cos(h), sb = Math.Sin(_st[b]), cb = Math.Cos(_st[b]);
        // The turn onto h takes time (a slow board turns at the rate the rig can steer it, a fast one carves quicker;
        // model value 20 + 8 deg/s per m/s, at most 70 deg/s): until it is made, a moves along the bisector.
        double turn = Unit.WrapRadPi(h - _st[a]);
        double turnS = Math.Abs(Unit.RadToDeg(turn)) / Math.Clamp(20 + 8 * _sv[a], 20, Tuning.MaxYawDegPerS);
        double mid = _st[a] + 0.5 * turn, sm = Math.Sin(mid), cm = Math.Cos(mid), vNow = Math.Max(_sv[a], 0.5);
        double gap = double.PositiveInfinity;
        for (int i = 0; i <= 12; i++)
        {
            double tau = 0.5 * i;
            double db = Math.Max(0, _sv[b] * tau + 0.5 * _sa[b] * tau * tau); // b's run along its track, with its acceleration
            double inTurn = Math.Min(tau, turnS), after = tau - inTurn;
            double ax = _sx[a] + vNow * inTurn * sm + v * after * sa, ay = _sy[a] + vNow * inTurn * cm + v * after * ca;
            var ra = new RuleBoard(ax, ay, ha, la);
            var rb = new RuleBoard(_sx[b] + db * sb, _sy[b] + db * cb, hb, lb);
            gap = Math.Min(gap, RightOfWay.HullDistance(ra, rb));
        }
        return gap;
    }

    // The boards a rider must act for this lookout, reused.
    readonly List<int> _threats = new();

    /// <summary>
    /// Fills <see cref="_threats"/> with the boards board k must act for if it makes good track h at speed v: those it
    /// must keep clear of (or, when <paramref name="turning"/>, any board: RRS 15 and 16) passing within the margin in
    /// the lookahead, and right-of-way boards about to hit it that are not keeping clear themselves (RRS 14).
    /// </summary>
    bool Threats(int k, double h, double v, double margin, bool turning, ref int firstOther, ref string firstRule)
    {
        _threats.Clear();
        for (int q = _adjStart[k]; q < _adjStart[k + 1]; q++)
        {
            int j = _adj[q];
            long key = PairKey(k, j);
            var (t, d) = Cpa(k, h, v, j);
            // Faster closing, wider berth (the same rule of thumb as the passing gap).
            double m = margin + ConflictPerMs * ClosingSpeed(k, h, v, j);
            if (d >= m || t >= LookaheadS)
            {
                // No conflict: forget one this rider had foreseen as theirs (the verdict is only needed then).
                if (!turning && _foreseen.ContainsKey(key) && Judge(k, h, j).KeepClear == k) _foreseen.Remove(key);
                continue;
            }
            var (keep, rule) = Judge(k, h, j);
            bool mine = keep == k || turning && keep >= 0;
            bool lastMoment = keep == j && t < LastMomentS && !(_avoidOn[j] && Time >= _avoidAt[j]);
            if (keep == k && (!_foreseen.TryGetValue(key, out var seen) || seen.Rule != rule)) _foreseen[key] = (Time, k, rule, _sh[j]);
            if (!mine && !lastMoment) continue;
            _threats.Add(j);
            if (firstOther < 0) { firstOther = j; firstRule = keep == k ? rule : turning ? "16" : "14"; }
        }
        return _threats.Count > 0;
    }

    void LookoutOne(int k)
    {
        if (_sBusy[k]) return; // mid-manoeuvre or in the water: cannot act now
        // What the rider is about to do: a decision still in their reaction time is what they look out for.
        bool pending = !double.IsPositiveInfinity(_pendAt[k]) && _penaltyStage[k] == 0;
        double want = pending ? _pendH[k] : _desH[k];
        double from = _sFrom[k];
        int side = Math.Sign(SignedAngle(from, _sh[k])); if (side == 0) side = 1;
        // Wanting the other tack: the rider foresees being nearly stopped through the tack (model value: a third of the speed).
        bool turning = Math.Sign(SignedAngle(from, want)) != side;
        // Until a pending decision takes effect the present one still steers: a tack it asks for is vetted too.
        if (!turning && Math.Sign(SignedAngle(from, _desH[k])) != side) { want = _desH[k]; turning = true; }
        double va = turning ? 0.3 * _sv[k] : Math.Max(_sv[k], 1.0);
        int firstOther = -1; string firstRule = "";
        double margin = _avoidOn[k] ? ConflictM * 1.3 : ConflictM; // hysteresis: release only when clearly clear
        if (!Threats(k, want, va, turning ? margin * TurnMarginShare : margin, turning, ref firstOther, ref firstRule))
        {
            _avoidOn[k] = false; return;
        }
        double cur = _st[k];
        double baseH = want;
        if (turning)
        {
            // The tack or gybe is put off: the rider stays on the present tack, keeping clear there as the rules ask.
            baseH = cur; va = Math.Max(_sv[k], 1.0);
            int o2 = -1; string r2 = "";
            if (!Threats(k, cur, va, margin, false, ref o2, ref r2))
            {
                StartAvoiding(k, pending, firstOther, firstRule);
                _avoidH[k] = cur; _avoidP[k] = 1;
                return;
            }
        }
        // Each candidate is scored by how far it turns from what the rider wants, plus a large charge for any
        // clearance short of the margin (so the clearest is taken when none clears fully), less a bonus for the way of
        // keeping clear already chosen (riders do not dither between ducking and slowing).
        double bestScore = double.PositiveInfinity, bestH = baseH, bestP = 1;
        // Besides fixed turns either way, the duck: the track that passes astern of the nearest threat, led for its
        // motion (aim at a point a length and a clearance behind its stern, where it will be when the rider gets there).
        Span<double> offsets = stackalloc double[19];
        ReadOnlySpan<double> fixedOffsets = [0, 10, -10, 20, -20, 30, -30, 45, -45, 60, -60, 80, -80, 100, -100, 120, -120];
        fixedOffsets.CopyTo(offsets);
        offsets[17] = Unit.RadToDeg(Unit.WrapRadPi(DuckTrack(k, _threats[0], va) - baseH));
        // A change of tack is a candidate too, unless a turn is already being put off or another board is close: on a
        // run a gybe away (any offset onto the other gybe deep enough), on a beat a tack away onto the other tack's best
        // VMG angle (slot 18). Either is vetted against every board in sight, not only the present threats (RRS 13, 15, 16).
        double twaCur = Math.Abs(SignedAngle(from, cur));
        bool roomToTurn = !turning && _nearestM[k] > TurnAwayMinM;
        bool mayGybe = roomToTurn && twaCur >= Unit.DegToRad(GybeAwayMinTwaDeg);
        bool mayTack = roomToTurn && twaCur <= Unit.DegToRad(TackAwayMaxTwaDeg);
        offsets[18] = mayTack ? Unit.RadToDeg(Unit.WrapRadPi(CloseHauledOtherTack(k, from, side, _sTws[k]) - baseH)) : double.NaN;
        for (int slow = 0; slow < 2; slow++)
            for (int oi = 0; oi < offsets.Length; oi++)
            {
                double off = offsets[oi];
                if (double.IsNaN(off)) continue;
                double h = Unit.WrapRadPi(baseH + Unit.DegToRad(off));
                double twa = SignedAngle(from, h);
                bool other = Math.Sign(twa) != side;
                bool gybe = other && mayGybe && Math.Abs(twa) >= Unit.DegToRad(GybeAwayMinTwaDeg);
                bool tack = other && mayTack && oi == 18;
                if (other && !(slow == 0 && (gybe || tack))) continue;
                if (Math.Abs(twa) < Unit.DegToRad(AvoidMinTwaDeg) || !other && Math.Abs(twa) > Unit.DegToRad(178)) continue;
                // Luffing, a board coasts to a stop over a few seconds (mean speed over the next three seconds about 60 %
                // of the present one); sheeting out on a run hardly slows it (model values).
                double v = tack ? TackAwaySpeedShare * va : gybe ? GybeAwaySpeedShare * va : slow == 1 ? (Math.Abs(twa) < Unit.DegToRad(110) ? 0.6 : 0.85) * _sv[k] : va;
                double worst = double.PositiveInfinity;
                if (other) for (int q = _adjStart[k]; q < _adjStart[k + 1]; q++) worst = Math.Min(worst, PredictedHullGap(k, h, v, _adj[q]) - PassClear(k, h, v, _adj[q]));
                else foreach (int j in _threats) worst = Math.Min(worst, PredictedHullGap(k, h, v, j) - PassClear(k, h, v, j));
                double score = (tack ? 0 : Math.Abs(off)) + (slow == 1 ? 25 : 0) + (gybe ? GybeAwayCharge : 0) + (tack ? TackAwayCharge : 0)
                             + (worst < 0 ? 200 - 80 * worst : 0) - (oi == 17 ? DuckPreference : 0);
                if (_avoidOn[k] && (slow == 1) == (_avoidP[k] == 0) && Math.Abs(Unit.WrapRadPi(h - _avoidH[k])) < Unit.DegToRad(6)) score -= 15;
                if (score < bestScore) { bestScore = score; bestH = h; bestP = slow == 1 ? 0 : 1; }
            }
        StartAvoiding(k, pending, firstOther, firstRule);
        _avoidH[k] = bestH; _avoidP[k] = bestP;
    }

    void StartAvoiding(int k, bool pending, int other, string rule)
    {
        if (_avoidOn[k] && _avoidOther[k] == other && _avoidRule[k] == rule) return;
        // A new give-way episode (or the same rider now keeping clear of another board, or under another rule).
        if (!_avoidOn[k]) _avoidAt[k] = Time + _reactionS[k];
        _avoidOn[k] = true; _avoidOther[k] = other; _avoidRule[k] = rule; _giveWays[k]++;
        if (pending) _avoidAt[k] = Math.Min(_avoidAt[k], _pendAt[k]); // seen while deciding: acted on with it
        _events.Add(new RaceEvent(Time, k, RaceEventKind.GiveWay, _sx[k], _sy[k],
            rule == "16" ? $"puts off a tack or gybe near {Setup.Boards[other].Name} (rule 16)" : $"keeps clear of {Setup.Boards[other].Name} (rule {rule})"));
    }

    /// <summary>Centre distance beyond which two hulls cannot be in contact, m (two board lengths and the clearance, with room).</summary>
    const double ContactCheckM = 8;

    /// <summary>Every step: the close pairs are checked for contact (hulls within race.contact_m), which is judged once per contact.</summary>
    void CheckContacts()
    {
        if (_close.Count == 0) return;
        double clearance = Setup.Rules.ContactM;
        foreach (var (a, b) in _close)
        {
            var ea = _entities[a]; var eb = _entities[b];
            if (World.Has<Done>(ea) || World.Has<Done>(eb)) continue;
            ref var pa = ref World.Get<Pose>(ea); ref var pb = ref World.Get<Pose>(eb);
            double cd = Math.Sqrt((pa.X - pb.X) * (pa.X - pb.X) + (pa.Y - pb.Y) * (pa.Y - pb.Y));
            long key = PairKey(a, b);
            if (cd > ContactCheckM) { _touching.Remove(key); continue; }
            var ra = new RuleBoard(pa.X, pa.Y, Unit.RadToDeg(pa.Heading), _lengthM[a]);
            var rb = new RuleBoard(pb.X, pb.Y, Unit.RadToDeg(pb.Heading), _lengthM[b]);
            double hd = RightOfWay.HullDistance(ra, rb);
            if (hd >= clearance) { if (hd > clearance + 0.5) _touching.Remove(key); continue; }
            if (!_touching.Add(key)) continue;
            Judged(a, b, 0.5 * (pa.X + pb.X), 0.5 * (pa.Y + pb.Y));
        }
    }

    void Judged(int a, int b, double x, double y)
    {
        // The snapshot may be a lookout old: refresh the two boards' positions and headings for the judgement.
        foreach (int q in (ReadOnlySpan<int>)[a, b])
        {
            ref var p = ref World.Get<Pose>(_entities[q]);
            _sx[q] = p.X; _sy[q] = p.Y; _sh[q] = p.Heading;
        }
        long key = PairKey(a, b);
        int keep; string rule; double since = double.NaN, rowHeading = double.NaN;
        // The verdict of the moment (positions of the contact, tacks and manoeuvres from the last lookout); the
        // warning the keep-clear rider had is how long the lookout had seen this conflict with the same verdict.
        (keep, rule) = Judge(a, _sh[a], b);
        if (_foreseen.TryGetValue(key, out var f) && f.KeepClear == keep && f.Rule == rule) { since = f.Since; rowHeading = f.RowHeading; }
        int row = keep == a ? b : keep == b ? a : -1;
        bool capsized = rule == "22" || keep < 0;
        string detail; bool avoidable = false;
        if (capsized) detail = keep < 0 ? "both boards in the water" : $"{Setup.Boards[row].Name} capsized in the way";
        else
        {
            double warning = double.IsNaN(since) ? 0 : Time - since;
            double turned = double.IsNaN(rowHeading) ? 0 : Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(_sh[row] - rowHeading)));
            bool busy = _sBusy[keep];
            bool tooClose = Time - _turnStartS[keep] < TurnTooCloseS && _turnStartNearestM[keep] < TurnTooCloseM;
            if (!Setup.Rules.GiveWay) detail = "give-way logic off";
            else if (tooClose) { avoidable = true; detail = $"keep-clear board began a tack or gybe {Time - _turnStartS[keep]:F1} s before with a board {_turnStartNearestM[keep]:F0} m away"; }
            else if (turned > 15) detail = $"right-of-way board changed course by {turned:F0} deg";
            else if (busy) detail = "keep-clear board mid-manoeuvre (begun well clear)";
            else if (warning < _reactionS[keep] + 1.0) detail = $"seen {warning:F1} s before contact";
            else { avoidable = true; detail = $"seen {warning:F1} s before contact and not avoided"; }
        }
        bool penalty = !capsized && Setup.Rules.Penalties;
        if (penalty) _penaltyOwed[keep]++;
        var inc = new RaceIncident(Time, x, y, capsized ? -1 : keep, capsized ? -1 : row, rule, penalty, avoidable, detail);
        _incidents.Add(inc);
        string who = capsized ? $"{Setup.Boards[a].Name} and {Setup.Boards[b].Name}" : $"{Setup.Boards[keep].Name} (keep clear) and {Setup.Boards[row].Name}";
        _events.Add(new RaceEvent(Time, capsized ? a : keep, RaceEventKind.Contact, x, y, $"{who}: rule {rule}; {detail}{(penalty ? "; one-turn penalty" : "")}"));
    }

    /// <summary>
    /// A one-turn penalty (RRS 44.1 as changed by Appendix B), served as soon as the board is racing and well clear of
    /// others: one full turn made of a tack and a gybe, the same way round: head up to close-hauled, tack, bear away,
    /// gybe back onto the original tack.
    /// </summary>
    void PenaltyIntent(int b, in Pose pose, in SensedWind sw, in ManoeuvreState man, ref double h, ref double pw)
    {
        double twa = SignedAngle(sw.TrueFromDeg, pose.Heading);
        int s = _penaltySign[b];
        double fromDeg = sw.TrueFromDeg;
        double At(double twaDeg) => Unit.WrapRadPi(Unit.DegToRad(fromDeg - twaDeg));
        pw = 1;
        switch (_penaltyStage[b])
        {
            case 1:
                h = At(s * 45);
                if (Math.Abs(twa) < Unit.DegToRad(60)) Next(2);
                break;
            case 2:
                // The tack waits until well clear (not once begun).
                h = _nearestM[b] < WellClearM && man.Kind == Manoeuvre.None && Math.Sign(twa) == s ? At(s * 45) : At(-s * 45);
                if (man.Kind == Manoeuvre.None && Math.Sign(twa) == -s) Next(3);
                break;
            case 3:
                h = At(-s * 150);
                if (Math.Abs(twa) > Unit.DegToRad(130)) Next(4);
                break;
            case 4:
                h = _nearestM[b] < WellClearM && man.Kind == Manoeuvre.None && Math.Sign(twa) == -s ? At(-s * 150) : At(s * 150); // so does the gybe
                if (man.Kind == Manoeuvre.None && Math.Sign(twa) == s)
                {
                    _penaltyStage[b] = 0; _penaltyOwed[b]--; _penaltiesTaken[b]++; _lastTurn[b] = Time;
                    AddEvent(b, RaceEventKind.PenaltyServed, pose, "one-turn penalty taken");
                }
                break;
        }
        void Next(int stage) => _penaltyStage[b] = stage;
    }

    /// <summary>Starts a penalty turn for a board that owes one, is racing, free, and well clear of the others.</summary>
    void MaybeStartPenalty(int b, in Pose pose, in SensedWind sw, in ManoeuvreState man, in RaceStatus st)
    {
        if (_penaltyOwed[b] <= 0 || _penaltyStage[b] != 0 || man.Kind != Manoeuvre.None) return;
        if (st.State is not (RaceState.Racing or RaceState.Returning) || _nearestM[b] < WellClearM) return;
        _penaltySign[b] = SignedAngle(sw.TrueFromDeg, pose.Heading) >= 0 ? 1 : -1;
        _penaltyStage[b] = 1;
    }
}
