using CourseSim.Units;

namespace CourseSim.Wind;

/// <summary>A sail that leaves a wake: where it is, which way its apparent wind blows, and its mast height.</summary>
public readonly record struct ShadowSource(double X, double Y, double ApparentFromDeg, double MastHeightM, double WindSpeedMs);

/// <summary>
/// Wind shadows (docs/wind.md, "Wind shadow"). Each sail leaves a wake downstream along its apparent wind: a Jensen
/// (1983, Riso-M-2411) top-hat wake whose half-width grows linearly, r(x) = r0 + k x, with a deficit falling as
/// (r0/r(x))^2 and tapering to nothing at its end. The wake is 8 mast heights long in light wind (8 kn and less) and 4 in
/// strong wind (20 kn and more), linear between (common practice). Most of the loss is a header, not lower speed
/// (wind-tunnel work of the Yacht Research Unit, Auckland): the air is turned towards the source's apparent wind.
/// Nothing changes upwind of a sail. Neighbours are found through a uniform grid rebuilt by counting sort: O(N), no
/// all-pairs loop, deterministic order.
/// </summary>
public sealed class WindShadow
{
    readonly WindSettings _s;
    ShadowSource[] _src = [];
    double[] _dx = [], _dy = [], _len = [];
    int[] _cellStart = [], _items = [], _fill = [];
    int _count, _nx, _ny;
    double _x0, _y0, _cell;

    public WindShadow(WindSettings settings) => _s = settings;

    public int Count => _count;

    /// <summary>Wake length (m) for a mast height and wind speed.</summary>
    public static double WakeLength(double mastHeightM, double windMs)
    {
        double kn = Unit.MsToKnots(windMs);
        double n = 8 - 4 * Math.Clamp((kn - 8) / 12, 0, 1);
        return n * mastHeightM;
    }

    /// <summary>Rebuilds the grid for this step's sources. Allocates only when the fleet grows.</summary>
    public void Build(ReadOnlySpan<ShadowSource> sources)
    {
        _count = sources.Length;
        if (_src.Length < _count)
        {
            _src = new ShadowSource[_count]; _dx = new double[_count]; _dy = new double[_count];
            _len = new double[_count]; _items = new int[_count];
        }
        if (_count == 0) return;
        double minX = double.MaxValue, minY = double.MaxValue, maxX = double.MinValue, maxY = double.MinValue, maxLen = 1;
        for (int i = 0; i < _count; i++)
        {
            var s = sources[i];
            _src[i] = s;
            double r = Unit.DegToRad(s.ApparentFromDeg);
            _dx[i] = -Math.Sin(r); _dy[i] = -Math.Cos(r); // the direction the apparent wind blows to
            _len[i] = WakeLength(s.MastHeightM, s.WindSpeedMs);
            maxLen = Math.Max(maxLen, _len[i]);
            minX = Math.Min(minX, s.X); maxX = Math.Max(maxX, s.X); minY = Math.Min(minY, s.Y); maxY = Math.Max(maxY, s.Y);
        }
        _cell = maxLen;
        _x0 = minX - _cell; _y0 = minY - _cell;
        _nx = Math.Min(2048, (int)((maxX - _x0) / _cell) + 2);
        _ny = Math.Min(2048, (int)((maxY - _y0) / _cell) + 2);
        _cell = Math.Max(_cell, Math.Max((maxX - _x0) / (_nx - 1), (maxY - _y0) / (_ny - 1)));
        int cells = _nx * _ny;
        if (_cellStart.Length < cells + 1) _cellStart = new int[cells + 1];
        else Array.Clear(_cellStart, 0, cells + 1);
        for (int i = 0; i < _count; i++) _cellStart[CellOf(_src[i].X, _src[i].Y) + 1]++;
        for (int c = 0; c < cells; c++) _cellStart[c + 1] += _cellStart[c];
        if (_fill.Length < cells) _fill = new int[cells];
        else Array.Clear(_fill, 0, cells);
        for (int i = 0; i < _count; i++) { int c = CellOf(_src[i].X, _src[i].Y); _items[_cellStart[c] + _fill[c]++] = i; }
    }

    int CellOf(double x, double y)
    {
        int i = Math.Clamp((int)((x - _x0) / _cell), 0, _nx - 1), j = Math.Clamp((int)((y - _y0) / _cell), 0, _ny - 1);
        return j * _nx + i;
    }

    /// <summary>Applies the shadows of all sources except <paramref name="exclude"/> at (x, y) to a free-stream sample.</summary>
    public WindSample Apply(WindSample free, double x, double y, int exclude = -1)
    {
        if (_count == 0 || !_s.Shadows) return free;
        int ci = Math.Clamp((int)((x - _x0) / _cell), -1, _nx), cj = Math.Clamp((int)((y - _y0) / _cell), -1, _ny);
        double factor = 1, header = 0;
        for (int j = cj - 1; j <= cj + 1; j++)
        {
            if (j < 0 || j >= _ny) continue;
            for (int i = ci - 1; i <= ci + 1; i++)
            {
                if (i < 0 || i >= _nx) continue;
                int c = j * _nx + i;
                for (int k = _cellStart[c]; k < _cellStart[c + 1]; k++)
                {
                    int s = _items[k];
                    if (s == exclude) continue;
                    double w = Strength(s, x, y);
                    if (w <= 0) continue;
                    factor *= 1 - _s.ShadowDeficit * w;
                    // Turn the air towards the source's apparent wind direction.
                    double diff = Unit.WrapDeg180(_src[s].ApparentFromDeg - free.FromDeg);
                    header += Math.Sign(diff) * Math.Min(Math.Abs(diff), _s.ShadowHeaderDeg) * w;
                }
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
