using CourseSim.Replay;
using CourseSim.Units;

namespace CourseSim.RigFit;

/// <summary>A smoothed track point: time (s from the first point of all tracks), speed (m/s) and course over ground (deg).</summary>
public readonly record struct GroundPoint(double T, double X, double Y, double SpeedMs, double CourseDeg, int Segment);

/// <summary>A steady stretch: a rider holding course and speed for <see cref="DurationS"/> seconds.</summary>
public sealed record Stretch(double T, double DurationS, double SpeedMs, double CourseDeg, int Segment, int Run);

/// <summary>
/// From GPS tracks to steady stretches (docs/rig-fit.md). Positions are projected to metres about the first point
/// (local equirectangular, as Gpx.ToGeo); velocity is the slope of a least-squares line through the positions within
/// +-<see cref="HalfWindowS"/> s (a first-order Savitzky-Golay smoother, Savitzky and Golay 1964, Anal. Chem. 36: it
/// takes irregular times and averages independent position noise of sigma over n points down to about
/// sigma sqrt(12/n)/window in speed). Points are steady where, over +-<see cref="SteadyHalfS"/> s, the course stays
/// within <see cref="CourseTolDeg"/> of its mean and the speed within <see cref="SpeedTolShare"/> of its mean, at more
/// than <see cref="MinSpeedMs"/>; runs of steady points lose <see cref="TrimS"/> s at each end (the way out of a
/// manoeuvre) and are cut into stretches of <see cref="StretchS"/> s.
/// </summary>
public static class TrackAnalysis
{
    public const double HalfWindowS = 4, SteadyHalfS = 8, CourseTolDeg = 12, SpeedTolShare = 0.2, MinSpeedMs = 2.5, TrimS = 5, StretchS = 20;

