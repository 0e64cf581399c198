using CourseSim.Replay;
using CourseSim.Settings;
using CourseSim.Tests.Engine;
using CourseSim.Tests.Settings;
using CourseSim.Tests.Viewer;

namespace CourseSim.Tests.Hardening;

/// <summary>
/// Each input that used to end in "This is a bug" (exit 1), hang or fill the memory (issue 14) is now exit 2 with a
/// located message. Runs with the viewer tests, alone: some set the limits' environment variables.
/// </summary>
[Collection(ViewerCollection.Name)]
public class ReproducerTests(ViewerFixture fx) : IClassFixture<ViewerFixture>
{
    static (int Code, string Out, string Err) Cli(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    static string Temp(string name, string text)
    {
        string f = Path.Combine(Directory.CreateTempSubdirectory("cs-repro-").FullName, name);
        File.WriteAllText(f, text);
        return f;
    }

    static void BadInput((int Code, string Out, string Err) r, params string[] words)
    {
        Assert.True(r.Code == 2, $"exit {r.Code}: {r.Err}");
        Assert.DoesNotContain("bug", r.Err);
        foreach (var w in words) Assert.Contains(w, r.Err);
    }

    string ViewExport(byte[] replay)
    {
        string f = Path.Combine(Directory.CreateTempSubdirectory("cs-rp-").FullName, "r.msgpack");
        File.WriteAllBytes(f, replay);
        var r = Cli("view", f, "--export", Path.Combine(Path.GetDirectoryName(f)!, "r.html"));
        BadInput(r, "r.msgpack");
        return r.Err;
    }

    [Fact]
    public void ReplayFieldsOutOfRangeAreBadInput()
    {
        Assert.Contains("version", ViewExport(ReplayForge.Seal(ReplayForge.Payload(fx.Bytes), 4294967295u)));
        var p = ReplayForge.Payload(fx.Bytes);
        p["frames"] = 2147483648L;
        Assert.Contains("frames", ViewExport(ReplayForge.Seal(p)));
        p = ReplayForge.Payload(fx.Bytes);
        var events = (object[])p["events"];
        ((object[])events[0])[1] = 2147483648L;
        Assert.Contains("out of range", ViewExport(ReplayForge.Seal(p)));
        p = ReplayForge.Payload(fx.Bytes);
        ((object[])((object[])p["events"])[0])[1] = 5000;
        Assert.Contains("names board 5000", ViewExport(ReplayForge.Seal(p)));
    }

    [Fact]
    public void LengthsOf0xFFFFFFFFAreRefusedBeforeAllocating()
    {
        // A payload whose board list claims 2^32-1 entries, and an envelope whose payload claims 2^32-1 bytes.
        byte[] payload = [0x81, 0xA6, (byte)'b', (byte)'o', (byte)'a', (byte)'r', (byte)'d', (byte)'s', 0xDD, 0xFF, 0xFF, 0xFF, 0xFF];
        ViewExport(ReplayForge.SealBytes(payload));
        byte[] envelope = [0x81, 0xA7, (byte)'p', (byte)'a', (byte)'y', (byte)'l', (byte)'o', (byte)'a', (byte)'d', 0xC6, 0xFF, 0xFF, 0xFF, 0xFF, 1, 2, 3];
        ViewExport(envelope);
        var p = ReplayForge.Payload(fx.Bytes);
        ((Dictionary<object, object>)p["course"])["start"] = new object[0];
        Assert.Contains("start line", ViewExport(ReplayForge.Seal(p)));
    }

    [Fact]
    public void MalformedReplaysThatUsedToBeAcceptedAreRefused()
    {
        var cases = new (string What, Action<Dictionary<object, object>> Harm, string Word)[]
        {
            ("short column", p => { var c = (Dictionary<object, object>)p["columns"]; c["x_m"] = ((byte[])c["x_m"])[..^4]; }, "column 'x_m'"),
            ("missing column", p => ((Dictionary<object, object>)p["columns"]).Remove("y_m"), "column 'y_m' is missing"),
            ("result board", p => ((object[])((object[])p["results"])[0])[0] = 99, "names board 99"),
            ("interval zero", p => p["interval_s"] = 0.0, "interval_s"),
            ("interval negative", p => p["interval_s"] = -1.0, "interval_s"),
            ("flags short", p => p["flags"] = new byte[3], "flags"),
            ("huge wind grid", p => { var w = (Dictionary<object, object>)p["wind"]; w["nx"] = 100000; w["ny"] = 100000; }, "wind grid"),
            ("wind size mismatch", p => ((Dictionary<object, object>)p["wind"])["frames"] = 1_000, "wind"),
            ("incident board", p => p["incidents"] = new object[] { new object[] { 1.0, 0.0, 0.0, 77, -1, "10", true, false, "" } }, "incident"),
        };
        foreach (var (what, harm, word) in cases)
        {
            var p = ReplayForge.Payload(fx.Bytes);
            harm(p);
            var e = Assert.Throws<ReplayException>(() => ReplayFile.Read(ReplayForge.Seal(p), what));
            Assert.Contains(word, e.Message);
        }
        // The untouched payload, re-sealed the same way, still reads: the checks refuse the harm, not the forging.
        Assert.Equal(fx.Replay.Frames, ReplayFile.Read(ReplayForge.Seal(ReplayForge.Payload(fx.Bytes)), "same").Frames);
    }

    [Fact]
    public void AReplayOverTheSizeLimitIsRefusedUnlessTheLimitIsRaised()
    {
        string f = Path.Combine(Directory.CreateTempSubdirectory("cs-cap-").FullName, "r.msgpack");
        File.WriteAllBytes(f, fx.Bytes);
        try
        {
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_REPLAY_MB", "0.01");
            BadInput(Cli("view", f, "--export", f + ".html"), "over the limit of 0 MB", "COURSESIM_MAX_REPLAY_MB");
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_REPLAY_MB", "1000");
            Assert.Equal(0, Cli("view", f, "--export", f + ".html").Code);
        }
        finally { System.Environment.SetEnvironmentVariable("COURSESIM_MAX_REPLAY_MB", null); }
    }

    [Fact]
    public void SpecialFilesAreRefusedNotRead()
    {
        if (!OperatingSystem.IsLinux()) return;
        BadInput(Cli("polar", "/dev/zero"), "/dev/zero", "not an ordinary file");
        BadInput(Cli("view", "/dev/zero"), "not an ordinary file");
        string fifo = Path.Combine(Directory.CreateTempSubdirectory("cs-fifo-").FullName, "pipe.toml");
        using (var mk = System.Diagnostics.Process.Start("mkfifo", fifo)) mk.WaitForExit();
        BadInput(Cli("polar", fifo), "not an ordinary file"); // a named pipe nobody writes to: refused, not waited on
        string scen = Temp("s.toml", EngineTestKit.SteadyWind(12) + "[course]\nkind = \"windward-leeward\"\n[boards.a]\nequipment = \"/dev/zero\"\n");
        BadInput(Cli("race", scen), "/dev/zero", "not an ordinary file");
        BadInput(Cli("polar", Path.GetTempPath()), "folder");
    }

    [Fact]
    public void DatesOutOfRangeAreRefusedBeforeTheRace()
    {
        string scen = Temp("s.toml", EngineTestKit.SteadyWind(12) + "[race]\nstart_time_utc = \"0001-01-01T00:00:00Z\"\n[course]\nkind = \"windward-leeward\"\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n");
        BadInput(Cli("race", scen), "s.toml:8", "race.start_time_utc", "1900-01-01");
        // A TOML date-time (unquoted) is read as the same text.
        var ok = EngineTestKit.Parse(EngineTestKit.SteadyWind(12) + "[race]\nstart_time_utc = 2026-07-01T10:00:00Z\n[course]\nkind = \"windward-leeward\"\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n");
        Assert.Equal(new DateTime(2026, 7, 1, 10, 0, 0, DateTimeKind.Utc), ok.Race.StartTimeUtc);
    }

    [Fact]
    public void DuplicateKeysAndTablesAreRefusedAtTheSecondOne()
    {
        var schema = CourseSim.Equilibrium.EquipmentFile.Schema;
        var t = Assert.Throws<SettingsException>(() => SettingsFile.Parse("[sail]\narea_m2 = 6.6\n\n[rider]\nmass_kg = 70\n[sail]\narea_m2 = 7\n", "e.toml", schema));
        Assert.Equal(6, t.Line);
        Assert.Contains("first at line 1", t.Message);
        var k = Assert.Throws<SettingsException>(() => SettingsFile.Parse("[sail]\narea_m2 = 6.6\n# again\narea_m2 = 7.8\n", "e.toml", schema));
        Assert.Equal(4, k.Line);
        Assert.Contains("first at line 2", k.Message);
        var d = Assert.Throws<SettingsException>(() => SettingsFile.Parse("sail.area_m2 = 6.6\n[sail]\narea_m2 = 7\n", "e.toml", schema));
        Assert.True(d.Line is 2 or 3, d.Message);
    }

    [Fact]
    public void InlineQuotedAndDottedKeysKeepTheirLines()
    {
        var schema = CourseSim.Equilibrium.EquipmentFile.Schema;
        var inline = Assert.Throws<SettingsException>(() => SettingsFile.Parse("name = \"x\"\nsail = { area_m2 = 6.6,\n  area_mm = 3 }\n", "e.toml", schema));
        Assert.Equal(3, inline.Line);
        var quoted = Assert.Throws<SettingsException>(() => SettingsFile.Parse("\n[\"sail\"]\n\"area_m2\" = 99\n", "e.toml", schema));
        Assert.Equal(3, quoted.Line);
        var dotted = Assert.Throws<SettingsException>(() => SettingsFile.Parse("name = \"x\"\n\nsail . area_m2 = 99\n", "e.toml", schema));
        Assert.Equal(3, dotted.Line);
        var multi = Assert.Throws<SettingsException>(() => SettingsFile.Parse("name = \"\"\"a\n[sail]\nb\"\"\"\n[sail]\narea_m2 = 99\n", "e.toml", schema));
        Assert.Equal(5, multi.Line); // the [sail] inside the string is text, not a table
    }

    [Fact]
    public void AStarIsRefusedWhereItIsNotAPattern()
    {
        BadInput(Cli("race", Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-race.toml"), "--set", "boards.*.equipment=x.toml"), "'*' is not a name");
        var e = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(EngineTestKit.SteadyWind(12) + "[course]\nkind = \"windward-leeward\"\n[boards.\"*\"]\nequipment = \"x.toml\"\n"));
        Assert.Equal(10, e.Line);
    }

    [Theory]
    [InlineData("order = \"a\"\n[course.marks.a]\nx_m = 0\ny_m = 0\n", "the leg to 'a'")]
    [InlineData("order = \"a b\"\n[course.marks.a]\nx_m = 0\ny_m = 500\n[course.marks.b]\nx_m = 0\ny_m = 500\n", "from 'a'")]
    [InlineData("order = \"a\"\n[course.marks.a]\nbearing_deg = 0\ndistance_m = 5\n", "5 m long")]
    public void DegenerateCoursesAreRefused(string marks, string word)
    {
        var e = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(EngineTestKit.SteadyWind(12) + "[course]\nkind = \"waypoints\"\n" + marks +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n"));
        Assert.Contains(word, e.Message);
        Assert.Contains("course.order", e.Message);
    }

    [Fact]
    public void FleetAndListLimitsHoldAndCanBeRaised()
    {
        string boards = string.Concat(Enumerable.Range(0, 3).Select(i => $"[boards.b{i}]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n"));
        string toml = EngineTestKit.SteadyWind(12) + "[course]\nkind = \"windward-leeward\"\n" + boards;
        try
        {
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_BOARDS", "2");
            Assert.Contains("COURSESIM_MAX_BOARDS", Assert.Throws<SettingsException>(() => EngineTestKit.Parse(toml)).Message);
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_BOARDS", "3");
            Assert.Equal(3, EngineTestKit.Parse(toml).Boards.Count);
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_LIST", "5");
            BadInput(Cli("polar", EngineTestKit.Equip("light-66.toml"), "--wind", "6,7,8,9,10,11"), "--wind", "COURSESIM_MAX_LIST");
        }
        finally
        {
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_BOARDS", null);
            System.Environment.SetEnvironmentVariable("COURSESIM_MAX_LIST", null);
        }
    }
}
