namespace CourseSim.Wind;

/// <summary>
/// The wind of a scenario, at the 10 m reference height (the [wind] table; docs/wind.md). Defaults: a moderate,
/// shifty sea breeze.
/// </summary>
public sealed record WindSettings
{
    /// <summary>Mean speed at the start, kn.</summary>
    public double SpeedKn { get; init; } = 14;
    /// <summary>Mean direction the wind comes from, deg true.</summary>
    public double DirectionDeg { get; init; } = 225;
    /// <summary>Change of mean speed over the race, kn per hour (positive: building breeze).</summary>
    public double RampKnPerHour { get; init; } = 0;
    /// <summary>Amplitude of the oscillating shift, deg (a sinusoid of this amplitude has standard deviation amplitude/sqrt 2).</summary>
    public double ShiftAmplitudeDeg { get; init; } = 8;
    /// <summary>Period of the oscillating shift, s.</summary>
    public double ShiftPeriodS { get; init; } = 360;
    /// <summary>0 = a pure sinusoid; towards 1 the shift is a sum of components spread over periods P/2..2P.</summary>
    public double ShiftIrregularity { get; init; } = 0.3;
    /// <summary>Persistent shift, deg per minute (positive veers: clockwise).</summary>
    public double PersistentDegPerMin { get; init; } = 0;
    /// <summary>Geographic bend: direction on the right of the course (looking upwind) minus the left, over 1 km across, deg.</summary>
    public double BendDeg { get; init; } = 0;
    /// <summary>Pressure difference across the course: extra speed per km towards the right looking upwind, kn/km.</summary>
    public double PressureKnPerKm { get; init; } = 0;
    /// <summary>Amplitude of pressure bands lying across the wind, kn.</summary>
    public double BandAmplitudeKn { get; init; } = 0;
    /// <summary>Spacing of the pressure bands along the wind, m.</summary>
    public double BandSpacingM { get; init; } = 800;
    /// <summary>Turbulence intensity sigma_u / mean speed.</summary>
    public double GustIntensity { get; init; } = 0.12;
    /// <summary>Integral length scale of the gust field along the wind, m.</summary>
    public double GustLengthM { get; init; } = 150;
    /// <summary>Whether sails leave wind shadows.</summary>
    public bool Shadows { get; init; } = true;
    /// <summary>Speed deficit just behind a sail, share of the wind speed.</summary>
    public double ShadowDeficit { get; init; } = 0.25;
    /// <summary>Header just behind a sail, deg.</summary>
    public double ShadowHeaderDeg { get; init; } = 8;
    /// <summary>Half-width of a sail's wake where it starts, m.</summary>
    public double ShadowHalfWidthM { get; init; } = 2.5;
    /// <summary>Wake growth rate (Jensen's k): half-width grows by k per metre downstream.</summary>
    public double ShadowSpread { get; init; } = 0.10;
    /// <summary>A measured log driving mean speed, direction and shifts (null: the parametric field above).</summary>
    public WindLogDrive? Log { get; init; }
}
