using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Rules;

/// <summary>
/// Contacts: every step the pairs the grid found close enough to touch are checked in the step snapshot for contact
/// (hulls within rules.contact_m); a contact is judged once, when it begins: who was to keep clear, under which rule,
/// whether their give-way logic could have avoided it, and a one-turn penalty for the board at fault.
/// </summary>
public sealed class ContactSystem : RaceSystem
{
    public override string Name => "contacts";
    public override SystemScope Scope => SystemScope.Fleet;
    public override string Reads => "snapshot; grid (close pairs); foreseen conflicts; Wake (turn start, recent headings); GiveWay";
    public override string Writes => "incidents, Penalty.Owed (of the board that broke the rule), events";

    public override void RunFleet(RaceContext c)
    {
        var close = c.Grid.Close;
        if (close.Count == 0) return;
        var s = c.Snapshot;
        double clearance = c.Rules.ContactM;
        foreach (var (a, b) in close)
        {
            if (!s.Live[a] || !s.Live[b]) continue;
            double cd = Math.Sqrt((s.X[a] - s.X[b]) * (s.X[a] - s.X[b]) + (s.Y[a] - s.Y[b]) * (s.Y[a] - s.Y[b]));
            long key = RaceContext.UnorderedKey(a, b);
            // (Most close pairs are not touching: the set is only looked into when it holds any.)
            if (cd > Engine.Systems.SnapshotSystem.ContactCheckM) { if (c.Touching.Count != 0) c.Touching.Remove(key); continue; }
            var ra = new RuleBoard(s.X[a], s.Y[a], Unit.RadToDeg(s.Heading[a]), c.Fleet.LengthM[a]);
            var rb = new RuleBoard(s.X[b], s.Y[b], Unit.RadToDeg(s.Heading[b]), c.Fleet.LengthM[b]);
            double hd = RightOfWay.HullDistance(ra, rb);
            if (hd >= clearance) { if (hd > clearance + 0.5 && c.Touching.Count != 0) c.Touching.Remove(key); continue; }
            if (!c.Touching.Add(key)) continue;
            Judged(c, a, b, 0.5 * (s.X[a] + s.X[b]), 0.5 * (s.Y[a] + s.Y[b]));
        }
    }

