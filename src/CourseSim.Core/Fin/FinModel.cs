using CourseSim.Hull;
using CourseSim.Wings;

namespace CourseSim.Fin;

/// <summary>Fin geometry. Defaults: a 42 cm, 450 cm2 slalom/freeride fin.</summary>
public sealed record FinSpec
{
    /// <summary>Planform area, cm2.</summary>
    public double AreaCm2 { get; init; } = 450;
    /// <summary>Depth (span below the board), cm.</summary>
    public double DepthCm { get; init; } = 42;
    /// <summary>Lift coefficient at which the fin ventilates and spins out.</summary>
    public double MaxLift { get; init; } = 0.9;
    /// <summary>Thickness-to-chord ratio of the section.</summary>
    public double Thickness { get; init; } = 0.10;
}

/// <summary>Fin side force and drag at a given water speed and side force.</summary>
public readonly record struct FinState(double Lift, double Incidence, double Drag, bool SpunOut);

/// <summary>
/// The fin as a finite hydrofoil. The board bottom acts as an end plate, so the effective aspect ratio is twice the
/// geometric span^2/area (image method; from memory, see docs/physics.md). Lift slope from Helmbold's formula;
/// profile drag from the ITTC 1957 line on both faces with Hoerner's thickness form factor
/// 1 + 2 t/c + 60 (t/c)^4 (Hoerner 1965, Fluid-Dynamic Drag, ch. 6); induced drag CL^2/(pi e AR).
/// </summary>
public sealed class FinModel
{
    public const double SpanEfficiency = 0.9;
    public FinSpec Spec { get; }
    public double AreaM2 { get; }
    public double SpanM { get; }
    public double MeanChordM { get; }
    public double GeometricAspectRatio { get; }
    public double EffectiveAspectRatio { get; }
    public double LiftSlope { get; }
    readonly double _formFactor;

    public FinModel(FinSpec spec)
    {
        Spec = spec;
        AreaM2 = spec.AreaCm2 * 1e-4;
        SpanM = spec.DepthCm * 1e-2;
        MeanChordM = AreaM2 / SpanM;
        GeometricAspectRatio = SpanM * SpanM / AreaM2;
        EffectiveAspectRatio = 2 * GeometricAspectRatio;
        LiftSlope = WingTheory.HelmboldSlope(EffectiveAspectRatio);
        double t = spec.Thickness;
        _formFactor = 1 + 2 * t + 60 * t * t * t * t;
    }

    /// <summary>Profile drag coefficient (on planform area) at water speed <paramref name="speed"/> m/s.</summary>
    public double ProfileDrag(double speed, double kinematicViscosity)
        => 2.0 * Friction.Ittc1957(Math.Max(speed, 0.05) * MeanChordM / kinematicViscosity) * _formFactor;

    /// <summary>Fin state needed to carry <paramref name="sideForce"/> N at water speed <paramref name="speed"/> m/s.</summary>
    public FinState Carry(double sideForce, double speed, double density, double kinematicViscosity)
    {
        double q = 0.5 * density * speed * speed * AreaM2;
        double cd0 = ProfileDrag(speed, kinematicViscosity);
        if (q < 1e-9) return new FinState(0, 0, 0, sideForce > 1e-6);
        double cl = Math.Abs(sideForce) / q;
        double cd = cd0 + WingTheory.InducedDrag(cl, EffectiveAspectRatio, SpanEfficiency);
        return new FinState(cl, cl / LiftSlope, q * cd, cl > Spec.MaxLift);
    }
}
