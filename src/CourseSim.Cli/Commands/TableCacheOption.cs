using System.CommandLine;
using CourseSim.Equilibrium;

namespace CourseSim.Cli.Commands;

/// <summary>
/// The rig table cache on the commands that race (docs/engine.md, "Rig tables"): on by default, kept in
/// COURSESIM_CACHE_DIR, else $XDG_CACHE_HOME/coursesim, else ~/.cache/coursesim; --no-table-cache builds every table
/// afresh and writes none.
/// </summary>
public static class TableCacheOption
{
    public static Option<bool> Create() => new("--no-table-cache")
    {
        Description = "build the rig tables afresh and keep none on disk (default: read and saved in COURSESIM_CACHE_DIR, else ~/.cache/coursesim)",
    };

    /// <summary>The run's rig cache: with the disk cache unless <paramref name="off"/> (or there is no home folder).</summary>
    public static RigCache Rigs(bool off, TextWriter stderr)
    {
        if (off || RigTableStore.DefaultFolder() is not { } folder) return new RigCache();
        return new RigCache(new RigTableStore(folder, m => { lock (stderr) stderr.WriteLine("warning: " + m); }));
    }
}
