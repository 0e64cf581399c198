using System.Globalization;
using System.Text;

namespace CourseSim.Experiments;

/// <summary>
/// One board in one race of one variant: a row of results.csv and of the per-race files runs/VARIANT/NNNNNN.csv.
/// <see cref="PlaceScored"/> is the place that counts: the place if the board finished, else the place after the
/// race's last finisher (finishers + 1). <see cref="FirstFinisherS"/> and <see cref="LastFinisherS"/> are the race's
/// duration (first and last finisher's elapsed time from the signal; NaN when nobody finished).
/// </summary>
public sealed record RaceRow(string Variant, int Race, ulong Seed, string BoardId, string Name, int? Place, int PlaceScored, bool Finished,
    double? ElapsedS, double DistanceM, int Tacks, int Gybes, int Falls, bool Ocs, double FirstFinisherS, double LastFinisherS, double TimeLimitS,
    double WindKn, string FirstBeatSide = "", string SplitsS = "")
{
    public const string Header = "variant,race,seed,board,name,place,place_scored,finished,elapsed_s,distance_m,tacks,gybes,falls,ocs," +
        "first_finisher_s,last_finisher_s,time_limit_s,wind_kn,first_beat_side,splits_s";
    static readonly string[] Columns = Header.Split(',');

    /// <summary>Time that counts for this board: its elapsed time if it finished, else the time limit (a board that did
    /// not finish is scored as having sailed until the time limit).</summary>
    public double TimeOrLimitS => Finished && ElapsedS is double e ? e : TimeLimitS;

    /// <summary>Split times (s from the signal) at each course step passed.</summary>
    public double[] Splits => SplitsS.Length == 0 ? [] : SplitsS.Split(';').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();

    static string I(long v) => v.ToString(CultureInfo.InvariantCulture);

    public string ToCsv() => string.Join(',', Csv(Variant), I(Race), Seed.ToString(CultureInfo.InvariantCulture), Csv(BoardId), Csv(Name),
        Place is int p ? I(p) : "", I(PlaceScored), Finished ? "true" : "false", N(ElapsedS), N(DistanceM), I(Tacks), I(Gybes), I(Falls),
        Ocs ? "true" : "false", N(FirstFinisherS), N(LastFinisherS), N(TimeLimitS), N(WindKn), FirstBeatSide, SplitsS);

    /// <summary>Reads a per-race file or results.csv: a header line naming the columns, then one row per board.</summary>
    public static List<RaceRow> ParseFile(IReadOnlyList<string> lines, string source)
    {
        var rows = new List<RaceRow>();
        if (lines.Count == 0) return rows;
        var head = SplitCsv(lines[0]);
        if (!head.SequenceEqual(Columns))
            throw new InvalidDataException($"{source}:1: expected the header '{Header}' (a file from an older version of coursesim? run the batch again without --resume)");
        for (int i = 1; i < lines.Count; i++)
            if (lines[i].Length > 0) rows.Add(Parse(lines[i], source, i + 1));
        return rows;
    }

    public static RaceRow Parse(string line, string source, int lineNo)
    {
        var p = SplitCsv(line);
        if (p.Count != Columns.Length) throw new InvalidDataException($"{source}:{lineNo}: expected {Columns.Length} fields, found {p.Count}");
        try
        {
            static double D(string s) => s.Length == 0 ? double.NaN : double.Parse(s, CultureInfo.InvariantCulture);
            static int N(string s) => int.Parse(s, CultureInfo.InvariantCulture);
            double el = D(p[8]);
            return new RaceRow(p[0], N(p[1]), ulong.Parse(p[2], CultureInfo.InvariantCulture), p[3], p[4], p[5].Length == 0 ? null : N(p[5]), N(p[6]),
                p[7] == "true", double.IsNaN(el) ? null : el, D(p[9]), N(p[10]), N(p[11]), N(p[12]), p[13] == "true", D(p[14]), D(p[15]), D(p[16]), D(p[17]),
                p[18], p[19]);
        }
        catch (FormatException e) { throw new InvalidDataException($"{source}:{lineNo}: {e.Message}"); }
    }

    static string N(double? v) => v is double d && double.IsFinite(d) ? Math.Round(d, 3).ToString("0.###", CultureInfo.InvariantCulture) : "";
    static string Csv(string s) => s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;

    /// <summary>Splits one CSV line (RFC 4180 quoting).</summary>
    public static List<string> SplitCsv(string line)
    {
        var parts = new List<string>();
        var sb = new StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            char c = line[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else sb.Append(c);
            }
            else if (c == '"') quoted = true;
            else if (c == ',') { parts.Add(sb.ToString()); sb.Clear(); }
            else sb.Append(c);
        }
        parts.Add(sb.ToString());
        return parts;
    }
}
