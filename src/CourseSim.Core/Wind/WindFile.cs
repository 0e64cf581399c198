using CourseSim.Settings;

namespace CourseSim.Wind;

/// <summary>The [wind] table of a scenario file and the scenario keys it shares a file with.</summary>
public static class WindFile
{
    public static IEnumerable<KeySpec> Keys =>
    [
        KeySpec.Number("wind.speed_kn", 0, 45, 14, "mean true wind speed at 10 m, kn"),
        KeySpec.Number("wind.direction_deg", 0, 360, 225, "mean direction the wind comes from, deg true"),
        KeySpec.Number("wind.ramp_kn_per_hour", -20, 20, 0, "change of mean speed over time, kn per hour"),
        KeySpec.Number("wind.shift_amplitude_deg", 0, 45, 8, "amplitude of the oscillating shift, deg"),
        KeySpec.Number("wind.shift_period_s", 30, 7200, 360, "period of the oscillating shift, s"),
        KeySpec.Number("wind.shift_irregularity", 0, 1, 0.3, "0 = pure sinusoid .. 1 = periods spread over P/2..2P"),
        KeySpec.Number("wind.persistent_deg_per_min", -5, 5, 0, "persistent shift, deg per minute (positive veers)"),
        KeySpec.Number("wind.bend_deg", -40, 40, 0, "direction on the right (looking upwind) minus the left, per km across, deg"),
        KeySpec.Number("wind.pressure_kn_per_km", -10, 10, 0, "extra speed towards the right looking upwind, kn per km"),
        KeySpec.Number("wind.band_amplitude_kn", 0, 10, 0, "amplitude of pressure bands lying across the wind, kn"),
        KeySpec.Number("wind.band_spacing_m", 100, 10000, 800, "spacing of the pressure bands, m"),
        KeySpec.Number("wind.gust_intensity", 0, 0.4, 0.12, "turbulence intensity, sigma over mean speed"),
        KeySpec.Number("wind.gust_length_m", 10, 2000, 150, "integral length scale of gusts along the wind, m"),
        KeySpec.Flag("wind.shadows", true, "sails leave wind shadows"),
        KeySpec.Number("wind.shadow_deficit", 0, 0.8, 0.25, "speed deficit just behind a sail, share"),
        KeySpec.Number("wind.shadow_header_deg", 0, 30, 8, "header just behind a sail, deg"),
        KeySpec.Number("wind.shadow_half_width_m", 0.5, 10, 2.5, "half-width of a wake where it starts, m"),
        KeySpec.Number("wind.shadow_spread", 0, 0.5, 0.10, "growth of the wake half-width per metre downstream"),
        KeySpec.Number("wind.area_m", 200, 20000, 3000, "side of the square course area mapped, m"),
        KeySpec.Text("wind.log", "", "measured wind log (CSV) driving mean speed, direction and shifts, relative to the scenario file (docs/wind-fit.md)"),
        KeySpec.Number("wind.log_offset_s", 0, 1e8, 0, "seconds after the log's first row at which the starting signal falls"),
        KeySpec.Text("wind.log_columns", "", "column mapping of the log, e.g. time=Zeit,speed=V,dir=R,unit=m/s (default: found by header)"),
        KeySpec.Text("wind.log_windows", "fixed", "fixed: every race at log_offset_s; random: each race's window drawn from the log by its seed", ["fixed", "random"]),
    ];

    /// <summary>Keys the log replaces: given together with wind.log they are an error.</summary>
    static readonly string[] LogReplaces = ["wind.speed_kn", "wind.direction_deg", "wind.ramp_kn_per_hour", "wind.shift_amplitude_deg",
        "wind.shift_period_s", "wind.shift_irregularity", "wind.persistent_deg_per_min"];

    /// <summary>
    /// The [wind] table. With <c>wind.log</c> the log is read (relative to the file) and attached; the race's window is
    /// resolved by <see cref="WindLogDrive.ForSeed"/> once the race's seed is known.
    /// </summary>
    public static WindSettings From(SettingsFile f)
    {
        var w = Parametric(f);
        string log = f.Text("wind.log");
        if (log.Length == 0)
        {
            foreach (var k in new[] { "wind.log_offset_s", "wind.log_columns", "wind.log_windows" })
                if (f.Has(k)) throw f.ErrorAt(k, "applies only with wind.log = \"FILE.csv\"");
            return w;
        }
        foreach (var k in LogReplaces)
            if (f.Has(k)) throw f.ErrorAt(k, "the wind log (wind.log) gives the mean speed, direction and shifts: remove this key, or wind.log");
        string full = System.IO.Path.GetFullPath(System.IO.Path.Combine(f.Directory, log));
        if (!File.Exists(full)) throw f.ErrorAt("wind.log", $"wind log '{log}' not found (looked for {full})");
        var format = WindLogFormat.Parse(f.Text("wind.log_columns"), f.Path + " (wind.log_columns)");
        var wl = WindLog.Load(full, format);
        double lead = f.Schema.TryFind("race.countdown_s", out _) ? f.Number("race.countdown_s") : 0;
        double span = lead + (f.Schema.TryFind("race.time_limit_s", out _) ? f.Number("race.time_limit_s") : 3600);
        double off = f.Number("wind.log_offset_s");
        if (off > wl.DurationS) throw f.ErrorAt("wind.log_offset_s", $"{off} s is beyond the end of the log ({wl.DurationS:0} s after its first row)");
        return w with { Log = WindLogDrive.From(wl, off, f.Text("wind.log_windows") == "random", lead, span) };
    }

    static WindSettings Parametric(SettingsFile f) => new()
    {
        SpeedKn = f.Number("wind.speed_kn"), DirectionDeg = f.Number("wind.direction_deg"), RampKnPerHour = f.Number("wind.ramp_kn_per_hour"),
        ShiftAmplitudeDeg = f.Number("wind.shift_amplitude_deg"), ShiftPeriodS = f.Number("wind.shift_period_s"),
        ShiftIrregularity = f.Number("wind.shift_irregularity"), PersistentDegPerMin = f.Number("wind.persistent_deg_per_min"),
        BendDeg = f.Number("wind.bend_deg"), PressureKnPerKm = f.Number("wind.pressure_kn_per_km"),
        BandAmplitudeKn = f.Number("wind.band_amplitude_kn"), BandSpacingM = f.Number("wind.band_spacing_m"),
        GustIntensity = f.Number("wind.gust_intensity"), GustLengthM = f.Number("wind.gust_length_m"), Shadows = f.Flag("wind.shadows"),
        ShadowDeficit = f.Number("wind.shadow_deficit"), ShadowHeaderDeg = f.Number("wind.shadow_header_deg"),
        ShadowHalfWidthM = f.Number("wind.shadow_half_width_m"), ShadowSpread = f.Number("wind.shadow_spread"),
    };
}
