using CourseSim.Rider;

namespace CourseSim.Tests.Rider;

public class RiderTests
{
    // Critical power model (Monod and Scherrer 1965): above CP the reserve W' drains at (P - CP) joules per second.
    [Fact]
    public void ReserveDrainsAboveCriticalPower()
    {
        var r = new RiderModel(new RiderSpec { CriticalPowerW = 200, ReserveKj = 15 });
        double w = r.ReserveJ;
        for (int i = 0; i < 10; i++) w = r.StepReserve(w, 500, 1.0);
        Assert.Equal(15000 - 3000, w, 9);
        // Time to exhaustion at P: W'/(P - CP) (Monod and Scherrer 1965): 15 kJ at 300 W over CP -> 50 s.
        Assert.Equal(500, r.PowerFor(50), 9);
    }

    // Skiba et al. (2012), Med Sci Sports Exerc 44(8): tau = 546 exp(-0.01 D_CP) + 316 s; at D_CP = 0, 862 s.
    [Fact]
    public void SkibaRecoveryTimeConstant()
    {
        var r = new RiderModel(new RiderSpec { CriticalPowerW = 200 });
        Assert.Equal(862, r.RecoveryTimeConstant(200), 9);
        Assert.Equal(546 * Math.Exp(-1) + 316, r.RecoveryTimeConstant(100), 9);
        double w = r.StepReserve(0, 100, r.RecoveryTimeConstant(100));
        Assert.Equal(r.ReserveJ * (1 - Math.Exp(-1)), w, 6);
    }

    // Balance: the mast foot carries no moment, so the largest heeling moment is the rider's weight times its lever.
    [Fact]
    public void MaxHeelingMomentIsWeightTimesLever() =>
        Assert.Equal(80 * 9.80665 * 1.2, new RiderModel(new RiderSpec { MassKg = 80, LeverM = 1.2 }).MaxHeelingMomentNm, 9);
}
