using System.Reflection;
using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Tests.Engine;
using CourseSim.Tests.Settings;
using CourseSim.Units;
using MessagePack;

namespace CourseSim.Tests.Equilibrium;

/// <summary>
/// The rig table cache on disk (RigTableStore, docs/engine.md "Rig tables"): tables read back give the same bits as
/// tables built, a race is the same with a cold or a warm cache, a damaged or foreign file is ignored and rebuilt, and
/// saves from two caches at once leave a readable file. Each test works in a temporary folder of its own.
/// </summary>
public class RigTableStoreTests
{
    static Equipment Rig(string name) => EquipmentFile.Load(EngineTestKit.Equip(name + ".toml"));

    static void InTempFolder(Action<string> test)
    {
        string dir = Directory.CreateTempSubdirectory("cs-rigtables-").FullName;
        try { test(dir); }
        finally { Directory.Delete(dir, true); }
    }

    static void Same(double expected, double actual, string what) =>
        Assert.True(BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(actual), $"{what}: {expected:R} built, {actual:R} read back");

    /// <summary>Every read of the polar at winds lo..hi kn, off the listed winds and angles too, bit for bit.</summary>
    static int SameReads(RigPolar built, RigPolar read, double loKn, double hiKn)
    {
        int n = 0;
        for (double kn = loKn; kn <= hiKn; kn += 0.37)
        {
            double tws = Unit.KnotsToMs(kn);
            for (double twa = 0; twa <= Math.PI; twa += 0.0713)
            {
                Same(built.Speed(tws, twa), read.Speed(tws, twa), $"Speed({kn} kn, {twa} rad)");
                Same(built.GetPlaningSpeed(tws, twa), read.GetPlaningSpeed(tws, twa), $"GetPlaningSpeed({kn} kn, {twa} rad)");
                n += 2;
            }
            foreach (bool up in new[] { true, false })
            {
                Same(built.BestTwa(tws, up), read.BestTwa(tws, up), $"BestTwa({kn} kn, {up})");
                Same(built.BestVmg(tws, up), read.BestVmg(tws, up), $"BestVmg({kn} kn, {up})");
                Same(built.GetPlaningTwa(tws, up), read.GetPlaningTwa(tws, up), $"GetPlaningTwa({kn} kn, {up})");
                n += 3;
            }
        }
        return n;
    }

    [Fact]
    public void RowsReadBackGiveTheSameBitsAsRowsBuilt() => InTempFolder(dir =>
    {
        var eq = Rig("light-78");
        var warnings = new List<string>();
        var first = new RigCache(new RigTableStore(dir, warnings.Add));
        var built = first.For(eq);
        for (double kn = 6; kn <= 20; kn += 0.5) built.Speed(Unit.KnotsToMs(kn), 1.0);
        ulong rows = built.ReadyRows;
        Assert.Equal(16, System.Numerics.BitOperations.PopCount(rows)); // 6..21 kn
        Assert.Equal(1, first.Save());
        Assert.Equal(0, first.Save()); // nothing new since

        var second = new RigCache(new RigTableStore(dir, warnings.Add));
        var read = second.For(eq);
        Assert.Equal(rows, read.ReadyRows); // loaded, not built on use
        var fresh = RigPolar.Build(eq);
        Assert.True(SameReads(fresh, read, 6, 21) > 3000);
        Assert.Equal(rows, read.ReadyRows); // reading inside the loaded rows built none
        // Rows the file lacks are built as ever, on a polar whose plan rows and drop-off memo came from the file.
        Assert.True(SameReads(fresh, read, 26.5, 30) > 500);
        Assert.Equal(1, second.Save());

        // The trim and hull tables read back too.
        for (double beta = 0; beta <= Math.PI; beta += 0.05)
            for (double f = 0; f <= 1; f += 0.0625)
            {
                Assert.Equal(fresh.Rig.Sail(9.5, beta, f), read.Rig.Sail(9.5, beta, f));
                Same(fresh.Rig.AttackAngle(beta, f), read.Rig.AttackAngle(beta, f), $"AttackAngle({beta}, {f})");
            }
        for (double v = 0; v < 40; v += 0.173) Same(fresh.Rig.Physics.Resistance(v), read.Rig.Physics.Resistance(v), $"Resistance({v})");
        Same(fresh.Rig.TimeToPlane(7, 1.6, 2, true), read.Rig.TimeToPlane(7, 1.6, 2, true), "TimeToPlane");
        Assert.Empty(warnings);
        Assert.Equal(0, new RigCache().Save()); // without a store nothing is written
    });

