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
    /// <summary>Boom height above the mast foot, m (from memory: the boom is set near shoulder height, 1.4-1.6 m above the
    /// deck for an adult rider, whatever the sail size).</summary>
    public const double BoomHeightM = 1.5;
    /// <summary>Share of the boom force the harness lines carry when hooked in, the arms carrying the rest (from memory:
    /// riders hold most of the pull in the harness; 0.75 is a model value).</summary>
    public const double HarnessShare = 0.75;
    /// <summary>Rake of the rig to windward when planing in the harness, deg (from memory: 10-20 deg; used for the
    /// vertical sail force reported in the loads).</summary>
    public const double WindwardRakeDeg = 15;
    /// <summary>Mean pull on the boom a rider can put into a pumping stroke, N per kg of rider mass: the harness-line load
    /// riders hold (Walls and Gale 2001, J Sci Med Sport 4(3):348-356: 4.9 N/kg) over the harness share.</summary>
    public const double PumpPullPerKg = 4.9 / HarnessShare;
    /// <summary>Share of a stroke's boom pull that ends up as forward thrust on average over the stroke cycle (model value:
    /// the pull is across the board, the sail turns only part of it forward, and half the cycle is the recovery).</summary>
    public const double PumpThrustShare = 0.15;

    public RiderSpec Spec { get; }
    public double MaxHeelingMomentNm { get; }
    public double ReserveJ { get; }

    public RiderModel(RiderSpec spec, double gravity = 9.80665)
    {
        Spec = spec;
        MaxHeelingMomentNm = spec.MassKg * gravity * spec.LeverM;
        ReserveJ = spec.ReserveKj * 1000.0;
    }

    /// <summary>Largest mean pumping thrust a rider of this mass can make, N: <see cref="PumpThrustShare"/> of the boom pull
    /// <see cref="PumpPullPerKg"/> x mass. At low speed this, not power / speed, bounds the thrust.</summary>
    public double MaxPumpThrustN => PumpThrustShare * PumpPullPerKg * Spec.MassKg;

    /// <summary>Pumping thrust (N) at board speed V for rider power P (W): eta P / V, bounded by <see cref="MaxPumpThrustN"/>.</summary>
    public double PumpThrust(double powerW, double speed) => Math.Min(Spec.PumpEfficiency * powerW / Math.Max(speed, 0.1), MaxPumpThrustN);

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
