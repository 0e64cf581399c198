using CourseSim.Experiments;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Experiments;

/// <summary>Numbers that cannot blow up: DNF places, zero differences, Holm on three variants, seeds as unsigned integers.</summary>
public class HonestNumbersTests
{
    static RaceRow Row(string variant, int race, string board, int? place, int scored, double? elapsed, double limit = 1000) =>
        new(variant, race, 7, board, board, place, scored, place is not null, elapsed, 0, 0, 0, 0, false, double.NaN, double.NaN, limit, 12);

    static ExperimentSpec Spec(params string[] variants) =>
        new("t", "", "", "a", variants.Select(v => new Variant(v, [], null!)).ToList(), 10, 1, "");

    [Fact]
    public void ABoardThatDidNotFinishTakesThePlaceAfterTheLastFinisher()
    {
        // Through the batch's own row builder: three boards, two finish.
        var setup = EngineTestKit.Parse(EngineTestKit.SteadyWind(12) + "[race]\ntime_limit_s = 900\n[course]\nkind = \"windward-leeward\"\nbeat_m = 300\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n" +
            $"[boards.c]\nequipment = \"{EngineTestKit.Equip("heavy-70.toml")}\"\n");
        var boards = new List<CourseSim.Engine.BoardResult>
        {
            new(0, "A", "e", null, false, null, null, [100], 500, 3, 1, 0, 0, false, 0),
            new(1, "B", "e", 1, true, 600, 0, [200, 600], 900, 3, 1, 0, 0, false, 0),
            new(2, "C", "e", 2, true, 650, 50, [210, 650], 900, 3, 1, 0, 0, false, 0),
        };
        var result = new CourseSim.Engine.RaceResult(1, "t", 900, boards, [], "test");
        var metrics = new RaceMetrics(600, 650, 0, 0, 0, 0, new Dictionary<int, string>(), Boards: 3, Finishers: 2);
        var rows = BatchRunner.RowsOf("v", 0, setup, result, metrics).ToList();
        Assert.Equal([3, 1, 2], rows.Select(r => r.PlaceScored));
        Assert.Equal(900, rows[0].TimeOrLimitS); // the time limit, not the race's end or int.MaxValue
        // The round trip through the per-race file keeps it.
        var back = RaceRow.ParseFile([RaceRow.Header, .. rows.Select(r => r.ToCsv())], "x.csv");
        Assert.Equal(rows, back);
        // A variant whose board did not finish in one of two races: mean place (1 + 3) / 2 = 2, not 6.7e8.
        var spec = Spec("x", "y");
        var list = new List<RaceRow> { Row("x", 0, "a", 1, 1, 500), Row("x", 1, "a", null, 3, null), Row("y", 0, "a", 2, 2, 510), Row("y", 1, "a", 2, 2, 520) };
        var (variants, pairs) = Comparison.Of(spec, list, 1);
        Assert.Equal(2, variants[0].MeanPlace, 12);
        Assert.Equal(0.5 * ((1 - 2) + (3 - 2)), pairs[0].PlaceDiffT!.Value.Estimate, 12);
    }

    [Fact]
    public void AZeroDifferenceGivesZeroIntervalsAndNoRacesNeededFigure()
    {
        var spec = Spec("x", "y");
        var rows = Enumerable.Range(0, 12).SelectMany(i => new[] { Row("x", i, "a", 1 + i % 3, 1 + i % 3, 500 + 10 * i), Row("y", i, "a", 1 + i % 3, 1 + i % 3, 500 + 10 * i) }).ToList();
        var p = Assert.Single(Comparison.Of(spec, rows, 1).Pairs);
        Assert.Equal(new Interval(0, 0, 0), p.MeanDiffT);
        Assert.Equal(new Interval(0, 0, 0), p.MeanDiffBootstrap);
        Assert.Equal(1, p.P);
        Assert.False(p.Significant);
        Assert.False(p.Needed.Known); // no "about 2147483647 races"
        Assert.Equal(0, p.Needed.ResolvableS.Estimate);
        string text = CourseSim.Cli.Output.ExperimentReport.Needed(p);
        Assert.DoesNotContain("2147483647", text);
        Assert.DoesNotContain("races (", text);
    }

