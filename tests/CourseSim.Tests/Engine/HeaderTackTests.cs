using CourseSim.Engine;
using CourseSim.Settings;

namespace CourseSim.Tests.Engine;

/// <summary>
/// Groundwork for the tactics issue: the "header-tack" tactic against plain VMG sailing to the laylines on a long beat.
/// In oscillating shifts tacking on the headers sails the lifted tack more of the time and must gain; in steady wind
/// there are no headers, so the two sail the same race. (The analytic size of the gain comes with the tactics issue.)
/// </summary>
public class HeaderTackTests
{
    static double Beat(string tactic, double amplitudeDeg, string extra = "")
    {
        var setup = EngineTestKit.Parse(
            $"[wind]\nspeed_kn = 14\ndirection_deg = 0\nshift_amplitude_deg = {amplitudeDeg}\nshift_period_s = 300\nshift_irregularity = 0\n" +
            "gust_intensity = 0\nshadows = false\n[race]\nfalls = false\ntime_limit_s = 3600\ncountdown_s = 30\n" +
            "[course]\nkind = \"waypoints\"\norder = \"top\"\n[course.marks.top]\nx_m = 0\ny_m = 2500\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"{tactic}\"\n{extra}");
        var res = new Race(setup).Run();
        Assert.True(res.Boards[0].Finished);
        return res.Boards[0].ElapsedS!.Value;
    }

    [Fact]
    public void TackingOnHeadersGainsInOscillatingShiftsAndChangesNothingInSteadyWind()
    {
        double plain = Beat("vmg-layline", 10), headers = Beat("header-tack", 10);
        Assert.True(headers < plain, $"header-tack {headers:F0} s vs vmg-layline {plain:F0} s");
        double steadyPlain = Beat("vmg-layline", 0), steadyHeaders = Beat("header-tack", 0);
        Assert.Equal(steadyPlain, steadyHeaders, 6);
    }

    [Fact]
    public void UnknownTacticParametersNameTheKnownOnes()
    {
        var e = Assert.Throws<SettingsException>(() => Beat("header-tack", 10, "[boards.a.params]\nheader_degs = 4\n"));
        Assert.Contains("header_degs", e.Message);
        Assert.Contains("header_deg, lift_deg, min_tack_s, mean_s", e.Message);
        Assert.True(e.Line > 0);
        var range = Assert.Throws<SettingsException>(() => Beat("header-tack", 10, "[boards.a.params]\nheader_deg = 90\n"));
        Assert.Contains("accepted 1 to 45", range.Message);
        var other = Assert.Throws<SettingsException>(() => Beat("vmg-layline", 10, "[boards.a.params]\nheader_deg = 5\n"));
        Assert.Contains("its parameters: min_turn_s", other.Message);
        var unknown = Assert.Throws<SettingsException>(() => Beat("tack-a-lot", 10));
        Assert.Contains("no tactic 'tack-a-lot'", unknown.Message);
        foreach (var name in new[] { "conservative", "cover", "header-tack", "pressure", "vmg-layline" }) Assert.Contains(name, unknown.Message);
        Assert.True(unknown.Line > 0);
    }
}
