using CourseSim.Entities;
using CourseSim.Equilibrium;
using CourseSim.Random;

namespace CourseSim.Engine;

/// <summary>
/// The cold, per-board data of a race, fixed once the race is built and kept in one race-owned place: ids and names,
/// the identity keys that seed each board's random streams, the boards' canonical order, rig tables and polars, hull
/// lengths, and constants the step derives from the rider's skill. Indexed by <see cref="BoardId"/> (the board's place in
/// the scenario), but nothing here or in the step depends on that place: random streams and staggering are keyed by
/// <see cref="Keys"/>, and every fleet-wide loop whose order could matter walks <see cref="ByRank"/>, the boards in the
/// ordinal order of their ids.
/// </summary>
public sealed class Fleet
{
    public int Count { get; }
    public string[] Ids { get; }
    public string[] Names { get; }
    /// <summary>A 64-bit key of each board's id (FNV-1a of its UTF-8 bytes, mixed): the board's random streams are keyed by it.</summary>
    public ulong[] Keys { get; }
    /// <summary>Rank of each board in the ordinal order of the ids, and the board at each rank.</summary>
    public int[] Rank { get; }
    public int[] ByRank { get; }
    public RigPolar[] Polars { get; }
    public RigDynamics[] Rigs { get; }
    public Entity[] Entities { get; }
    public double[] LengthM { get; }
    public double[] MastHeightM { get; }
    public double[] Skill { get; }
    /// <summary>Share of the gap to the wanted sheet closed per step (the rider's sheeting lag).</summary>
    public double[] SheetGain { get; }
    /// <summary>Yaw rate while stepping round the mast in a tack, rad/s.</summary>
    public double[] CrossYaw { get; }
    public double[] InvCarveRadius { get; }
    /// <summary>Recovery factor of the rider's anaerobic reserve per step at rest.</summary>
    public double[] RestDecay { get; }
    public double[] DtOverMass { get; }
    /// <summary>Time from a decision to acting on it, s.</summary>
    public double[] ReactionS { get; }
    /// <summary>The step phase (0..every-1) at which each board samples the wind: from its key, so the fleet is spread over the phases.</summary>
    public int[] SenseSlot { get; }

    public Fleet(IReadOnlyList<BoardEntry> boards, Func<Equipment, RigPolar> rigFor, double dt, int senseEvery)
    {
        int n = Count = boards.Count;
        Ids = boards.Select(b => b.Id).ToArray();
        if (Ids.Distinct(StringComparer.Ordinal).Count() != n) throw new ArgumentException("two boards of a fleet share an id");
        Names = boards.Select(b => b.Name).ToArray();
        Keys = Ids.Select(KeyOf).ToArray();
        ByRank = Enumerable.Range(0, n).OrderBy(b => Ids[b], StringComparer.Ordinal).ToArray();
        Rank = new int[n];
        for (int r = 0; r < n; r++) Rank[ByRank[r]] = r;
        // Set-ups are resolved in parallel (each a pure function of its equipment, so the result does not depend on the
        // thread count); the race itself is single-threaded.
        var distinct = boards.Select(b => b.Equipment).Distinct().ToArray();
        var resolved = new RigPolar[distinct.Length];
        Parallel.For(0, distinct.Length, k => resolved[k] = rigFor(distinct[k]));
        var byEquipment = new Dictionary<Equipment, RigPolar>();
        for (int k = 0; k < distinct.Length; k++) byEquipment[distinct[k]] = resolved[k];
        Polars = boards.Select(b => byEquipment[b.Equipment]).ToArray();
        Rigs = Polars.Select(p => p.Rig).ToArray();
        Entities = new Entity[n];
        LengthM = Rigs.Select(r => r.Physics.Equipment.Board.LengthM).ToArray();
        MastHeightM = Rigs.Select(r => r.MastHeightM).ToArray();
        Skill = boards.Select(b => b.Equipment.Rider.Skill).ToArray();
        SheetGain = new double[n]; CrossYaw = new double[n]; InvCarveRadius = new double[n]; RestDecay = new double[n];
        DtOverMass = new double[n]; ReactionS = new double[n]; SenseSlot = new int[n];
        for (int b = 0; b < n; b++)
        {
            double skill = Skill[b];
            SheetGain[b] = Math.Min(1, dt / Tuning.Lerp(Tuning.SheetLagExpertS, Tuning.SheetLagNoviceS, skill));
            // Stepping round the mast the board swings through twice the cross-over angle in the crossing time.
            CrossYaw[b] = Units.Unit.DegToRad(2 * Tuning.TackCrossStartDeg) / Tuning.Lerp(Tuning.TackCrossExpertS, Tuning.TackCrossNoviceS, skill);
            InvCarveRadius[b] = 1 / Tuning.Lerp(Tuning.CarveRadiusExpertM, Tuning.CarveRadiusNoviceM, skill);
            RestDecay[b] = Rigs[b].Rider.RestingDecay(dt);
            DtOverMass[b] = dt / Rigs[b].MassKg;
            ReactionS[b] = Tuning.Lerp(Tuning.ReactionExpertS, Tuning.ReactionNoviceS, skill);
            SenseSlot[b] = (int)(Keys[b] % (ulong)senseEvery);
        }
    }

    /// <summary>The identity key of a board id: FNV-1a 64 over its UTF-8 bytes, then SplitMix64's finaliser.</summary>
    public static ulong KeyOf(string id)
    {
        ulong h = 0xCBF29CE484222325UL;
        foreach (byte c in System.Text.Encoding.UTF8.GetBytes(id)) { h ^= c; h *= 0x100000001B3UL; }
        return CounterRng.Mix(h);
    }

    /// <summary>Board b's own sub-stream of a purpose's stream (<paramref name="purpose"/> tells apart several streams of one board).</summary>
    public CounterRng Stream(CounterRng rng, int b, ulong purpose = 0) => rng.For(Keys[b] ^ CounterRng.Mix(purpose + 0x51ED));
}
