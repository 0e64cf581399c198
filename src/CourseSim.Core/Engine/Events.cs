namespace CourseSim.Engine;

/// <summary>
/// An incident: two boards in contact. Who was to keep clear and the other board (-1 for both when both were in the
/// water; a capsized board is the other board, rule 22), the rule, whether a penalty was given and to which board (not
/// always the keep-clear one: rules 15, 16.1 and 43.1(a)), and whether the keep-clear board's give-way logic could have
/// avoided it (it had seen the conflict in time, was free to act, and the right-of-way board held its course). A value:
/// the step adds it to a list sized up front and its texts are made when read, so a contact allocates nothing.
/// </summary>
public readonly struct RaceIncident
{
    public double TimeS { get; }
    public double X { get; }
    public double Y { get; }
    public int KeepClear { get; }
    public int RightOfWay { get; }
    public string Rule { get; }
    public bool Penalty { get; }
    public bool Avoidable { get; }
    /// <summary>The board given the penalty (-1: none).</summary>
    public int Penalised { get; }
    /// <summary>The verdict's parts (<see cref="Detail"/> is its text).</summary>
    public ContactVerdict Verdict { get; }

    public RaceIncident(double timeS, double x, double y, int keepClear, int rightOfWay, string rule, bool penalty, bool avoidable,
        ContactVerdict verdict, int penalised = -1)
    {
        TimeS = timeS; X = x; Y = y; KeepClear = keepClear; RightOfWay = rightOfWay; Rule = rule; Penalty = penalty; Avoidable = avoidable;
        Verdict = verdict; Penalised = penalised;
    }

    /// <summary>The verdict in words (made on each read).</summary>
    public string Detail => Verdict.Text();

    /// <summary>Both boards were in the water, or one capsized in the other's way (rule 22): no keep-clear board's fault.</summary>
    public bool Capsized => Verdict.Kind is VerdictKind.BothInWater or VerdictKind.CapsizedInWay;

    /// <summary>The contact event's text: who, the rule, the verdict and the penalty.</summary>
    public string EventText()
    {
        string who = Capsized ? $"{Verdict.A} and {Verdict.B}" : $"{Verdict.Keep} (keep clear) and {Verdict.Row}";
        // The penalised board is one the verdict names: the keep-clear board, the right-of-way one (rules 15, 16.1) or the
        // third board that compelled (43.1(a)).
        string pen = !Penalty ? "" : Penalised == KeepClear ? "; one-turn penalty"
            : $"; one-turn penalty for {(Penalised == RightOfWay ? Verdict.Row : Verdict.By)}";
        return $"{who}: rule {Rule}; {Detail}{pen}";
    }

    /// <summary>Every field in one line (the race's state hash reads this).</summary>
    public override string ToString() =>
        $"RaceIncident {{ TimeS = {TimeS}, X = {X}, Y = {Y}, KeepClear = {KeepClear}, RightOfWay = {RightOfWay}, Rule = {Rule}, Penalty = {Penalty}, Avoidable = {Avoidable}, Detail = {Detail}, Penalised = {Penalised} }}";
}

public enum RaceEventKind : byte { Started, Ocs, Cleared, Rounded, WrongSide, Tack, Gybe, Fall, Finished, NotFinished, GiveWay, Contact, PenaltyServed }

/// <summary>
/// Something that happened in the race: when (s from the signal), where, to which board, and a detail. The step keeps
/// the detail's parts (a composite format, up to two strings it already holds, such as a board's or a mark's name, and a
/// number) and the text is made when <see cref="Detail"/> is read, so recording an event allocates nothing in the step
/// (issue 17: 0 bytes per board-step). The text is the one the step used to build: the same format, arguments and
/// culture as the interpolated string it replaces.
/// </summary>
public readonly record struct RaceEvent
{
    public double TimeS { get; }
    public int Board { get; }
    public RaceEventKind Kind { get; }
    public double X { get; }
    public double Y { get; }
    // _incidents set: the detail is the text of incident (int)_value of that list (a contact). Else _format null: the
    // detail is _a as it stands ("" when null); else string.Format(_format, _a, _b, _value).
    readonly string? _format, _a, _b;
    readonly double _value;
    readonly List<RaceIncident>? _incidents;

    /// <summary>An event whose detail is a text already made.</summary>
    public RaceEvent(double timeS, int board, RaceEventKind kind, double x, double y, string detail)
        : this(timeS, board, kind, x, y, null, detail, null, 0) { }

    /// <summary>An event whose detail is made when read: <c>string.Format(format, a, b, value)</c> ({0} a, {1} b, {2} value).</summary>
    public RaceEvent(double timeS, int board, RaceEventKind kind, double x, double y, string? format, string? a, string? b, double value)
    {
        TimeS = timeS; Board = board; Kind = kind; X = x; Y = y;
        _format = format; _a = a; _b = b; _value = value;
    }

    /// <summary>A contact's event, whose detail is the text of incident <paramref name="index"/> of <paramref name="incidents"/> (a list that is only ever added to).</summary>
    public RaceEvent(double timeS, int board, RaceEventKind kind, double x, double y, List<RaceIncident> incidents, int index)
        : this(timeS, board, kind, x, y, null, null, null, index) { _incidents = incidents; }

    /// <summary>The event's text (made on each read; equal texts every time).</summary>
    public string Detail => _incidents is not null ? _incidents[(int)_value].EventText()
        : _format is null ? _a ?? "" : string.Format(_format, _a, _b, _value);
}

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
