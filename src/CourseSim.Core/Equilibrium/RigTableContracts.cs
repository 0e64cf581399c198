using MessagePack;

namespace CourseSim.Equilibrium;

// The on-disk rig table cache's contracts (RigTableStore; docs/engine.md, "Rig tables"). Floats and doubles are stored
// as MessagePack float32 and float64: the exact bits the tables hold.

/// <summary>One cache file: the format version, the key it was saved under, and the tables as MessagePack bytes with
/// their SHA-256, so a file damaged or cut short is recognised and ignored.</summary>
[MessagePackObject]
public sealed class RigTableFile
{
    [Key(0)] public int Format { get; set; }
    [Key(1)] public string Key { get; set; } = "";
    [Key(2)] public byte[] Payload { get; set; } = [];
    [Key(3)] public byte[] PayloadSha256 { get; set; } = [];
}

/// <summary>What a set-up's rig tables hold that does not depend on the seed.</summary>
[MessagePackObject]
public sealed class RigTables
{
    /// <summary>The set-up's stable text the key was made from (for a person reading the file).</summary>
    [Key(0)] public string Setup { get; set; } = "";
    [Key(1)] public List<PolarRowData> Rows { get; set; } = [];
    [Key(2)] public List<PlanRowData> Plan { get; set; } = [];
    [Key(3)] public int[] DropOffKeys { get; set; } = [];
    [Key(4)] public double[] DropOffWinds { get; set; } = [];
    [Key(5)] public TrimTableData? Trim { get; set; }
    [Key(6)] public HullTableData? Hull { get; set; }
}

/// <summary>The hull's resistance table (<see cref="CourseSim.Hull.HullModel"/>), one entry per 0.05 m/s.</summary>
[MessagePackObject]
public sealed class HullTableData
{
    [Key(0)] public double[] Resistance { get; set; } = [];
    [Key(1)] public double[] LiftFraction { get; set; } = [];
    [Key(2)] public double[] TrimDeg { get; set; } = [];
    [Key(3)] public double[] WettedLengthM { get; set; } = [];

    /// <summary>The table as the hull holds it, for saving.</summary>
    public static HullTableData Of(IReadOnlyList<Hull.HullState> t) => new()
    {
        Resistance = t.Select(x => x.Resistance).ToArray(), LiftFraction = t.Select(x => x.LiftFraction).ToArray(),
        TrimDeg = t.Select(x => x.TrimDeg).ToArray(), WettedLengthM = t.Select(x => x.WettedLengthM).ToArray(),
    };

    /// <summary>The table back as the hull holds it (shapes checked by the store).</summary>
    public Hull.HullState[] ToStates() => Resistance.Select((r, i) => new Hull.HullState(r, LiftFraction[i], TrimDeg[i], WettedLengthM[i])).ToArray();
}

/// <summary>One built row of <see cref="RigPolar"/> (one listed wind speed).</summary>
[MessagePackObject]
public sealed class PolarRowData
{
    [Key(0)] public int W { get; set; }
    [Key(1)] public float[] Speed { get; set; } = [];
    [Key(2)] public float[] Get { get; set; } = [];
    [Key(3)] public double UpTwa { get; set; }
    [Key(4)] public double DownTwa { get; set; }
    [Key(5)] public double UpVmg { get; set; }
    [Key(6)] public double DownVmg { get; set; }
    [Key(7)] public double GetUpTwa { get; set; }
    [Key(8)] public double GetDownTwa { get; set; }
}

/// <summary>Where the planing branch exists at each angle, at one listed wind speed.</summary>
[MessagePackObject]
public sealed class PlanRowData
{
    [Key(0)] public int W { get; set; }
    [Key(1)] public bool[] Plan { get; set; } = [];
}

/// <summary><see cref="RigDynamics"/>' trim table: [beta, f] cells and the full-power sail side force per beta.</summary>
[MessagePackObject]
public sealed class TrimTableData
{
    [Key(0)] public float[] Drive { get; set; } = [];
    [Key(1)] public float[] Side { get; set; } = [];
    [Key(2)] public float[] SailSide { get; set; } = [];
    [Key(3)] public float[] Alpha { get; set; } = [];
    [Key(4)] public double[] FullSailSide { get; set; } = [];
}
