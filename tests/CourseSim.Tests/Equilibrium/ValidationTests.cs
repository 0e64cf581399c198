using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Rider;
using CourseSim.Sail;
using CourseSim.Units;

namespace CourseSim.Tests.Equilibrium;

/// <summary>
/// The board model checked against published figures (docs/validation.md lists every check side by side, with the ones
/// that still fail). Each check names its source; tolerances are justified in docs/validation.md.
/// </summary>
public class ValidationTests
{
    static readonly string[] Rigs = ["light-66", "light-78", "heavy-70", "heavy-86", "heavy-100"];
    static readonly Dictionary<string, VelocityPrediction> Vpps = new();
    static readonly object Gate = new();

    static Equipment Load(string rig) => EquipmentFile.Load(CourseSim.Tests.Engine.EngineTestKit.Equip(rig + ".toml"));

    static VelocityPrediction Vpp(string rig)
    {
        lock (Gate)
        {
            if (!Vpps.TryGetValue(rig, out var v)) Vpps[rig] = v = new VelocityPrediction(new BoardPhysics(Load(rig)));
            return v;
        }
    }

    static double Ms(double kn) => Unit.KnotsToMs(kn);
    static double Kn(double ms) => Unit.MsToKnots(ms);

    // Walls and Gale (2001), "A technique for the assessment of sailboard harness line force", J Sci Med Sport 4(3):348-356:
    // an expert on a 6.5 m2 sail reaching in 12-30 kn held 415.0 +- 66.7 N in the harness lines, about 4.9 N/kg. The
    // rider's load at the heel limit (the onset of overpowering) for a rider of that build (85 kg = 415 / 4.9) on that sail
    // must lie within two standard deviations of the mean, scaled by mass: 4.9 +- 2 x 0.16 x 4.9 N/kg.
    [Fact]
    public void HarnessLoadAtTheHeelLimitIsInTheMeasuredRange()
    {
        var eq = new Equipment { Rider = new RiderSpec { MassKg = 85 }, Sail = new SailSpec { AreaM2 = 6.5 } };
        var b = new BoardPhysics(eq);
        var vpp = new VelocityPrediction(b);
        // A beam reach in 22 kn is well past the limit for this rig: the trim sits on it.
        var s = vpp.Solve(Ms(22), Unit.DegToRad(90)).Sailed;
        Assert.InRange(s.Trim.HeelUse, 0.99, 1.0 + 1e-6);
        double perKg = b.Loads(s.Trim).HarnessPerKg(85);
        Assert.InRange(perKg, 4.9 * (1 - 2 * 0.16), 4.9 * (1 + 2 * 0.16));
    }

    // The onset of overpowering (heel limit reached on the fastest reach) does not come before the rider can get planing
    // (common practice: a rig sized for the rider planes before it overpowers them). docs/validation.md records that it
    // comes only 0.5-2 kn after, not "well after" as riders report: a known disagreement.
    [Theory]
    [InlineData("light-66")]
    [InlineData("heavy-70")]
    [InlineData("heavy-86")]
    [InlineData("heavy-100")]
    public void OverpoweringComesAfterPlaningOnset(string rig)
    {
        var vpp = Vpp(rig);
        double threshold = Kn(vpp.PlaningThresholdWithPumping!.Value);
        double onset = double.NaN;
        for (double kn = 5; kn <= 30 && double.IsNaN(onset); kn += 0.5)
        {
            var best = Enumerable.Range(0, 19).Select(i => vpp.Solve(Ms(kn), Unit.DegToRad(60 + 5 * i))).MaxBy(p => p.Sailed.Speed)!;
            if (best.Sailed.Trim.HeelUse >= 0.99) onset = kn;
        }
        Assert.True(onset >= threshold, $"{rig}: overpowered from {onset} kn, planing from {threshold:F1} kn");
    }

    // A bigger sail (+0.8 m2) or a looser outhaul (-0.3) is at least as fast while the rider is not overpowered on the
    // smaller or flatter one, and no faster by more than 0.3 kn once the rider is overpowered on both (common practice:
    // riders choose the largest sail they can hold). On the demo rigs and a rig sized for a heavy rider; beam and broad
    // reach, 6-26 kn, on the steady branch sailed (the planing or displacement equilibrium).
    [Theory]
    [InlineData("light-66")]
    [InlineData("light-78")]
    [InlineData("heavy-70")]
    [InlineData("heavy-86")]
    [InlineData("heavy-100")]
    public void MorePowerIsFasterUntilOverpowered(string rig)
    {
        var eq = Load(rig);
        var variants = new[]
        {
            ("area", eq with { Sail = eq.Sail with { AreaM2 = eq.Sail.AreaM2 + 0.8 } }),
            ("outhaul", eq with { Sail = eq.Sail with { Outhaul = Math.Max(0, eq.Sail.Outhaul - 0.3) } }),
        };
        var bad = new List<string>();
        var baseVpp = Vpp(rig);
        foreach (var (what, more) in variants)
        {
            var moreVpp = new VelocityPrediction(new BoardPhysics(more));
            foreach (double kn in new[] { 6.0, 9, 12, 15, 18, 22, 26 })
                foreach (double twa in new[] { 90.0, 120 })
                {
                    var a = Branch(baseVpp.Solve(Ms(kn), Unit.DegToRad(twa)));
                    var b = Branch(moreVpp.Solve(Ms(kn), Unit.DegToRad(twa)));
                    if (a.Planing != b.Planing) continue; // a different regime is a different question (planing thresholds)
                    if (a.Trim.HeelUse < 0.95 && b.Speed < a.Speed - Ms(0.05))
                        bad.Add($"{what} {kn} kn {twa} deg not overpowered: {Kn(a.Speed):F2} -> {Kn(b.Speed):F2}");
                    if (a.Trim.HeelUse >= 0.99 && b.Trim.HeelUse >= 0.99 && b.Speed > a.Speed + Ms(0.3))
                        bad.Add($"{what} {kn} kn {twa} deg overpowered: {Kn(a.Speed):F2} -> {Kn(b.Speed):F2}");
                }
        }
        Assert.True(bad.Count == 0, string.Join("; ", bad));
    }

