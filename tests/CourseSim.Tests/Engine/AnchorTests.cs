using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Units;

namespace CourseSim.Tests.Engine;

/// <summary>
/// The engine's anchor: integrating the board step by step at a constant true wind angle in steady wind must settle at
/// the steady speed the velocity prediction finds for the same set-up (the equilibrium of the physics issue,
/// docs/physics.md). Started near that speed (the same branch where there are two), pumping off as in the prediction.
/// </summary>
public class AnchorTests
{
    public static TheoryData<string, double, double> Points()
    {
        var d = new TheoryData<string, double, double>();
        foreach (var eq in new[] { "light-66.toml", "heavy-86.toml" })
            foreach (var kn in new[] { 8.0, 12, 16, 22 })
                foreach (var twa in new[] { 45.0, 60, 90, 120, 150 })
                    if (!(twa == 45 && (kn == 22 || kn == 8 || eq == "heavy-86.toml"))) d.Add(eq, kn, twa);
        return d;
    }

    /// <summary>
    /// The equilibrium of the branch the polar's sustained speed leans to: the planing one where the board is planing
    /// more than half the time, else the displacement one. In the steady wind of these tests there are no lulls, so the
    /// step settles at an equilibrium, not at the gust-weighted sustained speed.
    /// </summary>
    static double SteadyBranchSpeed(Equipment eq, double kn, double twaDeg)
    {
        var s = new VelocityPrediction(new BoardPhysics(eq)).Solve(Unit.KnotsToMs(kn), Unit.DegToRad(twaDeg));
        var st = s.PlaningShare >= 0.5 && s.Planing is { } p ? p : s.Displacement ?? s.Planing ?? s.Sailed;
        return st.Speed;
    }

    [Theory]
    [MemberData(nameof(Points))]
    public void IntegrationConvergesToTheSteadyPolarSpeed(string equipment, double kn, double twaDeg)
    {
        var setup = EngineTestKit.OpenWater(kn, equipment, pumping: false);
        var eq = setup.Boards[0].Equipment;
        double expected = SteadyBranchSpeed(eq, kn, twaDeg);
        var race = new Race(setup);
        race.HoldTrueWindAngle(0, twaDeg);
        race.World.Get<Motion>(race.EntityOf(0)).Speed = 0.97 * expected;
        while (race.Time < 150) race.Step();
        double v = race.World.Get<Motion>(race.EntityOf(0)).Speed;
        // Within 3 %: the trim in the step maximises the rig's drive (fin drag left out of the choice), the prediction
        // maximises drive less fin drag; the difference stays under 2.5 % over this grid (docs/engine.md).
        Assert.InRange(v / expected, 0.97, 1.03);
    }

    [Theory]
    [InlineData("heavy-86.toml", 22)]
    [InlineData("heavy-86.toml", 16)]
    [InlineData("heavy-86.toml", 12)]
    [InlineData("heavy-86.toml", 8)]
    [InlineData("light-66.toml", 8)]
    public void CloseHauledAtTheEdgesIsTheKnownGap(string equipment, double kn)
    {
        // Documented in docs/engine.md: close-hauled (45 deg) in light wind the fin is stalled and the rails carry side
        // force at a poor lift-to-drag ratio, and at 22 kn the 8.6 m2 rig is far past the rider's heel limit; in both
        // the drive-maximising trim of the step is slower than the thrust-maximising trim of the prediction (up to
        // ~20 %). With the 8.6 m2 rig at 12 and 16 kn the prediction's equilibrium sits at 3.1 m/s, just above the
        // spin-out speed, where the fin rule's step in the net force makes a root the step overshoots by up to 7 %
        // (docs/validation.md, "known gaps").
        var setup = EngineTestKit.OpenWater(kn, equipment, pumping: false);
        double expected = SteadyBranchSpeed(setup.Boards[0].Equipment, kn, 45);
        var race = new Race(setup);
        race.HoldTrueWindAngle(0, 45);
        race.World.Get<Motion>(race.EntityOf(0)).Speed = 0.97 * expected;
        while (race.Time < 150) race.Step();
        double ratio = race.World.Get<Motion>(race.EntityOf(0)).Speed / expected;
        Assert.InRange(ratio, 0.8, 1.07);
    }
}
