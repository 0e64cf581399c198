using CourseSim.Random;
using CourseSim.Units;

namespace CourseSim.Wind;

/// <summary>Wind at one place and time, 10 m height: speed (m/s) and the direction it comes from (deg true).</summary>
public readonly record struct WindSample(double SpeedMs, double FromDeg)
{
    public double SpeedKn => Unit.MsToKnots(SpeedMs);
}

/// <summary>
/// The reproducible wind field W(x, y, t) over the course (docs/wind.md). x east, y north, metres from the course origin;
/// t seconds from the start. Mean speed with an optional ramp; oscillating shifts (random-phase components around the
/// period) and a persistent trend; a geographic bend and pressure differences across the course; pressure bands, gusts
/// and shifts frozen and carried downwind with the mean wind (Taylor's hypothesis), so upwind boards see them first.
/// Every value is a pure function of (settings, seed, x, y, t): thread count and query order cannot change it.
/// </summary>
public sealed class WindField
{
    /// <summary>Rotation of the gust tile against the wind axis, so a point's path through the periodic tile does not repeat
    /// after one tile length (an irrational slope; 23.7 deg).</summary>
    const double TileRotation = 0.41364;
    /// <summary>Width over which the geographic bend applies its full difference, m.</summary>
    public const double BendWidthM = 1000;

    public WindSettings Settings { get; }
    public ulong Seed { get; }
    readonly double _u0, _ramp, _dirRad, _ex, _ey, _nx, _ny, _ca, _sa;
    readonly double[] _shiftFreq, _shiftAmp, _shiftPhase;
    // Gust tiles: the coarse band (large scales) and the fine band above it, each longitudinal (u) and lateral (v).
    readonly GustTile? _gu, _gv, _fu, _fv;
    /// <summary>Coarse tile: 512 x 512 points, 8 per l (a 12.8 km period at the default 150 m), modes up to half its
    /// Nyquist index; fine tile: 512 x 512 points, 64 per l (1.6 km), the modes from there to half its own Nyquist index,
    /// 8 times higher. Together they hold the von Karman spectrum up to k l = 100 (about 12 m at the default length).</summary>
    const int TileSize = 512, CoarsePoints = 8, FinePoints = 64, BandTop = TileSize / 4, FineFloor = BandTop * CoarsePoints / FinePoints;
    readonly double _sigmaU, _invU0;
    // The oscillating shift tabulated every 0.5 s over advected times -2 h .. +6 h (the sum of sines dominates a sample's
    // cost); outside the table it is computed directly. Linear interpolation error is below 0.01 deg for periods over 60 s.
    const double ShiftTableStep = 0.5, ShiftTableStart = -7200, ShiftTableEnd = 21600;
    readonly float[] _shiftTable;

