using CourseSim.Agents;
using CourseSim.Engine;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Rules;

/// <summary>
/// Scripted encounters, one per rule of the Racing Rules of Sailing (World Sailing, RRS 2025-2028, Part 2, Section A,
/// rules 10-13 and 18, as changed for boards by Appendix B): two boards are put on converging courses; the one the rule
/// says must keep clear gives way, the other holds its course, and there is no contact. With the give-way logic off
/// the same geometry ends in contact, judged against the board that should have kept clear, which then serves a
/// one-turn penalty (RRS 44.1 as changed by Appendix B).
/// </summary>
public partial class EncounterTests
{
    /// <summary>A scripted rider (registered as a user tactic would be): hold a true wind angle at a power, tack once at a time.</summary>
    sealed class Hold(TacticArgs a) : ITactic
    {
        readonly double _twa = a["twa_deg"], _power = a["power"], _tackAt = a["tack_at_s"];
        public Decision Decide(Observation o, INavigator nav) =>
            new(nav.AtTrueWindAngle(o.TimeS >= _tackAt ? -_twa : _twa), _power);
    }

    /// <summary>This class's own tactic registry: the built-in tactics and the scripted rider.</summary>
    static readonly TacticRegistry Tactics = MakeTactics();

    static TacticRegistry MakeTactics()
    {
        var r = new TacticRegistry();
        r.Register(new TacticSpec("test-hold", "scripted: hold a true wind angle",
        [
            new("twa_deg", -180, 180, 45, "signed true wind angle held, deg"),
            new("power", 0, 1, 1, "power held"),
            new("tack_at_s", -1000, 1e6, 1e6, "time to go onto the other tack, s"),
        ], a => new Hold(a)));
        return r;
    }

    const double Kn = 12;

    static string Board(string id, string tactic, string prm = "") =>
        $"[boards.{id}]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\nname = \"{id}\"\ntactic = \"{tactic}\"\n" +
        (prm.Length > 0 ? $"[boards.{id}.params]\n{prm}\n" : "");

