using System.Security.Cryptography;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Replay;
using CourseSim.Settings;

namespace CourseSim.Tests.Engine;

public class RaceTests
{
    static string TwoBoards(string extra = "") => EngineTestKit.SteadyWind(14) +
        "[race]\ncountdown_s = 60\ntime_limit_s = 900\nfalls = false\n" + extra +
        "[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 400\nstart_line_m = 150\n" +
        $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\nline_position = 0.3\n" +
        $"[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\nline_position = 0.7\n";

    [Fact]
    public void ABoardOnTheCourseSideAtTheSignalMustReturnBeforeItStarts()
    {
        var race = new Race(EngineTestKit.Parse(TwoBoards()));
        var e = race.EntityOf(0);
        while (race.Time < -0.5) race.Step();
        // Put board a 10 m over the line, heading upwind-ish, just before the signal.
        ref var p = ref race.World.Get<Pose>(e);
        p.X = -20; p.Y = 10;
        var res = race.Run();
        var a = res.Boards[0];
        Assert.True(a.Ocs);
        var evs = res.Events.Where(x => x.Board == 0).ToList();
        int ocs = evs.FindIndex(x => x.Kind == RaceEventKind.Ocs), cleared = evs.FindIndex(x => x.Kind == RaceEventKind.Cleared),
            started = evs.FindIndex(x => x.Kind == RaceEventKind.Started);
        Assert.True(ocs >= 0 && cleared > ocs && started > cleared, string.Join(", ", evs.Select(x => x.Kind)));
        Assert.True(evs[started].TimeS > 0);
        // Board b was not over and started normally.
        Assert.False(res.Boards[1].Ocs);
        Assert.True(res.Boards.All(b => b.Finished));
        Assert.True(a.SplitsS.Count == race.Course.Steps.Count);
    }

    [Fact]
    public async Task SameScenarioAndSeedGiveIdenticalBytesEvenUnderLoad()
    {
        var setup = EngineTestKit.Demo(["race.time_limit_s=200"]);
        byte[] Once()
        {
            var race = new Race(setup);
            var res = race.Run();
            return ReplayFile.Write(race, res);
        }
        var first = Once();
        // Again while other races run on every core.
        var load = Enumerable.Range(0, System.Environment.ProcessorCount).Select(_ => Task.Run(Once)).ToArray();
        var second = Once();
        var others = await Task.WhenAll(load);
        Assert.Equal(SHA256.HashData(first), SHA256.HashData(second));
        foreach (var o in others) Assert.Equal(first, o);
        // A different seed changes the race.
        var other = new Race(EngineTestKit.Demo(["race.time_limit_s=200"], seed: 8));
        Assert.NotEqual(first, ReplayFile.Write(other, other.Run()));
    }

    [Fact]
    public void TheDemoRaceFinishesWithEveryBoardAccountedForAndNoNaN()
    {
        var setup = EngineTestKit.Demo();
        Assert.True(setup.Boards.Count >= 12);
        Assert.Equal("trapezoid", setup.Course.Kind);
        var race = new Race(setup);
        var res = race.Run();
        Assert.Equal(setup.Boards.Count, res.Boards.Count);
        foreach (var b in res.Boards)
        {
            Assert.True(b.Finished || res.Events.Any(e => e.Board == b.Board && e.Kind == RaceEventKind.NotFinished));
            Assert.True(double.IsFinite(b.DistanceM) && b.DistanceM > 0);
        }
        Assert.True(res.Boards.Count(b => b.Finished) >= setup.Boards.Count / 2, "most of the fleet finishes the demo");
        var places = res.Boards.Where(b => b.Place is not null).Select(b => b.Place!.Value).Order().ToList();
        Assert.Equal(Enumerable.Range(1, places.Count), places);
        for (int k = 0; k < race.Recorder.Frames; k++)
            foreach (var s in race.Recorder.Frame(k))
                Assert.True(float.IsFinite(s.X) && float.IsFinite(s.Y) && float.IsFinite(s.SpeedMs) && float.IsFinite(s.HeadingDeg) && float.IsFinite(s.HeelUse));
        // Finishers are ranked by elapsed time; every finisher passed every step.
        var fin = res.ByPlace.Where(b => b.Finished).ToList();
        for (int i = 1; i < fin.Count; i++) Assert.True(fin[i].ElapsedS >= fin[i - 1].ElapsedS);
        Assert.All(fin, b => Assert.Equal(setup.Course.Steps.Count, b.SplitsS.Count));
    }