    public WindField(WindSettings s, ulong seed)
    {
        Settings = s; Seed = seed;
        _u0 = Unit.KnotsToMs(s.SpeedKn);
        _ramp = Unit.KnotsToMs(s.RampKnPerHour) / 3600.0;
        _dirRad = Unit.DegToRad(s.DirectionDeg);
        // Downwind unit vector (where the wind blows to) and the unit vector to the right of the course looking upwind
        // (to the left looking downwind): wind from 0 (north) gives n = east.
        _ex = -Math.Sin(_dirRad); _ey = -Math.Cos(_dirRad);
        _nx = -_ey; _ny = _ex;
        _ca = Math.Cos(TileRotation); _sa = Math.Sin(TileRotation);
        var rng = new CounterRng(seed, CounterRng.Streams.WindShifts);
        int k = s.ShiftIrregularity <= 0 ? 1 : 6;
        _shiftFreq = new double[k]; _shiftAmp = new double[k]; _shiftPhase = new double[k];
        for (int i = 0; i < k; i++)
        {
            double z = k == 1 ? 0 : 2 * rng.Uniform((ulong)(3 * i)) - 1;
            _shiftFreq[i] = 2 * Math.PI / s.ShiftPeriodS * Math.Pow(2, s.ShiftIrregularity * z);
            _shiftAmp[i] = s.ShiftAmplitudeDeg / Math.Sqrt(k);
            _shiftPhase[i] = 2 * Math.PI * rng.Uniform((ulong)(3 * i + 1));
        }
        _sigmaU = s.GustIntensity * _u0;
        _invU0 = _u0 > 0 ? 1 / _u0 : 0;
        _shiftTable = new float[(int)((ShiftTableEnd - ShiftTableStart) / ShiftTableStep) + 2];
        FillShiftTable();
        if (s.GustIntensity > 0)
        {
            // IEC 61400-1: lateral sigma 0.8 sigma_u, lateral length scale about a third of the longitudinal one. One inverse
            // FFT per band gives both components (GustTile.Band).
            var scratch = new GustTile.Scratch(TileSize);
            (_gu, _gv) = GustTile.Band(s.GustLengthM, s.GustLengthM / 3.0, new CounterRng(seed, CounterRng.Streams.WindGustU),
                TileSize, CoarsePoints, 0, BandTop, scratch);
            (_fu, _fv) = GustTile.Band(s.GustLengthM, s.GustLengthM / 3.0, new CounterRng(seed, CounterRng.Streams.WindGustV),
                TileSize, FinePoints, FineFloor, BandTop, scratch);
        }
    }

    /// <summary>
    /// The oscillating shift tabulated every <see cref="ShiftTableStep"/> s. Each component's phasor is rotated from one
    /// entry to the next (one complex multiplication instead of a sine per component per entry) and set exactly again
    /// every 256 entries, so rounding cannot build up (it stays near 1e-13 deg, far below the table's single precision):
    /// building the table was a quarter of a wind field's set-up, paid again by every race of a batch.
    /// </summary>
    void FillShiftTable()
    {
        const int Anchor = 256;
        int nk = _shiftFreq.Length;
        // Each component's phasor and step rotation; the entries are walked once with the components inside, so the
        // components' recurrences run side by side instead of one long chain each (the same operations in the same order
        // per component, and each entry summed over the components in the same order: the same bits).
        Span<double> sn = stackalloc double[nk], cs = stackalloc double[nk], sr = stackalloc double[nk], cr = stackalloc double[nk];
        for (int k = 0; k < nk; k++) (sr[k], cr[k]) = Math.SinCos(_shiftFreq[k] * ShiftTableStep);
        for (int i = 0; i < _shiftTable.Length; i++)
        {
            double acc = 0;
            for (int k = 0; k < nk; k++)
            {
                if (i % Anchor == 0) (sn[k], cs[k]) = Math.SinCos(_shiftFreq[k] * (ShiftTableStart + i * ShiftTableStep) + _shiftPhase[k]);
                acc += _shiftAmp[k] * sn[k];
                (sn[k], cs[k]) = (sn[k] * cr[k] + cs[k] * sr[k], cs[k] * cr[k] - sn[k] * sr[k]);
            }
            _shiftTable[i] = (float)acc;
        }
    }

    /// <summary>Mean speed (m/s) at time t: start speed plus ramp.</summary>
    public double MeanSpeed(double t) => Settings.Log is { } log ? log.SpeedAt(t) : Math.Max(0, _u0 + _ramp * t);

    /// <summary>Oscillating shift (deg) at "advected time" tau.</summary>
    public double OscillatingShift(double tau)
    {
        double d = 0;
        for (int i = 0; i < _shiftFreq.Length; i++) d += _shiftAmp[i] * Math.Sin(_shiftFreq[i] * tau + _shiftPhase[i]);
        return d;
    }

    internal double TabulatedShift(double tau)
    {
        double x = (tau - ShiftTableStart) * (1 / ShiftTableStep);
        if (x < 0 || x >= _shiftTable.Length - 1) return OscillatingShift(tau);
        int i = (int)x; double f = x - i;
        return _shiftTable[i] + f * (_shiftTable[i + 1] - _shiftTable[i]);
    }