    static Race Build(string boards, bool giveWay = true, string rules = "", string course = "", ulong? seed = null, double kn = Kn)
    {
        course = course.Length > 0 ? course : "[course]\nkind = \"waypoints\"\norder = \"far\"\n[course.marks.far]\nx_m = 0\ny_m = 30000\n";
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(kn) + "[race]\nfalls = false\ncountdown_s = 20\ntime_limit_s = 600\n" +
            $"[rules]\ngive_way = {(giveWay ? "true" : "false")}\n{rules}" + course + boards, seed, tactics: Tactics);
        return new Race(setup, tactics: Tactics);
    }

    /// <summary>Puts board b where it reaches <paramref name="meet"/> after <paramref name="inS"/> seconds at a true wind angle.</summary>
    static void Toward(Race race, int b, double twaDeg, double mx, double my, double inS, double speedShare = 1)
    {
        double tws = CourseSim.Units.Unit.KnotsToMs(Kn);
        double v = race.RigOf(b).Speed(tws, CourseSim.Units.Unit.DegToRad(Math.Abs(twaDeg))) * speedShare;
        double h = CourseSim.Units.Unit.WrapDeg360(0 - twaDeg);
        var d = CourseSim.Courses.Vec2.FromBearing(h);
        race.Place(b, mx - d.X * v * inS, my - d.Y * v * inS, h, v);
    }

    static (RaceResult Result, double[] MaxTurnDeg) Sail(Race race, double seconds)
    {
        int n = race.BoardCount;
        // What each rider steers for (the intent: the course to make good), against where they started.
        var h0 = Enumerable.Range(0, n).Select(b => race.World.Get<Intent>(race.EntityOf(b)).Heading).ToArray();
        var maxTurn = new double[n];
        double end = race.Time + seconds;
        while (!race.IsOver && race.Time < end)
        {
            race.Step();
            for (int b = 0; b < n; b++)
            {
                ref var it = ref race.World.Get<Intent>(race.EntityOf(b));
                double d = Math.Abs(CourseSim.Units.Unit.RadToDeg(CourseSim.Units.Unit.WrapRadPi(it.Heading - h0[b])));
                if (it.Power < 0.05) d = Math.Max(d, 90); // luffing to slow down counts as acting
                maxTurn[b] = Math.Max(maxTurn[b], d);
            }
        }
        return (race.Result(), maxTurn);
    }

    static IEnumerable<RaceEvent> GiveWays(RaceResult r, int board) => r.Events.Where(e => e.Board == board && e.Kind == RaceEventKind.GiveWay);

    [Fact]
    public void PortMeetsStarboard_PortKeepsClear_Rule10()
    {
        var race = Build(Board("s", "test-hold", "twa_deg = 45") + Board("p", "test-hold", "twa_deg = -45"));
        Toward(race, 0, 45, 0, 0, 12);
        Toward(race, 1, -45, 0, 0, 12);
        var (r, turn) = Sail(race, 30);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 10"));
        Assert.Empty(GiveWays(r, 0));
        Assert.True(turn[0] < 6, $"starboard board held its course (turned {turn[0]:F1} deg)");
        Assert.True(turn[1] > 5, $"port board bore away or slowed (changed course by {turn[1]:F1} deg; 90 = slowed)");

        // The same encounter with nobody looking out: contact, port at fault under rule 10, penalty served.
        var blind = Build(Board("s", "test-hold", "twa_deg = 45") + Board("p", "test-hold", "twa_deg = -45"), giveWay: false);
        Toward(blind, 0, 45, 0, 0, 12);
        Toward(blind, 1, -45, 0, 0, 12);
        var (rb, _) = Sail(blind, 90);
        var inc = Assert.Single(rb.Incidents);
        Assert.Equal("10", inc.Rule);
        Assert.Equal(1, inc.KeepClear);
        Assert.True(inc.Penalty);
        Assert.Contains(rb.Events, e => e.Board == 1 && e.Kind == RaceEventKind.PenaltyServed);
        Assert.Equal(1, rb.Boards[1].Penalties);
        Assert.Equal(0, rb.Boards[0].Penalties);
    }

    [Fact]
    public void RunningOnOppositeGybes_PortKeepsClear_Rule10()
    {
        // Both running, converging at 35 deg on opposite gybes towards the same point, starboard slightly faster: the
        // port board can hardly slow on a run, and gybing away is its cheapest way clear: it gybes, and no contact.
        // The scripted riders read the wind with their reading error (a random draw of the seed), so the encounter is
        // sailed for twelve seeds: the mechanism must work in most of them, not in one lucky draw.
        Race Make(bool gw, ulong seed)
        {
            var race = Build(Board("s", "test-hold", "twa_deg = 150") + Board("p", "test-hold", "twa_deg = -175"), gw, seed: seed);
            Toward(race, 0, 150, 0, 0, 14);
            Toward(race, 1, -175, 0, 0, 14);
            return race;
        }
        int clean = 0, gybed = 0, contactsOff = 0;
        var log = new List<string>();
        for (ulong seed = 1; seed <= 12; seed++)
        {
            var (r, turn) = Sail(Make(true, seed), 30);
            Assert.DoesNotContain(GiveWays(r, 0), e => e.Detail.Contains("rule 10"));
            Assert.True(turn[0] < 6, $"seed {seed}: starboard board held its course (turned {turn[0]:F1} deg)");
            if (r.Incidents.Count == 0) clean++;
            if (r.Boards[1].Gybes >= 1 && GiveWays(r, 1).Any(e => e.Detail.Contains("rule 10"))) gybed++;
            log.Add($"seed {seed}: {r.Incidents.Count} contacts, {r.Boards[1].Gybes} gybes");
            var (rb, _) = Sail(Make(false, seed), 30);
            if (rb.Incidents.Count > 0) { contactsOff++; Assert.All(rb.Incidents, i => { Assert.Equal("10", i.Rule); Assert.Equal(1, i.KeepClear); }); }
        }
        // Measured at engine 2: 11 of 12 clean, 8 of 12 gybed away (the others keep clear by bearing away), 12 of 12
        // collide with the give-way logic off.
        Assert.True(clean >= 10, $"clean in {clean} of 12: {string.Join("; ", log)}");
        Assert.True(gybed >= 6, $"gybed away in {gybed} of 12: {string.Join("; ", log)}");
        Assert.True(contactsOff >= 10, $"with give-way off, contact in only {contactsOff} of 12");
    }

    [Fact]
    public void PortMeetsAStarboardPair_PortTacksAway_Rule10()
    {
        // A port board beating meets two starboard boards abreast, 12 m apart: ducking both means
        // bearing away far, so it tacks away onto starboard (RRS 10; then 13 and 15: it keeps clear while tacking).
        Race Make(bool gw)
        {
            var race = Build(Board("s1", "test-hold", "twa_deg = 45") + Board("s2", "test-hold", "twa_deg = 45") + Board("p", "test-hold", "twa_deg = -45"), gw);
            Toward(race, 0, 45, 0, 0, 12);
            Toward(race, 1, 45, -8.5, -8.5, 12); // abreast, 12 m to leeward
            Toward(race, 2, -45, 0, 0, 12.5);
            return race;
        }
        var (r, turn) = Sail(Make(true), 40);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 2), e => e.Detail.Contains("rule 10"));
        Assert.True(turn[0] < 6 && turn[1] < 6, $"starboard boards held their course (turned {turn[0]:F1} and {turn[1]:F1} deg): {string.Join("; ", r.Events.Select(e => $"{e.TimeS:F1} b{e.Board} {e.Kind} {e.Detail}"))}");
        // It tacked away before the crossing (they meet at 0 s), once it had seen the pair.
        var first = r.Events.FirstOrDefault(e => e.Board == 2 && e.Kind == RaceEventKind.Tack);
        Assert.True(first.Kind == RaceEventKind.Tack && first.TimeS < -5, $"the port board tacked away: {string.Join("; ", r.Events.Where(e => e.Board == 2).Select(e => $"{e.TimeS:F1} {e.Kind} {e.Detail}"))}");

        var (rb, _) = Sail(Make(false), 40);
        Assert.NotEmpty(rb.Incidents);
        Assert.All(rb.Incidents, i => Assert.Equal(2, i.KeepClear));
    }

    [Fact]
    public void WindwardOverlappedOnLeeward_WindwardKeepsClear_Rule11()
    {
        // Both on starboard, overlapped 2.5 m abeam; the windward board sails 7 deg lower, eased so as not to draw ahead,
        // and converges on the leeward one. Twelve seeds (the riders' reading error is a random draw): see the gybe test.
        Race Make(bool gw, ulong seed)
        {
            var race = Build(Board("lee", "test-hold", "twa_deg = 45") + Board("wind", "test-hold", "twa_deg = 52\npower = 0.6"), gw, seed: seed);
            double tws = CourseSim.Units.Unit.KnotsToMs(Kn);
            race.Place(0, 0, 0, 315, race.RigOf(0).Speed(tws, CourseSim.Units.Unit.DegToRad(45)));
            // Starboard of a board heading 315 is bearing 45: the windward side on starboard tack.
            race.Place(1, 2.5 * Math.Sin(Math.PI / 4), 2.5 * Math.Cos(Math.PI / 4), 308, race.RigOf(1).Speed(tws, CourseSim.Units.Unit.DegToRad(45)));
            return race;
        }
        int held = 0, offContacts = 0;
        var log = new List<string>();
        for (ulong seed = 1; seed <= 12; seed++)
        {
            // (Five seconds: afterwards the windward board, faster, draws clear ahead and the overlap ends.)
            var (r, turn) = Sail(Make(true, seed), 5);
            Assert.Empty(r.Incidents);
            Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 11"));
            // (Once the windward board has drawn ahead the overlap ends, and rule 12 may then apply the other way.)
            Assert.DoesNotContain(GiveWays(r, 0), e => e.Detail.Contains("rule 11"));
            bool acted = GiveWays(r, 0).Any(e => e.Detail.Contains("rule 14"));
            if (turn[0] < 6 && !acted) held++;
            log.Add($"seed {seed}: leeward turned {turn[0]:F1} deg{(acted ? ", acted under rule 14" : "")}");
            var (rb, _) = Sail(Make(false, seed), 30);
            if (rb.Incidents.Count > 0)
            {
                // The first contact is the windward board's (later ones, after penalty turns, may be under other rules).
                offContacts++;
                Assert.Equal("11", rb.Incidents[0].Rule); Assert.Equal(1, rb.Incidents[0].KeepClear);
            }
        }
        // Measured at engine 2: the leeward board holds its course in 9 of 12 (in the others the windward board,
        // reading the wind lower, draws ahead within the five seconds and rule 12 asks the leeward one to keep clear).
        Assert.True(held >= 8, $"leeward held its course in {held} of 12: {string.Join("; ", log)}");
        Assert.True(offContacts >= 10, $"with give-way off, contact in only {offContacts} of 12");
    }

    [Fact]
    public void OvertakingFromClearAstern_AsternKeepsClear_Rule12()
    {
        // Both on starboard on a beam reach, the one ahead sailing at a third of its power, the one astern at full.
        var race = Build(Board("ahead", "test-hold", "twa_deg = 90\npower = 0.3") + Board("astern", "test-hold", "twa_deg = 90"));
        double v = race.RigOf(0).Speed(CourseSim.Units.Unit.KnotsToMs(Kn), Math.PI / 2);
        race.Place(0, -20, 0, 270, 0.4 * v);
        race.Place(1, 0, 0, 270, v);
        // (Four seconds, while the overtaking board comes up from astern; once it is clear ahead, rule 12 turns round.)
        var (r, turn) = Sail(race, 4);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 12"));
        Assert.Empty(GiveWays(r, 0));
        Assert.True(turn[0] < 6, $"the board ahead held its course (turned {turn[0]:F1} deg)");
    }

    [Fact]
    public void TackingIntoAnother_TheTackerKeepsClear_Rule13()
    {
        // Port crosses well ahead of starboard, then wants to tack onto starboard close in front of it: the tack must
        // wait until it can be made clear (rule 13, Appendix B: keep clear from head to wind until the sail fills).
        var race = Build(Board("s", "test-hold", "twa_deg = 45") + Board("p", "test-hold", "twa_deg = -45\ntack_at_s = -12.5"));
        Toward(race, 0, 45, 0, 0, 11);
        Toward(race, 1, -45, 0, 0, 8); // p crosses 3 s ahead of s, and wants to tack as it does
        var (r, turn) = Sail(race, 40);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 13"));
        Assert.DoesNotContain(GiveWays(r, 0), e => e.Detail.Contains("rule 13"));
        var tack = r.Events.First(e => e.Board == 1 && e.Kind == RaceEventKind.Tack);
        Assert.True(tack.TimeS > -12.5 + 3, $"the tack was put off (scripted at -12.5 s, made at {tack.TimeS:F1} s)");
        Assert.True(turn[0] < 6, $"the starboard board held its course (turned {turn[0]:F1} deg)");
    }

    [Fact]
    public void EnteringAtAMarkOverlapped_OutsideGivesMarkRoom_Rule18()
    {
        // A leeward mark left to port; two boards run at it on port gybe, overlapped, the inside one to windward. By
        // rule 11 the inside board would keep clear; rounding the mark, rule 18 makes the outside board give it room.
        string course = "[course]\nkind = \"waypoints\"\norder = \"m far\"\n[course.marks.m]\nx_m = 0\ny_m = -400\nrounding = \"port\"\n" +
                        "[course.marks.far]\nx_m = 0\ny_m = 800\n";
        Race Make(bool gw)
        {
            var race = Build(Board("inside", "vmg-layline") + Board("outside", "vmg-layline"), gw, "mark_room_m = 60\n", course);
            double tws = CourseSim.Units.Unit.KnotsToMs(Kn);
            double v = race.RigOf(0).Speed(tws, CourseSim.Units.Unit.DegToRad(150));
            var inside = new CourseSim.Courses.Vec2(-20, -400 + 25);
            var outside = inside + 4.0 * CourseSim.Courses.Vec2.FromBearing(240);
            race.Place(0, inside.X, inside.Y, 154, v);
            race.Place(1, outside.X, outside.Y, 147, v);
            return race;
        }
        var (r, _) = Sail(Make(true), 30);
        Assert.Empty(r.Incidents);
        Assert.Contains(GiveWays(r, 1), e => e.Detail.Contains("rule 18"));
        Assert.True(r.Boards[0].SplitsS.Count >= 1 && r.Boards[1].SplitsS.Count >= 1, "both rounded the mark");
        // Up to its rounding the inside board never had to give way as the windward board or under mark-room (if the
        // outside board draws clear ahead, rule 12 may apply to it, as RRS 18.2 would have it too).
        double rounded = r.Events.First(e => e.Board == 0 && e.Kind == RaceEventKind.Rounded).TimeS;
        Assert.True(!GiveWays(r, 0).Any(e => e.TimeS <= rounded && (e.Detail.Contains("rule 11") || e.Detail.Contains("rule 18"))),
            string.Join("; ", r.Events.Select(e => $"{e.TimeS:F1} b{e.Board} {e.Kind} {e.Detail}")));

        // Nobody looking out: the two converge on the mark and touch; the outside board broke rule 18.
        var (rb, _) = Sail(Make(false), 30);
        Assert.NotEmpty(rb.Incidents);
        var inc = rb.Incidents[0];
        Assert.Equal("18", inc.Rule);
        Assert.Equal(1, inc.KeepClear);
    }
}
