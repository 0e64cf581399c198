using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Rules;

/// <summary>
/// The rules' lookout (docs/tactics.md). At the lookout rate each rider scans the boards within range in the step
/// snapshot and projects both tracks ahead (closest point of approach at present speeds, the rider on the heading they
/// want): a conflict with a board they must keep clear of (rules 10-13, 18 as changed by Appendix B) makes them act,
/// after their reaction time, by the least change that clears it (bear away to duck, head up, slow down, tack or gybe
/// away, or put off a tack); a right-of-way rider holds course unless contact is imminent (rule 14). Writes only the
/// rider's own give-way plan and their own foreseen conflicts (keyed by keep-clear board first).
/// </summary>
public sealed class Lookout : RaceSystem
{
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
    /// of at least this (deg) onto one of at least this on the other gybe (common practice; model value).
    /// </summary>
    public const double GybeAwayMinTwaDeg = 140;
    /// <summary>Mean speed through a gybe away as a share of the present speed, and its score charge in degrees of turn (model values).</summary>
    public const double GybeAwaySpeedShare = 0.75, GybeAwayCharge = 40;
    /// <summary>
    /// Least hull-to-hull gap through a gybe a rider accepts from any board (RRS 15, 16: room to keep clear), m (model
    /// value: a little over one board length), and how long a rider waits beside a board that blocks the gybe before
    /// sheeting out to drop astern of it and gybe there, s (model value: at once).
    /// </summary>
    public const double GybeClearM = 3, GybeWaitS = 0;
    /// <summary>No gybe is begun with another hull closer than this, m (model value: a board's width with its rig swung).</summary>
    public const double GybeMinGapM = 1.5;
    /// <summary>A gybe that closes on another board goes ahead only if the hulls stay this far apart all through it, m (model value).</summary>
    public const double GybeCrossM = 9;
    /// <summary>A board alongside only lets a gybe go ahead when the gybe leads away from it at this rate or more, m/s (model value).</summary>
    public const double GybeOpeningMs = 0.5;
    /// <summary>
    /// A rider whose tack is put off by a board alongside to windward on the same tack (within this centre distance, m)
    /// for this long after the start signal (s) sheets out to drop astern of it and tacks across its wake (model values:
    /// two boards beating side by side otherwise sailed on together far past the layline, issue 12).
    /// </summary>
    public const double TackBlockedNearM = 2 * TurnTooCloseM, TackWaitS = 3;
    /// <summary>
    /// A beating give-way rider (this close to the wind or closer, deg) may tack away onto the best VMG angle of the other
    /// tack, when no board is within <see cref="TurnAwayMinM"/>: at this share of the present speed over the look
    /// ahead, charged as this many degrees of turn (common practice; RRS 13 and 15; model values).
    /// </summary>
    public const double TackAwayMaxTwaDeg = 75, TackAwaySpeedShare = 0.3, TackAwayCharge = 60;
    /// <summary>A give-way rider does not tack or gybe away with another board's centre closer than this, m.</summary>
    public const double TurnAwayMinM = TurnTooCloseM;
    /// <summary>Hull-to-hull gap a give-way rider aims to keep when passing slowly, m, and the extra per m/s of closing speed (model values).</summary>
    public const double PassClearM = 2.5, PassClearPerMs = 0.25;
    /// <summary>Score preference for ducking astern over a fixed turn of the same size (model value, degrees of turn).</summary>
    public const double DuckPreference = 15;

    public override string Name => "rules lookout";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Helm, Penalty, Pose (heading); snapshot; grid (neighbours, nearest); lookout accelerations";
    public override string Writes => "GiveWay, Wake (heading samples), own foreseen conflicts, events";

    readonly List<int> _threats = new(NeighbourGrid.MaxNeighbours); // a rider's neighbours at most: never grown in the step

