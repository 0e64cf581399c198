using CourseSim.Engine;
using CourseSim.Replay;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Rules;

/// <summary>
/// The forty-board demo (scenarios/korrin-bay-fleet40.toml): crowded start, port-starboard crossings, packed roundings.
/// The race completes; every contact is judged, and at most a few are ones the give-way logic could have avoided (the
/// keep-clear rider saw it in time, was free to act and the right-of-way board held its course; docs/tactics.md). The same race
/// with nobody looking out (rules.give_way = false) shows the logic at work: many more contacts, each judged under a
/// rule, every penalty given served or listed as not taken, and the replay carrying the same incidents.
/// </summary>
public class FleetRulesTests(Xunit.Abstractions.ITestOutputHelper output)
{
    static (Race Race, RaceResult Result) Fleet(params string[] sets)
    {
        var setup = ScenarioFile.LoadRace(Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-fleet40.toml"), sets);
        Assert.Equal(40, setup.Boards.Count);
        var race = new Race(setup);
        return (race, race.Run());
    }

    /// <summary>
    /// Twelve starts of the forty-board demo (seeds 1-12, the countdown and 30 s after the signal): contacts are rare
    /// and seldom avoidable. Measured (3 Dec 2026, eighth session): 3 contacts in the twelve starts, 1 avoidable. Before
    /// riders' spots were spread along the line (StartPlanner.SpotApartM) the ends' clamps gave every rider who wanted
    /// an end one spot, two riders held on one point, and seeds 1-8 alone had 11 contacts in their starts.
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void TwelveStartsOfTheFortyBoardDemo()
    {
        int contacts = 0, avoidable = 0;
        var lines = new List<string>();
        var rigs = new CourseSim.Equilibrium.RigCache(); // the fleet's rig tables once, not once a start
        for (ulong seed = 1; seed <= 12; seed++)
        {
            var setup = ScenarioFile.LoadRace(Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-fleet40.toml"), ["race.time_limit_s=60"], seed);
            var res = new Race(setup, rigs.For).Run();
            foreach (var i in res.Incidents.Where(i => i.TimeS < 30))
            {
                contacts++; if (i.Avoidable) avoidable++;
                lines.Add($"seed {seed} {i.TimeS:F1} s rule {i.Rule}: {i.Detail}");
            }
        }
        foreach (var l in lines) output.WriteLine(l);
        Assert.True(contacts <= 4 && avoidable <= 2, $"{contacts} contacts ({avoidable} avoidable) in twelve starts: {string.Join("; ", lines)}");
    }

    /// <summary>
    /// Contacts the give-way logic could have avoided, over whole races of the forty-board demo, seeds 1-12: at most 3.0 a
    /// race on average, the level documented as the known limit (docs/tactics.md, "Measured": 179 of 490 contacts over
    /// seeds 1-60, 3.0 a race), so a worse give-way logic fails here. A single seed's count moves with any change to the
    /// race (the demo's own seed read 1 before returning early starters stopped being trapped up the beat, 3 Dec
    /// 2026's ninth session, and 5 after, where seeds 1-48 moved from 2.0 to 2.4 a race; before, seed 11 alone was held
    /// to 3). Measured: 27 in the twelve races, 2.25 a race, after that change (17, 1.42, before it); 32, 2.67 a race, at
    /// the end of that session (neighbour rows in canonical order, penalty turns given up after 30 s; seeds 1-48: 2.4).
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void TwelveFortyBoardRacesAverageAtMostThreeAvoidableContacts()
    {
        var rigs = new CourseSim.Equilibrium.RigCache();
        var avoidable = new int[12];
        Parallel.For(0, 12, k =>
        {
            var setup = ScenarioFile.LoadRace(Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-fleet40.toml"), [], (ulong)k + 1);
            avoidable[k] = new Race(setup, rigs.For).Run().Incidents.Count(i => i.Avoidable);
        });
        output.WriteLine("avoidable contacts, seeds 1-12: " + string.Join(", ", avoidable));
        Assert.True(avoidable.Sum() <= 36, $"{avoidable.Sum()} avoidable contacts in twelve races ({string.Join(", ", avoidable)}): over 3.0 a race");
    }

    /// <summary>
    /// A rider whose tack back up to the windward mark is blocked by a board alongside to windward sheets out and drops
    /// astern of it, and keeps doing so while keeping clear of other boards (Lookout.DropAstern). Before (3 Dec 2026, tenth
    /// session), keeping clear of others reset the power to full at every other look, the rider never fell behind, and
    /// sailed 120 s down the course beside the blocker: at seed 35 of the 40-board demo a first leg of 670 s against a
    /// fleet median of 411 s (1.63 x); after, 476 s against 400 s. Over seeds 1-96 the worst ratio went from 1.63 to 1.51
    /// (other traps remain: docs/tactics.md), so this holds the one rider's case at that seed, not a fleet bound.
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void ARiderWhoseTackIsBlockedDropsAsternInsteadOfSailingOnBesideTheBlocker()
    {
        var res = Fleet("race.seed=35").Result;
        var legs = res.Boards.Where(b => b.SplitsS.Count > 0).Select(b => b.SplitsS[0]).Order().ToArray();
        double median = legs[legs.Length / 2];
        // The rider who was trapped (other boards' first legs move with penalties and traffic, whatever this rule does).
        double sten = res.Boards.Single(b => b.Name == "Sten Zeller").SplitsS[0];
        output.WriteLine($"first legs: median {median:F0} s, longest {legs[^1]:F0} s; Sten Zeller {sten:F0} s");
        Assert.True(sten < 1.3 * median, $"Sten Zeller's first leg {sten:F0} s against a median of {median:F0} s");
    }

    [Fact, Trait("Category", Slow.Category)]
    public void TheFortyBoardDemoRaceHasACleanStartAndItsRulesAtWork()
    {
        var (race, res) = CourseSim.Tests.Engine.Fleet40Demo.Reference;
        foreach (var i in res.Incidents)
            output.WriteLine($"{i.TimeS,7:F1} s ({i.X:F0}, {i.Y:F0}) rule {i.Rule} keep clear {i.KeepClear} other {i.RightOfWay}: {i.Detail}");
        Assert.True(res.Boards.Count(b => b.Finished) >= 36, $"{res.Boards.Count(b => b.Finished)} of 40 finished");
        // How many contacts the give-way logic could have avoided is held over twelve races, not this one
        // (TwelveFortyBoardRacesAverageAtMostThreeAvoidableContacts): one seed's count moves with any change anywhere.
        output.WriteLine($"{res.Incidents.Count(i => i.Avoidable)} avoidable contacts");
        // No contact at the start that the keep-clear rider could have avoided (3 Dec 2026, issue 12): before, a rider
        // who could not fetch the line at the pin end on starboard tacked onto port 5.5 s before the signal and three
        // starboard boards hit it (rule 10, 2.7-3.8 s). Now spots near that end are taken far enough in for the holding
        // drift (StartPlanner.EndDriftM). The start over many seeds: TwelveStartsOfTheFortyBoardDemo.
        Assert.DoesNotContain(res.Incidents, i => i.TimeS < 30 && i.Avoidable);
        Assert.All(res.Incidents, i => Assert.Contains(i.Rule, new[] { "10", "11", "12", "13", "15", "16.1", "18", "22", "43.1(a)" }));
        // Riders did give way (the logic was exercised, not idle), and each penalty given was taken.
        Assert.True(res.Boards.Sum(b => b.GiveWays) > 100, $"{res.Boards.Sum(b => b.GiveWays)} give-way episodes");
        Assert.Equal(res.Incidents.Count(i => i.Penalty), res.Boards.Sum(b => b.Penalties + b.PenaltiesNotTaken));
        // The downwind finish is crossed along the line, not all at its middle (docs/engine.md): the middle half of the
        // crossing points spans more than a fifth of the line.
        var line = race.Course.Steps[^1].Line!;
        var along = line.B - line.A;
        var u = res.Events.Where(e => e.Kind == RaceEventKind.Finished)
            .Select(e => CourseSim.Courses.Vec2.Dot(new CourseSim.Courses.Vec2(e.X, e.Y) - line.A, along) / along.Length / along.Length).Order().ToArray();
        double iqr = u[(int)(0.75 * (u.Length - 1))] - u[(int)(0.25 * (u.Length - 1))];
        output.WriteLine($"finish crossings: interquartile range {iqr:F2} of the line ({u.Length} boards)");
        Assert.True(iqr > 0.2, $"finish crossings bunched: interquartile range {iqr:F2} of the line");

        // Nobody looking out: the same fleet collides far more often, and every contact is judged and penalised.
        var (blind, off) = Fleet("rules.give_way=false");
        output.WriteLine($"give-way on: {res.Incidents.Count} contacts; off: {off.Incidents.Count}");
        Assert.True(off.Incidents.Count >= res.Incidents.Count + 10, $"{off.Incidents.Count} contacts with nobody giving way, {res.Incidents.Count} with");
        Assert.All(off.Incidents, i => Assert.Contains(i.Rule, new[] { "10", "11", "12", "13", "18", "22" }));
        // (A rule 18 verdict adds where the mark-room was owed: "give-way logic off; mark-room at the gate".)
        Assert.All(off.Incidents.Where(i => i.Rule != "22"), i => Assert.StartsWith("give-way logic off", i.Detail));
        // Every penalty given is either served (an event each) or listed as not taken (never well clear before the finish).
        int given = off.Incidents.Count(i => i.Penalty), taken = off.Boards.Sum(b => b.Penalties);
        output.WriteLine($"penalties given {given}, taken {taken}, not taken {off.Boards.Sum(b => b.PenaltiesNotTaken)}");
        Assert.True(taken > 0 && taken >= given / 2, $"{taken} of {given} penalties taken");
        Assert.Equal(given, taken + off.Boards.Sum(b => b.PenaltiesNotTaken));
        Assert.Equal(taken, off.Events.Count(e => e.Kind == RaceEventKind.PenaltyServed));

        var back = ReplayFile.Read(ReplayFile.Write(blind, off), "fleet.msgpack");
        Assert.Equal(off.Incidents.Count, back.Incidents.Count);
        for (int k = 0; k < off.Incidents.Count; k++)
        {
            Assert.Equal(off.Incidents[k].Rule, back.Incidents[k].Rule);
            Assert.Equal(off.Incidents[k].KeepClear, back.Incidents[k].KeepClear);
            Assert.Equal(off.Incidents[k].TimeS, back.Incidents[k].TimeS, 9);
        }
        Assert.Equal(off.Events.Count(e => e.Kind == RaceEventKind.Contact), back.Events.Count(e => e.Kind == "contact"));
    }
}