    static SteadyState Branch(PointSolution s) => s.PlaningShare >= 0.5 && s.Planing is { } p ? p : s.Displacement ?? s.Planing ?? s.Sailed;

    // GPS track of a Formula board in a regatta-style session at 18 kn true wind (gpsactionreplay.free.fr, "Formula"
    // example, 2004): upwind 14.1-14.4 kn at 55-62 deg (VMG 6.8-8.1 kn); downwind 19.4-21.5 kn at 116-122 deg (VMG
    // 9.1-11.0 kn); best 500 m run 24.4 kn. Our demo rigs are smaller (6.6-9.0 m2 against about 11 m2, fins half as
    // deep), so the bands are widened as docs/validation.md explains: downwind VMG 0.7..1.4 of the published range, best
    // downwind angle 110..140 deg, top speed within 20 % of the best 500 m run.
    [Theory]
    [InlineData("light-66")]
    [InlineData("heavy-70")]
    [InlineData("heavy-86")]
    [InlineData("heavy-100")]
    public void EighteenKnotsMatchesCourseRacingGps(string rig)
    {
        var vpp = Vpp(rig);
        double tws = Ms(18);
        var down = vpp.BestVmg(tws, false);
        Assert.InRange(Kn(down.VmgMs), 0.7 * 9.1, 1.4 * 11.0);
        Assert.InRange(Unit.RadToDeg(down.TwaRad), 110, 140);
        var up = vpp.BestVmg(tws, true);
        Assert.InRange(Unit.RadToDeg(up.TwaRad), 50, 66);
        Assert.InRange(Kn(up.VmgMs), 0.7 * 6.8, 8.1);
        double top = Enumerable.Range(0, 31).Max(i => vpp.SpeedAt(tws, Unit.DegToRad(60 + 3 * i)));
        Assert.InRange(Kn(top), 0.8 * 24.4, 1.2 * 24.4);
    }

    // Top speed at the strong end: PWA slalom racers in dense chop are estimated at 32-34 kn on the fastest run (a racer's
    // estimate quoted on the Seabreeze GPS forum, "PWA and GPS"; not a measurement); the 500 m record, about 53 kn, was
    // set on a purpose-built speed canal (WSSRC; from memory). Course gear in 25-30 kn must stay under the racers' figure
    // plus 10 % and well under the record.
    [Theory]
    [InlineData("light-66")]
    [InlineData("light-78")]
    [InlineData("heavy-70")]
    [InlineData("heavy-86")]
    [InlineData("heavy-100")]
    public void TopSpeedStaysInTheMeasuredRange(string rig)
    {
        var vpp = Vpp(rig);
        foreach (double kn in new[] { 25.0, 30 })
        {
            double top = Enumerable.Range(0, 31).Max(i => vpp.SpeedAt(Ms(kn), Unit.DegToRad(60 + 3 * i)));
            Assert.InRange(Kn(top), 20, 34 * 1.1);
        }
    }

