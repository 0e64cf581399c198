namespace CourseSim.Replay;

/// <summary>A board as the replay names it.</summary>
public sealed record ReplayBoard(string Name, string Equipment, double SailAreaM2, double RiderMassKg, double Skill);

/// <summary>A course step: kind (mark, gate, finish), name, rounding side, and its points (x, y pairs, m).</summary>
public sealed record ReplayStep(string Kind, string Name, string Rounding, double[] Points);

/// <summary>An event of the race.</summary>
public sealed record ReplayEvent(double TimeS, int Board, string Kind, double X, double Y, string Detail);

/// <summary>A contact between boards as judged: time, place, the board to keep clear and the other (-1: none), rule, outcome.</summary>
public sealed record ReplayIncident(double TimeS, double X, double Y, int KeepClear, int RightOfWay, string Rule, bool Penalty, bool Avoidable, string Detail);

/// <summary>A board's result.</summary>
public sealed record ReplayResult(int Board, int? Place, bool Finished, double? ElapsedS, double DistanceM, int Tacks, int Gybes, int Falls);

/// <summary>
/// The wind on a coarse grid over the course at intervals, for display: speed (m/s, 10 m) and direction (deg from),
/// frame-major then row-major (y rows from the south, x columns from the west).
/// </summary>
public sealed record ReplayWind(double X0, double Y0, double CellM, int Nx, int Ny, double StartS, double IntervalS, int Frames,
    float[] SpeedMs, float[] FromDeg);

/// <summary>Everything in a replay file (docs/replay.md).</summary>
public sealed class ReplayData
{
    public int Version { get; init; }
    public string Engine { get; init; } = "";
    public string Scenario { get; init; } = "";
    public string Venue { get; init; } = "";
    public double OriginLatDeg { get; init; }
    public double OriginLonDeg { get; init; }
    public ulong Seed { get; init; }
    public string StartTimeUtc { get; init; } = "";
    public double StepHz { get; init; }
    public double IntervalS { get; init; }
    /// <summary>Time of the first frame from the starting signal, s.</summary>
    public double StartS { get; init; }
    public int Frames { get; init; }
    public IReadOnlyList<ReplayBoard> Boards { get; init; } = [];
    public string CourseKind { get; init; } = "";
    public double CourseAxisDeg { get; init; }
    /// <summary>Start line: ax, ay, bx, by (m) and the unit normal towards the course side nx, ny.</summary>
    public double[] StartLine { get; init; } = [];
    public IReadOnlyList<ReplayStep> Steps { get; init; } = [];
    /// <summary>Per-sample columns (frame-major: frame k, board b at k x boards + b), by name (docs/replay.md).</summary>
    public IReadOnlyDictionary<string, float[]> Columns { get; init; } = new Dictionary<string, float[]>();
    public byte[] Flags { get; init; } = [];
    public byte[] NextStep { get; init; } = [];
    public IReadOnlyList<ReplayEvent> Events { get; init; } = [];
    public IReadOnlyList<ReplayIncident> Incidents { get; init; } = [];
    public IReadOnlyList<ReplayResult> Results { get; init; } = [];
    public ReplayWind? Wind { get; init; }

    public float Value(string column, int frame, int board) => Columns[column][frame * Boards.Count + board];
}

/// <summary>A replay that cannot be read: names the file and what is wrong.</summary>
public sealed class ReplayException(string message) : Exception(message);
