using CourseSim.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Engine;

/// <summary>
/// Issue 17: "0 bytes allocated per board-step in a steady race". A behaviour, not a timing: the bytes the race's own
/// thread allocates (GC.GetAllocatedBytesForCurrentThread counts every managed allocation made on it) while the
/// 40-board demo steps through a steady stretch. The step allocating in a long race means garbage collections in every
/// batch of races, and a pause that grows with the heap; the fix is in the step (events keep their numbers and format
/// their text when read; run-up curves and polar rows are built on first use and kept in the rig cache, which a
/// warm-up race fills), so any new allocation there fails this test.
/// </summary>
public class AllocationTests
{
    [Fact]
    public void ASteadyStretchOfTheFortyBoardDemoAllocatesNothingOnTheRacesThread()
    {
        var setup = ScenarioFile.LoadRace(Fleet40Demo.ScenarioPath);
        // The rigs' polar rows are built on first use, one wind speed at a time, and kept in the rig cache (a batch
        // shares one): a first race over the same stretch builds those this race meets, as the benchmarks' warm-up does.
        var rigs = new CourseSim.Equilibrium.RigCache();
        var warm = new Race(setup, rigs.For);
        while (!warm.IsOver && warm.Time < 260) warm.Step();
        var race = new Race(setup, rigs.For);
        // The start and its first minute: every code path of the stretch has run once (the JIT's first calls and
        // static constructors allocate; they are not the step's allocation).
        while (!race.IsOver && race.Time < 60) race.Step();
        int events0 = race.Events.Count;
        long before = GC.GetAllocatedBytesForCurrentThread();
        for (int i = 0; i < 4000 && !race.IsOver; i++) race.Step(); // +60 s to +260 s: every board racing
        long bytes = GC.GetAllocatedBytesForCurrentThread() - before;
        int logged = race.Events.Count - events0;
        // The stretch is not a quiet one: boards tack, gybe, give way and round marks, so recording events is covered.
        Assert.True(logged > 50, $"only {logged} events in the stretch");
        Assert.False(race.IsOver);
        Assert.True(bytes == 0, $"{bytes} B allocated over {4000 * 40} board-steps ({logged} events logged)");
        // The countdown and first minute of a second race, the code now warm: nothing either (the first neighbour-grid
        // build once sized its small-fleet arrays in the step, 824 B; they are sized when the race is made now).
        var again = new Race(setup, rigs.For);
        long start = GC.GetAllocatedBytesForCurrentThread();
        while (!again.IsOver && again.Time < 60) again.Step();
        long startBytes = GC.GetAllocatedBytesForCurrentThread() - start;
        Assert.True(startBytes == 0, $"{startBytes} B allocated from the countdown to +60 s");
    }

    [Fact]
    public void AnEventsTextMadeWhenReadIsTheTextTheStepUsedToBuild()
    {
        // The step used to build these with interpolated strings; the same format and culture must give the same text.
        double kn = 12.345678;
        var fall = new RaceEvent(1, 0, RaceEventKind.Fall, 0, 0, "{0} at {2:F1} kn", "failed gybe", null, kn);
        Assert.Equal($"failed gybe at {kn:F1} kn", fall.Detail);
        Assert.Equal("failed gybe at 12.3 kn", fall.Detail);
        var ocs = new RaceEvent(-0.05, 3, RaceEventKind.Ocs, 0, 0, "on the course side at the signal (by {2:0.00} m)", null, null, 0.456);
        Assert.Equal("on the course side at the signal (by 0.46 m)", ocs.Detail);
        var give = new RaceEvent(2, 1, RaceEventKind.GiveWay, 0, 0, "keeps clear of {0} (rule {1})", "Ilse Varn", "11", 0);
        Assert.Equal("keeps clear of Ilse Varn (rule 11)", give.Detail);
        Assert.Equal("", new RaceEvent(0, 0, RaceEventKind.Tack, 0, 0, "").Detail);
        Assert.Equal("1", new RaceEvent(0, 0, RaceEventKind.Rounded, 0, 0, "1").Detail);
    }
}