    [Fact]
    public void ARaceIsTheSameWithAColdAndAWarmCache() => InTempFolder(dir =>
    {
        var warnings = new List<string>();
        var cold = new RigCache(new RigTableStore(dir, warnings.Add));
        var r1 = new Race(EngineTestKit.Demo(), cold.For);
        r1.Run();
        Assert.Equal(cold.Count, cold.Save()); // every set-up of the fleet written
        Assert.Equal(cold.Count, Directory.GetFiles(dir, "*.rigtables").Length);

        var warm = new RigCache(new RigTableStore(dir, warnings.Add));
        var r2 = new Race(EngineTestKit.Demo(), warm.For);
        r2.Run();
        Assert.Equal(0, warm.Save()); // the warm race built nothing the files lacked
        Assert.Equal(DeterminismTests.GoldenDemo12, r1.StateHash());
        Assert.Equal(DeterminismTests.GoldenDemo12, r2.StateHash());
        Assert.Empty(warnings);
    });

    static string SavedFile(string dir, Equipment eq, double loKn = 8, double hiKn = 12)
    {
        var c = new RigCache(new RigTableStore(dir, m => Assert.Fail(m)));
        var p = c.For(eq);
        for (double kn = loKn; kn <= hiKn; kn += 1) p.Speed(Unit.KnotsToMs(kn), 0.9);
        Assert.Equal(1, c.Save());
        return Directory.GetFiles(dir).Single(f => f.EndsWith(RigTableStore.KeyOf(eq) + ".rigtables", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData("truncated")]
    [InlineData("flipped")]
    [InlineData("empty")]
    [InlineData("garbage")]
    public void ADamagedFileIsIgnoredAndRebuilt(string damage) => InTempFolder(dir =>
    {
        var eq = Rig("heavy-86");
        string path = SavedFile(dir, eq);
        var bytes = File.ReadAllBytes(path);
        switch (damage)
        {
            case "truncated": File.WriteAllBytes(path, bytes[..(bytes.Length / 2)]); break;
            case "flipped": bytes[bytes.Length * 2 / 3] ^= 0x10; File.WriteAllBytes(path, bytes); break;
            case "empty": File.WriteAllBytes(path, []); break;
            default: File.WriteAllText(path, "not a table at all\n"); break;
        }
        var warnings = new List<string>();
        var c = new RigCache(new RigTableStore(dir, warnings.Add));
        var p = c.For(eq);
        Assert.Equal(path, Assert.Single(warnings).Split(' ')[4].TrimEnd(':')); // one line, naming the file
        Assert.Contains("building the tables again", warnings[0]);
        Assert.Equal(0UL, p.ReadyRows); // nothing taken from it
        SameReads(RigPolar.Build(eq), p, 9, 11);
        Assert.Equal(1, c.Save()); // written again, whole
        var again = new RigCache(new RigTableStore(dir, m => Assert.Fail(m)));
        Assert.NotEqual(0UL, again.For(eq).ReadyRows);
    });

    [Fact]
    public void AFileSavedUnderAnotherKeyOrFormatIsIgnored() => InTempFolder(dir =>
    {
        var light = Rig("light-66");
        var heavy = Rig("heavy-100");
        string lightFile = SavedFile(dir, light);
        // The light rig's tables under the heavy rig's name: they would give the heavy rig the wrong speeds.
        string heavyFile = Path.Combine(dir, RigTableStore.KeyOf(heavy) + ".rigtables");
        File.Copy(lightFile, heavyFile);
        var freshLight = RigPolar.Build(light);
        var freshHeavy = RigPolar.Build(heavy);
        double tws = Unit.KnotsToMs(10);
        Assert.NotEqual(freshLight.Speed(tws, 1.5), freshHeavy.Speed(tws, 1.5));
        var warnings = new List<string>();
        var p = new RigCache(new RigTableStore(dir, warnings.Add)).For(heavy);
        Assert.Contains("saved under another key", Assert.Single(warnings));
        Assert.Equal(0UL, p.ReadyRows);
        SameReads(freshHeavy, p, 8, 12);

        // The right key in another format version.
        var file = MessagePackSerializer.Deserialize<RigTableFile>(File.ReadAllBytes(lightFile));
        file.Format = RigTableStore.FormatVersion + 1;
        File.WriteAllBytes(lightFile, MessagePackSerializer.Serialize(file));
        warnings.Clear();
        var q = new RigCache(new RigTableStore(dir, warnings.Add)).For(light);
        Assert.Contains($"format {RigTableStore.FormatVersion + 1}", Assert.Single(warnings));
        Assert.Equal(0UL, q.ReadyRows);
        SameReads(freshLight, q, 8, 12);
    });

    [Fact]
    public void SavesFromTwoCachesAtOnceLeaveAReadableFile() => InTempFolder(dir =>
    {
        var eq = Rig("heavy-70");
        var warnings = new System.Collections.Concurrent.ConcurrentQueue<string>();
        var a = new RigCache(new RigTableStore(dir, warnings.Enqueue));
        var b = new RigCache(new RigTableStore(dir, warnings.Enqueue));
        var pa = a.For(eq); var pb = b.For(eq);
        for (double kn = 5; kn <= 8; kn++) pa.Speed(Unit.KnotsToMs(kn), 1.1);
        for (double kn = 15; kn <= 18; kn++) pb.Speed(Unit.KnotsToMs(kn), 1.1);
        // Many caches at once, each loading the file, building rows of its own and saving them merged; readers meanwhile.
        long saved = 0;
        Parallel.For(0, 24, new ParallelOptions { MaxDegreeOfParallelism = 4 }, i =>
        {
            var c = new RigCache(new RigTableStore(dir, warnings.Enqueue));
            var p = c.For(eq);
            if (i % 3 == 2) return;
            p.Speed(Unit.KnotsToMs(4 + i), 0.8);
            c.Save();
            Interlocked.Or(ref saved, (long)p.ReadyRows);
        });
        Assert.Empty(warnings); // no reader ever met half a file
        Assert.Empty(Directory.GetFiles(dir, "*.tmp"));
        Assert.Single(Directory.GetFiles(dir, "*.rigtables"));
        // Savers take turns on the lock file, each merging into what the last left: no saver's rows are lost.
        ulong all = (ulong)saved;
        Assert.Equal(all, new RigCache(new RigTableStore(dir, warnings.Enqueue)).For(eq).ReadyRows & all);
        a.Save(); b.Save(); // one after the other: the second merges the first's rows
        var read = new RigCache(new RigTableStore(dir, warnings.Enqueue)).For(eq);
        ulong both = pa.ReadyRows | pb.ReadyRows;
        Assert.Equal(both, read.ReadyRows & both); // with the rows the racing caches added
        Assert.Empty(warnings);
        SameReads(RigPolar.Build(eq), read, 5, 8);
    });

    /// <summary>A copy of each (nested) set-up record with one field changed, for every field.</summary>
    static IEnumerable<(string Path, object Copy)> OneFieldChanged(object o)
    {
        var clone = o.GetType().GetMethod("<Clone>$")!;
        foreach (var p in o.GetType().GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.SetMethod is not null))
        {
            var v = p.GetValue(o);
            IEnumerable<(string, object)> changes = v switch
            {
                double d => [(p.Name, double.IsNaN(d) ? 3.25 : d * 1.0000001 + 1e-9)],
                string s => [(p.Name, s + "-b")],
                _ => OneFieldChanged(v!).Select(c => (p.Name + "." + c.Path, c.Copy)),
            };
            foreach (var (path, nv) in changes)
            {
                var copy = clone.Invoke(o, null)!;
                p.SetValue(copy, nv);
                yield return (path, copy);
            }
        }
    }

    [Fact]
    public void EveryFieldOfTheSetUpIsInTheKey()
    {
        var eq = Rig("light-78");
        string key = RigTableStore.KeyOf(eq);
        Assert.Equal(64, key.Length);
        Assert.Equal(key, RigTableStore.KeyOf(Rig("light-78"))); // same values, another instance
        var keys = new HashSet<string> { key };
        var changed = OneFieldChanged(eq).ToList();
        Assert.True(changed.Count >= 28, $"{changed.Count} fields");
        foreach (var (path, copy) in changed)
        {
            Assert.True(keys.Add(RigTableStore.KeyOf((Equipment)copy)), $"{path} is not in the key");
            Assert.Contains(path + "=", RigTableStore.StableText(eq));
        }
    }

    [Fact]
    public void TheCommandLineKeepsTheTablesInCourseSimCacheDirUnlessTurnedOff()
    {
        // COURSESIM_CACHE_DIR is this test run's own folder (TestCacheFolder).
        Assert.Equal(Path.Combine(TestCacheFolder.Root, "rig-tables"), RigTableStore.DefaultFolder());
        string demo = Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-race.toml");
        string outDir = Directory.CreateTempSubdirectory("cs-race-").FullName;
        try
        {
            var o = new StringWriter(); var e = new StringWriter();
            int code = CourseSim.Cli.Program.Run(["race", demo, "--set", "race.time_limit_s=60", "--out", outDir, "--no-table-cache"], o, e);
            Assert.True(code == 0, e.ToString());
            code = CourseSim.Cli.Program.Run(["race", demo, "--set", "race.time_limit_s=60", "--out", outDir], o, e);
            Assert.True(code == 0, e.ToString());
            Assert.DoesNotContain("warning", e.ToString());
            foreach (var b in ScenarioFile.LoadRace(demo, null, null).Boards)
                Assert.True(File.Exists(Path.Combine(TestCacheFolder.Root, "rig-tables", RigTableStore.KeyOf(b.Equipment) + ".rigtables")), b.Id);
        }
        finally { Directory.Delete(outDir, true); }
    }
}
