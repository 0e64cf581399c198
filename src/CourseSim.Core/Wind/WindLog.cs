using System.Globalization;
using CourseSim.Settings;

namespace CourseSim.Wind;

/// <summary>A row of a wind log the reader set aside, with its line and why.</summary>
public sealed record LogProblem(int Line, string Problem);

/// <summary>
/// A measured wind log (docs/wind-fit.md): times in seconds from the first good row, mean speed (m/s), direction the
/// wind comes from (deg true; NaN in a calm or where the cell is empty) and gust (m/s; NaN if the log has none).
/// Rows that cannot be read are set aside with their line (<see cref="Problems"/>), never crashed on.
/// </summary>
public sealed class WindLog
{
    public required string Path { get; init; }
    public required DateTimeOffset Start { get; init; }
    public required double[] T { get; init; }
    public required double[] SpeedMs { get; init; }
    public required double[] DirDeg { get; init; }
    public required double[] GustMs { get; init; }
    public required IReadOnlyList<LogProblem> Problems { get; init; }
    /// <summary>What each role was read from, for the report: "time=utc, speed=speed_kn (kn), dir=dir, gust=none".</summary>
    public required string Mapping { get; init; }
    public bool HasGust => GustMs.Any(double.IsFinite);
    public int Count => T.Length;
    public double DurationS => T.Length > 0 ? T[^1] - T[0] : 0;

    /// <summary>The median interval between rows, s.</summary>
    public double MedianStepS
    {
        get
        {
            if (T.Length < 2) return double.NaN;
            var d = new double[T.Length - 1];
            for (int i = 1; i < T.Length; i++) d[i - 1] = T[i] - T[i - 1];
            Array.Sort(d);
            return d[d.Length / 2];
        }
    }

    /// <summary>The rows between two times (seconds from the start), as a new log starting at the first kept row.</summary>
    public WindLog Window(double fromS, double toS)
    {
        var idx = Enumerable.Range(0, T.Length).Where(i => T[i] >= fromS && T[i] <= toS).ToArray();
        double t0 = idx.Length > 0 ? T[idx[0]] : 0;
        return new WindLog
        {
            Path = Path, Start = Start.AddSeconds(t0), T = idx.Select(i => T[i] - t0).ToArray(), SpeedMs = idx.Select(i => SpeedMs[i]).ToArray(),
            DirDeg = idx.Select(i => DirDeg[i]).ToArray(), GustMs = idx.Select(i => GustMs[i]).ToArray(), Problems = Problems, Mapping = Mapping,
        };
    }

    public static WindLog Load(string path, WindLogFormat? format = null)
    {
        if (!File.Exists(path)) throw new SettingsException(path, 0, null, "file not found (expected a wind log in CSV)");
        var bytes = Storage.InputFile.TryRead(path, Storage.Limits.MaxInputMb, "COURSESIM_MAX_INPUT_MB", out string problem)
            ?? throw new SettingsException(path, 0, null, $"{problem} (expected a wind log in CSV)");
        string text;
        try { text = new System.Text.UTF8Encoding(false, true).GetString(bytes).TrimStart('\uFEFF'); }
        catch (System.Text.DecoderFallbackException) { throw new SettingsException(path, 0, null, "not UTF-8 text (expected a wind log in CSV)"); }
        return Parse(text, path, format ?? new WindLogFormat());
    }

