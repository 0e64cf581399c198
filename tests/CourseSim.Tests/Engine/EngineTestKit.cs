using CourseSim.Engine;
using CourseSim.Settings;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Engine;

/// <summary>Scenarios written inline for engine tests (steady wind unless a test says otherwise).</summary>
public static class EngineTestKit
{
    public static string Equip(string name) => Path.Combine(RepoRoot.Path, "scenarios", "equipment", name).Replace("\\", "/");

    public static string SteadyWind(double kn, double fromDeg = 0) =>
        $"[wind]\nspeed_kn = {kn}\ndirection_deg = {fromDeg}\nshift_amplitude_deg = 0\ngust_intensity = 0\nshadows = false\n";

    /// <summary>A board on a far waypoint (no course events), for sailing at fixed angles.</summary>
    public static RaceSetup OpenWater(double kn, string equipment, bool pumping = true, string extra = "") =>
        Parse(SteadyWind(kn) + $"[race]\nfalls = false\npumping = {(pumping ? "true" : "false")}\ncountdown_s = 20\ntime_limit_s = 600\n{extra}" +
              "[course]\nkind = \"waypoints\"\norder = \"far\"\n[course.marks.far]\nx_m = 0\ny_m = 40000\n" +
              $"[boards.a]\nequipment = \"{Equip(equipment)}\"\n");

    public static RaceSetup Parse(string toml, ulong? seed = null, CourseSim.Agents.TacticRegistry? tactics = null) =>
        ScenarioFile.FromSettings(SettingsFile.Parse(toml, "test.toml", ScenarioFile.Schema), seed, tactics);

    public static RaceSetup Demo(IEnumerable<string>? sets = null, ulong? seed = null) =>
        ScenarioFile.LoadRace(Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-race.toml"), sets, seed);
}
