using CourseSim.Experiments;
using Parquet.Serialization;

namespace CourseSim.Cli.Output;

/// <summary>
/// results.parquet: the rows of results.csv as an Apache Parquet table (Parquet.Net), same columns and order. The seed
/// is an unsigned 64-bit integer (INT64 with the UINT_64 logical type), so readers give back the seed itself.
/// </summary>
public static class ParquetResults
{
    /// <summary>One row; property names are the column names.</summary>
    public sealed class Row
    {
        public string variant { get; set; } = "";
        public int race { get; set; }
        public ulong seed { get; set; }
        public string board { get; set; } = "";
        public string name { get; set; } = "";
        public int? place { get; set; }
        public int place_scored { get; set; }
        public bool finished { get; set; }
        public double? elapsed_s { get; set; }
        public double distance_m { get; set; }
        public int tacks { get; set; }
        public int gybes { get; set; }
        public int falls { get; set; }
        public bool ocs { get; set; }
        public double? first_finisher_s { get; set; }
        public double? last_finisher_s { get; set; }
        public double time_limit_s { get; set; }
        public double wind_kn { get; set; }
        public string first_beat_side { get; set; } = "";
        public string splits_s { get; set; } = "";
    }

    static double? N(double v) => double.IsFinite(v) ? Math.Round(v, 3) : null;

    public static void Write(IEnumerable<RaceRow> rows, string path)
    {
        var data = rows.Select(r => new Row
        {
            variant = r.Variant, race = r.Race, seed = r.Seed, board = r.BoardId, name = r.Name, place = r.Place, place_scored = r.PlaceScored,
            finished = r.Finished, elapsed_s = r.ElapsedS is double e ? Math.Round(e, 3) : null, distance_m = Math.Round(r.DistanceM, 3), tacks = r.Tacks,
            gybes = r.Gybes, falls = r.Falls, ocs = r.Ocs, first_finisher_s = N(r.FirstFinisherS), last_finisher_s = N(r.LastFinisherS),
            time_limit_s = r.TimeLimitS, wind_kn = Math.Round(r.WindKn, 3), first_beat_side = r.FirstBeatSide, splits_s = r.SplitsS,
        }).ToList();
        string tmp = path + ".tmp";
        using (var fs = File.Create(tmp)) ParquetSerializer.SerializeAsync(data, fs).GetAwaiter().GetResult();
        File.Move(tmp, path, true);
    }

    public static IList<Row> Read(string path)
    {
        using var fs = File.OpenRead(path);
        return ParquetSerializer.DeserializeAsync<Row>(fs).GetAwaiter().GetResult().Data;
    }
}