    /// <summary>Interval between the heading samples kept for the judge's rule 16.1, s.</summary>
    public const double HeadingSampleS = 1;

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        if (!c.IsLookoutStep) return;
        // The board's recent headings (the judge asks whether a right-of-way board changed course just before a contact).
        for (int i = 0; i < blk.Count; i++)
        {
            ref var w = ref blk.Wake[i];
            if (w.HistN > 0 && c.Time - w.HistS < HeadingSampleS - 1e-9) continue;
            w.H3 = w.H2; w.H2 = w.H1; w.H1 = w.H0; w.H0 = blk.Pose[i].Heading; w.HistS = c.Time; w.HistN++;
        }
        if (!c.Rules.GiveWay) return;
        for (int i = 0; i < blk.Count; i++)
        {
            int k = blk.Id[i].Value;
            if (!c.Snapshot.Live[k]) continue;
            c.Foreseen.KeepOnlyNeighbours(k, c.Grid.Neighbours(k));
            One(c, k, in blk.Helm[i], in blk.Penalty[i], ref blk.GiveWay[i]);
        }
    }

    /// <summary>
    /// Fills the threat list with the boards board k must act for if it makes good track h at speed v: those it must
    /// keep clear of (or, when <paramref name="turning"/>, any board: RRS 15 and 16) passing within the margin in the
    /// lookahead, and right-of-way boards about to hit it that are not keeping clear themselves (RRS 14).
    /// </summary>
    bool Threats(RaceContext c, int k, double h, double v, double margin, bool turning, ref int firstOther, ref byte firstRule, bool gybing = false)
    {
        _threats.Clear();
        var s = c.Snapshot;
        var (sinH, cosH) = Judge.TrackSinCos(s, k, h);
        var probe = gybing ? new Judge.GapProbe(c, k, h, sinH, cosH, v) : default;
        // Before the signal only: boards there are slow or stopped, a tack from a standstill takes seconds, and a board
        // alongside may sheet in and go at any moment (the start's "go"), which no prediction from its present speed
        // foresees. Racing, the predicted approach below vets a tack: a fixed distance there could pin a board sailing
        // in company to its tack for as long as the company lasts.
        bool tacking = turning && !gybing && c.Time < 0;
        var neighbours = c.Grid.Neighbours(k);
        // Every neighbour's closest approach first, four at a time (the same bits as one at a time).
        Span<double> cpaT = stackalloc double[NeighbourGrid.MaxNeighbours], cpaD = stackalloc double[NeighbourGrid.MaxNeighbours], cpaC = stackalloc double[NeighbourGrid.MaxNeighbours];
        Judge.CpaAndClosingAll(s, k, sinH, cosH, v, neighbours, cpaT, cpaD, cpaC);
        for (int q = 0; q < neighbours.Length; q++)
        {
            int j = neighbours[q];
            long key = RaceContext.PairKey(k, j);
            // No tack is begun before the signal with another board's centre this close: the judge holds a contact that
            // follows it against the tacking board (rule 13: it keeps clear from head to wind until the sail fills,
            // nearly stopped), so the rider's lookout holds itself to the same standard. Held off, the tack waits.
            if (tacking && s.Live[j] && !s.Finished[j])
            {
                double ex = s.X[j] - s.X[k], ey = s.Y[j] - s.Y[k];
                if (ex * ex + ey * ey < TurnTooCloseM * TurnTooCloseM)
                {
                    _threats.Add(j);
                    if (firstOther < 0) { firstOther = j; firstRule = Judge.Rule13; }
                    continue;
                }
            }
            double t = cpaT[q], d = cpaD[q], closing = cpaC[q];
            c.Work.NeighbourChecks++;
            // Faster closing, wider berth (the same rule of thumb as the passing gap).
            double m = margin + ConflictPerMs * closing;
            if (d >= m || t >= LookaheadS)
            {
                // No conflict: forget one this rider had foreseen as theirs.
                if (!turning && c.Foreseen.ContainsKey(key) && Judge.Decide(c, k, h, j).KeepClear == k) c.Foreseen.Remove(key);
                continue;
            }
            var (keep, rule) = Judge.Decide(c, k, h, j);
            // A gybe is vetted by the hulls' gap through the turn (the board keeps most of its speed on a run), not by
            // the centres' closest approach: a board alongside that the gybe leads away from is no reason to put it off
            // (two boards running side by side would otherwise each block the other's gybe: issue 12).
            // A gybe that crosses another board's course goes ahead only with a wide gap all through it.
            if (gybing && probe.Gap(c, j, GybeCrossM) >= GybeCrossM) continue;
            if (gybing && Opening(s, k, sinH, cosH, v, j))
            {
                // The gap a gybe leading away must keep: the clearance, or what there is now when the boards are closer.
                if (ClearThrough(c, s, k, j, in probe)) continue;
            }
            bool mine = keep == k || turning && keep >= 0;
            bool lastMoment = keep == j && t < LastMomentS && !s.KeepingClear[j];
            if (keep == k && (!c.Foreseen.TryGetValue(key, out var seen) || seen.Rule != rule)) c.Foreseen.Set(key, new Foreseen(c.Time, rule, s.Heading[j]));
            if (!mine && !lastMoment) continue;
            _threats.Add(j);
            if (firstOther < 0) { firstOther = j; firstRule = keep == k ? rule : turning ? Judge.Rule16 : Judge.Rule14; }
        }
        return _threats.Count > 0;
    }

    /// <summary>Whether the hulls of k and j are at least <see cref="GybeMinGapM"/> apart now and keep the clearance (or
    /// what there is now, if less) all through k's turn as the probe projects it.</summary>
    static bool ClearThrough(RaceContext c, StepSnapshot s, int k, int j, in Judge.GapProbe probe)
    {
        // The gap a turn leading away must keep: the clearance, or what there is now when the boards are closer.
        double now = RightOfWay.HullDistance(new RuleBoard(s.X[k], s.Y[k], Unit.RadToDeg(s.Heading[k]), c.Fleet.LengthM[k]),
                                             new RuleBoard(s.X[j], s.Y[j], Unit.RadToDeg(s.Heading[j]), c.Fleet.LengthM[j]));
        double need = Math.Min(GybeClearM, now - 0.3);
        return now >= GybeMinGapM && probe.Gap(c, j, need) >= need;
    }

    /// <summary>Whether k and j sail on the same tack (the side the wind each feels comes over).</summary>
    static bool SameTack(StepSnapshot s, int k, int j) =>
        FastMath.Sign(Sailing.SignedAngle(s.FromDeg[k], s.Heading[k])) == FastMath.Sign(Sailing.SignedAngle(s.FromDeg[j], s.Heading[j]));

    /// <summary>How far k is to windward of j's track, m (negative: to leeward), across j's track on the side the wind comes from.</summary>
    static double WindwardOffset(StepSnapshot s, int k, int j)
    {
        double nx = s.TrackCos[j], ny = -s.TrackSin[j]; // right-hand normal of j's track
        double from = Unit.DegToRad(s.FromDeg[j]);
        if (nx * Math.Sin(from) + ny * Math.Cos(from) < 0) { nx = -nx; ny = -ny; }
        return (s.X[k] - s.X[j]) * nx + (s.Y[k] - s.Y[j]) * ny;
    }

    /// <summary>Whether board j draws away from board k making good the track whose sine and cosine are given at v (range opening at <see cref="GybeOpeningMs"/> or more).</summary>
    static bool Opening(StepSnapshot s, int k, double sinH, double cosH, double v, int j)
    {
        double rx = s.X[j] - s.X[k], ry = s.Y[j] - s.Y[k], r = Math.Sqrt(rx * rx + ry * ry);
        double vx = s.Speed[j] * s.TrackSin[j] - v * sinH, vy = s.Speed[j] * s.TrackCos[j] - v * cosH;
        return r > 1e-6 && (rx * vx + ry * vy) / r >= GybeOpeningMs;
    }

    void One(RaceContext c, int k, in Helm helm, in Penalty pen, ref GiveWay gw)
    {
        var s = c.Snapshot;
        if (s.Busy[k]) return; // mid-manoeuvre or in the water: cannot act now
        // What the rider is about to do: a decision still in their reaction time is what they look out for.
        bool pending = helm.HasPending && pen.Stage == 0;
        double want = pending ? helm.PendH : helm.PlannedH;
        double from = s.FromDeg[k];
        int side = FastMath.Sign(Sailing.SignedAngle(from, s.Heading[k])); if (side == 0) side = 1;
        // Wanting the other tack: the rider foresees being nearly stopped through the tack (model value: a third of the speed).
        bool turning = FastMath.Sign(Sailing.SignedAngle(from, want)) != side;
        // Until a pending decision takes effect the present one still steers: a tack it asks for is vetted too.
        if (!turning && FastMath.Sign(Sailing.SignedAngle(from, helm.PlannedH)) != side) { want = helm.PlannedH; turning = true; }
        // Running, a gybe keeps most of the speed; a tack nearly stops the board.
        bool gybing = turning && Math.Abs(Sailing.SignedAngle(from, want)) > Math.PI / 2 && Math.Abs(Sailing.SignedAngle(from, s.Heading[k])) > Math.PI / 2;
        double va = gybing ? GybeAwaySpeedShare * s.Speed[k] : turning ? 0.3 * s.Speed[k] : Math.Max(s.Speed[k], 1.0);
        int firstOther = -1; byte firstRule = 0;
        double margin = gw.On ? ConflictM * 1.3 : ConflictM; // hysteresis: release only when clearly clear
        if (!Threats(c, k, want, va, turning ? margin * TurnMarginShare : margin, turning, ref firstOther, ref firstRule, gybing))
        {
            gw.DeferS = double.NaN;
            // RRS 16.1: a right-of-way rider changing course gives the other board room to keep clear; one that could
            // no longer keep clear is not turned into: the present course is held until it can.
            int crowded = turning || !c.Rules.GiveRoom ? -1 : NoRoom(c, k, want);
            if (crowded < 0) { gw.On = false; return; }
            Start(c, k, ref gw, pending ? helm.PendAt : double.NaN, crowded, Judge.Rule161);
            gw.Heading = s.Track[k]; gw.Power = 1;
            return;
        }
        if (!turning) gw.DeferS = double.NaN;
        else if (double.IsNaN(gw.DeferS)) gw.DeferS = c.Time;
        double cur = s.Track[k];
        double baseH = want;
        if (turning)
        {
            // The tack or gybe is put off: the rider stays on the present tack, keeping clear there as the rules ask.
            baseH = cur; va = Math.Max(s.Speed[k], 1.0);
            int o2 = -1; byte r2 = 0;
            if (!Threats(c, k, cur, va, margin, false, ref o2, ref r2))
            {
                Start(c, k, ref gw, pending ? helm.PendAt : double.NaN, firstOther, firstRule);
                gw.Heading = cur;
                gw.Power = DropAstern(c, s, k, in gw, gybing, firstOther) ? 0 : 1;
                return;
            }
        }
        var (bestH, bestP) = Choose(c, k, in gw, baseH, va, side, turning, from, cur);
        // Keeping clear of others does not end a blocked tack's drop astern (before, the two alternated look by look and
        // the rider sailed on beside the blocker: the 40-board demo at seed 35, 120 s down the course).
        if (turning && !gybing && DropAstern(c, s, k, in gw, gybing, firstOther)) bestP = 0;
        Start(c, k, ref gw, pending ? helm.PendAt : double.NaN, firstOther, firstRule);
        gw.Heading = bestH; gw.Power = bestP;
    }

    /// <summary>A gybe blocked by a board alongside for more than a moment, or a tack blocked for a few seconds by one to
    /// windward on the same tack: the rider sheets out and drops astern of it to turn across its wake.</summary>
    static bool DropAstern(RaceContext c, StepSnapshot s, int k, in GiveWay gw, bool gybing, int blocker)
    {
        double ox = s.X[k] - s.X[blocker], oy = s.Y[k] - s.Y[blocker];
        return gybing ? c.Time - gw.DeferS >= GybeWaitS
            : c.Time > 0 && c.Time - gw.DeferS >= TackWaitS && SameTack(s, k, blocker) && WindwardOffset(s, k, blocker) < 0
              && Math.Sqrt(ox * ox + oy * oy) < TackBlockedNearM;
    }

    /// <summary>
    /// The way of keeping clear: each candidate is scored by how far it turns from what the rider wants, plus a large
    /// charge for any clearance short of the margin (so the clearest is taken when none clears fully), less a bonus for
    /// the way already chosen (riders do not dither between ducking and slowing). Besides fixed turns either way, the
    /// duck astern of the nearest threat, and a change of tack (a gybe away on a run, a tack away on a beat) vetted
    /// against every board in sight (RRS 13, 15, 16).
    /// </summary>
    (double H, double P) Choose(RaceContext c, int k, in GiveWay gw, double baseH, double va, int side, bool turning, double from, double cur)
    {
        c.Work.GiveWaySearches++;
        var s = c.Snapshot;
        double bestScore = double.PositiveInfinity, bestH = baseH, bestP = 1;
        Span<double> offsets = stackalloc double[19];
        ReadOnlySpan<double> fixedOffsets = [0, 10, -10, 20, -20, 30, -30, 45, -45, 60, -60, 80, -80, 100, -100, 120, -120];
        fixedOffsets.CopyTo(offsets);
        offsets[17] = Unit.RadToDeg(Unit.WrapRadPi(Judge.DuckTrack(c, k, _threats[0], va) - baseH));
        double twaCur = Math.Abs(Sailing.SignedAngle(from, cur));
        bool roomToTurn = !turning && c.Grid.NearestM[k] > TurnAwayMinM;
        bool mayGybe = roomToTurn && twaCur >= Unit.DegToRad(GybeAwayMinTwaDeg);
        bool mayTack = roomToTurn && twaCur <= Unit.DegToRad(TackAwayMaxTwaDeg);
        offsets[18] = mayTack ? Unit.RadToDeg(Unit.WrapRadPi(Sailing.CloseHauledOtherTack(c.Fleet.Polars[k], from, side, s.Tws[k]) - baseH)) : double.NaN;
        var neighbours = c.Grid.Neighbours(k);
        // What depends on a candidate's track alone (the track, its sine and cosine, the probe's turn onto it) is worked
        // out once for both passes (full power and slowed): the same expressions, so the same bits.
        Span<double> hs = stackalloc double[19];
        Span<Judge.GapProbe> probes = stackalloc Judge.GapProbe[19];
        Span<bool> probed = stackalloc bool[19];
        for (int slow = 0; slow < 2; slow++)
            for (int oi = 0; oi < offsets.Length; oi++)
            {
                double off = offsets[oi];
                if (double.IsNaN(off)) continue;
                if (slow == 0) hs[oi] = Unit.WrapRadPi(baseH + Unit.DegToRad(off));
                double h = hs[oi];
                double twa = Sailing.SignedAngle(from, h);
                bool other = FastMath.Sign(twa) != side;
                bool gybe = other && mayGybe && Math.Abs(twa) >= Unit.DegToRad(GybeAwayMinTwaDeg);
                bool tack = other && mayTack && oi == 18;
                if (other && !(slow == 0 && (gybe || tack))) continue;
                if (Math.Abs(twa) < Unit.DegToRad(AvoidMinTwaDeg) || !other && Math.Abs(twa) > Unit.DegToRad(178)) continue;
                // Luffing, a board coasts to a stop over a few seconds (mean speed over the next three seconds about 60 %
                // of the present one); sheeting out on a run hardly slows it (model values).
                double v = tack ? TackAwaySpeedShare * va : gybe ? GybeAwaySpeedShare * va : slow == 1 ? (Math.Abs(twa) < Unit.DegToRad(110) ? 0.6 : 0.85) * s.Speed[k] : va;
                // The score is the charges below plus a shortfall term that is never negative: a candidate whose charges
                // alone do not beat the best so far is not vetted at all, and the vetting stops as soon as the shortfall
                // found so far puts it out of reach (the same choice as scoring every candidate in full: the sums are
                // monotone in the shortfall term, so the same bits).
                double lead = (tack ? 0 : Math.Abs(off)) + (slow == 1 ? 25 : 0) + (gybe ? GybeAwayCharge : 0) + (tack ? TackAwayCharge : 0)
                    + (c.Course.LeavesOnWrongHand(s.NextStep[k], new Courses.Vec2(s.X[k], s.Y[k]), Courses.Vec2.Of(Math.SinCos(h)), 0, WrongHandLookM, 1) ? WrongHandCharge : 0);
                double duck = oi == 17 ? DuckPreference : 0;
                bool kept = gw.On && (slow == 1) == (gw.Power == 0) && Math.Abs(Unit.WrapRadPi(h - gw.Heading)) < Unit.DegToRad(6);
                if (Score(lead, duck, kept, double.PositiveInfinity) >= bestScore) continue;
                // Only a shortfall of clearance counts in the score, so each gap need be exact only below the clearance.
                if (!probed[oi])
                {
                    var (sn, cs) = Judge.TrackSinCos(s, k, h);
                    probes[oi] = new Judge.GapProbe(c, k, h, sn, cs, v);
                    probed[oi] = true;
                }
                var probe = probes[oi].WithSpeed(v);
                c.Work.CandidatesVetted++;
                double worst = double.PositiveInfinity, sinH = probe.SinH, cosH = probe.CosH;
                foreach (int j in other ? neighbours : System.Runtime.InteropServices.CollectionsMarshal.AsSpan(_threats))
                {
                    double clear = Judge.PassClear(s, sinH, cosH, v, j);
                    worst = Math.Min(worst, probe.Gap(c, j, clear) - clear);
                    if (worst < 0 && Score(lead, duck, kept, worst) >= bestScore) break;
                }
                double score = Score(lead, duck, kept, worst);
                if (score < bestScore) { bestScore = score; bestH = h; bestP = slow == 1 ? 0 : 1; }
            }
        return (bestH, bestP);
    }

    /// <summary>
    /// Charge (degrees of turn) on a way of keeping clear that would leave the next mark on the wrong hand (model value:
    /// more than any turn, less than a shortfall of clearance, so a rider keeps clear of a board first and of the
    /// mark's wrong side next). Without it, riders steering round a board capsized at the leeward mark passed the mark
    /// on the wrong side and had to go back round it (RRS 28; the 12-board demo, seed 5).
    /// </summary>
    public const double WrongHandCharge = 150;
    /// <summary>How far ahead a mark is looked at for the wrong-hand charge, m (model value: a few seconds at speed).</summary>
    public const double WrongHandLookM = 40;

    /// <summary>A candidate's score: its charges, the shortfall of clearance (worst, m, counted only below zero), the duck's preference and the bonus for the way already chosen.</summary>
    static double Score(double lead, double duck, bool kept, double worst)
    {
        double sc = lead + (worst < 0 ? 200 - 80 * worst : 0) - duck;
        return kept ? sc - 15 : sc;
    }

    /// <summary>
    /// A board that must keep clear of board k (rules 10-12) and could not if k now changed course to h: on the new
    /// course their hulls would come within the passing gap sooner than that rider can react and act (<see
    /// cref="Judge.RoomWindowS"/>), and on the present course they would not. -1 when none (or the change is small).
    /// </summary>
    int NoRoom(RaceContext c, int k, double h)
    {
        var s = c.Snapshot;
        double cur = s.Track[k];
        if (Math.Abs(Unit.WrapRadPi(h - cur)) < Unit.DegToRad(Judge.AlterDeg) * 0.5) return -1;
        double v = Math.Max(s.Speed[k], 1.0), sinC = s.TrackSin[k], cosC = s.TrackCos[k]; // the snapshot's Math.Sin and Math.Cos of cur
        var (sinH, cosH) = Judge.TrackSinCos(s, k, h);
        var onH = new Judge.GapProbe(c, k, h, sinH, cosH, v); var onCur = new Judge.GapProbe(c, k, cur, sinC, cosC, v);
        foreach (int j in c.Grid.Neighbours(k))
        {
            var (keep, rule) = Judge.Decide(c, k, h, j);
            if (keep != j || rule is not (10 or 11 or 12)) continue;
            double win = Judge.RoomWindowS(c, j);
            double clear = Judge.PassClear(s, sinH, cosH, v, j);
            if (onH.Gap(c, j, clear, win) >= clear) continue;
            double clearNow = Judge.PassClear(s, sinC, cosC, v, j);
            if (onCur.Gap(c, j, clearNow, win) < clearNow) continue; // not the change's doing
            return j;
        }
        return -1;
    }

    /// <summary>A new give-way episode (or the same rider now keeping clear of another board, or under another rule).</summary>
    void Start(RaceContext c, int k, ref GiveWay gw, double pendingAt, int other, byte rule)
    {
        if (gw.On && gw.Other == other && gw.Rule == rule) return;
        // The same board kept clear of, clear astern and then overlapped or back (rules 12 and 11: two boards at the
        // edge of an overlap go from one to the other as they move), is the same encounter: the rule is updated, no new
        // episode is counted or logged. A change to another rule (a tack put off under rule 16 becoming a keep-clear
        // under rule 13, say) is a new situation, logged as ever.
        if (gw.On && gw.Other == other && gw.Rule is (11 or 12) && rule is (11 or 12)) { gw.Rule = rule; return; }
        if (!gw.On) gw.AtS = c.Time + c.Fleet.ReactionS[k];
        gw.On = true; gw.Other = other; gw.Rule = rule; gw.Episodes++;
        if (!double.IsNaN(pendingAt)) gw.AtS = Math.Min(gw.AtS, pendingAt); // seen while deciding: acted on with it
        var s = c.Snapshot;
        // The text is made when read (RaceEvent.Detail): the names and rule names are strings the race already holds.
        string format = rule == Judge.Rule16 ? "puts off a tack or gybe near {0} (rule 16)"
            : rule == Judge.Rule161 ? "holds its course: room for {0} to keep clear (rule 16.1)"
            : "keeps clear of {0} (rule {1})";
        c.Log.Add(c.Time, k, RaceEventKind.GiveWay, s.X[k], s.Y[k], format, c.Fleet.Names[other], Judge.RuleName(rule), 0);
    }
}
