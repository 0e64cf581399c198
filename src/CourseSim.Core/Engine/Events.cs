namespace CourseSim.Engine;

/// <summary>
/// An incident: two boards in contact. Who was to keep clear (-1 when nobody was, as with a capsized board), the rule,
/// whether a penalty was given, and whether the keep-clear board's give-way logic could have avoided it (it had seen
/// the conflict in time, was free to act, and the right-of-way board held its course).
/// </summary>
public sealed record RaceIncident(double TimeS, double X, double Y, int KeepClear, int RightOfWay, string Rule, bool Penalty,
    bool Avoidable, string Detail);

public enum RaceEventKind : byte { Started, Ocs, Cleared, Rounded, WrongSide, Tack, Gybe, Fall, Finished, NotFinished, GiveWay, Contact, PenaltyServed }

/// <summary>Something that happened in the race: when (s from the signal), where, to which board, and a detail.</summary>
public readonly record struct RaceEvent(double TimeS, int Board, RaceEventKind Kind, double X, double Y, string Detail);

/// <summary>
/// One board's result. <see cref="Penalties"/>: one-turn penalties taken; <see cref="PenaltiesNotTaken"/>: penalties
/// still owed when the board finished or the race ended (never well clear of the others in time; RRS 44.1 asks for
/// them as soon as possible, so a protest committee would act on them).
/// </summary>
public sealed record BoardResult(int Board, string Name, string Equipment, int? Place, bool Finished, double? ElapsedS,
    double? GapS, IReadOnlyList<double> SplitsS, double DistanceM, double AverageSpeedMs, int Tacks, int Gybes, int Falls,
    bool Ocs, int WrongSide, int Penalties = 0, int GiveWays = 0, int PenaltiesNotTaken = 0);

/// <summary>The outcome of a race.</summary>
public sealed record RaceResult(ulong Seed, string Scenario, double DurationS, IReadOnlyList<BoardResult> Boards,
    IReadOnlyList<RaceEvent> Events, string EngineVersion)
{
    /// <summary>Contacts between boards, judged (time order).</summary>
    public IReadOnlyList<RaceIncident> Incidents { get; init; } = [];

    /// <summary>Results in finishing order (finished boards by elapsed time, then the rest by legs done).</summary>
    public IEnumerable<BoardResult> ByPlace => Boards.OrderBy(b => b.Place ?? int.MaxValue).ThenByDescending(b => b.SplitsS.Count).ThenBy(b => b.Board);
}
