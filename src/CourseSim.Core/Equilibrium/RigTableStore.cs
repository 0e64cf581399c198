using System.Globalization;
using System.Reflection;
using System.Runtime.InteropServices;
using System.Security.Cryptography;
using System.Text;
using MessagePack;

namespace CourseSim.Equilibrium;

/// <summary>
/// The rig tables kept on disk between runs (docs/engine.md, "Rig tables"): a set-up's polar rows, trim table and hull resistance table depend
/// only on the set-up and the model code, never on the seed, so a second run reads them back instead of building them.
/// One file per set-up, named by its key: the SHA-256 of the format version, the CourseSim.Core assembly's module
/// version id (deterministic builds make it a hash of the code: any change to the model gives new keys), the runtime
/// and CPU architecture, and the set-up's every field (doubles in round-trip form). The key is stored inside the file
/// and checked, with a SHA-256 of the tables; a file that fails any check is ignored with one warning and the tables
/// are built afresh. Writes go to a temporary file in the same folder, renamed over the old one, so a reader (another
/// process too) sees the old file or the new, never half of one. Savers take turns: each holds the folder's lock file
/// (an exclusive lock the operating system drops if the process dies) while it reads what is on disk, merges its own rows
/// in and renames, so no saver's rows are lost to another's (<see cref="LockWaitMs"/>). Used through <see cref="RigCache"/>.
/// </summary>
public sealed class RigTableStore
{
    /// <summary>Bumped when the file's contracts change.</summary>
    public const int FormatVersion = 1;
    const string Extension = ".rigtables";
    /// <summary>The lock file savers take turns on (in the tables' folder).</summary>
    public const string LockName = "save.lock";
    /// <summary>
    /// Longest a saver waits for another's turn, ms (a save is a read, a merge and a write of well under a megabyte: tens
    /// of milliseconds). Past it the save goes ahead unlocked, merged with what the file held when read, as without the
    /// lock: the file stays whole, but rows another saver adds meanwhile can be lost (built again when next needed).
    /// </summary>
    public const int LockWaitMs = 10_000;

    readonly Action<string> _warn;

    /// <summary>The folder the files are in.</summary>
    public string Folder { get; }

    /// <param name="folder">the folder for the files (made when first saving)</param>
    /// <param name="warn">where a warning line goes (a file ignored, a save that failed): the caller's (the CLI prints
    /// it on standard error; nothing in the engine library writes to the console)</param>
    public RigTableStore(string folder, Action<string> warn)
    {
        Folder = folder;
        _warn = warn ?? throw new ArgumentNullException(nameof(warn));
    }

    /// <summary>The default folder: COURSESIM_CACHE_DIR if set, else $XDG_CACHE_HOME/coursesim, else ~/.cache/coursesim;
    /// the tables in its rig-tables/ subfolder. Null if there is no home folder to put it in.</summary>
    public static string? DefaultFolder()
    {
        string? root = System.Environment.GetEnvironmentVariable("COURSESIM_CACHE_DIR");
        if (string.IsNullOrWhiteSpace(root))
        {
            string? xdg = System.Environment.GetEnvironmentVariable("XDG_CACHE_HOME");
            string home = System.Environment.GetFolderPath(System.Environment.SpecialFolder.UserProfile);
            if (!string.IsNullOrWhiteSpace(xdg) && Path.IsPathRooted(xdg)) root = Path.Combine(xdg, "coursesim");
            else if (home.Length > 0) root = Path.Combine(home, ".cache", "coursesim");
            else return null;
        }
        return Path.Combine(root, "rig-tables");
    }

    static readonly string CodeIdentity = "core " + typeof(RigPolar).Assembly.ManifestModule.ModuleVersionId.ToString("N") +
        "\nruntime " + RuntimeInformation.FrameworkDescription + " " + RuntimeInformation.ProcessArchitecture + "\n";

