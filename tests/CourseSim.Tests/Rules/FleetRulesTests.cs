using CourseSim.Engine;
using CourseSim.Replay;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Rules;

/// <summary>
/// The forty-board demo (scenarios/korrin-bay-fleet40.toml): crowded start, port-starboard crossings, packed roundings.
/// The race completes; every contact is judged, and none is one the give-way logic could have avoided (the keep-clear
/// rider saw it in time, was free to act and the right-of-way board held its course; docs/tactics.md); every penalty
/// given is served; the replay carries the same incidents.
/// </summary>
public class FleetRulesTests(Xunit.Abstractions.ITestOutputHelper output)
{
    [Fact]
    public void TheFortyBoardDemoRaceHasNoContactTheGiveWayLogicCouldHaveAvoided()
    {
        var setup = ScenarioFile.LoadRace(Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-fleet40.toml"));
        Assert.Equal(40, setup.Boards.Count);
        var race = new Race(setup);
        var res = race.Run();
        foreach (var i in res.Incidents)
            output.WriteLine($"{i.TimeS,7:F1} s ({i.X:F0}, {i.Y:F0}) rule {i.Rule} keep clear {i.KeepClear} other {i.RightOfWay}: {i.Detail}");
        Assert.True(res.Boards.Count(b => b.Finished) >= 36, $"{res.Boards.Count(b => b.Finished)} of 40 finished");
        Assert.All(res.Incidents, i => Assert.False(i.Avoidable, $"avoidable contact at {i.TimeS:F1} s: {i.Detail}"));
        Assert.All(res.Incidents, i => Assert.Contains(i.Rule, new[] { "10", "11", "12", "13", "18", "22" }));
        // Riders did give way (the logic was exercised, not idle), and each penalty given was taken.
        Assert.True(res.Boards.Sum(b => b.GiveWays) > 100, $"{res.Boards.Sum(b => b.GiveWays)} give-way episodes");
        int given = res.Incidents.Count(i => i.Penalty);
        Assert.Equal(given, res.Boards.Sum(b => b.Penalties));
        Assert.Equal(given, res.Events.Count(e => e.Kind == RaceEventKind.PenaltyServed));

        var back = ReplayFile.Read(ReplayFile.Write(race, res), "fleet.msgpack");
        Assert.Equal(res.Incidents.Count, back.Incidents.Count);
        for (int k = 0; k < res.Incidents.Count; k++)
        {
            Assert.Equal(res.Incidents[k].Rule, back.Incidents[k].Rule);
            Assert.Equal(res.Incidents[k].KeepClear, back.Incidents[k].KeepClear);
            Assert.Equal(res.Incidents[k].TimeS, back.Incidents[k].TimeS, 9);
        }
        Assert.Equal(res.Events.Count(e => e.Kind == RaceEventKind.Contact), back.Events.Count(e => e.Kind == "contact"));
    }
}