    [Theory]
    [InlineData("kind = \"slalom\"\nslalom_marks = 4\n", 18.0)]
    [InlineData("kind = \"windward-leeward\"\nlaps = 2\nbeat_m = 600\n", 12.0)]
    [InlineData("kind = \"trapezoid\"\nloop = \"inner\"\nlaps = 2\nbeat_m = 600\nreach_m = 350\nrun_m = 500\n", 14.0)]
    [InlineData("kind = \"waypoints\"\norder = \"n e s fin\"\n[course.marks.n]\nx_m = 0\ny_m = 900\n[course.marks.e]\nx_m = 900\ny_m = 900\nrounding = \"starboard\"\n[course.marks.s]\nx_m = 900\ny_m = 0\n[course.marks.fin]\nx_m = 200\ny_m = -150\n", 12.0)]
    public void EveryCourseKindIsSailedToTheFinishInTheRightOrder(string course, double kn)
    {
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(kn) + "[race]\ntime_limit_s = 3600\n[course]\n" + course +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n");
        var race = new Race(setup);
        var res = race.Run();
        Assert.All(res.Boards, b => Assert.True(b.Finished, $"{b.Name} did not finish {setup.Course.Kind}"));
        Assert.All(res.Boards, b => Assert.Equal(setup.Course.Steps.Count, b.SplitsS.Count));
        // Every rounding event names the steps in course order.
        foreach (var b in res.Boards)
        {
            var names = res.Events.Where(e => e.Board == b.Board && e.Kind == RaceEventKind.Rounded).Select(e => e.Detail).ToList();
            Assert.Equal(setup.Course.Steps.Take(setup.Course.Steps.Count - 1).Select(s => s.Name), names);
        }
    }

    [Fact]
    public void ATimeLimitEndsTheRaceAndRecordsTheUnfinished()
    {
        var race = new Race(EngineTestKit.Parse(TwoBoards().Replace("time_limit_s = 900", "time_limit_s = 120")));
        var res = race.Run();
        Assert.All(res.Boards, b => Assert.False(b.Finished));
        Assert.Equal(2, res.Events.Count(e => e.Kind == RaceEventKind.NotFinished));
        Assert.InRange(res.DurationS, 120, 120.1);
    }

    [Fact]
    public void ReplaysRoundTripAndCorruptionOrTruncationIsDetected()
    {
        var race = new Race(EngineTestKit.Parse(TwoBoards()));
        var res = race.Run();
        var bytes = ReplayFile.Write(race, res);
        var data = ReplayFile.Read(bytes, "race.msgpack");
        Assert.Equal(ReplayFile.Version, data.Version);
        Assert.Equal(2, data.Boards.Count);
        Assert.Equal(race.Recorder.Frames, data.Frames);
        Assert.Equal(race.Course.Steps.Count, data.Steps.Count);
        int k = data.Frames / 2;
        Assert.Equal(race.Recorder.At(k, 1).X, data.Value("x_m", k, 1));
        Assert.Equal(race.Recorder.At(k, 0).SpeedMs, data.Value("speed_ms", k, 0));
        Assert.Equal(res.Events.Count, data.Events.Count);
        Assert.NotNull(data.Wind);
        Assert.Equal(data.Wind!.Frames * data.Wind.Nx * data.Wind.Ny, data.Wind.SpeedMs.Length);

        var corrupt = (byte[])bytes.Clone();
        corrupt[bytes.Length / 2] ^= 0x40;
        var e1 = Assert.Throws<ReplayException>(() => ReplayFile.Read(corrupt, "race.msgpack"));
        Assert.Contains("race.msgpack", e1.Message);
        var e2 = Assert.Throws<ReplayException>(() => ReplayFile.Read(bytes[..(bytes.Length / 3)], "race.msgpack"));
        Assert.Contains("race.msgpack", e2.Message);
        Assert.Throws<ReplayException>(() => ReplayFile.Read("not a replay"u8.ToArray(), "x"));
    }

