using CourseSim.Units;

namespace CourseSim.Wind;

/// <summary>
/// A sail that leaves a wake: where it is, which way its apparent wind comes from, its mast height and the wind speed.
/// <see cref="DownX"/>, <see cref="DownY"/> may give the unit vector the apparent wind blows to (the race step has it
/// already); left NaN, it is computed from <see cref="ApparentFromDeg"/>.
/// </summary>
public readonly record struct ShadowSource(double X, double Y, double ApparentFromDeg, double MastHeightM, double WindSpeedMs,
    double DownX = double.NaN, double DownY = double.NaN);

/// <summary>
/// Wind shadows (docs/wind.md, "Wind shadow"). Each sail leaves a wake downstream along its apparent wind: a Jensen
/// (1983, Riso-M-2411) top-hat wake whose half-width grows linearly, r(x) = r0 + k x, with a deficit falling as
/// (r0/r(x))^2 and tapering to nothing at its end. The wake is 8 mast heights long in light wind (8 kn and less) and 4 in
/// strong wind (20 kn and more), linear between (common practice). Most of the loss is a header, not lower speed
/// (wind-tunnel work of the Yacht Research Unit, Auckland): the air is turned towards the source's apparent wind.
/// Nothing changes upwind of a sail. Neighbours are found through a spatial hash of wake-length cells rebuilt by
/// counting sort: O(N) however the fleet spreads, no all-pairs loop, deterministic order.
/// </summary>
public sealed class WindShadow
{
    readonly WindSettings _s;
    ShadowSource[] _src = [];
    double[] _dx = [], _dy = [], _len = [];
    // Spatial hash: square cells one wake length across, hashed into a table of about twice as many buckets as sources,
    // so building costs O(N) however far the fleet spreads (a dense grid over the fleet's box would grow with its area).
    int[] _bucketStart = [], _fill = [];
    // The sources in bucket order, packed so a look-up walks contiguous memory; each keeps its cell to reject hash collisions.
    struct Packed { public double X, Y, Dx, Dy, Len, InvLen, FromDeg; public int Index, Ci, Cj; }
    Packed[] _packed = [];
    int _count, _mask;
    double _cell, _invCell;
    readonly double _deficit, _headerMax, _r0, _spread;

    public WindShadow(WindSettings settings)
    {
        _s = settings;
        _deficit = settings.ShadowDeficit; _headerMax = settings.ShadowHeaderDeg;
        _r0 = settings.ShadowHalfWidthM; _spread = settings.ShadowSpread;
    }

    public int Count => _count;

    /// <summary>Wake length (m) for a mast height and wind speed.</summary>
    public static double WakeLength(double mastHeightM, double windMs)
    {
        double kn = Unit.MsToKnots(windMs);
        double n = 8 - 4 * Math.Clamp((kn - 8) / 12, 0, 1);
        return n * mastHeightM;
    }

    /// <summary>Sizes the hash for this many sources now (a race does so when it is made), so no step allocates.</summary>
    public void Reserve(int count)
    {
        if (_src.Length < count)
        {
            _src = new ShadowSource[count]; _dx = new double[count]; _dy = new double[count];
            _len = new double[count]; _packed = new Packed[count];
        }
        int buckets = CellBuckets.CountFor(count);
        if (_bucketStart.Length < buckets + 1) { _bucketStart = new int[buckets + 1]; _fill = new int[buckets]; }
    }

