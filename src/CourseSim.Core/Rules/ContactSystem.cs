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
    public override string Reads => "snapshot; grid (close pairs); foreseen conflicts; Wake (turn start)";
    public override string Writes => "incidents, Penalty.Owed, events";

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
            if (cd > Engine.Systems.SnapshotSystem.ContactCheckM) { c.Touching.Remove(key); continue; }
            var ra = new RuleBoard(s.X[a], s.Y[a], Unit.RadToDeg(s.Heading[a]), c.Fleet.LengthM[a]);
            var rb = new RuleBoard(s.X[b], s.Y[b], Unit.RadToDeg(s.Heading[b]), c.Fleet.LengthM[b]);
            double hd = RightOfWay.HullDistance(ra, rb);
            if (hd >= clearance) { if (hd > clearance + 0.5) c.Touching.Remove(key); continue; }
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
        string detail; bool avoidable = false;
        if (capsized) detail = keep < 0 ? "both boards in the water" : $"{names[row]} capsized in the way";
        else
        {
            var wake = c.World.Get<Wake>(c.Fleet.Entities[keep]);
            double warning = double.IsNaN(since) ? 0 : c.Time - since;
            double turned = double.IsNaN(rowHeading) ? 0 : Math.Abs(Unit.RadToDeg(Unit.WrapRadPi(s.Heading[row] - rowHeading)));
            bool tooClose = c.Time - wake.TurnStartS < Lookout.TurnTooCloseS && wake.TurnStartNearestM < Lookout.TurnTooCloseM;
            if (!c.Rules.GiveWay) detail = "give-way logic off";
            else if (tooClose) { avoidable = true; detail = $"keep-clear board began a tack or gybe {c.Time - wake.TurnStartS:F1} s before with a board {wake.TurnStartNearestM:F0} m away"; }
            else if (turned > 15) detail = $"right-of-way board changed course by {turned:F0} deg";
            else if (s.Busy[keep]) detail = "keep-clear board mid-manoeuvre (begun well clear)";
            else if (warning < c.Fleet.ReactionS[keep] + 1.0) detail = $"seen {warning:F1} s before contact";
            else { avoidable = true; detail = $"seen {warning:F1} s before contact and not avoided"; }
        }
        bool penalty = !capsized && c.Rules.Penalties;
        if (penalty) c.World.Get<Penalty>(c.Fleet.Entities[keep]).Owed++;
        string ruleText = Judge.RuleText[rule];
        c.Log.Incidents.Add(new RaceIncident(c.Time, x, y, capsized ? -1 : keep, capsized ? -1 : row, ruleText, penalty, avoidable, detail));
        string who = capsized ? $"{names[a]} and {names[b]}" : $"{names[keep]} (keep clear) and {names[row]}";
        c.Log.Add(c.Time, capsized ? a : keep, RaceEventKind.Contact, x, y, $"{who}: rule {ruleText}; {detail}{(penalty ? "; one-turn penalty" : "")}");
    }
}
