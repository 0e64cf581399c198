using CourseSim.Agents;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Tests.Engine;
using Xunit.Abstractions;

namespace CourseSim.Tests.Agents;

/// <summary>
/// The start (docs/tactics.md, "Start plans"): early starters a minority, any part of the hull over at the signal
/// called (RRS 29.1 and the definition "Start"; Appendix B leaves them unchanged for boards), and a clean start from
/// any line position with few manoeuvres.
/// </summary>
public class StartTests(ITestOutputHelper output)
{
    /// <summary>
    /// Target share of boards over the line at the signal in the 12-board club demo: 5-12 % (about one board in a
    /// twelve-board start). Common practice (no published rate found): a club fleet has a few early starters, not a
    /// third; the band in the assertion adds the sampling spread of the batch.
    /// </summary>
    const double TargetLow = 0.05, TargetHigh = 0.12;
    /// <summary>"A few" manoeuvres before the start: a tack or gybe to line up and one or two to return (common practice).</summary>
    const int FewManoeuvres = 4;

    static List<StartBatch.BoardStart> Batch(int seeds)
    {
        var all = new List<StartBatch.BoardStart>[seeds];
        Parallel.For(0, seeds, new ParallelOptions { MaxDegreeOfParallelism = 2 }, i => all[i] = StartBatch.Sail(StartBatch.Setup((ulong)(i + 1)), 150));
        return all.SelectMany(x => x).ToList();
    }

    void CheckBatch(List<StartBatch.BoardStart> all, double low, double high)
    {
        double early = (double)all.Count(x => x.HullOver) / all.Count;
        output.WriteLine($"{all.Count} boards: over at the signal {early:P1}, called {all.Count(x => x.Called)}, " +
                         $"most manoeuvres before starting {all.Max(x => x.Manoeuvres)} (clean starters {all.Where(x => !x.Called).Max(x => x.Manoeuvres)})");
        Assert.InRange(early, low, high);
        // Called exactly when some part of the hull was over (the harness reads the hull from the pose, not the engine's call).
        foreach (var x in all) Assert.True(x.HullOver == x.Called, $"{x.Id}: over {x.HullOver} by {x.BowAheadM:F2} m, called {x.Called}");
        // Boards partly over (less than half a hull length) are among those called.
        Assert.Contains(all, x => x.Called && x.BowAheadM > 0 && x.BowAheadM < 1.0);
        // Clean starters: nearly all start within a few seconds of the signal with a few manoeuvres at most. The tail
        // (docs/tactics.md, "Start plans": boards pushed past an end by others keeping clear) is bounded, far from the
        // 131 manoeuvres and 18 minutes of circling this replaced.
        var clean = all.Where(x => !x.Called).ToList();
        double few = (double)clean.Count(x => x.Manoeuvres <= FewManoeuvres) / clean.Count;
        double prompt = (double)clean.Count(x => x.StartedS < 10) / clean.Count;
        output.WriteLine($"clean starters: {few:P1} with at most {FewManoeuvres} manoeuvres, {prompt:P1} started within 10 s; slowest {clean.Max(x => x.StartedS):F1} s");
        Assert.True(few >= 0.98, $"{few:P1} of clean starters with at most {FewManoeuvres} manoeuvres");
        Assert.True(prompt >= 0.90, $"{prompt:P1} of clean starters started within 10 s");
        // Every board: no circling (the old defect: up to 131 manoeuvres); nearly all started within 150 s. Known tail
        // (docs/tactics.md): a board squeezed past the pin by boards keeping clear, or held on the course side by them
        // while returning, can need a few minutes.
        foreach (var x in all) Assert.True(x.Manoeuvres <= 3 * FewManoeuvres, $"{x.Id}: {x.Manoeuvres} manoeuvres");
        double started = (double)all.Count(x => double.IsFinite(x.StartedS)) / all.Count;
        output.WriteLine($"started within 150 s: {started:P2}");
        Assert.True(started >= 0.995, $"{started:P2} started within 150 s");
    }

    [Fact]
    public void TenDemoStartsHaveFewEarlyStartersAllCalledAndFewManoeuvres()
    {
        // Ten races: the band is wider than the target for the sampling spread of 120 boards (binomial, about 2.5 sd).
        CheckBatch(Batch(10), 0.01, 0.20);
    }

