using CourseSim.Agents;
using CourseSim.Engine;
using CourseSim.Examples;
using CourseSim.Settings;
using CourseSim.Tests.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Agents;

/// <summary>
/// A tactic written by a user (docs/examples/LullTackTactic.cs, the worked example of docs/tactics.md): registered by
/// name, named in a scenario with its parameters, validated like the built-in ones, and sailed.
/// </summary>
public class UserTacticTests
{
    static readonly TacticRegistry Tactics = MakeTactics();

    static TacticRegistry MakeTactics()
    {
        var r = new TacticRegistry();
        r.Register(LullTackTactic.Spec);
        return r;
    }

    static string Scenario(string tactic, string prm, double gust) =>
        $"[wind]\nspeed_kn = 14\ndirection_deg = 0\nshift_amplitude_deg = 0\ngust_intensity = {gust}\ngust_length_m = 200\nshadows = false\n" +
        "[race]\nfalls = false\ntime_limit_s = 2400\ncountdown_s = 30\n[course]\nkind = \"waypoints\"\norder = \"top\"\n" +
        $"[course.marks.top]\nx_m = 0\ny_m = 1500\n[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"{tactic}\"\n" +
        (prm.Length > 0 ? $"[boards.a.params]\n{prm}\n" : "");

    [Fact]
    public void ARegisteredTacticIsNamedInAScenarioValidatedAndSailed()
    {
        Assert.Contains("lull-tack", Tactics.Names);
        Assert.DoesNotContain("lull-tack", new TacticRegistry().Names); // registries are instances: nothing leaks between them
        var gusty = new Race(EngineTestKit.Parse(Scenario("lull-tack", "lull_kn = 1.5\nmin_tack_s = 20", 0.15), tactics: Tactics), tactics: Tactics).Run();
        var plain = new Race(EngineTestKit.Parse(Scenario("vmg-layline", "", 0.15))).Run();
        Assert.True(gusty.Boards[0].Finished && plain.Boards[0].Finished);
        // In gusty wind it tacks in the lulls: more tacks than sailing to the laylines.
        Assert.True(gusty.Boards[0].Tacks > plain.Boards[0].Tacks + 1, $"lull-tack {gusty.Boards[0].Tacks} tacks, vmg-layline {plain.Boards[0].Tacks}");
        // Its parameters are checked like any tactic's: unknown names list the known ones; values outside the range say so.
        var e = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(Scenario("lull-tack", "lul_kn = 2", 0), tactics: Tactics));
        Assert.Contains("lull_kn, min_tack_s", e.Message);
        Assert.True(e.Line > 0);
        var r = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(Scenario("lull-tack", "lull_kn = 20", 0), tactics: Tactics));
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

    /// <summary>
    /// The same example built as a class library of its own (docs/examples/LullTack.csproj) and named in a scenario's
    /// [tactics] table: the coursesim command (a separate process, which never saw the tests' registration) loads it,
    /// and a board sails it. A path that is missing, not an assembly, or an assembly with no tactic is a scenario error.
    /// </summary>
    [Fact, Trait("Category", Slow.Category)]
    public void ACompiledTacticAssemblyNamedInTheScenarioIsLoadedByTheCommand()
    {
        string dir = Directory.CreateTempSubdirectory("coursesim-usertactic-").FullName;
        try
        {
            string lib = Path.Combine(dir, "lib");
            var (bc, bt) = Run("dotnet", $"build \"{Path.Combine(RepoRoot.Path, "docs", "examples", "LullTack.csproj")}\" -o \"{lib}\" -nologo -v q", 600);
            Assert.True(bc == 0, $"building the example failed: {bt}");
            string scen = Path.Combine(dir, "race.toml");
            File.WriteAllText(scen, Scenario("lull-tack", "lull_kn = 1.5", 0.15).Replace("[wind]", "[tactics]\nassemblies = \"lib/LullTack.dll\"\n[wind]"));
            string cli = Path.Combine(AppContext.BaseDirectory, "coursesim.dll");
            var (rc, rt) = Run("dotnet", $"\"{cli}\" race \"{scen}\" --out \"{Path.Combine(dir, "out")}\" --format json", 300);
            Assert.True(rc == 0, rt);
            using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "out", "summary.json")));
            Assert.True(doc.RootElement.GetProperty("boards")[0].GetProperty("finished").GetBoolean());
            Assert.True(doc.RootElement.GetProperty("boards")[0].GetProperty("tacks").GetInt32() > 1);

            // Clear errors, with the scenario's file and line, for a file that is not there, not an assembly, or has no tactic.
            foreach (var (path, says) in new[] { ("lib/Missing.dll", "not found"), ("race.toml", "not a .NET assembly"), ("lib/LullTack.deps.json", "not a .NET assembly") })
            {
                File.WriteAllText(scen, Scenario("vmg-layline", "", 0).Replace("[wind]", $"[tactics]\nassemblies = \"{path}\"\n[wind]"));
                var e = Assert.Throws<SettingsException>(() => ScenarioFile.LoadRace(scen));
                Assert.Contains(says, e.Message);
                Assert.Equal(2, e.Line);
            }
            File.WriteAllText(scen, Scenario("vmg-layline", "", 0).Replace("[wind]", $"[tactics]\nassemblies = \"{Path.Combine(AppContext.BaseDirectory, "Tomlyn.dll")}\"\n[wind]"));
            Assert.Contains("has no tactic", Assert.Throws<SettingsException>(() => ScenarioFile.LoadRace(scen)).Message);
        }
        finally { try { Directory.Delete(dir, true); } catch (IOException) { } }
    }

    static (int Code, string Output) Run(string file, string args, int timeoutS)
    {
        var psi = new System.Diagnostics.ProcessStartInfo(file, args) { RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = System.Diagnostics.Process.Start(psi)!;
        var so = p.StandardOutput.ReadToEndAsync(); var se = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeoutS * 1000)) { p.Kill(true); return (-1, $"timed out after {timeoutS} s"); }
        p.WaitForExit();
        return (p.ExitCode, so.GetAwaiter().GetResult() + se.GetAwaiter().GetResult());
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

