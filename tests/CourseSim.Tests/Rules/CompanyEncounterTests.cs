using CourseSim.Agents;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Tests.Engine;
using CourseSim.Units;

namespace CourseSim.Tests.Rules;

/// <summary>
/// Encounters in company (issue 12): two boards running side by side to a leeward mark; a right-of-way board that
/// alters course into a keep-clear one (RRS 16.1); a board compelled to break a rule by another's breach (RRS 43.1(a));
/// mark-room at a gate (RRS 18, Appendix B).
/// </summary>
public partial class EncounterTests
{
    // Leeward mark straight downwind (wind from the north), left to port; the boards start on starboard gybe east of it.
    const double RunMarkY = -500;
    /// <summary>Wind of the running pair, kn: planing, so the best downwind angle is a broad reach with laylines to gybe on
    /// (in 12 kn this rig's best run is dead downwind, off the plane: no layline).</summary>
    const double RunKn = 16;
    const string RunCourse = "[course]\nkind = \"waypoints\"\norder = \"m far\"\n[course.marks.m]\nx_m = 0\ny_m = -500\nrounding = \"port\"\n" +
                             "[course.marks.far]\nx_m = 0\ny_m = 3000\n";

    /// <summary>
    /// Metres past the port-gybe layline (at the rig's best downwind angle, true wind) through the rider's aim point at
    /// the mark, of the board's first gybe (positive: overstood); infinity if it never gybed.
    /// </summary>
    static double PastLayline(Race race, int b, RaceResult r)
    {
        var g = r.Events.FirstOrDefault(e => e.Board == b && e.Kind == RaceEventKind.Gybe);
        if (g.Kind != RaceEventKind.Gybe) return double.PositiveInfinity;
        double down = Unit.RadToDeg(race.RigOf(b).BestTwa(Unit.KnotsToMs(RunKn), false));
        var dir = Vec2.FromBearing(down); // port gybe in a wind from the north: heading = the angle off the wind
        var aim = new Vec2(0, RunMarkY) + Navigation.RoundingOffsetM * new Vec2(-1, 0);
        return -Vec2.Cross(dir, new Vec2(g.X, g.Y) - aim);
    }

    /// <summary>Two boards on starboard gybe at the best downwind angle, abeam <paramref name="gapM"/> apart (0 = board b far away: a alone).</summary>
    static Race RunPair(ulong seed, double gapM, bool bAlone = false)
    {
        var race = Build(Board("a", "vmg-layline") + Board("b", "vmg-layline"), course: RunCourse, seed: seed, kn: RunKn);
        double tws = Unit.KnotsToMs(RunKn);
        double twa = Unit.RadToDeg(race.RigOf(0).BestTwa(tws, false));
        double v = race.RigOf(0).Speed(tws, Unit.DegToRad(twa));
        double h = Unit.WrapDeg360(-twa); // starboard gybe: the wind over the starboard side
        var abeam = Vec2.FromBearing(h + 90); // b on a's starboard (windward) side
        var pa = new Vec2(100, 0); var pb = pa + gapM * abeam;
        if (gapM > 0) race.Place(0, pa.X, pa.Y, h, v); else race.Place(0, 3000, 3000, 0, v);
        if (!bAlone) race.Place(1, pb.X, pb.Y, h, v); else race.Place(1, -3000, 3000, 0, v);
        return race;
    }

