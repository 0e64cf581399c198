using System.Reflection;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Rules;
using CourseSim.Units;

namespace CourseSim.Agents;

/// <summary>
/// Decide: each rider decides at a human rate (race.decision_interval_s, staggered across the fleet by identity) from
/// what they perceive (docs/tactics.md). Before the start and when returning from an early start the board follows its
/// start plan; racing, it asks its tactic (<see cref="ITactic"/>), with other boards as the step snapshot shows them. A
/// decision takes effect after the rider's reaction time; every step the helm then steers by the decision in force,
/// unless a penalty turn is being served or the lookout has the rider keeping clear of another board.
/// </summary>
public sealed class DecideSystem : RaceSystem
{
    ITactic[] _tactics;
    readonly Observation _obs = new();
    readonly Navigator _nav = new();
    readonly Lookabout _look;

    public DecideSystem(RaceContext c, TacticRegistry registry)
    {
        var f = c.Fleet;
        _look = new Lookabout(f);
        _obs.FleetNames = f.Names;
        _tactics = new ITactic[f.Count];
        for (int b = 0; b < f.Count; b++)
        {
            var e = c.Setup.Boards[b];
            if (!registry.TryGet(e.Tactic, out var spec))
                throw new InvalidOperationException($"board '{e.Id}': no tactic '{e.Tactic}' (known: {string.Join(", ", registry.Names)})");
            var prm = spec.Params.ToDictionary(q => q.Name, q => e.Param(q.Name, q.Default));
            _tactics[b] = spec.Create(new TacticArgs(b, e.Name, prm, e.RivalIndex, c.Setup.Race.Seed));
        }
    }

    public override string Name => "decide";
    public override SystemScope Scope => SystemScope.OwnBoard;
    public override string Reads => "Pose, Motion, SensedWind, Trim (planing), Perception, RaceStatus, ManoeuvreState, Penalty, GiveWay; snapshot (boards in sight, the board kept clear of, boards waiting to take a penalty); grid (nearest, neighbours)";
    public override string Writes => "Helm, Intent, StartPlan, Perception.LastTurnS, Penalty (serving), events";

    /// <summary>The boards in sight come from a hash of the step snapshot, built at the step's first look.</summary>
    public override void Prepare(RaceContext c) => _look.Prepare();

    public override void RunBoards(RaceContext c, ref BoardBlock blk)
    {
        for (int i = 0; i < blk.Count; i++)
        {
            int b = blk.Id[i].Value;
            ref var it = ref blk.Intent[i];
            // A decision still pending when the board rounds a mark was made for the leg just sailed, towards an aim point
            // now behind it: the rider drops it and decides afresh for the new leg. Acted on, it started a tack or gybe
            // back towards the mark, and the new leg's decision a turn back again (in the 12-board demo about one gybe
            // in eight came within 8 s of the board's last one, runs of up to four, most of them just after a rounding).
            ref var helm = ref blk.Helm[i];
            if (helm.HasPending && helm.PendStep != blk.Status[i].NextStep)
            {
                helm.PendAt = double.PositiveInfinity;
                it.NextDecisionS = Math.Min(it.NextDecisionS, c.Time);
            }
            if (c.Time >= it.NextDecisionS) DecideOne(c, b, ref blk, i);
            ApplyIntent(c, b, ref it, ref helm, ref blk.Penalty[i], ref blk.Perception[i], in blk.Pose[i], in blk.Wind[i], in blk.Manoeuvre[i], in blk.Status[i], in blk.GiveWay[i]);
        }
    }

    /// <summary>
    /// A decision takes effect after the rider's reaction time. A newer one made while the last is still pending
    /// replaces it at the same moment (the rider is already acting and adjusts what they do).
    /// </summary>
    static void Submit(RaceContext c, int b, ref Helm h, double heading, double power, double target, double fromDeg, int step)
    {
        h.PendStep = step;
        // A pending decision already due is acted on first; a new tack or gybe always takes a full reaction time.
        if (h.PendAt <= c.Time) { h.WantH = h.PendH; h.WantP = h.PendP; h.WantV = h.PendV; h.PendAt = double.PositiveInfinity; }
        bool newSide = Math.Sign(Sailing.SignedAngle(fromDeg, heading)) != Math.Sign(Sailing.SignedAngle(fromDeg, h.HasPending ? h.PendH : h.WantH));
        h.PendH = heading; h.PendP = power; h.PendV = target;
        if (!h.HasPending || newSide) h.PendAt = c.Time + c.Fleet.ReactionS[b];
    }

    /// <summary>How long a returning rider holds on beside a board that keeps them from bearing away before sheeting out to let it by, s (model value).</summary>
    public const double ReturnHeldS = 3;

