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
            int lo = Math.Min(a, b), hi = Math.Max(a, b);
            // (Most close pairs are not touching: an empty row is answered by its length.)
            if (cd > Engine.Systems.SnapshotSystem.ContactCheckM) { c.Touching.Remove(lo, hi); continue; }
            var ra = new RuleBoard(s.X[a], s.Y[a], Unit.RadToDeg(s.Heading[a]), c.Fleet.LengthM[a]);
            var rb = new RuleBoard(s.X[b], s.Y[b], Unit.RadToDeg(s.Heading[b]), c.Fleet.LengthM[b]);
            double hd = RightOfWay.HullDistance(ra, rb);
            if (hd >= clearance) { if (hd > clearance + 0.5) c.Touching.Remove(lo, hi); continue; }
            if (!c.Touching.Add(lo, hi, true)) continue;
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
        string ruleText = Judge.RuleText[rule]; bool avoidable = false;
        int penalised = keep;
        // The verdict's parts (its text is made when read: nothing allocated here).
        var v = new ContactVerdict { A = names[a], B = names[b], Rule = ruleText };
        if (capsized) v = v with { Kind = keep < 0 ? VerdictKind.BothInWater : VerdictKind.CapsizedInWay, Row = keep < 0 ? null : names[row] };
        else
        {
            v = v with { Keep = names[keep], Row = names[row] };
            var wake = c.World.Get<Wake>(c.Fleet.Entities[keep]);
            double warning = double.IsNaN(since) ? 0 : c.Time - since;
            double turned = double.IsNaN(rowHeading) ? 0 : Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(s.Heading[row] - rowHeading)));
            bool tooClose = c.Time - wake.TurnStartS < Lookout.TurnTooCloseS && wake.TurnStartNearestM < Lookout.TurnTooCloseM;
            if (!c.Rules.GiveWay) v = v with { Kind = VerdictKind.GiveWayOff };
            else if (tooClose) { avoidable = true; v = v with { Kind = VerdictKind.TurnedTooClose, V1 = c.Time - wake.TurnStartS, V2 = wake.TurnStartNearestM }; }
            else if (c.Rules.JudgeRoom && NoRoomGiven(c, keep, row, rule, since, out double window, out double altered))
            {
                // Right of way acquired by its own tack or gybe within that time: rule 15 rather than 16.1.
                var rowWake = c.World.Get<Wake>(c.Fleet.Entities[row]);
                bool acquired = c.Time - rowWake.TurnStartS < window + AcquiredS;
                penalised = row; ruleText = acquired ? "15" : "16.1";
                v = acquired ? v with { Kind = VerdictKind.AcquiredRightOfWay, V1 = c.Time - rowWake.TurnStartS }
                    : v with { Kind = VerdictKind.NoRoomGiven, V1 = altered, V2 = window };
            }
            else if (c.Rules.JudgeRoom && Compelled(c, keep, row, ref v, out int by))
            {
                penalised = by; ruleText = "43.1(a)";
                v = v with { Kind = VerdictKind.Compelled, By = names[by] };
            }
            else if (turned > Judge.AlterDeg) v = v with { Kind = c.Rules.JudgeRoom ? VerdictKind.RowAlteredRoomLeft : VerdictKind.RowAltered, V1 = turned };
            else if (s.Busy[keep]) v = v with { Kind = VerdictKind.KeepBusy };
            else if (warning < c.Fleet.ReactionS[keep] + 1.0) v = v with { Kind = VerdictKind.SeenLate, V1 = warning };
            else { avoidable = true; v = v with { Kind = VerdictKind.NotAvoided, V1 = warning }; }
            if (rule == Judge.Rule18 && penalised == keep) v = v with { MarkRoomAt = MarkWhere(c, keep) };
        }
        bool penalty = !capsized && c.Rules.Penalties;
        if (penalty) c.World.Get<Penalty>(c.Fleet.Entities[penalised]).Owed++;
        c.Log.AddContact(new RaceIncident(c.Time, x, y, keep, row, ruleText, penalty, avoidable, v, penalty ? penalised : -1), capsized ? a : keep);
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
    static bool Compelled(RaceContext c, int keep, int row, ref ContactVerdict v, out int by)
    {
        by = -1;
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
                by = z; v = v with { Why = CompelledBy.DidNotKeepClear, ByRule = Judge.RuleText[zRule] };
                return true;
            }
            double altered = Judge.Altered(c, z, window);
            if (zKeep == keep && zRule is (10 or 11 or 12) && altered >= Judge.AlterDeg)
            {
                by = z; v = v with { Why = CompelledBy.ChangedCourse, V1 = altered, V2 = window };
                return true;
            }
        }
        return false;
    }
}
