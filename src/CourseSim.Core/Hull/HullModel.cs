namespace CourseSim.Hull;

/// <summary>Board hull geometry. Defaults: a 2.40 m by 75 cm, 120 l freeride/slalom board.</summary>
public sealed record BoardSpec
{
    public double LengthM { get; init; } = 2.40;
    public double WidthCm { get; init; } = 75;
    public double VolumeL { get; init; } = 120;
    public double MassKg { get; init; } = 8.0;
    /// <summary>Bottom vee (deadrise) at the planing area, deg; boards are nearly flat.</summary>
    public double DeadriseDeg { get; init; } = 2.0;
}

/// <summary>Hull resistance at one speed and whether the board is planing.</summary>
public readonly record struct HullState(double Resistance, double LiftFraction, double TrimDeg, double WettedLengthM);

/// <summary>
/// Hull resistance across the displacement, transition and planing regimes (docs/physics.md, "Hull"). The share of weight
/// carried by dynamic lift rises with the volume Froude number FnV = V / sqrt(g vol^(1/3)) from 1 to 3.5 along a
/// smootherstep (zero slope and curvature at both ends, so the blend adds no kinks that make spurious equilibria):
/// planing hulls beat displacement forms above FnV 1 and are fully planing near FnV 3 to 3.5 (Radojcic et al. 2014,
/// Polish Maritime Research 21(2)). The planing state has hysteresis: a board gets planing at FnV
/// <see cref="PlaningFroude"/> and stays planing down to <see cref="DropOffFroude"/>. The displaced part pays skin friction on the resting wetted area (ITTC 1957 line) plus wave-making that
/// rises as FnV^4 (a model term sized so the hump drag is about an eighth of the weight, from memory for planing boards);
/// the lifted part pays Savitsky's planing drag at the trim that minimises it (the rider moves to trim the board), on a
/// planing beam of 0.6 of the board's width (the narrower tail carries the board when planing; from memory).
/// Results are tabulated once per board and interpolated.
/// </summary>
public sealed class HullModel
{
    public const double PlaningBeamFraction = 0.6;
    /// <summary>Lift starts at this volume Froude number and carries the whole weight at <see cref="FullLiftFroude"/>.</summary>
    public const double LiftStartFroude = 1.0, FullLiftFroude = 3.5;
    /// <summary>Volume Froude number from which a board is planing when getting going (Radojcic et al. 2014: full planing near 3).</summary>
    public const double PlaningFroude = 3.0;
    /// <summary>Volume Froude number below which a planing board drops off the plane (model value: the far side of the
    /// resistance hump, where the lift still carries about two thirds of the weight).</summary>
    public const double DropOffFroude = 2.4;
    public const double WaveCoefficient = 0.005;
    public const double FormFactor = 1.1;
    const double TableStep = 0.05;
    const double TableMax = 40.0;

    public BoardSpec Spec { get; }
    public double WeightN { get; }
    public double DisplacementM3 { get; }
    public double PlaningBeamM { get; }
    public double RestingWettedAreaM2 { get; }
    readonly double _rho, _nu, _g;
    // sqrt(g cbrt(displacement)): the speed of volume Froude number 1, m/s (fixed by the set-up; worked out once, not per call).
    readonly double _froudeSpeed;
    readonly HullState[] _table;
    // Resistance and lift fraction only, in single precision: the race step's compact copy (stays in cache).
    readonly float[] _fast;

    /// <summary>Drag area (m2, on the water's dynamic pressure) of spray and chop added to the planing hull's flat-water drag.</summary>
    public double ChopDragAreaM2 { get; }

    public HullModel(BoardSpec spec, double totalMassKg, double density, double kinematicViscosity, double gravity = 9.80665, double chopDragAreaM2 = 0)
        : this(spec, totalMassKg, density, kinematicViscosity, gravity, chopDragAreaM2, null) { }

    /// <summary>Length of the resistance table (the disk cache checks a table read back against it).</summary>
    internal const int TableLength = (int)(TableMax / TableStep) + 1;

    /// <summary>The resistance table, read-only (for the rig tables kept on disk between runs).</summary>
    internal IReadOnlyList<HullState> Table => _table;

    /// <summary>The hull with its resistance table given (as built before for this very hull, read back from the disk
    /// cache; the hull keeps the array, which the caller made for it), or built when <paramref name="table"/> is null.</summary>
    internal HullModel(BoardSpec spec, double totalMassKg, double density, double kinematicViscosity, double gravity, double chopDragAreaM2, HullState[]? table)
    {
        Spec = spec;
        ChopDragAreaM2 = chopDragAreaM2;
        _rho = density; _nu = kinematicViscosity; _g = gravity;
        WeightN = totalMassKg * gravity;
        DisplacementM3 = totalMassKg / density;
        _froudeSpeed = Math.Sqrt(_g * Math.Cbrt(DisplacementM3));
        PlaningBeamM = PlaningBeamFraction * spec.WidthCm / 100.0;
        // Resting wetted area: bottom planform about 0.7 of length x width, plus the rails.
        RestingWettedAreaM2 = 0.7 * spec.LengthM * spec.WidthCm / 100.0 * 1.1;
        int n = TableLength;
        if (table is not null) _table = table;
        else
        {
            _table = new HullState[n];
            for (int i = 0; i < n; i++) _table[i] = Compute(i * TableStep);
        }
        _fast = new float[2 * n];
        for (int i = 0; i < n; i++) { _fast[2 * i] = (float)_table[i].Resistance; _fast[2 * i + 1] = (float)_table[i].LiftFraction; }
    }