    [Fact, Trait("Category", Slow.Category)]
    public void AHundredDemoStartsHaveARealisticMinorityOfEarlyStarters()
    {
        // 1,200 boards: the binomial spread at 8 % is under 1 %, so the target band itself, widened by one point.
        CheckBatch(Batch(100), TargetLow - 0.01, TargetHigh + 0.01);
    }

    [Theory]
    [InlineData(0.0)] [InlineData(0.25)] [InlineData(0.5)] [InlineData(0.75)] [InlineData(1.0)]
    public void EveryLinePositionStartsCleanlyAloneAndInTheFleet(double linePosition)
    {
        foreach (bool alone in new[] { true, false })
            foreach (ulong seed in new ulong[] { 1, 3 })
            {
                var b = StartBatch.Sail(StartBatch.Setup(seed, linePosition, alone), 120)[0];
                output.WriteLine($"{(alone ? "alone" : "fleet")} seed {seed}: {b.Manoeuvres} manoeuvres, started {b.StartedS:F1} s{(b.Called ? " (early, returned)" : "")}");
                // A clean start needs no tack or gybe at all. Before the spot near the end the start tack sails to was taken
                // far enough in for the holding drift (StartPlanner.EndDriftM), the pin-end board (0) drifted past where
                // it could fetch the line on starboard and tacked onto port to start (3 Dec 2026, seed 1 alone).
                Assert.True(b.Manoeuvres <= (b.Called ? FewManoeuvres : 0), $"{b.Manoeuvres} manoeuvres");
                Assert.True(b.StartedS < (b.Called ? 60 : 10), $"started {b.StartedS:F1} s after the signal");
            }
    }

    [Theory]
    [InlineData(0.0, 150)] [InlineData(1.0, 150)] [InlineData(0.0, 20)] [InlineData(1.0, 20)] [InlineData(0.5, 20)]
    public void SpotsKeepClearOfTheEndsAndFurtherFromTheEndTheStartTackSailsTo(double linePosition, double lineM)
    {
        // Every spot at least 5 m inside the ends, and at least StartPlanner.EndDriftM (15 m) inside the end the start
        // tack sails towards: on this upwind start, starboard close-hauled sails towards end A, the pin (docs/tactics.md,
        // "Start plans"). A 20 m line (the least start_line_m allows) still fits both: 15 m from A, 5 m from B.
        var text = OneBoard.Replace("line_position = 0.5", $"line_position = {linePosition.ToString(System.Globalization.CultureInfo.InvariantCulture)}")
            .Replace("start_line_m = 150", $"start_line_m = {lineM.ToString(System.Globalization.CultureInfo.InvariantCulture)}");
        var race = new Race(EngineTestKit.Parse(text));
        var line = race.Course.Start;
        var plan = race.World.Get<StartPlan>(race.EntityOf(0));
        var spot = new CourseSim.Courses.Vec2(plan.SpotX, plan.SpotY);
        double fromA = (spot - line.A).Length, fromB = (spot - line.B).Length;
        output.WriteLine($"line {lineM} m, line_position {linePosition}: spot {fromA:F2} m from A, {fromB:F2} m from B");
        Assert.Equal(line.Length, fromA + fromB, 6);
        Assert.True(fromA >= StartPlanner.EndDriftM - 1e-6, $"{fromA:F2} m from end A");
        Assert.True(fromB >= StartPlanner.EndInsetM - 1e-6, $"{fromB:F2} m from end B");
        // Within that the rider's own line_position stands: 1 at 150 m is the 5 m inset from B.
        if (lineM == 150 && linePosition == 1.0) Assert.Equal(StartPlanner.EndInsetM, fromB, 6);
    }

    static string OneBoard => EngineTestKit.SteadyWind(14) +
        "[race]\ncountdown_s = 30\ntime_limit_s = 120\nfalls = false\n" +
        "[course]\nkind = \"windward-leeward\"\nlaps = 1\nbeat_m = 400\nstart_line_m = 150\n" +
        $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\nline_position = 0.5\n";