    public static WindLog Parse(string text, string path, WindLogFormat format)
    {
        var lines = text.Split('\n');
        int headerLine = -1;
        for (int i = 0; i < lines.Length; i++)
        {
            string l = lines[i].Trim();
            if (l.Length == 0 || l.StartsWith('#')) continue;
            headerLine = i; break;
        }
        if (headerLine < 0) throw new SettingsException(path, 0, null, "no header row (expected a CSV header such as time,speed_kn,direction_deg,gust_kn)");
        string head = lines[headerLine].TrimEnd('\r');
        char sep = new[] { ',', ';', '\t' }.MaxBy(c => head.Count(x => x == c));
        var headers = CsvLine.Split(head, sep).Select(h => h.Trim()).ToArray();
        int Find(string? given, string[] names, string role, bool required)
        {
            if (given is not null)
            {
                int j = Array.FindIndex(headers, h => string.Equals(h, given, StringComparison.OrdinalIgnoreCase));
                if (j < 0) throw new SettingsException(path, headerLine + 1, null, $"no column '{given}' for {role}; the header has: {string.Join(", ", headers)}");
                return j;
            }
            foreach (var n in names)
            {
                int j = Array.FindIndex(headers, h => WindLogFormat.Bare(h) == n);
                if (j >= 0) return j;
            }
            if (required)
                throw new SettingsException(path, headerLine + 1, null, $"no {role} column found among: {string.Join(", ", headers)} (name it with --columns {role}=COLUMN, or call it one of {string.Join(", ", names.Take(4))})");
            return -1;
        }
        int ct = Find(format.Time, WindLogFormat.TimeNames, "time", true);
        int cs = Find(format.Speed, WindLogFormat.SpeedNames, "speed", true);
        int cd = Find(format.Direction, WindLogFormat.DirNames, "dir", true);
        int cg = Find(format.Gust, WindLogFormat.GustNames, "gust", false);
        string unit = format.Unit ?? WindLogFormat.UnitInHeader(headers[cs]) ?? "kn";
        string gunit = format.Unit ?? (cg >= 0 ? WindLogFormat.UnitInHeader(headers[cg]) : null) ?? unit;
        double k = WindLogFormat.ToMs(unit), kg = WindLogFormat.ToMs(gunit);
        var problems = new List<LogProblem>();
        var t = new List<double>(); var s = new List<double>(); var d = new List<double>(); var g = new List<double>();
        DateTimeOffset? t0 = null; double last = double.NegativeInfinity;
        for (int i = headerLine + 1; i < lines.Length; i++)
        {
            string l = lines[i].TrimEnd('\r');
            if (l.Trim().Length == 0 || l.TrimStart().StartsWith('#')) continue;
            int line = i + 1;
            var cells = CsvLine.Split(l, sep);
            if (cells.Count <= Math.Max(ct, Math.Max(cs, Math.Max(cd, cg))))
            { problems.Add(new(line, $"{cells.Count} cells, expected {headers.Length}")); continue; }
            if (!TryTime(cells[ct].Trim(), out var when)) { problems.Add(new(line, $"time '{cells[ct].Trim()}' is neither ISO 8601 nor epoch seconds")); continue; }
            t0 ??= when;
            double ts = (when - t0.Value).TotalSeconds;
            if (ts <= last) { problems.Add(new(line, $"time {cells[ct].Trim()} is not after the row before (rows must be in time order)")); continue; }
            string sc = cells[cs].Trim(), dc = cells[cd].Trim(), gc = cg >= 0 ? cells[cg].Trim() : "";
            double sp = double.NaN, dir = double.NaN, gu = double.NaN;
            if (sc.Length > 0 && !(double.TryParse(sc, NumberStyles.Float, CultureInfo.InvariantCulture, out sp) && sp >= 0 && sp < 200))
            { problems.Add(new(line, $"speed '{sc}' is not a number from 0 to 200 {unit}")); continue; }
            if (dc.Length > 0 && !(double.TryParse(dc, NumberStyles.Float, CultureInfo.InvariantCulture, out dir) && dir >= 0 && dir <= 360))
            { problems.Add(new(line, $"direction '{dc}' is not a number from 0 to 360 deg")); continue; }
            if (gc.Length > 0 && !(double.TryParse(gc, NumberStyles.Float, CultureInfo.InvariantCulture, out gu) && gu >= 0 && gu < 250))
            { problems.Add(new(line, $"gust '{gc}' is not a number from 0 to 250 {gunit}")); continue; }
            if (sc.Length == 0) { problems.Add(new(line, "no speed (a gap)")); continue; }
            sp *= k; if (double.IsFinite(gu)) gu *= kg;
            if (sp == 0) dir = double.NaN; // a calm has no direction, whatever the vane says
            if (double.IsFinite(gu) && gu < sp) gu = sp; // a gust below the mean is a rounding artefact of some loggers
            t.Add(ts); s.Add(sp); d.Add(dir); g.Add(gu); last = ts;
        }
        if (t.Count < 10)
            throw new SettingsException(path, 0, null, $"only {t.Count} readable rows (at least 10 needed)" + (problems.Count > 0 ? $"; first problem: line {problems[0].Line}: {problems[0].Problem}" : ""));
        string map = $"time={headers[ct]}, speed={headers[cs]} ({unit}), dir={headers[cd]}, gust={(cg >= 0 ? $"{headers[cg]} ({gunit})" : "none")}";
        return new WindLog { Path = path, Start = t0!.Value, T = [.. t], SpeedMs = [.. s], DirDeg = [.. d], GustMs = [.. g], Problems = problems, Mapping = map };
    }

    /// <summary>ISO 8601 (UTC unless an offset is given) or epoch seconds (epoch milliseconds above 1e11).</summary>
    public static bool TryTime(string text, out DateTimeOffset when)
    {
        when = default;
        if (text.Length == 0) return false;
        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double e))
        {
            if (!double.IsFinite(e) || e < 0 || e > 1e14) return false;
            if (e > 1e11) e /= 1000;
            when = DateTimeOffset.UnixEpoch.AddSeconds(e);
            return true;
        }
        return DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out when);
    }
}

/// <summary>Splits one CSV line (RFC 4180 quoting: "a, b" and "" for a quote).</summary>
static class CsvLine
{
    public static List<string> Split(string line, char sep)
    {
        var cells = new List<string>();
        var sb = new System.Text.StringBuilder();
        bool q = false;
        for (int i = 0; i < line.Length; i++)
        {
            char c = line[i];
            if (q)
            {
                if (c == '"') { if (i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; } else q = false; }
                else sb.Append(c);
            }
            else if (c == '"') q = true;
            else if (c == sep) { cells.Add(sb.ToString()); sb.Clear(); }
            else sb.Append(c);
        }
        cells.Add(sb.ToString());
        return cells;
    }
}
