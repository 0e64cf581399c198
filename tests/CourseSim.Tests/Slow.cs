namespace CourseSim.Tests;

/// <summary>
/// Tests that take minutes on two cores (long statistical runs, whole demo batches, a killed batch, a compiled
/// assembly): marked [Trait("Category", Slow.Category)]. `dotnet test` leaves them out unless COURSESIM_SLOW=1
/// (the test project's default filter); `.ci/run` sets it and runs them all.
/// </summary>
public static class Slow
{
    public const string Category = "Slow";
    /// <summary>Tests longer than CI's budget (a quarter of an hour on two cores): run only with COURSESIM_LONG=1.</summary>
    public const string Long = "Long";
}