    [Fact]
    public void RunningSideBySide_BothGybeNearTheLayline()
    {
        // Two boards running abeam, 3 to 8 m apart, towards the port-gybe layline: the leeward one (on the inside of the
        // gybe) gybes away from the other; the windward one gybes as soon as that is clear, or sheets out and gybes
        // astern. Each is compared with where it gybes sailing alone on the same seed (the riders read the wind with an
        // error, so the layline each sees differs from the true one by up to 20 m here). With the old gybe vetting
        // (any board within 12 m puts a gybe off) both held on beside each other 22-320 m past the layline, and this
        // test fails. Measured (3 Dec 2026, fifth session): the leeward board gybes at most 15 m after its lone gybe, the
        // windward one at most 22 m (about two seconds of planing, having waited for the other's gybe or dropped astern
        // of it); no contact. Against the true layline both gybe at most 15 m (six board lengths) past it, the same as
        // the worst lone gybe (the rider's misreading of the wind). The bounds: 25 m after the lone gybe, 20 m past the
        // true layline.
        var log = new List<string>();
        int bad = 0;
        foreach (double gap in new[] { 3.0, 5.0, 8.0 })
            for (ulong seed = 1; seed <= 4; seed++)
            {
                var pair = RunPair(seed, gap);
                var (r, _) = Sail(pair, 120);
                var soloA = RunPair(seed, gap, bAlone: true);
                var (ra, _) = Sail(soloA, 120);
                var soloB = RunPair(seed, 0);
                var (rb, _) = Sail(soloB, 120);
                double a = PastLayline(pair, 0, r), b = PastLayline(pair, 1, r), a0 = PastLayline(soloA, 0, ra), b0 = PastLayline(soloB, 1, rb);
                bool ok = a - a0 <= 25 && b - b0 <= 25 && a <= 20 && b <= 20 && r.Incidents.Count == 0;
                if (!ok) bad++;
                if (System.Environment.GetEnvironmentVariable("COURSESIM_DEBUG") == "1") foreach (var e in r.Events.Where(e => e.Kind is RaceEventKind.GiveWay or RaceEventKind.Gybe).Take(14)) Console.WriteLine($"   {gap} {seed} {e.TimeS:F1} b{e.Board} {e.Kind} ({e.X:F1},{e.Y:F1}) {e.Detail}");
                log.Add($"gap {gap} seed {seed}: a {a:F1} (alone {a0:F1}), b {b:F1} (alone {b0:F1}) m past the layline, {r.Incidents.Count} contacts");
            }
        foreach (var l in log) Console.WriteLine(l);
        Assert.True(bad == 0, string.Join("\n", log));
    }

    sealed class LuffAt(TacticArgs a) : ITactic
    {
        readonly double _at = a["luff_at_s"];
        public Decision Decide(Observation o, INavigator nav) => new(nav.AtTrueWindAngle(o.TimeS >= _at ? 50 : 90));
    }

