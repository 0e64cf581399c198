using CourseSim.Wings;

namespace CourseSim.Sail;

/// <summary>Geometry and trim of one sail. Defaults describe a 7.0 m2 freeride/race sail.</summary>
public sealed record SailSpec
{
    /// <summary>Sail area, m2.</summary>
    public double AreaM2 { get; init; } = 7.0;
    /// <summary>Luff length, m. NaN means derived from the area (see <see cref="SailModel.DefaultLuff"/>).</summary>
    public double LuffM { get; init; } = double.NaN;
    /// <summary>Outhaul setting, 0 = loosest (deepest), 1 = tightest (flattest).</summary>
    public double Outhaul { get; init; } = 0.5;
    /// <summary>Profile depth f/c with the outhaul fully eased.</summary>
    public double DepthLoose { get; init; } = 0.15;
    /// <summary>Profile depth f/c with the outhaul fully on.</summary>
    public double DepthTight { get; init; } = 0.07;
    /// <summary>How far the foot closes the gap to the deck, 0 = open, 1 = sealed (mirror image doubles the aspect ratio).</summary>
    public double FootClosure { get; init; } = 0.6;
}

/// <summary>Lift and drag coefficients of the sail at one attack angle, and the flow state.</summary>
public readonly record struct SailCoefficients(double Lift, double Drag, bool Luffing, bool Stalled);

/// <summary>
/// The sail as a soft cambered wing (docs/physics.md, "Sail"). Attack angle alpha is measured from the apparent wind to
/// the chord at the boom. The membrane carries no reverse load, so the sail luffs below the angle where its lift would
/// reach zero; from there lift grows with the finite-aspect-ratio (Helmbold) slope; it stalls smoothly at a maximum lift
/// set by depth, blending into the Viterna-Corrigan post-stall model where lift falls and drag keeps growing.
/// </summary>
public sealed class SailModel
{
    /// <summary>Oswald span efficiency used for the sail's induced drag (twisted soft sail; from memory, 0.8..0.9 typical).</summary>
    public const double SpanEfficiency = 0.85;
    /// <summary>Outhaul setting above which the sail is over-tightened and loses shape.</summary>
    public const double OverTightStart = 0.85;

    const double StallBlendWidthRad = 1.2 * Math.PI / 180.0;
    const double LuffBlendWidthRad = 0.8 * Math.PI / 180.0;

    public SailSpec Spec { get; }
    public double AreaM2 { get; }
    public double LuffM { get; }
    /// <summary>Geometric aspect ratio luff^2 / area.</summary>
    public double GeometricAspectRatio { get; }
    /// <summary>Effective aspect ratio: geometric times (1 + foot closure); a sealed foot mirrors the sail in the deck.</summary>
    public double EffectiveAspectRatio { get; }
    /// <summary>Lift slope per radian in the attached range (Helmbold, effective aspect ratio).</summary>
    public double LiftSlope { get; }
    /// <summary>Profile depth f/c at this outhaul.</summary>
    public double Depth { get; }
    /// <summary>Attack angle (rad) at which the sail luffs: its lift reaches zero.</summary>
    public double LuffAngle { get; }
    /// <summary>Nominal maximum lift coefficient.</summary>
    public double MaxLift { get; }
    /// <summary>Nominal stall attack angle (rad), where the attached lift line meets <see cref="MaxLift"/>.</summary>
    public double StallAngle { get; }
    /// <summary>Profile (zero-lift) drag coefficient, including mast and boom.</summary>
    public double ProfileDrag { get; }
    /// <summary>Centre of effort height above the mast foot, m.</summary>
    public double CentreOfEffortM { get; }
    readonly PostStall _post;

    /// <summary>Luff length from area for a modern sail, 1.62 sqrt(A) + 0.30 m (fit to typical sail ranges; from memory).</summary>
    public static double DefaultLuff(double areaM2) => 1.62 * Math.Sqrt(areaM2) + 0.30;

    public SailModel(SailSpec spec)
    {
        Spec = spec;
        AreaM2 = spec.AreaM2;
        LuffM = double.IsNaN(spec.LuffM) ? DefaultLuff(spec.AreaM2) : spec.LuffM;
        GeometricAspectRatio = LuffM * LuffM / AreaM2;
        EffectiveAspectRatio = GeometricAspectRatio * (1.0 + Math.Clamp(spec.FootClosure, 0, 1));
        LiftSlope = WingTheory.HelmboldSlope(EffectiveAspectRatio);

        double o = Math.Clamp(spec.Outhaul, 0, 1);
        Depth = spec.DepthLoose - (spec.DepthLoose - spec.DepthTight) * o;
        // Over-tightened: the leech opens and the entry flattens, the sail luffs earlier and holds less lift.
        double over = Math.Max(0, o - OverTightStart) / (1 - OverTightStart);
        // The membrane holds its camber down to a slightly negative chord incidence (the battens keep the shape), so the
        // luff angle sits just below zero and moves lower for a deeper sail (a deep sail is easier to keep full).
        LuffAngle = -0.5 * Depth + over * over * (3.0 * Math.PI / 180.0);
        MaxLift = (0.75 + 5.5 * Depth) * (1 - 0.15 * over * over);
        StallAngle = LuffAngle + MaxLift / LiftSlope;
        ProfileDrag = 0.025 + 0.6 * Depth * Depth;
        CentreOfEffortM = 0.42 * LuffM;
        double cdStall = ProfileDrag + WingTheory.InducedDrag(MaxLift, EffectiveAspectRatio, SpanEfficiency);
        _post = PostStall.From(StallAngle - LuffAngle, MaxLift, cdStall, EffectiveAspectRatio);
    }

    static double Softplus(double x) => x > 30 ? x : Math.Log(1 + Math.Exp(x));
    static double Sigmoid(double x) => 1.0 / (1.0 + Math.Exp(-x));

    /// <summary>Coefficients at attack angle <paramref name="alphaRad"/> (valid from luffing to 90 degrees).</summary>
    public SailCoefficients At(double alphaRad)
    {
        double rel = alphaRad - LuffAngle;
        // Attached: the linear lift line, softened into zero below the luff (no reverse load on a membrane).
        double clAtt = LiftSlope * LuffBlendWidthRad * Softplus(rel / LuffBlendWidthRad);
        double cdAtt = ProfileDrag + WingTheory.InducedDrag(clAtt, EffectiveAspectRatio, SpanEfficiency);
        double w = Sigmoid((alphaRad - StallAngle) / StallBlendWidthRad);
        double relPost = Math.Clamp(rel, 1e-3, Math.PI / 2);
        double cl = (1 - w) * clAtt + w * _post.Lift(relPost);
        double cd = (1 - w) * cdAtt + w * _post.Drag(relPost);
        return new SailCoefficients(cl, cd, rel < 0, alphaRad > StallAngle);
    }

    /// <summary>Force (N) for a coefficient: 0.5 rho V^2 A C.</summary>
    public double Force(double density, double speed, double coefficient) => 0.5 * density * speed * speed * AreaM2 * coefficient;
}
