using CourseSim.Agents;
using CourseSim.Engine;
using CourseSim.Examples;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Agents;

/// <summary>
/// A tactic written by a user (docs/examples/LullTackTactic.cs, the worked example of docs/tactics.md): registered by
/// name, named in a scenario with its parameters, validated like the built-in ones, and sailed.
/// </summary>
public class UserTacticTests
{
    static UserTacticTests() => TacticRegistry.Register(LullTackTactic.Spec);

    static string Scenario(string tactic, string prm, double gust) =>
        $"[wind]\nspeed_kn = 14\ndirection_deg = 0\nshift_amplitude_deg = 0\ngust_intensity = {gust}\ngust_length_m = 200\nshadows = false\n" +
        "[race]\nfalls = false\ntime_limit_s = 2400\ncountdown_s = 30\n[course]\nkind = \"waypoints\"\norder = \"top\"\n" +
        $"[course.marks.top]\nx_m = 0\ny_m = 1500\n[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"{tactic}\"\n" +
        (prm.Length > 0 ? $"[boards.a.params]\n{prm}\n" : "");

    [Fact]
    public void ARegisteredTacticIsNamedInAScenarioValidatedAndSailed()
    {
        Assert.Contains("lull-tack", TacticRegistry.Names);
        var gusty = new Race(EngineTestKit.Parse(Scenario("lull-tack", "lull_kn = 1.5\nmin_tack_s = 20", 0.15))).Run();
        var plain = new Race(EngineTestKit.Parse(Scenario("vmg-layline", "", 0.15))).Run();
        Assert.True(gusty.Boards[0].Finished && plain.Boards[0].Finished);
        // In gusty wind it tacks in the lulls: more tacks than sailing to the laylines.
        Assert.True(gusty.Boards[0].Tacks > plain.Boards[0].Tacks + 1, $"lull-tack {gusty.Boards[0].Tacks} tacks, vmg-layline {plain.Boards[0].Tacks}");
        // Its parameters are checked like any tactic's: unknown names list the known ones; values outside the range say so.
        var e = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(Scenario("lull-tack", "lul_kn = 2", 0)));
        Assert.Contains("lull_kn, min_tack_s", e.Message);
        Assert.True(e.Line > 0);
        var r = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(Scenario("lull-tack", "lull_kn = 20", 0)));
        Assert.Contains("accepted 0.5 to 10", r.Message);
    }

    [Fact]
    public void ATacticThatNeedsARivalMustBeGivenOneFromTheFleet()
    {
        string two(string rival) =>
            EngineTestKit.SteadyWind(12) + "[course]\nkind = \"windward-leeward\"\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"cover\"\n{rival}" +
            $"[boards.b]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n";
        var none = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(two("")));
        Assert.Contains("needs a rival", none.Message);
        var wrong = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(two("rival = \"zed\"\n")));
        Assert.Contains("no board 'zed'", wrong.Message);
        Assert.Contains("a, b", wrong.Message);
        var self = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(two("rival = \"a\"\n")));
        Assert.Contains("own rival", self.Message);
        var ok = EngineTestKit.Parse(two("rival = \"b\"\n"));
        Assert.Equal(1, ok.Boards[0].RivalIndex);
        Assert.True(new Race(ok).Run().Boards.All(x => x.Finished));
    }

    [Fact]
    public void TheOtherBuiltInTacticsSailACourse()
    {
        foreach (var t in new[] { "pressure", "conservative", "header-tack" })
        {
            var res = new Race(EngineTestKit.Parse(Scenario(t, "", 0.12))).Run();
            Assert.True(res.Boards[0].Finished, $"{t} finished");
        }
    }
}
