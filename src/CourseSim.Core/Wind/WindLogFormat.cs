using CourseSim.Settings;

namespace CourseSim.Wind;

/// <summary>
/// How the columns of a wind log map to time, speed, direction and gust (docs/wind-fit.md, "Formats"). Written as
/// "time=COL,speed=COL,dir=COL,gust=COL,unit=U" (any part may be left out); the columns not named are found by their
/// header (common names: time, timestamp, datetime, utc, date; speed, wind_speed, ws, avg, mean; direction, dir, wd,
/// wind_dir; gust, max, peak). The speed unit is taken from <c>unit=</c>, else from a unit in the speed column's name
/// (_kn, _kt, _kts, _ms, m/s, _kmh, km/h, _mph), else knots.
/// </summary>
public sealed record WindLogFormat
{
    public string? Time { get; init; }
    public string? Speed { get; init; }
    public string? Direction { get; init; }
    public string? Gust { get; init; }
    /// <summary>kn, m/s, km/h or mph; null: from the header, else kn.</summary>
    public string? Unit { get; init; }

    public static readonly string[] Units = ["kn", "m/s", "km/h", "mph"];
    internal static readonly string[] TimeNames = ["time", "timestamp", "datetime", "date_time", "utc", "time_utc", "date", "epoch", "t"];
    internal static readonly string[] SpeedNames = ["speed", "wind_speed", "windspeed", "ws", "avg", "mean", "wind", "speed_avg"];
    internal static readonly string[] DirNames = ["direction", "dir", "wind_dir", "winddir", "wd", "wind_direction", "from"];
    internal static readonly string[] GustNames = ["gust", "gusts", "max", "peak", "wind_gust", "gust_speed", "speed_max"];

    /// <summary>Parses "time=...,speed=...,unit=kn"; <paramref name="source"/> names where the text came from in errors.</summary>
    public static WindLogFormat Parse(string? text, string source)
    {
        var f = new WindLogFormat();
        if (string.IsNullOrWhiteSpace(text)) return f;
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            int eq = part.IndexOf('=');
            if (eq <= 0) throw new SettingsException(source, 0, null, $"'{part}' is not name=column (expected time=, speed=, dir=, gust= or unit=)");
            string k = part[..eq].Trim().ToLowerInvariant(), v = part[(eq + 1)..].Trim();
            f = k switch
            {
                "time" => f with { Time = v },
                "speed" => f with { Speed = v },
                "dir" or "direction" => f with { Direction = v },
                "gust" => f with { Gust = v },
                "unit" => Units.Contains(v) ? f with { Unit = v }
                    : throw new SettingsException(source, 0, null, $"unit '{v}' is not accepted: one of {string.Join(", ", Units)}"),
                _ => throw new SettingsException(source, 0, null, $"'{k}' is not a column role (expected time, speed, dir, gust or unit)"),
            };
        }
        return f;
    }

    /// <summary>Metres per second per unit of the speed columns.</summary>
    public static double ToMs(string unit) => unit switch
    {
        "kn" => 1852.0 / 3600.0,          // international nautical mile, 1852 m (BIPM SI brochure, table 8)
        "m/s" => 1.0,
        "km/h" => 1 / 3.6,
        "mph" => 0.44704,                 // international mile 1609.344 m (1959 agreement) per hour
        _ => throw new ArgumentException(unit),
    };

    /// <summary>A unit named in a column header, or null.</summary>
    internal static string? UnitInHeader(string header)
    {
        string h = header.ToLowerInvariant().Replace(" ", "");
        if (h.Contains("m/s") || h.EndsWith("_ms") || h.EndsWith("(ms)") || h.EndsWith("mps")) return "m/s";
        if (h.Contains("km/h") || h.EndsWith("_kmh") || h.EndsWith("kph")) return "km/h";
        if (h.EndsWith("mph")) return "mph";
        if (h.EndsWith("_kn") || h.EndsWith("_kt") || h.EndsWith("_kts") || h.EndsWith("knots") || h.EndsWith("(kn)") || h.EndsWith("(kt)")) return "kn";
        return null;
    }

    /// <summary>A header without its unit suffix, lower case, for matching the common names.</summary>
    internal static string Bare(string header)
    {
        string h = header.Trim().ToLowerInvariant();
        int p = h.IndexOf('('); if (p > 0) h = h[..p].Trim();
        foreach (var suf in new[] { "_kn", "_kts", "_kt", "_ms", "_kmh", "_mph", "_deg", "_s", "_iso" })
            if (h.EndsWith(suf, StringComparison.Ordinal)) { h = h[..^suf.Length]; break; }
        return h.Replace(' ', '_');
    }
}
