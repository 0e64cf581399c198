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
    /// <summary>How far the lookout scans for other boards, m (model value: about 8 s at a fast closing speed).</summary>
    public const double LookoutRangeM = 60;
    /// <summary>Centre-to-centre passing distance below which a rider sees a conflict, m (model value: under two board lengths).</summary>
    public const double ConflictM = 4.5;
    /// <summary>Time ahead a rider looks for conflicts, s (model value).</summary>
    public const double LookaheadS = 8;
    /// <summary>A right-of-way board acts (RRS 14) when contact is this close in time and the other is not keeping clear, s (model value).</summary>
    public const double LastMomentS = 1.5;
    /// <summary>Least true wind angle a give-way rider heads up to, deg (model value: a little below close-hauled).</summary>
    public const double AvoidMinTwaDeg = 38;
    /// <summary>A rider is well clear to take a penalty with no other board this close, m (model value).</summary>
    public const double WellClearM = 15;

    readonly List<RaceIncident> _incidents = new();
    public IReadOnlyList<RaceIncident> Incidents => _incidents;

    bool[] _avoidOn = [];
    double[] _avoidAt = [], _avoidH = [], _avoidP = [], _desH = [], _nearestM = [];
    int[] _penaltyOwed = [], _penaltyStage = [], _penaltySign = [], _penaltiesTaken = [], _giveWays = [];
    double[] _penaltyStageAt = [];
    // Lookout snapshot of the fleet.
    double[] _sx = [], _sy = [], _sh = [], _st = [], _sv = [], _sFrom = [];
    bool[] _sLive = [], _sTacking = [], _sCapsized = [], _sBusy = [];
    int[] _sNext = [];
    long[] _cellKey = []; int[] _cellOrder = [];
    readonly List<(int A, int B)> _near = new();
    readonly HashSet<long> _touching = new();
    /// <summary>Pairs whose conflict a rider has seen: when first seen, who keeps clear, the rule, the right-of-way board's heading then.</summary>
    readonly Dictionary<long, (double Since, int KeepClear, string Rule, double RowHeading)> _foreseen = new();
    int _lookoutEvery = 1;

    static long PairKey(int a, int b) => a < b ? ((long)a << 32) | (uint)b : ((long)b << 32) | (uint)a;

    void EnsureRuleArrays()
    {
        int n = BoardCount;
        _avoidOn = new bool[n]; _avoidAt = new double[n]; _avoidH = new double[n]; _avoidP = new double[n]; _desH = new double[n];
        _nearestM = new double[n]; Array.Fill(_nearestM, double.PositiveInfinity);
        _penaltyOwed = new int[n]; _penaltyStage = new int[n]; _penaltySign = new int[n]; _penaltiesTaken = new int[n]; _giveWays = new int[n];
        _penaltyStageAt = new double[n];
        _sx = new double[n]; _sy = new double[n]; _sh = new double[n]; _st = new double[n]; _sv = new double[n]; _sFrom = new double[n];
        _sLive = new bool[n]; _sTacking = new bool[n]; _sCapsized = new bool[n]; _sBusy = new bool[n]; _sNext = new int[n];
        _cellKey = new long[n]; _cellOrder = new int[n];
        _lookoutEvery = Math.Max(1, (int)Math.Round(Settings.StepHz / Math.Min(Setup.Rules.LookoutHz, Settings.StepHz)));
    }

    /// <summary>Penalty turns taken by a board (served in full).</summary>
    public int PenaltiesOf(int board) => _penaltiesTaken.Length > board ? _penaltiesTaken[board] : 0;

    /// <summary>
    /// System 8, rules (docs/tactics.md). At the lookout rate each rider scans the boards within range and projects
    /// both tracks ahead (closest point of approach at present speeds, the rider on the heading they want): a conflict
    /// with a board they must keep clear of (rules 10-13, 18 as changed by Appendix B) makes them act, after their
    /// reaction time, by the least change that clears it (bear away to duck, head up, slow down, or put off a tack); a
    /// right-of-way rider holds course unless contact is imminent (rule 14). Every step the pairs that are close are
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
                _sx[b] = pose[i].X; _sy[b] = pose[i].Y; _sh[b] = pose[i].Heading; _st[b] = Math.Atan2(mo[i].TrackSin, mo[i].TrackCos); _sv[b] = mo[i].Speed; _sFrom[b] = sw[i].TrueFromDeg;
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
        _near.Clear();
        int n = BoardCount, live = 0;
        for (int b = 0; b < n; b++)
        {
            _nearestM[b] = double.PositiveInfinity;
            if (!_sLive[b]) continue;
            _cellKey[live] = CellKey((long)Math.Floor(_sx[b] / LookoutRangeM), (long)Math.Floor(_sy[b] / LookoutRangeM));
            _cellOrder[live] = b; live++;
        }
        Array.Sort(_cellKey, _cellOrder, 0, live);
        for (int i = 0; i < live; i++)
        {
            int a = _cellOrder[i];
            long cx = (long)Math.Floor(_sx[a] / LookoutRangeM), cy = (long)Math.Floor(_sy[a] / LookoutRangeM);
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
                        if (d < _nearestM[a]) _nearestM[a] = d;
                        if (d < _nearestM[c]) _nearestM[c] = d;
                    }
                }
        }
        _near.Sort();
    }

    static long CellKey(long cx, long cy) => (cx + (1L << 30)) * (1L << 31) + (cy + (1L << 30));

    static int LowerBound(long[] keys, int count, long key)
    {
        int lo = 0, hi = count;
        while (lo < hi) { int mid = (lo + hi) >> 1; if (keys[mid] < key) lo = mid + 1; else hi = mid; }
        return lo;
    }

    RuleBoard RuleBoardOf(int b, double headingRad, bool tacking) =>
        new(_sx[b], _sy[b], Unit.RadToDeg(headingRad), _rig[b].Physics.Equipment.Board.LengthM, tacking);

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

    // The boards a rider must act for this lookout, reused.
    readonly List<int> _threats = new();

    void LookoutOne(int k)
    {
        if (_sBusy[k]) return; // mid-manoeuvre or in the water: cannot act now
        // What the rider is about to do: a decision still in their reaction time is what they look out for.
        bool pending = !double.IsPositiveInfinity(_pendAt[k]) && _penaltyStage[k] == 0;
        double want = pending ? _pendH[k] : _desH[k];
        // Wanting the other tack: the rider foresees being nearly stopped through the tack (model value: a third of the speed).
        bool turning = Math.Sign(SignedAngle(_sFrom[k], want)) != Math.Sign(SignedAngle(_sFrom[k], _sh[k]));
        double va = turning ? 0.3 * _sv[k] : Math.Max(_sv[k], 1.0);
        _threats.Clear();
        int firstOther = -1; string firstRule = "";
        bool any = false;
        double margin = _avoidOn[k] ? ConflictM * 1.3 : ConflictM; // hysteresis: release only when clearly clear
        foreach (var (a, b) in _near)
        {
            if (a != k && b != k) continue;
            int j = a == k ? b : a;
            var (keep, rule) = Judge(k, want, j);
            var (t, d) = Cpa(k, want, va, j);
            if (d >= margin || t >= LookaheadS) { if (keep == k) _foreseen.Remove(PairKey(k, j)); continue; }
            bool mine = keep == k;
            bool lastMoment = keep == j && t < LastMomentS && !(_avoidOn[j] && Time >= _avoidAt[j]);
            if (mine && !_foreseen.ContainsKey(PairKey(k, j))) _foreseen[PairKey(k, j)] = (Time, k, rule, _sh[j]);
            if (!mine && !lastMoment) continue;
            _threats.Add(j); any = true;
            if (firstOther < 0) { firstOther = j; firstRule = mine ? rule : "14"; }
        }
        if (!any) { _avoidOn[k] = false; return; }
        // The least change that clears every threat: headings on the present tack either side of the one wanted (or
        // the present heading, if the one wanted is on the other tack: the tack is put off), full power or slowing.
        double from = _sFrom[k];
        double cur = _st[k];
        int side = Math.Sign(SignedAngle(from, _sh[k])); if (side == 0) side = 1;
        double baseH = Math.Sign(SignedAngle(from, want)) == side ? want : cur;
        double bestCost = double.PositiveInfinity, bestH = baseH, bestP = 1, bestWorst = -1, fallbackH = baseH, fallbackP = 0;
        ReadOnlySpan<double> offsets = [0, 10, -10, 20, -20, 30, -30, 45, -45, 60, -60, 80, -80];
        for (int slow = 0; slow < 2; slow++)
            foreach (double off in offsets)
            {
                double h = Unit.WrapRadPi(baseH + Unit.DegToRad(off));
                double twa = SignedAngle(from, h);
                if (Math.Sign(twa) != side || Math.Abs(twa) < Unit.DegToRad(AvoidMinTwaDeg) || Math.Abs(twa) > Unit.DegToRad(178)) continue;
                double v = slow == 1 ? 0.35 * _sv[k] : va;
                double worst = double.PositiveInfinity;
                foreach (int j in _threats) { var (t, d) = Cpa(k, h, v, j); worst = Math.Min(worst, t >= LookaheadS ? double.PositiveInfinity : d); }
                double cost = Math.Abs(off) + (slow == 1 ? 25 : 0);
                // Riders stick to the way of keeping clear they chose (no dithering between ducking and slowing).
                if (_avoidOn[k] && (slow == 1) == (_avoidP[k] == 0) && Math.Abs(Unit.WrapRadPi(h - _avoidH[k])) < Unit.DegToRad(6)) cost -= 15;
                if (worst >= margin && cost < bestCost) { bestCost = cost; bestH = h; bestP = slow == 1 ? 0 : 1; }
                if (worst > bestWorst) { bestWorst = worst; fallbackH = h; fallbackP = slow == 1 ? 0 : 1; }
            }
        if (double.IsPositiveInfinity(bestCost)) { bestH = fallbackH; bestP = fallbackP; }
        if (!_avoidOn[k])
        {
            _avoidOn[k] = true; _avoidAt[k] = Time + _reactionS[k]; _giveWays[k]++;
            if (pending) _avoidAt[k] = Math.Min(_avoidAt[k], _pendAt[k]); // seen while deciding: acted on with it
            _events.Add(new RaceEvent(Time, k, RaceEventKind.GiveWay, _sx[k], _sy[k],
                $"keeps clear of {Setup.Boards[firstOther].Name} (rule {firstRule})"));
        }
        _avoidH[k] = bestH; _avoidP[k] = bestP;
    }

    /// <summary>Every step: the close pairs are checked for contact (hulls within race.contact_m), which is judged once per contact.</summary>
    void CheckContacts()
    {
        if (_near.Count == 0) return;
        double clearance = Setup.Rules.ContactM;
        foreach (var (a, b) in _near)
        {
            var ea = _entities[a]; var eb = _entities[b];
            if (World.Has<Done>(ea) || World.Has<Done>(eb)) continue;
            ref var pa = ref World.Get<Pose>(ea); ref var pb = ref World.Get<Pose>(eb);
            double cd = Math.Sqrt((pa.X - pb.X) * (pa.X - pb.X) + (pa.Y - pb.Y) * (pa.Y - pb.Y));
            long key = PairKey(a, b);
            if (cd > 8) { _touching.Remove(key); continue; }
            var ra = new RuleBoard(pa.X, pa.Y, Unit.RadToDeg(pa.Heading), _rig[a].Physics.Equipment.Board.LengthM);
            var rb = new RuleBoard(pb.X, pb.Y, Unit.RadToDeg(pb.Heading), _rig[b].Physics.Equipment.Board.LengthM);
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
        if (_foreseen.TryGetValue(key, out var f)) { keep = f.KeepClear; rule = f.Rule; since = f.Since; rowHeading = f.RowHeading; }
        else (keep, rule) = Judge(a, _sh[a], b);
        int row = keep == a ? b : keep == b ? a : -1;
        bool capsized = rule == "22" || keep < 0;
        string detail; bool avoidable = false;
        if (capsized) detail = keep < 0 ? "both boards in the water" : $"{Setup.Boards[row].Name} capsized in the way";
        else
        {
            double warning = double.IsNaN(since) ? 0 : Time - since;
            double turned = double.IsNaN(rowHeading) ? 0 : Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(_sh[row] - rowHeading)));
            bool busy = _sBusy[keep];
            if (!Setup.Rules.GiveWay) detail = "give-way logic off";
            else if (turned > 15) detail = $"right-of-way board changed course by {turned:F0} deg";
            else if (busy) detail = "keep-clear board mid-manoeuvre";
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
                h = At(-s * 45);
                if (man.Kind == Manoeuvre.None && Math.Sign(twa) == -s) Next(3);
                break;
            case 3:
                h = At(-s * 150);
                if (Math.Abs(twa) > Unit.DegToRad(130)) Next(4);
                break;
            case 4:
                h = At(s * 150);
                if (man.Kind == Manoeuvre.None && Math.Sign(twa) == s)
                {
                    _penaltyStage[b] = 0; _penaltyOwed[b]--; _penaltiesTaken[b]++; _lastTurn[b] = Time;
                    AddEvent(b, RaceEventKind.PenaltyServed, pose, "one-turn penalty taken");
                }
                break;
        }
        void Next(int stage) { _penaltyStage[b] = stage; _penaltyStageAt[b] = Time; }
    }

    /// <summary>Starts a penalty turn for a board that owes one, is racing, free, and well clear of the others.</summary>
    void MaybeStartPenalty(int b, in Pose pose, in SensedWind sw, in ManoeuvreState man, in RaceStatus st)
    {
        if (_penaltyOwed[b] <= 0 || _penaltyStage[b] != 0 || man.Kind != Manoeuvre.None) return;
        if (st.State is not (RaceState.Racing or RaceState.Returning) || _nearestM[b] < WellClearM) return;
        _penaltySign[b] = SignedAngle(sw.TrueFromDeg, pose.Heading) >= 0 ? 1 : -1;
        _penaltyStage[b] = 1; _penaltyStageAt[b] = Time;
    }
}