    public static (List<GroundPoint> Points, int Untimed, DateTimeOffset Start) Smooth(IReadOnlyList<GpxSegment> segs)
    {
        var timed = segs.SelectMany(s => s.Points).Where(p => p.Time is not null).ToList();
        int untimed = segs.Sum(s => s.Points.Count) - timed.Count;
        if (timed.Count == 0) return ([], untimed, default);
        var t0 = timed.Min(p => p.Time!.Value);
        double lat0 = timed[0].Lat, lon0 = timed[0].Lon, k = Math.Cos(Unit.DegToRad(lat0));
        var pts = new List<GroundPoint>();
        for (int si = 0; si < segs.Count; si++)
        {
            var raw = segs[si].Points.Where(p => p.Time is not null).OrderBy(p => p.Time).ToList();
            int n = raw.Count;
            var t = raw.Select(p => (p.Time!.Value - t0).TotalSeconds).ToArray();
            var x = raw.Select(p => Unit.DegToRad(p.Lon - lon0) * k * Gpx.EarthRadiusM).ToArray();
            var y = raw.Select(p => Unit.DegToRad(p.Lat - lat0) * Gpx.EarthRadiusM).ToArray();
            int lo = 0, hi = 0;
            for (int i = 0; i < n; i++)
            {
                while (t[lo] < t[i] - HalfWindowS) lo++;
                while (hi + 1 < n && t[hi + 1] <= t[i] + HalfWindowS) hi++;
                if (hi - lo < 3) continue;
                double mt = 0, mx = 0, my = 0; int m = hi - lo + 1;
                for (int j = lo; j <= hi; j++) { mt += t[j]; mx += x[j]; my += y[j]; }
                mt /= m; mx /= m; my /= m;
                double stt = 0, stx = 0, sty = 0;
                for (int j = lo; j <= hi; j++) { double dt = t[j] - mt; stt += dt * dt; stx += dt * (x[j] - mx); sty += dt * (y[j] - my); }
                if (stt <= 0) continue;
                double vx = stx / stt, vy = sty / stt;
                pts.Add(new GroundPoint(t[i], x[i], y[i], Math.Sqrt(vx * vx + vy * vy), Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(vx, vy))), si));
            }
        }
        return (pts, untimed, t0);
    }

    public static List<Stretch> Steady(IReadOnlyList<GroundPoint> pts)
    {
        var steady = new bool[pts.Count];
        for (int i = 0; i < pts.Count; i++)
        {
            var p = pts[i];
            if (p.SpeedMs < MinSpeedMs) continue;
            double sx = 0, sy = 0, ss = 0; int n = 0, a = i, b = i;
            while (a > 0 && pts[a - 1].Segment == p.Segment && pts[a - 1].T >= p.T - SteadyHalfS) a--;
            while (b + 1 < pts.Count && pts[b + 1].Segment == p.Segment && pts[b + 1].T <= p.T + SteadyHalfS) b++;
            if (pts[b].T - pts[a].T < 1.5 * SteadyHalfS) continue;
            for (int j = a; j <= b; j++) { sx += Math.Sin(Unit.DegToRad(pts[j].CourseDeg)); sy += Math.Cos(Unit.DegToRad(pts[j].CourseDeg)); ss += pts[j].SpeedMs; n++; }
            double mc = Unit.RadToDeg(Math.Atan2(sx, sy)), ms = ss / n;
            bool ok = true;
            for (int j = a; j <= b && ok; j++)
                ok = Math.Abs(Unit.WrapDeg180(pts[j].CourseDeg - mc)) <= CourseTolDeg && Math.Abs(pts[j].SpeedMs - ms) <= SpeedTolShare * ms && pts[j].SpeedMs >= MinSpeedMs;
            steady[i] = ok;
        }
        var list = new List<Stretch>();
        int run = 0;
        for (int i = 0; i < pts.Count;)
        {
            if (!steady[i]) { i++; continue; }
            int j = i;
            while (j + 1 < pts.Count && steady[j + 1] && pts[j + 1].Segment == pts[i].Segment && pts[j + 1].T - pts[j].T < 5) j++;
            double from = pts[i].T + TrimS, to = pts[j].T - TrimS;
            for (double s = from; s + StretchS <= to; s += StretchS)
            {
                var sel = pts.Skip(i).Take(j - i + 1).Where(p => p.T >= s && p.T < s + StretchS).ToList();
                if (sel.Count < 5) continue;
                double sx = sel.Sum(p => Math.Sin(Unit.DegToRad(p.CourseDeg))), sy = sel.Sum(p => Math.Cos(Unit.DegToRad(p.CourseDeg)));
                // Speed made good over the stretch (distance between the smoothed ends / time) would be biased low by any
                // wiggle; the mean of the smoothed speeds is used.
                list.Add(new Stretch(s + StretchS / 2, StretchS, sel.Average(p => p.SpeedMs), Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(sx, sy))), pts[i].Segment, run));
            }
            run++;
            i = j + 1;
        }
        return list;
    }

    /// <summary>
    /// The wind direction from tacking angles (docs/rig-fit.md): a 5-deg histogram of the stretches' courses, weighted by
    /// time and smoothed over 15 deg; of the pairs of peaks 60 to 130 deg apart, the beat is the pair sailed slowest, and
    /// the wind comes from its bisector (the side the boards were heading: they beat towards the wind). Null when no
    /// such pair exists (one tack only, or no beat).
    /// </summary>
    public static (double FromDeg, double TackAngleDeg)? WindFromTacks(IReadOnlyList<Stretch> st)
    {
        if (st.Count < 4) return null;
        var h = new double[72]; var v = new double[72];
        foreach (var s in st) { int b = (int)(Unit.WrapDeg360(s.CourseDeg) / 5) % 72; h[b] += s.DurationS; v[b] += s.DurationS * s.SpeedMs; }
        var hs = new double[72];
        for (int b = 0; b < 72; b++) for (int q = -1; q <= 1; q++) hs[b] += h[(b + q + 72) % 72];
        var peaks = Enumerable.Range(0, 72).Where(b => hs[b] > 0 && hs[b] >= hs[(b + 71) % 72] && hs[b] > hs[(b + 1) % 72] && hs[b] >= 0.05 * hs.Sum()).ToList();
        double Speed(int b) { double w = 0, s = 0; for (int q = -1; q <= 1; q++) { w += h[(b + q + 72) % 72]; s += v[(b + q + 72) % 72]; } return w > 0 ? s / w : 0; }
        (double, double)? best = null; double bestSpeed = double.MaxValue;
        for (int i = 0; i < peaks.Count; i++)
            for (int j = i + 1; j < peaks.Count; j++)
            {
                double a = peaks[i] * 5 + 2.5, b = peaks[j] * 5 + 2.5, sep = Math.Abs(Unit.WrapDeg180(a - b));
                if (sep is < 60 or > 130) continue;
                double sp = 0.5 * (Speed(peaks[i]) + Speed(peaks[j]));
                if (sp >= bestSpeed) continue;
                bestSpeed = sp;
                best = (Unit.WrapDeg360(a + Unit.WrapDeg180(b - a) / 2), sep);
            }
        return best;
    }
}
