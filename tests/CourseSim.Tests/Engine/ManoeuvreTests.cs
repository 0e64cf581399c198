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
public class ManoeuvreTests(Xunit.Abstractions.ITestOutputHelper output)
{
    /// <summary>Length of the measuring window, s: the manoeuvre starts at 15 s and the board is back to speed well before the end.</summary>
    const double EndS = 75;

    /// <summary>Returns (VMG lost in seconds, least speed during the manoeuvre / speed before, tacks, gybes).</summary>
    static (double LossS, double MinSpeedShare, int Tacks, int Gybes) Loss(string equipment, double kn, bool upwind)
    {
        var baseSetup = EngineTestKit.OpenWater(kn, equipment);
        var rig = CourseSim.Equilibrium.RigPolar.Build(baseSetup.Boards[0].Equipment);
        double twa = Unit.RadToDeg(rig.BestTwa(Unit.KnotsToMs(kn), upwind));
        double v0 = rig.Speed(Unit.KnotsToMs(kn), Unit.DegToRad(twa));
        // Both boards sail the same fixed time, long enough for the turned one to be back to its steady speed (checked):
        // loss = progress deficit / straight VMG. (Stopping the count once the turned board is back to 95 % of its speed
        // left out the slow end of the re-acceleration and under-counted the loss by about half.)
        var turned = Run(true, EndS);
        var straight = Run(false, EndS);
        Assert.True(turned.EndSpeedShare > 0.98, $"the turned board is at {turned.EndSpeedShare:P0} of its speed at the end of the window");
        double vmg = straight.Progress / (straight.EndS - 0);
        return ((straight.Progress - turned.Progress) / vmg, turned.MinShare, turned.Status.Tacks, turned.Status.Gybes);

        (double Progress, double EndS, double MinShare, RaceStatus Status, double EndSpeedShare) Run(bool turn, double endS)
        {
            var race = new Race(baseSetup);
            race.HoldTrueWindAngle(0, twa);
            var e = race.EntityOf(0);
            race.World.Get<Motion>(e).Speed = v0;
            while (race.Time < 0) race.Step();
            var p0 = race.World.Get<Pose>(e);
            double before = race.World.Get<Motion>(e).Speed, min = before;
            while (race.Time < endS)
            {
                if (turn && race.Time >= 15 && race.Time < 15 + race.Dt) race.HoldTrueWindAngle(0, -twa);
                race.Step();
                double v = race.World.Get<Motion>(e).Speed;
                if (turn && race.Time > 15) min = Math.Min(min, v);
            }
            var p1 = race.World.Get<Pose>(e);
            // Wind from north: upwind progress is +y, downwind -y.
            return (upwind ? p1.Y - p0.Y : p0.Y - p1.Y, race.Time, min / before, race.World.Get<RaceStatus>(e), race.World.Get<Motion>(e).Speed / before);
        }
    }

    // Planing upwind (heavy-86 at 20 kn) the tack drops the board off the plane and the loss is in the trade's 2-12 s
    // (from memory). Off the plane (12-14 kn, both riders sail upwind displacing) the model gives 1.2-1.9 s, under that
    // range, and at 8 kn 0.8 s: listed as failing in docs/validation.md. The floor here is 1 s at 12-14 kn, so these
    // tacks cannot fall back to tenths unnoticed.
    [Theory]
    [InlineData("heavy-86.toml", 20, 2.0)]
    [InlineData("light-66.toml", 14, 1.0)]
    [InlineData("heavy-86.toml", 12, 1.0)]
    public void ATackCostsSecondsOfUpwindVmgInTheTradesRange(string equipment, double kn, double floorS)
    {
        var (loss, minShare, tacks, gybes) = Loss(equipment, kn, upwind: true);
        output.WriteLine($"{equipment} {kn} kn tack: {loss:F2} s of VMG, least speed {minShare:P0} of the entry speed");
        Assert.Equal(1, tacks);
        Assert.Equal(0, gybes);
        Assert.InRange(loss, floorS, 12);
    }

    [Theory]
    [InlineData("light-66.toml", 16)]
    [InlineData("heavy-86.toml", 16)]
    public void APlaningGybeCostsSecondsAndKeepsTheBoardMoving(string equipment, double kn)
    {
        var (loss, minShare, tacks, gybes) = Loss(equipment, kn, upwind: false);
        output.WriteLine($"{equipment} {kn} kn gybe: {loss:F2} s of VMG, least speed {minShare:P0} of the entry speed");
        Assert.Equal(0, tacks);
        Assert.Equal(1, gybes);
        Assert.InRange(loss, 0.5, 5);
        Assert.True(minShare > 0.5, $"speed fell to {minShare:P0} of the entry speed");
    }
}