    static void Judged(RaceContext c, int a, int b, double x, double y)
    {
        var s = c.Snapshot; var names = c.Fleet.Names;
        // The verdict of the moment; the warning the keep-clear rider had is how long the lookout had seen this
        // conflict as theirs with the same rule.
        var (keep, rule) = Judge.Decide(c, a, s.Heading[a], b);
        double since = double.NaN, rowHeading = double.NaN;
        if (keep >= 0 && c.Foreseen.TryGetValue(RaceContext.PairKey(keep, keep == a ? b : a), out var f) && f.Rule == rule) { since = f.SinceS; rowHeading = f.OtherHeading; }
        int row = keep == a ? b : keep == b ? a : -1;
        bool capsized = rule == Judge.Rule22 || keep < 0;
        string detail, ruleText = Judge.RuleText[rule]; bool avoidable = false;
        int penalised = keep;
        if (capsized) detail = keep < 0 ? $"{names[a]} and {names[b]} both in the water" : $"{names[row]} capsized in the way";
        else
        {
            var wake = c.World.Get<Wake>(c.Fleet.Entities[keep]);
            double warning = double.IsNaN(since) ? 0 : c.Time - since;
            double turned = double.IsNaN(rowHeading) ? 0 : Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(s.Heading[row] - rowHeading)));
            bool tooClose = c.Time - wake.TurnStartS < Lookout.TurnTooCloseS && wake.TurnStartNearestM < Lookout.TurnTooCloseM;
            if (!c.Rules.GiveWay) detail = "give-way logic off";
            else if (tooClose) { avoidable = true; detail = $"keep-clear board began a tack or gybe {c.Time - wake.TurnStartS:F1} s before with a board {wake.TurnStartNearestM:F0} m away"; }
            else if (c.Rules.JudgeRoom && NoRoomGiven(c, keep, row, rule, since, out double window, out double altered))
            {
                // Right of way acquired by its own tack or gybe within that time: rule 15 rather than 16.1.
                var rowWake = c.World.Get<Wake>(c.Fleet.Entities[row]);
                bool acquired = c.Time - rowWake.TurnStartS < window + AcquiredS;
                penalised = row; ruleText = acquired ? "15" : "16.1";
                detail = acquired
                    ? $"{names[row]} acquired right of way (rule {Judge.RuleText[rule]}) by its tack or gybe {c.Time - rowWake.TurnStartS:F1} s before contact and did not initially give room to keep clear (rule 15): {names[row]} penalised; {names[keep]} exonerated (rule 43.1(a))"
                    : $"{names[row]} (right of way under rule {Judge.RuleText[rule]}) changed course by {altered:F0} deg in the last {window:F1} s without giving room to keep clear (rule 16.1): {names[row]} penalised; {names[keep]} exonerated (rule 43.1(a))";
            }
            else if (c.Rules.JudgeRoom && Compelled(c, keep, row, out int by, out string why))
            {
                penalised = by; ruleText = "43.1(a)";
                detail = $"{names[keep]} (keep clear under rule {Judge.RuleText[rule]}) was compelled by {names[by]}'s breach ({why}): {names[keep]} exonerated (rule 43.1(a)); {names[by]} penalised";
            }
            else if (turned > Judge.AlterDeg)
                detail = c.Rules.JudgeRoom ? $"right-of-way board changed course by {turned:F0} deg since the conflict was first seen, leaving room to keep clear (not rule 16.1)"
                    : $"right-of-way board changed course by {turned:F0} deg";
            else if (s.Busy[keep]) detail = "keep-clear board mid-manoeuvre (begun well clear)";
            else if (warning < c.Fleet.ReactionS[keep] + 1.0) detail = $"seen {warning:F1} s before contact";
            else { avoidable = true; detail = $"seen {warning:F1} s before contact and not avoided"; }
            if (rule == Judge.Rule18 && penalised == keep) detail = $"{detail}; mark-room at {MarkWhere(c, keep)}";
        }
        bool penalty = !capsized && c.Rules.Penalties;
        if (penalty) c.World.Get<Penalty>(c.Fleet.Entities[penalised]).Owed++;
        c.Log.Incidents.Add(new RaceIncident(c.Time, x, y, keep, row, ruleText, penalty, avoidable, detail, penalty ? penalised : -1));
        string who = capsized ? $"{names[a]} and {names[b]}" : $"{names[keep]} (keep clear) and {names[row]}";
        string pen = !penalty ? "" : penalised == keep ? "; one-turn penalty" : $"; one-turn penalty for {names[penalised]}";
        c.Log.Add(c.Time, capsized ? a : keep, RaceEventKind.Contact, x, y, $"{who}: rule {ruleText}; {detail}{pen}");
    }

    /// <summary>A tack or gybe this long (s) before the room window counts as the way the board acquired right of way (model value: the length of a gybe).</summary>
    public const double AcquiredS = 3;

    static string MarkWhere(RaceContext c, int k)
    {
        int step = c.Snapshot.NextStep[k];
        var steps = c.Course.Steps;
        if (step >= steps.Count) return "the mark";
        return steps[step].Kind switch { Courses.StepKind.Gate => "the gate", Courses.StepKind.Finish => "the finishing mark (Appendix B rule 18)", _ => "the mark" };
    }

    /// <summary>
    /// RRS 16.1: the right-of-way board (under rules 10-12; a board taking mark-room is exonerated by rule 21 and rule 13
    /// leaves the tacking board to keep clear) changed course by at least <see cref="Judge.AlterDeg"/> within the time the
    /// keep-clear rider needs to react and act (<see cref="Judge.RoomWindowS"/>), not in avoiding this very board (rule
    /// 14), and the keep-clear rider had not foreseen this conflict before that change: the change left no room to keep clear.
    /// </summary>
    static bool NoRoomGiven(RaceContext c, int keep, int row, byte rule, double since, out double window, out double altered)
    {
        window = Judge.RoomWindowS(c, keep);
        altered = Judge.Altered(c, row, window);
        if (rule is not (10 or 11 or 12) || altered < Judge.AlterDeg) return false;
        var gw = c.World.Get<GiveWay>(c.Fleet.Entities[row]);
        if (c.Snapshot.KeepingClear[row] && gw.Other == keep) return false;
        return double.IsNaN(since) || since > c.Time - window;
    }

    /// <summary>
    /// RRS 43.1(a): the keep-clear board was, at the contact, acting (its give-way in force) while a third board close
    /// to it was in breach towards it: one that had to keep clear of it, was not keeping clear and was about to hit it
    /// (closest approach within the conflict distance in under <see cref="Lookout.LastMomentS"/> s: rule 14 made the
    /// rider swerve), or a right-of-way board that had just changed course without giving room (16.1).
    /// </summary>
    static bool Compelled(RaceContext c, int keep, int row, out int by, out string why)
    {
        by = -1; why = "";
        var s = c.Snapshot;
        if (!s.KeepingClear[keep]) return false;
        double window = Judge.RoomWindowS(c, keep);
        double sinK = s.TrackSin[keep], cosK = s.TrackCos[keep], vK = s.Speed[keep];
        foreach (int z in c.Grid.Neighbours(keep))
        {
            if (z == row || !s.Live[z] || s.Capsized[z]) continue;
            var (t, d, closing) = Judge.CpaAndClosing(s, keep, sinK, cosK, vK, z);
            if (d >= Lookout.ConflictM + Lookout.ConflictPerMs * closing) continue;
            var (zKeep, zRule) = Judge.Decide(c, z, s.Heading[z], keep);
            if (zKeep == z && zRule is not Judge.Rule18 && !s.KeepingClear[z] && t < Lookout.LastMomentS)
            {
                by = z; why = $"it did not keep clear under rule {Judge.RuleText[zRule]} and was about to hit {c.Fleet.Names[keep]} (rule 14)";
                return true;
            }
            double altered = Judge.Altered(c, z, window);
            if (zKeep == keep && zRule is (10 or 11 or 12) && altered >= Judge.AlterDeg)
            {
                by = z; why = $"it changed course by {altered:F0} deg in the last {window:F1} s without giving room to keep clear (rule 16.1)";
                return true;
            }
        }
        return false;
    }
}
