using System.Globalization;
using System.Text;
using CourseSim.Engine;
using CourseSim.Random;
using CourseSim.Replay;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.RigFit;

/// <summary>
/// Tracks of a rider sailed by the race engine at held true wind angles, with GPS noise, written as GPX 1.1 (issue 15's
/// round trip and the demo tracks). Noise model, per axis and independent: white Gaussian of 1.5 m plus a first-order
/// Gauss-Markov error of 2 m and 60 s correlation time, sampled at 1 Hz; the order of a consumer GNSS receiver's
/// horizontal error in open sky (a few metres; common practice, from memory).
/// </summary>
public static class RigTracks
{
    public const double Lat0 = 47.25, Lon0 = -3.5, WhiteM = 1.5, WanderM = 2.0, WanderTauS = 60;

    /// <summary>One leg: the board held at <paramref name="twaDeg"/> (signed: positive starboard) for <paramref name="seconds"/>
    /// after 60 s to get going; positions at 1 Hz in metres, noise added.</summary>
    public static List<(double X, double Y)> Leg(string equipment, double kn, double fromDeg, double twaDeg, int seconds, CounterRng noise, string sets = "",
        string? windToml = null)
    {
        var setup = EngineTestKit.Parse((windToml ?? EngineTestKit.SteadyWind(kn, fromDeg)) + "[race]\nfalls = false\ncountdown_s = 20\ntime_limit_s = 900\n" +
            "[course]\nkind = \"waypoints\"\norder = \"far\"\n[course.marks.far]\nx_m = 0\ny_m = 40000\n" +
            $"[boards.a]\nequipment = \"{EngineTestKit.Equip(equipment)}\"\n" + (sets.Length > 0 ? $"set = \"{sets}\"\n" : ""), 5);
        var race = new Race(setup);
        race.HoldTrueWindAngle(0, twaDeg);
        var e = race.EntityOf(0);
        var pts = new List<(double, double)>();
        double next = 60;
        double gx = WanderM * noise.Normal(0), gy = WanderM * noise.Normal(1), a = Math.Exp(-1 / WanderTauS);
        ulong c = 2;
        while (race.Time < 60 + seconds)
        {
            race.Step();
            if (race.Time + 1e-9 < next) continue;
            next += 1;
            gx = a * gx + WanderM * Math.Sqrt(1 - a * a) * noise.Normal(c++); gy = a * gy + WanderM * Math.Sqrt(1 - a * a) * noise.Normal(c++);
            var p = race.World.Get<Pose>(e);
            pts.Add((p.X + gx + WhiteM * noise.Normal(c++), p.Y + gy + WhiteM * noise.Normal(c++)));
        }
        return pts;
    }

    /// <summary>A GPX 1.1 file with one segment per leg, legs 30 s apart in time, placed at the demo venue.</summary>
    public static string Gpx(IReadOnlyList<List<(double X, double Y)>> legs, DateTime start, string name)
        => Gpx(legs.Select((l, i) => (start.AddSeconds(legs.Take(i).Sum(p => p.Count + 30)), l)).ToList(), name);

    /// <summary>A GPX 1.1 file with one segment per leg, each starting at its own time.</summary>
    public static string Gpx(IReadOnlyList<(DateTime Start, List<(double X, double Y)> Points)> legs, string name)
    {
        var sb = new StringBuilder();
        sb.Append("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<gpx version=\"1.1\" creator=\"CourseSim test data (simulated, not a real track)\" xmlns=\"http://www.topografix.com/GPX/1/1\">\n");
        sb.Append($"  <trk>\n    <name>{name}</name>\n");
        foreach (var (start, leg) in legs)
        {
            var t = start;
            sb.Append("    <trkseg>\n");
            foreach (var (x, y) in leg)
            {
                var (lat, lon) = CourseSim.Replay.Gpx.ToGeo(x, y, Lat0, Lon0);
                sb.Append(string.Create(CultureInfo.InvariantCulture, $"      <trkpt lat=\"{lat:F7}\" lon=\"{lon:F7}\"><time>{t:yyyy-MM-ddTHH:mm:ssZ}</time></trkpt>\n"));
                t = t.AddSeconds(1);
            }
            sb.Append("    </trkseg>\n");
        }
        sb.Append("  </trk>\n</gpx>\n");
        return sb.ToString();
    }
}
