using System.Globalization;
using System.Text;
using System.Xml;
using CourseSim.Engine;
using CourseSim.Simulation;

namespace CourseSim.Replay;

/// <summary>
/// GPX 1.1 tracks (Topografix GPX 1.1 schema). Course coordinates (x east, y north, metres from the course origin) are
/// placed on the globe with the origin at the venue's latitude and longitude by a local equirectangular projection:
/// lat = lat0 + y / R, lon = lon0 + x / (R cos lat0), R = 6 371 008.8 m (IUGG mean Earth radius; Moritz 2000, "Geodetic
/// Reference System 1980", J. Geodesy 74). Over a course a few kilometres across the error is under a metre.
/// </summary>
public static class Gpx
{
    public const double EarthRadiusM = 6371008.8;

    public static (double Lat, double Lon) ToGeo(double x, double y, double lat0, double lon0)
    {
        double lat = lat0 + y / EarthRadiusM * 180 / Math.PI;
        double lon = lon0 + x / (EarthRadiusM * Math.Cos(lat0 * Math.PI / 180)) * 180 / Math.PI;
        return (lat, lon);
    }

    /// <summary>The track of one board from the recorder, from the first frame until it finished.</summary>
    public static string Track(Race race, int board)
    {
        var s = race.Setup;
        var rec = race.Recorder;
        var sb = new StringBuilder();
        var settings = new XmlWriterSettings { Indent = true, Encoding = new UTF8Encoding(false), OmitXmlDeclaration = false };
        using (var sw = new StringWriterUtf8(sb))
        using (var x = XmlWriter.Create(sw, settings))
        {
            const string ns = "http://www.topografix.com/GPX/1/1";
            x.WriteStartDocument();
            x.WriteStartElement("gpx", ns);
            x.WriteAttributeString("version", "1.1");
            x.WriteAttributeString("creator", "CourseSim " + Race.EngineVersion);
            x.WriteStartElement("metadata", ns);
            x.WriteElementString("name", ns, $"{s.Name}: {s.Boards[board].Name}");
            x.WriteElementString("desc", ns, $"Simulated track (seed {race.Seed}); course origin {s.LatDeg.ToString("F6", CultureInfo.InvariantCulture)}, {s.LonDeg.ToString("F6", CultureInfo.InvariantCulture)}. Not a real track.");
            x.WriteEndElement();
            x.WriteStartElement("trk", ns);
            x.WriteElementString("name", ns, s.Boards[board].Name);
            x.WriteStartElement("trkseg", ns);
            for (int k = 0; k < rec.Frames; k++)
            {
                ref readonly var smp = ref rec.At(k, board);
                var (lat, lon) = ToGeo(smp.X, smp.Y, s.LatDeg, s.LonDeg);
                x.WriteStartElement("trkpt", ns);
                x.WriteAttributeString("lat", lat.ToString("F7", CultureInfo.InvariantCulture));
                x.WriteAttributeString("lon", lon.ToString("F7", CultureInfo.InvariantCulture));
                var t = s.Race.StartTimeUtc.AddSeconds(rec.TimeOf(k));
                x.WriteElementString("time", ns, t.ToString("yyyy-MM-ddTHH:mm:ss.fZ", CultureInfo.InvariantCulture));
                x.WriteEndElement();
                if ((smp.Flags & 32) != 0) break; // finished
            }
            x.WriteEndElement(); x.WriteEndElement(); x.WriteEndElement();
            x.WriteEndDocument();
        }
        return sb.ToString();
    }

    sealed class StringWriterUtf8(StringBuilder sb) : StringWriter(sb, CultureInfo.InvariantCulture)
    {
        public override Encoding Encoding => new UTF8Encoding(false);
    }
}