/// <summary>
/// The pressure and cover tactics do what they say: in a wind with a steady pressure difference across the course the
/// pressure-seeker spends its beat on the windier side; ahead of its rival on a beat, the cover board sails the
/// rival's tack.
/// </summary>
public class TacticBehaviourTests(Xunit.Abstractions.ITestOutputHelper output)
{
    static string Fleet(string first, string prm) =>
        // Wind from the north, 6 kn more per km to the east (docs/wind.md: pressure_kn_per_km is the gain to the right
        // of the wind axis looking upwind); a 1.5 km beat; the board under test in the middle of the line and four
        // others spread evenly either side of it, 60 m apart. Off the line the boards sail starboard, towards the west:
        // the less windy side, so the pressure seeker has to tack to find the wind. (Each board has its own place on the
        // line: a second board started on the seeker's spot sails on its hip all the way, and rule 13 then keeps the
        // seeker from tacking at all, which tests the rules rather than the tactic.)
        "[wind]\nspeed_kn = 12\ndirection_deg = 0\nshift_amplitude_deg = 0\ngust_intensity = 0\npressure_kn_per_km = 6\nshadows = false\n" +
        "[race]\nfalls = false\ntime_limit_s = 1800\ncountdown_s = 40\n[course]\nkind = \"waypoints\"\norder = \"top\"\nstart_line_m = 300\n" +
        "[course.marks.top]\nx_m = 0\ny_m = 1500\n" +
        string.Concat(new[] { 0.5, 0.1, 0.3, 0.7, 0.9 }.Select((pos, i) =>
            $"[boards.b{i}]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\nline_position = {pos.ToString(System.Globalization.CultureInfo.InvariantCulture)}\n" +
            (i == 0 ? $"tactic = \"{first}\"\n{prm}" : "")));

    /// <summary>Mean x (m, east) of board 0 while it sails the beat.</summary>
    static double MeanEast(string tactic, string prm)
    {
        var race = new Race(EngineTestKit.Parse(Fleet(tactic, prm)));
        double sum = 0; int n = 0;
        while (!race.IsOver)
        {
            race.Step();
            var st = race.World.Get<RaceStatus>(race.EntityOf(0));
            if (st.State != RaceState.Racing || st.NextStep != 0) { if (st.State == RaceState.Finished) break; continue; }
            sum += race.World.Get<Pose>(race.EntityOf(0)).X; n++;
        }
        return sum / Math.Max(1, n);
    }

    [Fact]
    public void ThePressureSeekerSailsTheWindierSideOfTheBeat()
    {
        double plain = MeanEast("vmg-layline", ""), seeker = MeanEast("pressure", "[boards.b0.params]\ngain_kn = 0.3\n");
        output.WriteLine($"mean x on the beat: vmg-layline {plain:F0} m, pressure {seeker:F0} m");
        Assert.True(seeker > plain + 30, $"pressure {seeker:F0} m east on average against {plain:F0} m for vmg-layline (the wind is stronger to the east)");
    }

    /// <summary>Board a is 60 m ahead (upwind) of its rival b on a long beat, a on starboard, b on port; who tacks in 20 s?</summary>
    static (int ATacks, int BTacks) AheadOfRival(string tactic)
    {
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(14) + "[race]\nfalls = false\ncountdown_s = 20\ntime_limit_s = 600\n" +
            "[course]\nkind = \"waypoints\"\norder = \"top\"\n[course.marks.top]\nx_m = 0\ny_m = 4000\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"{tactic}\"\n" + (tactic == "cover" ? "rival = \"b\"\n" : "") +
            $"[boards.b]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n");
        var race = new Race(setup);
        double v = race.RigOf(0).Speed(CourseSim.Units.Unit.KnotsToMs(14), CourseSim.Units.Unit.DegToRad(45));
        race.Place(0, 0, 1000, 315, v);   // starboard, upwind of b
        race.Place(1, 40, 940, 45, v);    // port, 60 m below
        while (race.Time < -20 + 20) race.Step();
        var r = race.Result();
        return (r.Boards[0].Tacks, r.Boards[1].Tacks);
    }

    [Fact]
    public void TheCoverBoardAheadSailsTheRivalsTack()
    {
        var cover = AheadOfRival("cover");
        var plain = AheadOfRival("vmg-layline");
        output.WriteLine($"tacks in 20 s: cover {cover.ATacks} (rival {cover.BTacks}), vmg-layline {plain.ATacks}");
        Assert.Equal(1, cover.ATacks);      // onto port, as the rival
        Assert.Equal(0, cover.BTacks);
        Assert.Equal(0, plain.ATacks);      // far from its laylines, it would not have tacked
    }
}

