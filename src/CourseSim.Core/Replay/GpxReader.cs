using System.Globalization;
using System.Xml;
using CourseSim.Settings;

namespace CourseSim.Replay;

/// <summary>One track point: latitude and longitude (deg, WGS 84) and its time (null when the file has none).</summary>
public readonly record struct GpxPoint(double Lat, double Lon, DateTimeOffset? Time, int Line);

/// <summary>A track segment: points in file order (a device starts a new segment after losing its fix).</summary>
public sealed record GpxSegment(string File, string Track, int Index, IReadOnlyList<GpxPoint> Points);

/// <summary>
/// Reads tracks from GPX 1.0 and 1.1 files (Topografix GPX schemas: gpx/trk/trkseg/trkpt with lat and lon attributes and
/// an optional time element). Elements of other names and namespaces (extensions such as heart rate, elevation, speed)
/// are skipped; routes and waypoints are not tracks and are ignored. A file that is not well-formed XML, has no gpx root
/// or a point without a valid lat/lon is an error naming the file and line (exit code 2).
/// </summary>
public static class GpxReader
{
    public static IReadOnlyList<GpxSegment> Load(string path)
    {
        if (!File.Exists(path)) throw new SettingsException(path, 0, null, "file not found (expected a GPX track)");
        var bytes = Storage.InputFile.TryRead(path, Storage.Limits.MaxInputMb, "COURSESIM_MAX_INPUT_MB", out string problem)
            ?? throw new SettingsException(path, 0, null, $"{problem} (expected a GPX track)");
        using var ms = new MemoryStream(bytes);
        return Read(ms, path);
    }

    public static IReadOnlyList<GpxSegment> Parse(string text, string path)
    {
        using var ms = new MemoryStream(new System.Text.UTF8Encoding(false).GetBytes(text));
        return Read(ms, path);
    }

    static IReadOnlyList<GpxSegment> Read(Stream stream, string path)
    {
        var settings = new XmlReaderSettings { DtdProcessing = DtdProcessing.Prohibit, XmlResolver = null, IgnoreComments = true, IgnoreWhitespace = true };
        var segs = new List<GpxSegment>();
        try
        {
            using var r = XmlReader.Create(stream, settings);
            var li = (IXmlLineInfo)r;
            // The root by its local name, so a prefixed root (<g:gpx xmlns:g="...">) is read too.
            while (r.Read() && r.NodeType != XmlNodeType.Element) { }
            if (r.NodeType != XmlNodeType.Element || r.LocalName != "gpx")
                throw new SettingsException(path, li.LineNumber, null, $"no <gpx> root element{(r.NodeType == XmlNodeType.Element ? $" (found <{r.Name}>)" : "")} (expected a GPX 1.0 or 1.1 file)");
            string ns = r.NamespaceURI;
            if (ns.Length > 0 && !ns.StartsWith("http://www.topografix.com/GPX/1/", StringComparison.Ordinal))
                throw new SettingsException(path, li.LineNumber, null, $"<gpx> in namespace '{ns}' (expected http://www.topografix.com/GPX/1/0 or /1/1)");
            string trackName = ""; int trackNo = 0;
            List<GpxPoint>? seg = null;
            int depth0 = r.Depth;
            bool more = r.Read();
            while (more)
            {
                if (r.NodeType == XmlNodeType.Element && r.NamespaceURI == ns)
                {
                    switch (r.LocalName)
                    {
                        case "trk": trackNo++; trackName = $"track {trackNo}"; break;
                        case "name" when seg is null && trackNo > 0 && r.Depth == depth0 + 2: trackName = r.ReadElementContentAsString().Trim(); more = !r.EOF; continue;
                        case "trkseg": seg = r.IsEmptyElement ? null : []; break;
                        case "trkpt": var p = Point(r, li, path); seg?.Add(p); more = !r.EOF; continue;
                        case "extensions": r.Skip(); more = !r.EOF; continue;
                    }
                }
                else if (r.NodeType == XmlNodeType.Element) { r.Skip(); more = !r.EOF; continue; }
                if (r.NodeType == XmlNodeType.EndElement && r.LocalName == "trkseg" && seg is not null)
                {
                    if (seg.Count > 0) segs.Add(new GpxSegment(path, trackName, segs.Count, seg));
                    seg = null;
                }
                more = r.Read();
            }
        }
        catch (XmlException e) { throw new SettingsException(path, e.LineNumber, null, $"not well-formed GPX: {e.Message}"); }
        return segs;
    }

    static GpxPoint Point(XmlReader r, IXmlLineInfo li, string path)
    {
        int line = li.LineNumber;
        string? la = r.GetAttribute("lat"), lo = r.GetAttribute("lon");
        if (!double.TryParse(la, NumberStyles.Float, CultureInfo.InvariantCulture, out double lat) || !(lat >= -90 && lat <= 90))
            throw new SettingsException(path, line, null, $"<trkpt> lat '{la}' is not a latitude from -90 to 90 deg");
        if (!double.TryParse(lo, NumberStyles.Float, CultureInfo.InvariantCulture, out double lon) || !(lon >= -180 && lon <= 180))
            throw new SettingsException(path, line, null, $"<trkpt> lon '{lo}' is not a longitude from -180 to 180 deg");
        DateTimeOffset? time = null;
        string ns = r.NamespaceURI;
        if (r.IsEmptyElement) { r.Read(); return new GpxPoint(lat, lon, null, line); }
        int depth = r.Depth;
        r.Read();
        while (!(r.NodeType == XmlNodeType.EndElement && r.Depth == depth))
        {
            if (r.NodeType == XmlNodeType.Element && r.LocalName == "time" && r.NamespaceURI == ns)
            {
                int tl = li.LineNumber;
                string s = r.ReadElementContentAsString().Trim();
                if (!DateTimeOffset.TryParse(s, CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal, out var t))
                    throw new SettingsException(path, tl, null, $"<time> '{s}' is not an ISO 8601 time (GPX uses xsd:dateTime, such as 2026-06-14T13:00:00Z)");
                time = t;
                continue;
            }
            if (r.NodeType == XmlNodeType.Element) { r.Skip(); continue; }
            if (!r.Read()) break;
        }
        r.Read(); // past </trkpt>
        return new GpxPoint(lat, lon, time, line);
    }
}