    /// <summary>Whether board b is to windward of board o (in the wind from <paramref name="fromDeg"/>), as the snapshot has them.</summary>
    static bool ToWindwardOf(RaceContext c, int b, int o, double fromDeg)
    {
        var s = c.Snapshot;
        return Vec2.Dot(new Vec2(s.X[b] - s.X[o], s.Y[b] - s.Y[o]), Vec2.FromBearing(fromDeg)) > 0;
    }

    static void ApplyIntent(RaceContext c, int b, ref Intent it, ref Helm helm, ref Penalty pen, ref Perception per, in Pose pose, in SensedWind sw,
        in ManoeuvreState man, in RaceStatus st, in GiveWay gw)
    {
        if (helm.PendAt <= c.Time) { helm.WantH = helm.PendH; helm.WantP = helm.PendP; helm.WantV = helm.PendV; helm.PendAt = double.PositiveInfinity; }
        double h = helm.WantH, pw = helm.WantP;
        if (pen.Owed > 0 && pen.Stage == 0) PenaltyTurn.MaybeStart(c, b, ref pen, in pose, in sw, in man, in st);
        if (pen.Stage > 0) PenaltyTurn.Steer(c, b, ref pen, ref per, in pose, in sw, in man, ref h, ref pw);
        helm.PlannedH = h;
        if (gw.On && c.Time >= gw.AtS)
        {
            // Before the signal a rider keeping clear turns as the lookout says but sheets in no more than the start
            // plan wants: sheeting in near the line would carry them over early (docs/tactics.md, "Start plans").
            // Waiting for clear water to take a penalty, a rider who has sheeted out to let a board by (PenaltyTurn)
            // stays sheeted out while keeping clear of it: two boards owing penalties otherwise sailed on side by side
            // for minutes, the one keeping clear at full power (the 40-board demo, seed 17).
            bool penaltyDropsBack = pen.InWaitStage && pw == 0;
            h = gw.Heading; pw = st.State == RaceState.PreStart && c.Time < 0 || penaltyDropsBack ? Math.Min(gw.Power, pw) : gw.Power;
            // Back from an early start a rider keeps clear of every board not returning (RRS 21.1). Held for a few
            // seconds from bearing away back to the line by a board to leeward, they sheet out and let it sail by, then
            // bear away astern of it, rather than sail on up the course beside it (common practice; the 40-board demo's
            // early starter sailed a minute and a half of the beat that way).
            if (st.State == RaceState.Returning && c.Time - gw.AtS >= ReturnHeldS
                && Vec2.Dot(Vec2.FromBearing(Unit.RadToDeg(h)), c.Course.Start.Normal) > 0 && ToWindwardOf(c, b, gw.Other, sw.TrueFromDeg)) pw = 0;
        }
        it.Heading = h; it.Power = pw; it.TargetSpeed = helm.WantV;
    }

    void DecideOne(RaceContext c, int b, ref BoardBlock blk, int i)
    {
        ref var it = ref blk.Intent[i]; ref var helm = ref blk.Helm[i]; ref var per = ref blk.Perception[i];
        ref readonly var pose = ref blk.Pose[i]; ref readonly var sw = ref blk.Wind[i]; ref readonly var st = ref blk.Status[i];
        it.NextDecisionS += c.Settings.DecisionIntervalS;
        var rig = c.Fleet.Polars[b];
        var p = new Vec2(pose.X, pose.Y);
        double tws = sw.PerceivedSpeed, from = sw.PerceivedFromDeg;
        int tack = Sailing.SignedAngle(from, pose.Heading) >= 0 ? 1 : -1;
        // Busy: no new decision mid-manoeuvre, or once committed to a tack or gybe not yet begun (pinned boards excepted).
        if (blk.Manoeuvre[i].Kind != Manoeuvre.None) return;
        if (helm.Pinned)
        {
            // Pinned to a true wind angle (polar checks): steer by the true wind at the rig, full power, at once.
            helm.WantH = Unit.WrapRadPi(Unit.DegToRad(sw.TrueFromDeg - helm.HoldTwaDeg)); helm.WantP = 1;
            helm.WantV = rig.Speed(sw.TrueSpeed, Unit.DegToRad(helm.HoldTwaDeg));
            helm.PendAt = double.PositiveInfinity;
            return;
        }
        if (helm.HasPending && Math.Sign(Sailing.SignedAngle(from, helm.PendH)) != tack) return;
        bool mayTurn = c.Time - per.LastTurnS >= Navigation.MinTimeBetweenTurnsS;
        double heading, power = 1;
        switch (st.State)
        {
            case RaceState.PreStart when c.Time < 0:
                (heading, power) = StartPlanner.Countdown(c, b, ref blk.Start[i], p, pose.Heading, blk.Motion[i].Speed, tws, from, tack);
                break;
            case RaceState.PreStart:
                // After the signal, not yet started (late, or back from an early start): the run to the line.
                heading = StartPlanner.RunHeading(c, rig, p, new Vec2(blk.Start[i].SpotX, blk.Start[i].SpotY), tws, from, tack);
                break;
            case RaceState.Returning:
                // Back below the line after an early start: bear away on the same tack, part sheeted, letting the
                // starters go by (no gybe needed); once wholly below, the run to the line brings it back up.
                (heading, power) = StartPlanner.BackOff(c, b, p, new Vec2(blk.Start[i].WaitX, blk.Start[i].WaitY), tws, from, tack);
                break;
            default:
            {
                var d = AskTactic(c, b, in pose, in per, in st, blk.Motion[i].Speed);
                heading = Unit.WrapRadPi(Unit.DegToRad(d.HeadingDeg));
                power = double.IsFinite(d.Power) ? Math.Clamp(d.Power, 0, 1) : 1;
                if (!double.IsFinite(heading)) heading = pose.Heading;
                heading = Navigation.MarkSideGuard(c.Course, rig, st.NextStep, p, heading, tws, from, tack);
                heading = Navigation.PlaningGuard(rig, heading, tws, from, blk.Trim[i].Planing);
                break;
            }
        }
        if (Math.Sign(Sailing.SignedAngle(from, heading)) != tack) per.LastTurnS = c.Time;
        Submit(c, b, ref helm, heading, power, rig.Speed(tws, Sailing.SignedAngle(from, heading)), from, st.NextStep);
    }