    [Fact]
    public void GpxPointsAreGeoreferencedFromTheVenueOrigin()
    {
        // 1 km north of the origin is 1000 / R rad of latitude with R the IUGG mean radius 6 371 008.8 m (Moritz 2000):
        // 0.0089932 deg.
        var (lat, lon) = Gpx.ToGeo(0, 1000, 47.25, -3.5);
        Assert.Equal(47.25 + 0.0089932, lat, 6);
        Assert.Equal(-3.5, lon, 9);
        // 1 km east at 47.25 deg is 0.0089932 / cos(47.25 deg) = 0.0132487 deg of longitude.
        var (_, lon2) = Gpx.ToGeo(1000, 0, 47.25, -3.5);
        Assert.Equal(-3.5 + 0.0132487, lon2, 6);

        var race = new Race(EngineTestKit.Parse(TwoBoards() + "[venue]\nlat_deg = 47.25\nlon_deg = -3.5\n"));
        race.Run();
        var doc = new System.Xml.XmlDocument();
        doc.LoadXml(Gpx.Track(race, 0));
        var ns = new System.Xml.XmlNamespaceManager(doc.NameTable);
        ns.AddNamespace("g", "http://www.topografix.com/GPX/1/1");
        Assert.Equal("1.1", doc.DocumentElement!.GetAttribute("version"));
        var pts = doc.SelectNodes("//g:trkpt", ns)!;
        Assert.True(pts.Count > 100);
        foreach (System.Xml.XmlElement p in pts)
        {
            double la = double.Parse(p.GetAttribute("lat"), System.Globalization.CultureInfo.InvariantCulture);
            Assert.InRange(la, 47.24, 47.26);
        }
    }

    [Fact]
    public void BadBoardEntriesNameTheFileLineAndWhatIsExpected()
    {
        var bad = TwoBoards().Replace("line_position = 0.3", "line_position = 0.3\ntactic = \"zig-zag\"");
        var e = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(bad));
        Assert.Contains("vmg-layline", e.Message);
        Assert.True(e.Line > 0);
        var missing = TwoBoards().Replace("light-66.toml", "no-such-rig.toml");
        var e2 = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(missing));
        Assert.Contains("boards.a.equipment", e2.Message);
        Assert.Contains("not found", e2.Message);
        var typo = TwoBoards().Replace("line_position = 0.7", "line_postion = 0.7");
        var e3 = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(typo));
        Assert.Contains("boards.b.line_postion", e3.Message);
        var noBoards = EngineTestKit.SteadyWind(12) + "[course]\nkind = \"windward-leeward\"\n";
        Assert.Contains("at least one board", Assert.Throws<SettingsException>(() => EngineTestKit.Parse(noBoards)).Message);
        var badSet = TwoBoards().Replace("line_position = 0.3", "line_position = 0.3\nset = \"sail.area_m2=40\"");
        var e4 = Assert.Throws<SettingsException>(() => EngineTestKit.Parse(badSet));
        Assert.Contains("boards.a.set", e4.Message);
        Assert.Contains("sail.area_m2", e4.Message);
    }
}

public class ScenarioDocTests
{
    [Fact]
    public void EveryScenarioKeyIsDocumented()
    {
        var doc = File.ReadAllText(Path.Combine(CourseSim.Tests.Settings.RepoRoot.Path, "docs", "scenario.md"));
        foreach (var key in ScenarioFile.Schema.Keys.Keys) Assert.Contains($"`{key}`", doc);
    }
}
