using CourseSim.Engine;
using CourseSim.Units;

namespace CourseSim.Tests.Engine;

/// <summary>
/// The race sails the polar it plans with (issue 16, acceptance: the engine's straight-line speed, beat VMG and run VMG
/// each within 5 % of the polar, the run from a standing start included once the rider has got planing). Steady wind:
/// the polar's sustained speed is what a rider holds on the branch they sail (docs/physics.md); in gusty wind the
/// engine is slower on marginal runs, a known gap listed in docs/validation.md. The 5 % tolerance is the issue's.
/// </summary>
public class PolarFollowingTests
{
    static RaceSetup Leg(string eq, double kn, double towardY) => EngineTestKit.Parse(
        EngineTestKit.SteadyWind(kn) + "[race]\nfalls = false\ncountdown_s = 20\ntime_limit_s = 900\n" +
        $"[course]\nkind = \"waypoints\"\norder = \"far\"\n[course.marks.far]\nx_m = 0\ny_m = {towardY}\n" +
        $"[boards.a]\nequipment = \"{EngineTestKit.Equip(eq)}\"\n", 3);

    [Theory]
    [InlineData("light-66.toml", 14)]
    [InlineData("light-66.toml", 18)]
    [InlineData("heavy-86.toml", 14)]
    [InlineData("heavy-86.toml", 18)]
    public void BeatAndRunVmgFollowThePolar(string eq, double kn)
    {
        double tws = Unit.KnotsToMs(kn);
        foreach (bool upwind in new[] { true, false })
        {
            // The board starts from the start plan's crawl behind the line (a standing start) and sails the leg with its
            // usual navigation; VMG is measured from 60 s after it first planes (or after the start, where the polar does
            // not plane on that leg) over the next 300 s.
            var race = new Race(Leg(eq, kn, upwind ? 40000 : -40000));
            var rig = race.RigOf(0);
            var e = race.EntityOf(0);
            double from = double.NaN, y0 = 0;
            bool polarPlanes = rig.Speed(tws, rig.BestTwa(tws, upwind)) >= rig.Rig.DropOffSpeed;
            double startAt = polarPlanes ? double.NaN : 0;
            while (race.Time < 900)
            {
                race.Step();
                if (double.IsNaN(startAt) && race.Time > 0 && race.World.Get<Trim>(e).Planing) startAt = race.Time;
                if (double.IsNaN(from) && !double.IsNaN(startAt) && race.Time >= startAt + 60) { from = race.Time; y0 = race.World.Get<Pose>(e).Y; }
                if (!double.IsNaN(from) && race.Time >= from + 300) break;
            }
            Assert.False(double.IsNaN(from), $"{eq} {kn} kn {(upwind ? "beat" : "run")}: the board never got planing where the polar planes");
            double vmg = Math.Abs(race.World.Get<Pose>(e).Y - y0) / (race.Time - from);
            double ratio = vmg / rig.BestVmg(tws, upwind);
            Assert.True(ratio is > 0.95 and < 1.05, $"{eq} {kn} kn {(upwind ? "beat" : "run")}: engine VMG / polar = {ratio:F3}");
        }
    }

    [Theory]
    [InlineData("light-66.toml", 14, 90)]
    [InlineData("heavy-86.toml", 18, 110)]
    [InlineData("heavy-86.toml", 10, 60)]
    public void StraightLineSpeedFollowsThePolar(string eq, double kn, double twaDeg)
    {
        // Held at one true wind angle from a slow start with pumping (the rider gets going as in a race).
        var race = new Race(EngineTestKit.OpenWater(kn, eq));
        race.HoldTrueWindAngle(0, twaDeg);
        var e = race.EntityOf(0);
        double sum = 0; int n = 0;
        while (race.Time < 240) { race.Step(); if (race.Time >= 120) { sum += race.World.Get<Motion>(e).Speed; n++; } }
        double ratio = sum / n / race.RigOf(0).Speed(Unit.KnotsToMs(kn), Unit.DegToRad(twaDeg));
        Assert.True(ratio is > 0.95 and < 1.05, $"{eq} {kn} kn at {twaDeg} deg: engine speed / polar = {ratio:F3}");
    }
}
