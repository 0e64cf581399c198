using CourseSim.Courses;
using CourseSim.Equilibrium;
using CourseSim.Wind;

namespace CourseSim.Engine;

/// <summary>One board of the fleet as the scenario gives it.</summary>
public sealed record BoardEntry(string Id, string Name, Equipment Equipment, string Tactic, double LinePosition, int Line,
    IReadOnlyDictionary<string, double>? Params = null)
{
    /// <summary>Index in the fleet of the board this one's tactic watches (the rival to cover), or -1.</summary>
    public int RivalIndex { get; init; } = -1;
    /// <summary>The start plan: where on the line (line-position, favoured-end, pin-end or boat-end).</summary>
    public string Start { get; init; } = "line-position";
    /// <summary>Planned arrival at the line after the signal, s (null: the engine's default margin).</summary>
    public double? StartMarginS { get; init; }

    /// <summary>A tactic parameter, or its default.</summary>
    public double Param(string name, double fallback) => Params is not null && Params.TryGetValue(name, out var v) ? v : fallback;
}

/// <summary>Race settings: the step, the start sequence, the time limit and what is recorded.</summary>
public sealed record RaceSettings
{
    /// <summary>Fixed steps per second.</summary>
    public double StepHz { get; init; } = 20;
    /// <summary>Rate at which each board samples the wind field and shadows, per second (at most the step rate).</summary>
    public double WindHz { get; init; } = 5;
    /// <summary>The simulation starts this many seconds before the starting signal.</summary>
    public double CountdownS { get; init; } = 90;
    /// <summary>Boards still racing this long after the signal are recorded as not finished, s.</summary>
    public double TimeLimitS { get; init; } = 3600;
    /// <summary>Interval between recorded samples of every board, s.</summary>
    public double RecordIntervalS { get; init; } = 0.5;
    /// <summary>Interval between a rider's decisions (a human rate), s.</summary>
    public double DecisionIntervalS { get; init; } = 0.5;
    /// <summary>Whether riders can fall (overpowered, or a failed gybe).</summary>
    public bool Falls { get; init; } = true;
    /// <summary>Whether riders pump below planing (off in polar checks of the engine).</summary>
    public bool Pumping { get; init; } = true;
    /// <summary>Clock time of the starting signal (for GPX), UTC.</summary>
    public DateTime StartTimeUtc { get; init; } = new(2026, 6, 14, 13, 0, 0, DateTimeKind.Utc);
    public ulong Seed { get; init; } = 1;
}

/// <summary>The right-of-way rules as the engine applies them (docs/tactics.md).</summary>
public sealed record RuleSettings
{
    /// <summary>Whether riders look out and keep clear as the rules ask (off: contacts are only judged).</summary>
    public bool GiveWay { get; init; } = true;
    /// <summary>Whether right-of-way riders give room when changing course (RRS 16.1, the riders' part: a change of course into a board that could no longer keep clear is held off).</summary>
    public bool GiveRoom { get; init; } = true;
    /// <summary>Whether the judge applies rule 16.1 (a right-of-way board changing course without giving room broke it) and the exoneration of rule 43.1(a).</summary>
    public bool JudgeRoom { get; init; } = true;
    /// <summary>Whether a board found to have broken a rule in a contact takes a one-turn penalty.</summary>
    public bool Penalties { get; init; } = true;
    /// <summary>Rate of each rider's lookout for conflicts, per second.</summary>
    public double LookoutHz { get; init; } = 5;
    /// <summary>Hulls closer than this are in contact, m.</summary>
    public double ContactM { get; init; } = 1.0;
    /// <summary>Boards within this distance of the mark they are about to round are "rounding or passing" (Appendix B), m.</summary>
    public double MarkRoomM { get; init; } = 15;
}

/// <summary>Everything a race needs, resolved and validated.</summary>
public sealed record RaceSetup(string Name, string Description, string VenueName, double LatDeg, double LonDeg,
    WindSettings Wind, RaceSettings Race, Course Course, IReadOnlyList<BoardEntry> Boards, string SourcePath)
{
    public RuleSettings Rules { get; init; } = new();
    /// <summary>Compiled class libraries with tactics of the user's own (full paths), loaded into the race's tactic registry.</summary>
    public IReadOnlyList<string> TacticAssemblies { get; init; } = [];
}