    /// <summary>Puts the board's bow <paramref name="bowOverM"/> over the line (negative: below), stopped, heading up the course, just before the signal.</summary>
    static Race BowAt(double bowOverM)
    {
        var race = new Race(EngineTestKit.Parse(OneBoard));
        while (race.Time < -0.2) race.Step();
        var line = race.Course.Start;
        double half = 0.5 * race.Fleet.LengthM[0];
        var centre = line.Mid + (bowOverM - half) * line.Normal;
        double heading = line.Normal.Bearing;
        race.Place(0, centre.X, centre.Y, heading, 0);
        // Place() makes the board racing: put it back in the sequence, its last position where it is now.
        var e = race.EntityOf(0);
        race.World.Get<RaceStatus>(e) = new RaceStatus { State = RaceState.PreStart };
        return race;
    }

    [Theory]
    [InlineData(0.05)] [InlineData(0.3)] [InlineData(0.65)]
    public void ABoardWithOnlyItsBowOverAtTheSignalIsCalled(double bowOverM)
    {
        // RRS 29.1: "any part of her hull" on the course side at her starting signal. Its centre is below the line
        // (half a hull length, 1.2 m and more, minus the bow's part), so a check of the centre would not call it.
        var race = BowAt(bowOverM);
        while (race.Time < 0.5) race.Step();
        var st = race.World.Get<RaceStatus>(race.EntityOf(0));
        Assert.True(st.Ocs, $"bow {bowOverM} m over, not called");
        Assert.Contains(race.Events, x => x.Kind == RaceEventKind.Ocs && x.Board == 0);
    }

    [Fact]
    public void ABoardWhollyBelowTheLineAtTheSignalIsNotCalledAndStartsWhenItsBowCrosses()
    {
        var race = BowAt(-0.3);
        while (race.Time < 0.05) race.Step();
        Assert.False(race.World.Get<RaceStatus>(race.EntityOf(0)).Ocs);
        // It starts at the moment its bow (not its centre) crosses: the centre is still below the line then.
        while (race.Time < 30 && race.World.Get<RaceStatus>(race.EntityOf(0)).State == RaceState.PreStart) race.Step();
        var started = race.Events.First(x => x.Kind == RaceEventKind.Started && x.Board == 0);
        var line = race.Course.Start;
        var pose = race.World.Get<Pose>(race.EntityOf(0));
        Assert.True(line.Ahead(new Vec2(pose.X, pose.Y)) < 0, "started only once the centre crossed");
        Assert.True(started.TimeS < 10, $"started {started.TimeS:F1} s after the signal");
    }

    [Fact]
    public void TheRunToTheLineComesFromTheBoardsPhysicsAndMatchesTheEngine()
    {
        // The acceleration curve integrates the rig's own force model: a heavier board (more mass, same rig) takes
        // longer to get up to speed, and the engine's own board, sheeting in from rest close-hauled, covers the
        // curve's distance in about the curve's time.
        var race = new Race(EngineTestKit.OpenWater(14, "light-66.toml"));
        var rig = race.RigOf(0);
        double tws = CourseSim.Units.Unit.KnotsToMs(14), twa = rig.BestTwa(tws, true);
        var run = StartRun.Build(rig, tws, twa, pumping: true);
        Assert.InRange(run.FullSpeed, 0.9 * rig.Speed(tws, twa), 1.0 * rig.Speed(tws, twa));
        Assert.InRange(run.TimeToSpeedS, 2, 40);
        Assert.True(run.TimeToCover(20, 0) > 20 / run.FullSpeed, "from rest slower than at full speed");
        Assert.Equal(20 / run.FullSpeed, run.TimeToCover(20, run.FullSpeed), 6);
        // The engine: the board pinned close-hauled from rest.
        race.HoldTrueWindAngle(0, CourseSim.Units.Unit.RadToDeg(twa));
        var e = race.EntityOf(0);
        double dist = 0, t0 = race.Time; var last = race.World.Get<Pose>(e);
        double target = run.DistanceFromRest(8);
        while (dist < target && race.Time < t0 + 60)
        {
            race.Step();
            var p = race.World.Get<Pose>(e);
            dist += Math.Sqrt((p.X - last.X) * (p.X - last.X) + (p.Y - last.Y) * (p.Y - last.Y));
            last = p;
        }
        double took = race.Time - t0;
        output.WriteLine($"curve: {target:F1} m in 8.0 s (full speed {run.FullSpeed:F2} m/s after {run.TimeToSpeedS:F1} s); engine: {took:F1} s");
        // Within 1.5 s over 8 s: the curve leaves out the sheeting-in lag (the planner adds it separately).
        Assert.InRange(took, 8 - 1.5, 8 + 1.5);
    }
}
