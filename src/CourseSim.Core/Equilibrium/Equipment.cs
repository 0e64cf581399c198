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