    /// <summary>The set-up's key (64 hex digits): the same set-up and model code give the same key in every process.</summary>
    public static string KeyOf(Equipment eq) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(
        $"coursesim rig tables {FormatVersion}\n{CodeIdentity}{StableText(eq)}")));

    /// <summary>Every field of the set-up, one `path=value` line each in name order; doubles in round-trip form.</summary>
    public static string StableText(Equipment eq)
    {
        var sb = new StringBuilder();
        Append(sb, "", eq);
        return sb.ToString();
    }

    static void Append(StringBuilder sb, string path, object o)
    {
        var props = o.GetType().GetProperties(BindingFlags.Public | BindingFlags.Instance)
            .Where(p => p.SetMethod is not null && p.GetIndexParameters().Length == 0).OrderBy(p => p.Name, StringComparer.Ordinal);
        foreach (var p in props)
        {
            string name = path + p.Name;
            switch (p.GetValue(o))
            {
                case double d: sb.Append(name).Append('=').Append(d.ToString("R", CultureInfo.InvariantCulture)).Append('\n'); break;
                case string s: sb.Append(name).Append('=').Append(s.Length).Append(':').Append(s).Append('\n'); break;
                case int or long or bool or Enum: sb.Append(name).Append('=').Append(Convert.ToString(p.GetValue(o), CultureInfo.InvariantCulture)).Append('\n'); break;
                case null: sb.Append(name).Append("=null\n"); break;
                case var v when v.GetType().Namespace?.StartsWith("CourseSim", StringComparison.Ordinal) == true && v.GetType().IsClass:
                    Append(sb, name + ".", v); break;
                case var v:
                    // A new kind of field must be written out here, or two set-ups differing in it would share a file.
                    throw new NotSupportedException($"rig table key: {name} is a {v.GetType().Name}, which the key does not write out");
            }
        }
    }

    string PathFor(string key) => Path.Combine(Folder, key + Extension);

    /// <summary>Loads what the file holds for this set-up into a new polar (the rest is built on use as ever).</summary>
    internal (RigPolar Polar, ulong Rows, bool Tables) Load(Equipment eq)
    {
        string key = KeyOf(eq);
        var t = TryRead(PathFor(key), key, true);
        var physics = new BoardPhysics(eq, t?.Hull?.ToStates());
        var rig = t?.Trim is { } trim ? RigDynamics.FromTables(physics, trim) : new RigDynamics(physics);
        var polar = new RigPolar(rig);
        ulong rows = t is null ? 0 : polar.ImportRows(t);
        return (polar, rows, t?.Trim is not null && t.Hull is not null);
    }

    /// <summary>Saves what the polar has built that the file lacks, merged with what the file holds now (another
    /// process may have added rows since it was loaded): the file's rows are taken into the polar as at loading
    /// (<see cref="RigPolar.ImportRows"/>, which keeps what the polar built; rows are pure functions of the set-up, so
    /// this changes no bit) and the polar's whole set is written. False if there was nothing new or the save failed
    /// (warned); <paramref name="savedRows"/> are the rows the file now holds.</summary>
    internal bool Save(RigPolar polar, ulong loadedRows, bool loadedTables, out ulong savedRows)
    {
        savedRows = 0;
        if ((polar.ReadyRows & ~loadedRows) == 0 && loadedTables) return false;
        using var turn = TakeTurn();
        var eq = polar.Rig.Equipment;
        string key = KeyOf(eq), path = PathFor(key);
        if (TryRead(path, key, false) is { } disk) polar.ImportRows(disk);
        var mine = polar.ExportRows();
        mine.Setup = StableText(eq);
        mine.Trim = polar.Rig.ExportTrim();
        mine.Hull = HullTableData.Of(polar.Rig.Hull.Table);
        foreach (var r in mine.Rows) savedRows |= 1UL << r.W;
        byte[] payload = MessagePackSerializer.Serialize(mine);
        byte[] bytes = MessagePackSerializer.Serialize(new RigTableFile { Format = FormatVersion, Key = key, Payload = payload, PayloadSha256 = SHA256.HashData(payload) });
        string tmp = Path.Combine(Folder, $"{key}.{System.Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            Directory.CreateDirectory(Folder);
            using (var s = new FileStream(tmp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                s.Write(bytes);
                s.Flush(flushToDisk: true);
            }
            File.Move(tmp, path, overwrite: true);
            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            try { File.Delete(tmp); } catch (Exception d) when (d is IOException or UnauthorizedAccessException) { /* nothing more to do */ }
            _warn($"rig table cache: cannot save {path} ({e.Message}); the tables will be built again next time");
            savedRows = 0;
            return false;
        }
    }

    /// <summary>
    /// This saver's turn: the lock file held exclusively (FileShare.None: an advisory lock on Unix, honoured by every
    /// CourseSim process and by other handles in this one), retried until <see cref="LockWaitMs"/>. Null (save unlocked)
    /// if the folder cannot be made or the wait runs out; a warning says so only in the second case.
    /// </summary>
    FileStream? TakeTurn()
    {
        string path = Path.Combine(Folder, LockName);
        var waited = System.Diagnostics.Stopwatch.StartNew();
        for (int attempt = 0; ; attempt++)
        {
            try
            {
                Directory.CreateDirectory(Folder);
                return new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
            }
            catch (IOException) when (waited.ElapsedMilliseconds < LockWaitMs)
            {
                Thread.Sleep(Math.Min(50, 2 + attempt)); // another saver's turn
            }
            catch (IOException e)
            {
                _warn($"rig table cache: waited {LockWaitMs / 1000} s for {path} ({e.Message}); saving without it");
                return null;
            }
            catch (UnauthorizedAccessException)
            {
                return null; // the save itself will warn that the folder cannot be written
            }
        }
    }

    /// <summary>The file's tables if it exists and passes every check, else null (with a warning if asked).</summary>
    RigTables? TryRead(string path, string key, bool warn)
    {
        if (!File.Exists(path)) return null;
        string? problem;
        RigTables? t = null;
        try
        {
            var f = MessagePackSerializer.Deserialize<RigTableFile>(File.ReadAllBytes(path));
            problem = f.Format != FormatVersion ? $"format {f.Format}, expected {FormatVersion}"
                : f.Key != key ? "saved under another key"
                : !SHA256.HashData(f.Payload).AsSpan().SequenceEqual(f.PayloadSha256) ? "checksum mismatch (damaged)"
                : Check(t = MessagePackSerializer.Deserialize<RigTables>(f.Payload));
        }
        catch (Exception e) when (e is not OutOfMemoryException) // whatever a damaged file throws: ignore it, never crash
        {
            problem = $"cannot be read ({e.Message})";
        }
        if (problem is null) return t;
        if (warn) _warn($"rig table cache: ignoring {path}: {problem}; building the tables again");
        return null;
    }

    /// <summary>Null if every table has the shape the polar and rig expect, else what is wrong.</summary>
    static string? Check(RigTables t)
    {
        int nt = (int)(RigPolar.TwsMaxKn / RigPolar.TwsStepKn) + 1, n = RigPolar.RowLength;
        foreach (var r in t.Rows)
            if (r is null || r.W < 0 || r.W >= nt || r.Speed?.Length != n || r.Get?.Length != n) return "a polar row of the wrong shape";
        if (t.Rows.Select(r => r.W).Distinct().Count() != t.Rows.Count) return "a polar row twice";
        foreach (var p in t.Plan)
            if (p is null || p.W < 0 || p.W >= nt || p.Plan?.Length != n) return "a plan row of the wrong shape";
        if (t.DropOffKeys is null || t.DropOffWinds is null || t.DropOffKeys.Length != t.DropOffWinds.Length) return "drop-off memo of the wrong shape";
        if (t.Trim is { } tr && (tr.Drive?.Length != RigDynamics.TrimCells || tr.Side?.Length != RigDynamics.TrimCells
                || tr.SailSide?.Length != RigDynamics.TrimCells || tr.Alpha?.Length != RigDynamics.TrimCells || tr.FullSailSide?.Length != RigDynamics.TrimRows))
            return "a trim table of the wrong shape";
        int nh = CourseSim.Hull.HullModel.TableLength;
        if (t.Hull is { } hu && (hu.Resistance?.Length != nh || hu.LiftFraction?.Length != nh || hu.TrimDeg?.Length != nh || hu.WettedLengthM?.Length != nh))
            return "a hull table of the wrong shape";
        return null;
    }
}