    /// <summary>Fills the observation (the wind as the rider reads it) and asks the board's tactic.</summary>
    Decision AskTactic(RaceContext c, int b, in Pose pose, in Perception per, in RaceStatus st, double speed)
    {
        var f = c.Fleet; var rig = f.Polars[b];
        double from = per.ReadFromDeg, tws = per.ReadSpeed;
        var p = new Vec2(pose.X, pose.Y);
        var o = _obs;
        o.TimeS = c.Time; o.Board = b; o.Name = f.Names[b]; o.Position = p;
        o.HeadingDeg = Unit.WrapDeg360(Unit.RadToDeg(pose.Heading)); o.SpeedMs = speed;
        o.WindSpeedMs = tws; o.WindFromDeg = from;
        double twa = Unit.RadToDeg(Sailing.SignedAngle(from, pose.Heading));
        o.TrueWindAngleDeg = twa; o.Tack = twa >= 0 ? 1 : -1;
        o.Course = c.Course; o.NextStep = st.NextStep; o.Polar = rig; o.LastTurnS = per.LastTurnS;
        // Riders plan from where they will be when the decision takes effect (reaction time and half a decision
        // interval ahead along their heading), so a layline or a mark is not noticed only once passed.
        double lead = f.ReactionS[b] + 0.5 * c.Settings.DecisionIntervalS;
        var pl = p + lead * speed * Vec2.FromBearing(Unit.RadToDeg(pose.Heading));
        var aim = Navigation.AimPoint(c.Course, st.NextStep, pl, pose.Heading, from);
        o.AimPoint = aim;
        double direct = Math.Abs(Unit.RadToDeg(Sailing.SignedAngle(from, Unit.DegToRad((aim - pl).Bearing))));
        double up = Unit.RadToDeg(rig.BestTwa(tws, true)), down = Unit.RadToDeg(rig.BestTwa(tws, false));
        o.Leg = direct < up ? LegKind.Beat : direct > down && (aim - pl).Length > Navigation.CloseRunM ? LegKind.Run : LegKind.Reach;
        var tactic = _tactics[b];
        if (tactic.WantsNearby) o.NearbyFrom(_look, c); else o.ClearNearby();
        _nav.Set(rig, pl, tws, from, o.Tack);
        return tactic.Decide(o, _nav);
    }

    static readonly MethodInfo Clone = typeof(object).GetMethod("MemberwiseClone", BindingFlags.Instance | BindingFlags.NonPublic)!;

    /// <summary>
    /// Copies of the tactics' state, for a checkpoint: each tactic is copied member by member (a tactic keeps its memory
    /// in plain fields: docs/tactics.md asks user tactics to do the same).
    /// </summary>
    public object SaveState() => _tactics.Select(t => (ITactic)Clone.Invoke(t, null)!).ToArray();
    public void RestoreState(object state) => _tactics = ((ITactic[])state).Select(t => (ITactic)Clone.Invoke(t, null)!).ToArray();
}
