namespace CourseSim.Rider;

/// <summary>The rider. Defaults: a 75 kg club racer.</summary>
public sealed record RiderSpec
{
    public double MassKg { get; init; } = 75;
    /// <summary>Largest horizontal distance the rider's centre of mass can be held from the mast-foot line, m.</summary>
    public double LeverM { get; init; } = 1.25;
    /// <summary>Critical power: the mechanical pumping power the rider can sustain, W.</summary>
    public double CriticalPowerW { get; init; } = 220;
    /// <summary>Work capacity above critical power (W'), kJ.</summary>
    public double ReserveKj { get; init; } = 15;
    /// <summary>Share of the rider's pumping power that becomes thrust (model parameter, not a measured value).</summary>
    public double PumpEfficiency { get; init; } = 0.4;
    /// <summary>Frontal drag area of the rider in the apparent wind, m2 (from memory: 0.4..0.6 hanging in a harness).</summary>
    public double DragAreaM2 { get; init; } = 0.45;
    /// <summary>Skill 0..1 (used by the race engine for manoeuvres and falls).</summary>
    public double Skill { get; init; } = 0.7;
}

/// <summary>
/// Rider balance and pumping. The mast foot carries force but no moment, so the sail's heeling moment (side force times
/// centre-of-effort height) is held by the rider's weight times its windward offset: M_max = m g lever.
/// Pumping power follows the critical-power model (Monod and Scherrer 1965, Ergonomics 8(3)): power above CP draws on a
/// finite reserve W', which recovers below CP with Skiba et al.'s (2012, Med Sci Sports Exerc 44(8)) time constant
/// tau = 546 exp(-0.01 (CP - P)) + 316 s.
/// </summary>
public sealed class RiderModel
{
    public RiderSpec Spec { get; }
    public double MaxHeelingMomentNm { get; }
    public double ReserveJ { get; }

    public RiderModel(RiderSpec spec, double gravity = 9.80665)
    {
        Spec = spec;
        MaxHeelingMomentNm = spec.MassKg * gravity * spec.LeverM;
        ReserveJ = spec.ReserveKj * 1000.0;
    }

    /// <summary>Pumping thrust (N) at board speed V for rider power P (W): eta P / V, with V held at 1 m/s or more.</summary>
    public double PumpThrust(double powerW, double speed) => Spec.PumpEfficiency * powerW / Math.Max(speed, 1.0);

    /// <summary>Power the rider can hold for <paramref name="durationS"/> seconds from a full reserve: CP + W'/t.</summary>
    public double PowerFor(double durationS) => Spec.CriticalPowerW + ReserveJ / Math.Max(durationS, 1.0);

    /// <summary>Skiba (2012) recovery time constant, s, when pumping at <paramref name="powerW"/> below CP.</summary>
    public double RecoveryTimeConstant(double powerW) => 546.0 * Math.Exp(-0.01 * (Spec.CriticalPowerW - powerW)) + 316.0;

    /// <summary>Recovery factor exp(-dt / tau) over a step of <paramref name="dt"/> s at zero power (constant for a rider).</summary>
    public double RestingDecay(double dt) => Math.Exp(-dt / RecoveryTimeConstant(0));

    /// <summary>Advances the reserve W'bal (J) by <paramref name="dt"/> seconds at power P (W).</summary>
    public double StepReserve(double reserveJ, double powerW, double dt)
    {
        if (powerW > Spec.CriticalPowerW) return Math.Max(0, reserveJ - (powerW - Spec.CriticalPowerW) * dt);
        double tau = RecoveryTimeConstant(powerW);
        return ReserveJ - (ReserveJ - reserveJ) * Math.Exp(-dt / tau);
    }
}
