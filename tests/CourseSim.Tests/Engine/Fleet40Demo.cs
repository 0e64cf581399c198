using CourseSim.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Engine;

/// <summary>
/// The forty-board demo (scenarios/korrin-bay-fleet40.toml) at its own seed, raced once per test run and shared, read
/// only, by the tests that need the whole race (its golden hash, the permutation check's reference, the fleet rules):
/// each full race of forty boards costs about a minute of CI's quarter hour.
/// </summary>
public static class Fleet40Demo
{
    public static string ScenarioPath => Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-fleet40.toml");

    /// <summary>The scenario file's own seed.</summary>
    public const ulong Seed = 11;

    static readonly Lazy<(Race Race, RaceResult Result)> _reference = new(() =>
    {
        var setup = ScenarioFile.LoadRace(ScenarioPath);
        Assert.Equal(Seed, setup.Race.Seed);
        var race = new Race(setup);
        return (race, race.Run());
    }, LazyThreadSafetyMode.ExecutionAndPublication);

    /// <summary>The race and its result (do not step or restore it).</summary>
    public static (Race Race, RaceResult Result) Reference => _reference.Value;
}