    /// <summary>Volume Froude number at speed V (m/s).</summary>
    public double VolumeFroude(double speed) => speed / _froudeSpeed;

    static double SmootherStep(double x)
    {
        x = Math.Clamp(x, 0, 1);
        return x * x * x * (x * (6 * x - 15) + 10);
    }

    /// <summary>Share of the weight carried by dynamic lift at speed V.</summary>
    public double LiftFraction(double speed) => SmootherStep((VolumeFroude(speed) - LiftStartFroude) / (FullLiftFroude - LiftStartFroude));

    /// <summary>Planing state with hysteresis: getting going, planing from <see cref="PlaningFroude"/>; once planing,
    /// still planing down to <see cref="DropOffFroude"/>.</summary>
    public bool IsPlaning(double speed, bool wasPlaning) => VolumeFroude(speed) >= (wasPlaning ? DropOffFroude : PlaningFroude);

    /// <summary>Speed (m/s) at volume Froude number <paramref name="fnv"/>.</summary>
    public double SpeedAtFroude(double fnv) => fnv * _froudeSpeed;

    /// <summary>Savitsky's planing drag at the best trim (2..10 deg) for the full weight, and that trim.</summary>
    public PlaningState BestPlaning(double speed)
    {
        var best = Savitsky.At(WeightN, speed, PlaningBeamM, Spec.DeadriseDeg, 2.0, _rho, _nu, _g);
        for (double t = 2.25; t <= 10.0; t += 0.25)
        {
            var s = Savitsky.At(WeightN, speed, PlaningBeamM, Spec.DeadriseDeg, t, _rho, _nu, _g);
            if (s.Drag < best.Drag) best = s;
        }
        return best;
    }

    HullState Compute(double v)
    {
        double phi = LiftFraction(v);
        double re = Math.Max(v, 1e-3) * Spec.LengthM / _nu;
        double friction = 0.5 * _rho * v * v * RestingWettedAreaM2 * Friction.Ittc1957(re) * FormFactor;
        double fn = VolumeFroude(v);
        double wave = WaveCoefficient * WeightN * fn * fn * fn * fn;
        double displaced = friction + wave;
        if (phi <= 0) return new HullState(displaced, 0, 0, Spec.LengthM);
        var p = BestPlaning(Math.Max(v, 0.5));
        double planing = p.Drag + 0.5 * _rho * v * v * ChopDragAreaM2;
        double res = (1 - phi) * displaced + phi * planing;
        return new HullState(res, phi, p.TrimDeg, Math.Min(p.Lambda * PlaningBeamM, Spec.LengthM));
    }

    /// <summary>
    /// Resistance (N) at speed V with no dynamic lift: the board held down in displacement trim (the rider's weight
    /// forward at the mast, as in a tack), skin friction plus the wave-making term.
    /// </summary>
    public double UnplanedResistance(double v)
    {
        double re = Math.Max(v, 1e-3) * Spec.LengthM / _nu;
        double friction = 0.5 * _rho * v * v * RestingWettedAreaM2 * Friction.Ittc1957(re) * FormFactor;
        double fn = VolumeFroude(v);
        return friction + WaveCoefficient * WeightN * fn * fn * fn * fn;
    }

    /// <summary>
    /// Drag area (m2, on the water's dynamic pressure) of the bow pressed down when the rider stands at the mast foot to
    /// step round it in a tack (model value: the bow's immersed section, about 0.4 m wide and 4 cm deep, as a bluff body
    /// of drag coefficient about 1, from memory).
    /// </summary>
    public const double NoseDownDragAreaM2 = 0.015;

    /// <summary>
    /// Resistance (N) at speed V while the rider steps round the mast in a tack: no dynamic lift (<see cref="UnplanedResistance"/>)
    /// and the bow pressed down by the rider's weight at the mast foot (<see cref="NoseDownDragAreaM2"/>).
    /// </summary>
    public double CrossingResistance(double v) => UnplanedResistance(v) + 0.5 * _rho * v * v * NoseDownDragAreaM2;

    /// <summary>Resistance (N) and lift fraction at speed V (m/s) from the table in single precision: the race step's fast path of <see cref="At"/>.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public double ResistanceAt(double speed, out double liftFraction)
    {
        double x = Math.Clamp(speed, 0, TableMax) * (1 / TableStep);
        int i = Math.Min((int)x, _table.Length - 2);
        double f = x - i;
        int j = 2 * i;
        liftFraction = _fast[j + 1] + f * (_fast[j + 3] - _fast[j + 1]);
        return _fast[j] + f * (_fast[j + 2] - _fast[j]);
    }

    /// <summary>Hull state at speed V (m/s), interpolated from the table (clamped to 0..40 m/s).</summary>
    public HullState At(double speed)
    {
        double x = Math.Clamp(speed, 0, TableMax) * (1 / TableStep);
        int i = Math.Min((int)x, _table.Length - 2);
        double f = x - i;
        var a = _table[i]; var b = _table[i + 1];
        return new HullState(a.Resistance + f * (b.Resistance - a.Resistance), a.LiftFraction + f * (b.LiftFraction - a.LiftFraction),
            a.TrimDeg + f * (b.TrimDeg - a.TrimDeg), a.WettedLengthM + f * (b.WettedLengthM - a.WettedLengthM));
    }
}
