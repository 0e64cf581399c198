using CourseSim.Fin;
using CourseSim.Hull;
using CourseSim.Rider;
using CourseSim.Sail;

namespace CourseSim.Equilibrium;

/// <summary>Conditions of the water and air the board sails in.</summary>
public sealed record ConditionsSpec
{
    public double AirTemperatureC { get; init; } = 15;
    public double WaterTemperatureC { get; init; } = 15;
    /// <summary>Salinity, g/kg; 0 is fresh water.</summary>
    public double SalinityGPerKg { get; init; } = 35.16504;
    /// <summary>Drag area of spray and chop on a planing board, cm2 on the water's dynamic pressure (docs/physics.md,
    /// "Spray and chop"); 0 is flat water without spray drag.</summary>
    public double ChopDragAreaCm2 { get; init; } = DefaultChopDragAreaCm2;
    /// <summary>Default spray and chop drag area, cm2: a calibration, not a measurement (docs/validation.md): set so that
    /// the demo rigs' top and downwind speeds come nearer the published course-racing and speed figures.</summary>
    public const double DefaultChopDragAreaCm2 = 20;
}

/// <summary>One complete set-up: rider, sail, fin, board and conditions.</summary>
public sealed record Equipment
{
    public string Name { get; init; } = "setup";
    public RiderSpec Rider { get; init; } = new();
    public SailSpec Sail { get; init; } = new();
    /// <summary>Mass of mast, boom, extension and sail, kg; NaN means 3 + 0.7 x area (from memory for carbon race rigs).</summary>
    public double RigMassKg { get; init; } = double.NaN;
    public FinSpec Fin { get; init; } = new();
    public BoardSpec Board { get; init; } = new();
    public ConditionsSpec Conditions { get; init; } = new();

    public double ResolvedRigMassKg => double.IsNaN(RigMassKg) ? 3.0 + 0.7 * Sail.AreaM2 : RigMassKg;
    public double TotalMassKg => Rider.MassKg + Board.MassKg + ResolvedRigMassKg;
}