    static Race LuffRace(string rules, ulong seed)
    {
        var reg = MakeTactics();
        reg.Register(new TacticSpec("test-luff", "scripted: reach at 90 deg, luff to 50 deg at luff_at_s",
            [new("luff_at_s", -1000, 1e6, 1e6, "time of the luff, s")], a => new LuffAt(a)));
        string course = "[course]\nkind = \"waypoints\"\norder = \"far\"\n[course.marks.far]\nx_m = 0\ny_m = 30000\n";
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(Kn) + "[race]\nfalls = false\ncountdown_s = 20\ntime_limit_s = 600\n" +
            $"[rules]\n{rules}" + course + Board("lee", "test-luff", "luff_at_s = -19") + Board("wind", "test-hold", "twa_deg = 90"), seed, tactics: reg);
        var race = new Race(setup, tactics: reg);
        double v = race.RigOf(0).Speed(Unit.KnotsToMs(Kn), Math.PI / 2);
        // Heading 270 in a wind from the north: starboard tack; its starboard (windward) side is north.
        race.Place(0, 0, 0, 270, v);
        race.Place(1, 0, 3.5, 270, v);
        return race;
    }

    [Fact]
    public void RightOfWayBoardLuffsWithoutRoom_ItBrokeRule16_TheOtherIsExonerated()
    {
        // The riders' own 16.1 is off here (rules.give_room = false), so the leeward board luffs into the windward one,
        // which cannot get clear within its reaction time: contact. RRS 16.1: the leeward board broke it; the windward
        // board, compelled to break rule 11, is exonerated (RRS 43.1(a)). With the judge's 16.1 off, the old verdict:
        // the windward board at fault under rule 11.
        // The windward rider sometimes gets clear (its reading of the wind is a random draw of the seed), so the
        // luff is sailed for six seeds: contact in at least three, each judged as above.
        int contacts = 0, judged = 0, offOld = 0; var log = new List<string>();
        static int Pens(RaceResult r, int b) => r.Boards[b].Penalties + r.Boards[b].PenaltiesNotTaken;
        for (ulong seed = 1; seed <= 6; seed++)
        {
            var (r, _) = Sail(LuffRace("give_room = false\n", seed), 20);
            var (ro, _) = Sail(LuffRace("give_room = false\njudge_room = false\n", seed), 20);
            log.Add($"seed {seed}: on [{string.Join("; ", r.Incidents.Select(i => $"{i.Rule} {i.Detail}"))}] off [{string.Join("; ", ro.Incidents.Select(i => $"{i.Rule} {i.Detail}"))}]");
            if (r.Incidents.Count == 0) continue;
            contacts++;
            var first = r.Incidents[0];
            if (first.Rule == "16.1" && first.KeepClear == 1 && first.RightOfWay == 0 && first.Penalty && first.Detail.Contains("43.1(a)")
                && Pens(r, 1) == 0 && Pens(r, 0) >= 1) judged++;
            if (ro.Incidents.Count > 0 && ro.Incidents[0].Rule == "11" && ro.Incidents[0].KeepClear == 1 && Pens(ro, 1) >= 1 && Pens(ro, 0) == 0) offOld++;
        }
        foreach (var l in log) Console.WriteLine(l);
        Assert.True(contacts >= 3, $"contact in only {contacts} of 6:\n{string.Join("\n", log)}");
        Assert.True(judged == contacts, $"rule 16.1 judged in {judged} of {contacts} contacts:\n{string.Join("\n", log)}");
        Assert.True(offOld == contacts, $"with the judge's 16.1 off, the windward board at fault in {offOld} of {contacts}:\n{string.Join("\n", log)}");
    }

    [Fact]
    public void RightOfWayBoardGivesRoom_HoldsItsLuffUntilTheOtherCanKeepClear()
    {
        // The same luff with the riders' 16.1 on: the leeward rider holds its course until the windward board has room
        // (it has borne away or drawn clear), and there is no contact; with it off (the test above) there is.
        int clean = 0, held = 0; var log = new List<string>();
        for (ulong seed = 1; seed <= 6; seed++)
        {
            var (r, _) = Sail(LuffRace("", seed), 20);
            if (r.Incidents.Count == 0) clean++;
            if (GiveWays(r, 0).Any(e => e.Detail.Contains("rule 16.1"))) held++;
            log.Add($"seed {seed}: {r.Incidents.Count} contacts; {string.Join("; ", r.Events.Where(e => e.Kind == RaceEventKind.GiveWay).Select(e => $"{e.TimeS:F1} b{e.Board} {e.Detail}"))}");
            var (ro, _) = Sail(LuffRace("give_room = false\n", seed), 20);
            log.Add($"   off: {ro.Incidents.Count} contacts");
        }
        foreach (var l in log) Console.WriteLine(l);
        Assert.True(clean == 6 && held == 6, $"clean {clean}, held {held} of 6:\n{string.Join("\n", log)}");
    }

    [Fact]
    public void OverlappedAtAGateMark_OutsideGivesMarkRoom_Rule18()
    {
        // A windward-leeward course of two laps: the leeward gate (marks 60 m apart) is passed between its marks. Two
        // boards run at its western mark on starboard gybe, overlapped, the inside one (nearer the mark) to windward: by
        // rule 11 it would keep clear; passing the gate mark, rule 18 (Appendix B: rounding or passing) makes the outside
        // board give it mark-room. Nobody looking out, they converge and touch: the outside board broke rule 18.
        Race Make(bool gw)
        {
            string course = "[course]\nkind = \"windward-leeward\"\nlaps = 2\nbeat_m = 900\ngate_m = 60\n";
            var race = Build(Board("inside", "test-hold", "twa_deg = 154") + Board("outside", "test-hold", "twa_deg = 147"), gw, "mark_room_m = 60\n", course);
            var gate = race.Course.Steps[1];
            Assert.Equal(CourseSim.Courses.StepKind.Gate, gate.Kind);
            var west = gate.Mark!.Position.X < gate.Second!.Position.X ? gate.Mark.Position : gate.Second.Position;
            double v = race.RigOf(0).Speed(Unit.KnotsToMs(Kn), Unit.DegToRad(150));
            var inside = west + new Vec2(35, 45); // the mark ahead on both boards' starboard bow
            var outside = inside + 3.5 * Vec2.FromBearing(120);
            race.Place(0, inside.X, inside.Y, 206, v, nextStep: 1);
            race.Place(1, outside.X, outside.Y, 213, v, nextStep: 1);
            return race;
        }
        var (rb, _) = Sail(Make(false), 20);
        Assert.NotEmpty(rb.Incidents);
        var inc = rb.Incidents[0];
        Assert.True(inc.Rule == "18" && inc.KeepClear == 1, $"first contact at {inc.TimeS:F1} s ({inc.X:F0}, {inc.Y:F0}): rule {inc.Rule}, keep clear {inc.KeepClear}: {inc.Detail}; gate {string.Join(" ", rb.Events.Where(e => e.Kind == RaceEventKind.Rounded).Select(e => $"{e.TimeS:F1} b{e.Board} ({e.X:F0},{e.Y:F0})"))}");
        Assert.Contains("gate", inc.Detail);

        // With the riders looking out, the outside board gives the room (rule 18) and there is no contact.
        var (r, _) = Sail(Make(true), 20);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 18"));
    }

    [Fact]
    public void CompelledByAThirdBoardsBreach_Exonerated_Rule43()
    {
        // Three boards: "wind" overlaps "lee" to windward, their hulls already touching (under rule 11 the windward board
        // keeps clear), at the moment it is swerving (rule 14) from "port", a port-tack board bearing down on it 8 m away
        // that is not keeping clear (rule 10). The state is set as the lookout leaves it when a rider acts at the last
        // moment (GiveWay on, under rule 14, against "port"). RRS 43.1(a): the windward board was compelled to break
        // rule 11 by the port board's breach of rule 10: it is exonerated, the port board takes the penalty. With the
        // judge's room rules off (rules.judge_room = false) the old verdict: the windward board at fault under rule 11.
        RaceResult Run(bool judgeRoom)
        {
            var race = Build(Board("lee", "test-hold", "twa_deg = 90") + Board("wind", "test-hold", "twa_deg = 90") + Board("port", "test-hold", "twa_deg = -135"),
                rules: judgeRoom ? "" : "judge_room = false\n");
            double tws = Unit.KnotsToMs(Kn);
            double v = race.RigOf(0).Speed(tws, Math.PI / 2), vp = race.RigOf(2).Speed(tws, Unit.DegToRad(135));
            race.Place(0, 0, 0, 270, v);
            race.Place(1, 0, 0.8, 270, v); // hulls 0.8 m apart: in contact (rules.contact_m = 1)
            race.Place(2, -6, 6.8, 135, vp); // port tack, heading for the windward board, under 1.5 s away
            ref var gw = ref race.World.Get<GiveWay>(race.EntityOf(1));
            gw.On = true; gw.Other = 2; gw.Rule = CourseSim.Rules.Judge.Rule14; gw.AtS = race.Time - 1; gw.Heading = Unit.DegToRad(250); gw.Power = 1;
            var (r, _) = Sail(race, 0.5);
            return r;
        }
        var on = Run(true);
        var inc = Assert.Single(on.Incidents, i => i.KeepClear == 1 && i.RightOfWay == 0);
        Assert.True(inc.Rule == "43.1(a)" && inc.Penalty && inc.Detail.Contains("port") && inc.Detail.Contains("rule 10"), $"{inc.Rule}: {inc.Detail}");
        Assert.Equal(1, on.Boards[2].Penalties + on.Boards[2].PenaltiesNotTaken);
        Assert.Equal(0, on.Boards[1].Penalties + on.Boards[1].PenaltiesNotTaken);

        var off = Run(false);
        var old = Assert.Single(off.Incidents, i => i.KeepClear == 1 && i.RightOfWay == 0);
        Assert.Equal("11", old.Rule);
        Assert.Equal(1, off.Boards[1].Penalties + off.Boards[1].PenaltiesNotTaken);
    }
}