    /// <summary>
    /// Three variants whose paired differences have known t statistics on 9 degrees of freedom: x - y a constant
    /// (t infinite, p 0), x - z and y - z with t = 2.5 and 2.4. Both are below 5 % unadjusted (t above 2.262, the 97.5 %
    /// point of t with 9 df), but neither survives Holm's second step, which needs p at most 0.025, i.e. t at least
    /// 2.685 (the 98.75 % point) (Student's t table, e.g. NIST/SEMATECH e-Handbook table 1.3.6.7.2; from memory for 2.685).
    /// </summary>
    [Fact]
    public void HolmDecidesWhatIsResolvedAmongThreeVariants()
    {
        double s = Math.Sqrt(10.0 / 9); // the sd of ten alternating +-1
        double c1 = 2.5 * s / Math.Sqrt(10), c2 = 2.4 * s / Math.Sqrt(10);
        var rows = new List<RaceRow>();
        for (int i = 0; i < 10; i++)
        {
            double z = 400 + 13 * i, e = i % 2 == 0 ? 1 : -1;
            rows.Add(Row("x", i, "a", 1, 1, z + c1 + e));
            rows.Add(Row("y", i, "a", 1, 1, z + c2 + e));
            rows.Add(Row("z", i, "a", 1, 1, z));
        }
        var pairs = Comparison.Of(Spec("x", "y", "z"), rows, 1).Pairs;
        var xz = pairs.Single(p => p.A == "x" && p.B == "z");
        var yz = pairs.Single(p => p.A == "y" && p.B == "z");
        var xy = pairs.Single(p => p.A == "x" && p.B == "y");
        Assert.True(xz.MeanDiffT.ExcludesZero && yz.MeanDiffT.ExcludesZero, "both below 5 % unadjusted");
        Assert.True(xz.P < 0.05 && yz.P < 0.05);
        Assert.True(xy.Significant);
        Assert.False(xz.Significant);
        Assert.False(yz.Significant);
        Assert.True(xz.Adjusted && xz.PHolm > 0.05);
        var md = CourseSim.Cli.Output.ExperimentReport.Markdown(new CourseSim.Cli.Output.BatchFindings(Spec("x", "y", "z"), [], pairs, rows, [], [], [], true, null));
        Assert.Contains("Holm's step-down adjustment", md);
    }

    [Fact]
    public void SeedsAreUnsigned64BitInParquetAndExactIntegersInCsv()
    {
        // A seed above 2^63 (older batches made such seeds) survives as an unsigned 64-bit column.
        ulong big = (1UL << 63) + 12345;
        var rows = new List<RaceRow> { Row("x", 0, "a", 1, 1, 500) with { Seed = big }, Row("x", 1, "a", 1, 1, 500) with { Seed = 42 } };
        string path = Path.Combine(Directory.CreateTempSubdirectory("cs-pq-").FullName, "r.parquet");
        CourseSim.Cli.Output.ParquetResults.Write(rows, path);
        using (var fs = File.OpenRead(path))
        {
            var reader = Parquet.ParquetReader.CreateAsync(fs).GetAwaiter().GetResult();
            var field = reader.Schema.GetDataFields().Single(f => f.Name == "seed");
            Assert.Equal(typeof(ulong), field.ClrType);
            // The file's own schema: INT64 annotated as an unsigned 64-bit integer (Parquet format, LogicalTypes.md:
            // INT(64, false), converted type UINT_64).
            var element = reader.Metadata!.Schema.Single(e => e.Name == "seed");
            Assert.Equal(Parquet.Meta.Type.INT64, element.Type);
            Assert.Equal(Parquet.Meta.ConvertedType.UINT_64, element.ConvertedType);
            using (var rg = reader.OpenRowGroupReader(0))
            {
                var values = new ulong[2];
                rg.ReadAsync<ulong>(field, values.AsMemory()).AsTask().GetAwaiter().GetResult();
                Assert.Equal(new ulong[] { big, 42 }, values);
            }
            reader.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
        // New seeds stay below 2^53: inside race.seed's range, a signed 64-bit integer and a double, exactly.
        for (int i = 0; i < 1000; i++) Assert.True(ExperimentFile.RaceSeed(2026, i) <= ExperimentFile.SeedMask);
        Assert.Equal(9007199254740991UL, ExperimentFile.SeedMask);
        Assert.Contains(",42,", rows[1].ToCsv());
    }
}
