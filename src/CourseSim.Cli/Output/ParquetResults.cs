using CourseSim.Experiments;
using Parquet.Serialization;

namespace CourseSim.Cli.Output;

/// <summary>results.parquet: the rows of results.csv as an Apache Parquet table (Parquet.Net), same columns and order.</summary>
public static class ParquetResults
{
    /// <summary>One row; property names are the column names.</summary>
    public sealed class Row
    {
        public string variant { get; set; } = "";
        public int race { get; set; }
        public long seed { get; set; }
        public string board { get; set; } = "";
        public string name { get; set; } = "";
        public int? place { get; set; }
        public bool finished { get; set; }
        public double? elapsed_s { get; set; }
        public double distance_m { get; set; }
        public int tacks { get; set; }
        public int gybes { get; set; }
        public int falls { get; set; }
        public bool ocs { get; set; }
        public double race_duration_s { get; set; }
        public string first_beat_side { get; set; } = "";
        public string splits_s { get; set; } = "";
    }

    public static void Write(IEnumerable<RaceRow> rows, string path)
    {
        var data = rows.Select(r => new Row
        {
            variant = r.Variant, race = r.Race, seed = unchecked((long)r.Seed), board = r.BoardId, name = r.Name, place = r.Place, finished = r.Finished,
            elapsed_s = r.ElapsedS, distance_m = r.DistanceM, tacks = r.Tacks, gybes = r.Gybes, falls = r.Falls, ocs = r.Ocs, race_duration_s = r.DurationS,
            first_beat_side = r.FirstBeatSide, splits_s = r.SplitsS,
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
