using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Tests.Engine;

/// <summary>
/// Tack and gybe losses come out of the dynamics (no fixed penalty). Measured as the distance made good along the wind
/// lost against the same board sailing on without the manoeuvre, divided by its VMG: seconds of VMG lost.
/// Ranges of the trade, from memory (no published table of windsurf manoeuvre losses was found): a tack costs a
/// club-to-good racer about 2 to 12 s of upwind VMG (the board drops off the plane while the rider steps round the mast
/// and must be pumped back up to speed); a planing carve gybe costs about 0.5 to 5 s of downwind VMG and the board keeps
/// moving through it (common practice: a carve gybe is made without stopping).
/// </summary>
public class ManoeuvreTests
{
    /// <summary>Returns (VMG lost in seconds, least speed during the manoeuvre / speed before, tacks, gybes).</summary>
    static (double LossS, double MinSpeedShare, int Tacks, int Gybes) Loss(string equipment, double kn, bool upwind)
    {
        var baseSetup = EngineTestKit.OpenWater(kn, equipment);
        var rig = CourseSim.Equilibrium.RigPolar.Build(baseSetup.Boards[0].Equipment);
        double twa = Unit.RadToDeg(rig.BestTwa(Unit.KnotsToMs(kn), upwind));
        double v0 = rig.Speed(Unit.KnotsToMs(kn), Unit.DegToRad(twa));
        // The turned board runs until the manoeuvre is over and it is back to 95 % of its speed before (pumping if it
        // needs to); the straight board runs for the same time. Loss = progress deficit / straight VMG.
        var turned = Run(true, double.NaN);
        var straight = Run(false, turned.EndS);
        double vmg = straight.Progress / (straight.EndS - 0);
        return ((straight.Progress - turned.Progress) / vmg, turned.MinShare, turned.Status.Tacks, turned.Status.Gybes);

        (double Progress, double EndS, double MinShare, RaceStatus Status) Run(bool turn, double endS)
        {
            var race = new Race(baseSetup);
            race.HoldTrueWindAngle(0, twa);
            var e = race.EntityOf(0);
            race.World.Get<Motion>(e).Speed = v0;
            while (race.Time < 0) race.Step();
            var p0 = race.World.Get<Pose>(e);
            double before = race.World.Get<Motion>(e).Speed, min = before;
            while (race.Time < 120)
            {
                if (turn && race.Time >= 15 && race.Time < 15 + race.Dt) race.HoldTrueWindAngle(0, -twa);
                race.Step();
                double v = race.World.Get<Motion>(e).Speed;
                if (turn && race.Time > 15) min = Math.Min(min, v);
                if (!turn && race.Time >= endS) break;
                if (turn && race.Time > 20 && race.World.Get<ManoeuvreState>(e).Kind == Manoeuvre.None && v >= 0.95 * before) break;
            }
            var p1 = race.World.Get<Pose>(e);
            // Wind from north: upwind progress is +y, downwind -y.
            return (upwind ? p1.Y - p0.Y : p0.Y - p1.Y, race.Time, min / before, race.World.Get<RaceStatus>(e));
        }
    }

    [Theory]
    [InlineData("light-66.toml", 14)]
    [InlineData("heavy-86.toml", 12)]
    public void ATackCostsSecondsOfUpwindVmgInTheTradesRange(string equipment, double kn)
    {
        var (loss, _, tacks, gybes) = Loss(equipment, kn, upwind: true);
        Assert.Equal(1, tacks);
        Assert.Equal(0, gybes);
        Assert.InRange(loss, 2, 12);
    }

    [Theory]
    [InlineData("light-66.toml", 16)]
    [InlineData("heavy-86.toml", 16)]
    public void APlaningGybeCostsSecondsAndKeepsTheBoardMoving(string equipment, double kn)
    {
        var (loss, minShare, tacks, gybes) = Loss(equipment, kn, upwind: false);
        Assert.Equal(0, tacks);
        Assert.Equal(1, gybes);
        Assert.InRange(loss, 0.5, 5);
        Assert.True(minShare > 0.5, $"speed fell to {minShare:P0} of the entry speed");
    }
}