    /// <summary>Rebuilds the hash for this step's sources. Allocates only when the fleet grows past what was reserved.</summary>
    public void Build(ReadOnlySpan<ShadowSource> sources)
    {
        _count = sources.Length;
        if (_count == 0) return;
        int buckets = CellBuckets.CountFor(_count);
        Reserve(_count);
        _mask = buckets - 1;
        Array.Clear(_bucketStart, 0, buckets + 1); Array.Clear(_fill, 0, buckets);
        double maxLen = 1;
        for (int i = 0; i < _count; i++)
        {
            var s = sources[i];
            _src[i] = s;
            if (double.IsNaN(s.DownX) || double.IsNaN(s.DownY))
            {
                var (sn, cs) = Math.SinCos(Unit.DegToRad(s.ApparentFromDeg));
                _dx[i] = -sn; _dy[i] = -cs; // the direction the apparent wind blows to
            }
            else { _dx[i] = s.DownX; _dy[i] = s.DownY; }
            _len[i] = WakeLength(s.MastHeightM, s.WindSpeedMs);
            maxLen = Math.Max(maxLen, _len[i]);
        }
        _cell = maxLen;
        _invCell = 1 / maxLen;
        for (int i = 0; i < _count; i++) _bucketStart[CellBuckets.Hash(CellIndex(_src[i].X), CellIndex(_src[i].Y), _mask) + 1]++;
        for (int b = 0; b < buckets; b++) _bucketStart[b + 1] += _bucketStart[b];
        for (int i = 0; i < _count; i++)
        {
            int ci = CellIndex(_src[i].X), cj = CellIndex(_src[i].Y);
            int b = CellBuckets.Hash(ci, cj, _mask);
            _packed[_bucketStart[b] + _fill[b]++] = new Packed
            {
                X = _src[i].X, Y = _src[i].Y, Dx = _dx[i], Dy = _dy[i], Len = _len[i], InvLen = 1 / _len[i], FromDeg = _src[i].ApparentFromDeg, Index = i, Ci = ci, Cj = cj,
            };
        }
    }

    int CellIndex(double v) => (int)Math.Floor(Math.Clamp(v * _invCell, -1e9, 1e9));

    /// <summary>Applies the shadows of all sources except <paramref name="exclude"/> at (x, y) to a free-stream sample.</summary>
    public WindSample Apply(WindSample free, double x, double y, int exclude = -1)
    {
        if (_count == 0 || !_s.Shadows) return free;
        int ci = CellIndex(x), cj = CellIndex(y);
        double factor = 1, header = 0;
        for (int j = cj - 1; j <= cj + 1; j++)
            for (int i = ci - 1; i <= ci + 1; i++)
            {
                int b = CellBuckets.Hash(i, j, _mask);
                for (int k = _bucketStart[b], end = _bucketStart[b + 1]; k < end; k++)
                {
                    ref readonly var p = ref _packed[k];
                    if (p.Ci != i || p.Cj != j) continue; // another cell sharing the bucket
                    // Same arithmetic as Strength, on the packed copy.
                    double px = x - p.X, py = y - p.Y;
                    double along = px * p.Dx + py * p.Dy;
                    if (along <= 0 || along >= p.Len || p.Index == exclude) continue;
                    double lateral = Math.Abs(-px * p.Dy + py * p.Dx);
                    double r = _r0 + _spread * along;
                    if (lateral > r) continue;
                    double q = _r0 / r;
                    double w = q * q * (1 - along * p.InvLen);
                    if (w <= 0) continue;
                    factor *= 1 - _deficit * w;
                    // Turn the air towards the source's apparent wind direction.
                    double diff = Unit.WrapDeg180(p.FromDeg - free.FromDeg);
                    header += FastMath.Sign(diff) * Math.Min(Math.Abs(diff), _headerMax) * w;
                }
            }
        if (factor == 1 && header == 0) return free;
        return new WindSample(free.SpeedMs * factor, Unit.WrapDeg360(free.FromDeg + header));
    }

    /// <summary>Wake strength 0..1 of source s at (x, y): (r0/r)^2 inside the wake, tapering to 0 at its end; 0 upwind.</summary>
    public double Strength(int s, double x, double y)
    {
        double px = x - _src[s].X, py = y - _src[s].Y;
        double along = px * _dx[s] + py * _dy[s];
        if (along <= 0 || along >= _len[s]) return 0;
        double lateral = Math.Abs(-px * _dy[s] + py * _dx[s]);
        double r0 = _s.ShadowHalfWidthM, r = r0 + _s.ShadowSpread * along;
        if (lateral > r) return 0;
        double q = r0 / r;
        return q * q * (1 - along / _len[s]);
    }
}