    /// <summary>Gust tile memory, bytes (both bands, both components).</summary>
    public long MemoryBytes => (_gu?.MemoryBytes ?? 0) + (_gv?.MemoryBytes ?? 0) + (_fu?.MemoryBytes ?? 0) + (_fv?.MemoryBytes ?? 0)
                               + _shiftTable.Length * sizeof(float);

    /// <summary>
    /// Starts loading the gust tiles' cells a <see cref="Sample"/> at (x, y, t) will read (the same tile coordinates): a
    /// hint that changes no value, so a caller about to sample several places can overlap their cache misses.
    /// </summary>
    public void Prefetch(double x, double y, double t)
    {
        if (_gu is null) return;
        var (a, b) = TileAt(x * _ex + y * _ey, x * _nx + y * _ny, _u0 > 0.1 ? _u0 : 0.1, t);
        _gu.Prefetch(a, b); _gv!.Prefetch(a, b); _fu!.Prefetch(a, b); _fv!.Prefetch(a, b);
    }

    /// <summary>The gust tiles' coordinates of a point (along, cross: m downwind and across) at t, the pattern carried
    /// downwind at adv m/s and turned by the tiles' angle; <see cref="Sample"/> and <see cref="Prefetch"/> read the same cells.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    (double A, double B) TileAt(double along, double cross, double adv, double t)
    {
        double xi = along - adv * t;
        return (xi * _ca - cross * _sa, xi * _sa + cross * _ca);
    }

    public WindSample Sample(double x, double y, double t)
    {
        var s = Settings;
        double along = x * _ex + y * _ey;      // downwind distance
        double cross = x * _nx + y * _ny;      // to the right looking upwind (docs/scenario.md: bend and pressure)
        // Patterns travel downwind at the starting mean speed: a point 'along' metres downwind sees at t what the origin saw at t - along/U.
        double adv = _u0 > 0.1 ? _u0 : 0.1;
        double tau = t - along * (adv == _u0 ? _invU0 : 1 / adv);
        double dir, u;
        if (s.Log is null)
        {
            dir = s.DirectionDeg + TabulatedShift(tau) + s.PersistentDegPerMin * tau * (1 / 60.0)
                  + s.BendDeg * Math.Clamp(cross * (1 / BendWidthM), -0.5, 0.5);
            u = MeanSpeed(t) + Unit.KnotsToMs(s.PressureKnPerKm) * (cross * 0.001);
        }
        else
        {
            // Driven by a log: speed and direction at the origin as logged, carried downwind (Taylor) like the shifts.
            dir = s.Log.DirectionAt(tau) + s.BendDeg * Math.Clamp(cross * (1 / BendWidthM), -0.5, 0.5);
            u = s.Log.SpeedAt(tau) + Unit.KnotsToMs(s.PressureKnPerKm) * (cross * 0.001);
        }
        if (s.BandAmplitudeKn != 0) u += Unit.KnotsToMs(s.BandAmplitudeKn) * Math.Sin(2 * Math.PI * (along - adv * t) / s.BandSpacingM);
        u = Math.Max(u, 0);
        if (_gu is not null)
        {
            var (a, b) = TileAt(along, cross, adv, t);
            double du = _sigmaU * (_gu.At(a, b) + _fu!.At(a, b));
            double dv = 0.8 * _sigmaU * (_gv!.At(a, b) + _fv!.At(a, b));
            double uu = Math.Max(u + du, 0);
            dir += Unit.RadToDeg(FastMath.Atan2(dv, Math.Max(uu, 0.1))); // to 1e-5 rad (6e-4 deg)
            u = Math.Sqrt(uu * uu + dv * dv);
        }
        return new WindSample(u, Unit.WrapDeg360(dir));
    }
}