    // Planing with hysteresis (docs/physics.md, "Planing with hysteresis"): on the planing branch, more than 2 kn above
    // the drop-off speed (its end is a fold), no adjacent-degree step over 2.5 kn (the documented bound: the steepest fall of the planing speed
    // past the best downwind angle, where the apparent wind collapses); the sustained speed falls from the planing to the
    // displacement branch over the band the gusts spread the drop-off across, with no step over 2.5 kn or 0.45 of the gap
    // between the branches, whichever is larger (the documented bound for GustShare 0.10).
    [Theory]
    [InlineData("light-66")]
    [InlineData("heavy-86")]
    public void NoCliffsBetweenAdjacentDegrees(string rig)
    {
        var vpp = Vpp(rig);
        // The planing equilibrium ends in a fold (it merges with the unstable one and vanishes), where its speed moves as the
        // square root of the distance to the fold: the last 2 kn above the drop-off speed are left to the sustained check.
        double end = vpp.Board.Hull.SpeedAtFroude(CourseSim.Hull.HullModel.DropOffFroude) + Ms(2);
        var bad = new List<string>();
        foreach (double kn in new[] { 12.0, 16, 20, 25 })
        {
            PointSolution? prev = null;
            for (int a = 60; a <= 178; a++)
            {
                var s = vpp.Solve(Ms(kn), Unit.DegToRad(a));
                if (prev is not null)
                {
                    if (prev.Planing is { } p0 && s.Planing is { } p1 && p0.Speed > end && p1.Speed > end && Math.Abs(Kn(p1.Speed - p0.Speed)) > 2.5)
                        bad.Add($"{kn} kn {a} deg planing {Kn(p0.Speed):F1} -> {Kn(p1.Speed):F1}");
                    double gap = Math.Max(Kn((prev.Planing ?? prev.Sailed).Speed - (prev.Displacement ?? prev.Sailed).Speed), 2.5 / 0.45);
                    if (Math.Abs(Kn(s.Sailed.Speed - prev.Sailed.Speed)) > 0.45 * gap)
                        bad.Add($"{kn} kn {a} deg sustained {Kn(prev.Sailed.Speed):F1} -> {Kn(s.Sailed.Speed):F1}");
                }
                prev = s;
            }
        }
        Assert.True(bad.Count == 0, string.Join("; ", bad));
    }

    // The pumping bound: the mean thrust is a share of the boom pull a rider holds (Walls and Gale 2001: 4.9 N/kg in the
    // harness), so at low speed a 75 kg rider on a 100 kg set-up gets under 1 m/s2 (the old power / speed rule gave
    // 1.4 m/s2 at 3 kn); the burst power needed for that thrust at planing onset stays within the rider's short-burst
    // power, which in turn is within the aerobic bound of Vogiatzis and De Vito (2015, Eur J Sport Sci 15(3)): pumping at
    // 48 ml/min/kg O2 is about 1250 W metabolic for 75 kg, under 300 W mechanical at 20-25 % efficiency.
    [Fact]
    public void PumpingThrustIsBoundedByTheBoomPull()
    {
        var rider = new RiderModel(new RiderSpec { MassKg = 75 });
        double burst = rider.PowerFor(VelocityPrediction.PumpBurstS);
        Assert.InRange(burst, 200, 300 + 15000.0 / 30); // CP plus W'/30 s for the default rider
        double atThreeKnots = rider.PumpThrust(burst, Ms(3));
        Assert.Equal(RiderModel.PumpThrustShare * 4.9 / RiderModel.HarnessShare * 75, atThreeKnots, 6);
        Assert.InRange(atThreeKnots / 100.0, 0.3, 1.0);
        Assert.True(rider.PumpThrust(burst, 0.01) <= rider.MaxPumpThrustN + 1e-9);
    }

    // A manoeuvre that drops the board off the plane costs the time to re-plane. Walls and Gale (2001) timed an expert's
    // gybes at 9.9 +- 2.0 s (5.0 m2) and 12.2 +- 1.3 s (6.5 m2) from entry to planing exit; the re-planing part must be a
    // positive share of that, no longer than the whole gybe plus two standard deviations, in planing winds, and must be
    // infinite (the board stays under the hump) in a wind below the planing threshold.
    [Theory]
    [InlineData("light-66")]
    [InlineData("heavy-86")]
    public void TimeToReplaneIsSecondsInPlaningWinds(string rig)
    {
        var polar = RigPolar.Build(Load(rig));
        double t14 = polar.Rig.TimeToPlane(Ms(14), Unit.DegToRad(100), Ms(4), pumping: true);
        Assert.InRange(t14, 0.5, 12.2 + 2 * 1.3);
        double t18 = polar.Rig.TimeToPlane(Ms(18), Unit.DegToRad(100), Ms(4), pumping: false);
        Assert.InRange(t18, 0.5, 12.2 + 2 * 1.3);
        Assert.True(double.IsPositiveInfinity(polar.Rig.TimeToPlane(Ms(7), Unit.DegToRad(100), Ms(4), pumping: true)));
    }

    // The race's tables and the velocity prediction come from one board model: the rig polar's sustained speed is within
    // 5 % of the prediction's on reaches and runs where both plane (the tables use a 1-degree trim grid and the drive-
    // maximising trim, the prediction the thrust-maximising one: docs/engine.md).
    [Theory]
    [InlineData("light-66")]
    [InlineData("heavy-86")]
    public void RigPolarFollowsTheVelocityPrediction(string rig)
    {
        var polar = RigPolar.Build(Load(rig));
        var vpp = Vpp(rig);
        foreach (double kn in new[] { 16.0, 20 })
            foreach (double twa in new[] { 90.0, 110, 130 })
            {
                double a = vpp.SpeedAt(Ms(kn), Unit.DegToRad(twa)), b = polar.Speed(Ms(kn), Unit.DegToRad(twa));
                Assert.InRange(b / a, 0.95, 1.05);
            }
        Assert.False(double.IsNaN(polar.GetPlaningTwa(Ms(16), false)));
        Assert.InRange(Unit.RadToDeg(polar.GetPlaningTwa(Ms(16), false)), 90, Unit.RadToDeg(polar.BestTwa(Ms(16), false)) + 30);
    }
}
