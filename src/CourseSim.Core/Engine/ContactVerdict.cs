namespace CourseSim.Engine;

/// <summary>Which finding a contact's verdict states (its text is made from the parts when read).</summary>
public enum VerdictKind : byte
{
    BothInWater, CapsizedInWay, GiveWayOff, TurnedTooClose, AcquiredRightOfWay, NoRoomGiven, Compelled,
    RowAlteredRoomLeft, RowAltered, KeepBusy, SeenLate, NotAvoided,
}

/// <summary>Why a third board compelled the keep-clear one (rule 43.1(a)).</summary>
public enum CompelledBy : byte { None, DidNotKeepClear, ChangedCourse }

/// <summary>
/// A contact's verdict as parts: the finding, the boards' names and rules it cites (strings the race already holds) and
/// its numbers. The step stores the parts and the text is made when <see cref="Text"/> is read, so judging a contact
/// allocates nothing in the step (issue 17: 0 bytes per board-step), as with <see cref="RaceEvent"/>. The texts are the
/// ones the contact system used to build: the same wording, number formats and culture.
/// </summary>
public readonly record struct ContactVerdict
{
    public VerdictKind Kind { get; init; }
    /// <summary>The two boards in contact (a, b), the keep-clear board, the right-of-way board and the third board that compelled (names).</summary>
    public string? A { get; init; }
    public string? B { get; init; }
    public string? Keep { get; init; }
    public string? Row { get; init; }
    public string? By { get; init; }
    /// <summary>The rule the keep-clear board was under, and the third board's rule when it did not keep clear.</summary>
    public string? Rule { get; init; }
    public string? ByRule { get; init; }
    public CompelledBy Why { get; init; }
    /// <summary>The finding's numbers (seconds, metres or degrees as the finding says).</summary>
    public double V1 { get; init; }
    public double V2 { get; init; }
    /// <summary>Where mark-room was owed (rule 18 with the keep-clear board penalised), else null.</summary>
    public string? MarkRoomAt { get; init; }

    /// <summary>The verdict's text (made on each read; equal texts every time).</summary>
    public string Text()
    {
        string t = Kind switch
        {
            VerdictKind.BothInWater => $"{A} and {B} both in the water",
            VerdictKind.CapsizedInWay => $"{Row} capsized in the way",
            VerdictKind.GiveWayOff => "give-way logic off",
            VerdictKind.TurnedTooClose => $"keep-clear board began a tack or gybe {V1:F1} s before with a board {V2:F0} m away",
            VerdictKind.AcquiredRightOfWay => $"{Row} acquired right of way (rule {Rule}) by its tack or gybe {V1:F1} s before contact and did not initially give room to keep clear (rule 15): {Row} penalised; {Keep} exonerated (rule 43.1(a))",
            VerdictKind.NoRoomGiven => $"{Row} (right of way under rule {Rule}) changed course by {V1:F0} deg in the last {V2:F1} s without giving room to keep clear (rule 16.1): {Row} penalised; {Keep} exonerated (rule 43.1(a))",
            VerdictKind.Compelled => $"{Keep} (keep clear under rule {Rule}) was compelled by {By}'s breach ({CompelledWhy()}): {Keep} exonerated (rule 43.1(a)); {By} penalised",
            VerdictKind.RowAlteredRoomLeft => $"right-of-way board changed course by {V1:F0} deg since the conflict was first seen, leaving room to keep clear (not rule 16.1)",
            VerdictKind.RowAltered => $"right-of-way board changed course by {V1:F0} deg",
            VerdictKind.KeepBusy => "keep-clear board mid-manoeuvre (begun well clear)",
            VerdictKind.SeenLate => $"seen {V1:F1} s before contact",
            VerdictKind.NotAvoided => $"seen {V1:F1} s before contact and not avoided",
            _ => throw new InvalidOperationException($"unknown verdict {Kind}"),
        };
        return MarkRoomAt is null ? t : $"{t}; mark-room at {MarkRoomAt}";
    }

    string CompelledWhy() => Why == CompelledBy.DidNotKeepClear
        ? $"it did not keep clear under rule {ByRule} and was about to hit {Keep} (rule 14)"
        : $"it changed course by {V1:F0} deg in the last {V2:F1} s without giving room to keep clear (rule 16.1)";
}
