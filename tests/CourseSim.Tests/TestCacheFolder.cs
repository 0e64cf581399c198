using System.Runtime.CompilerServices;

namespace CourseSim.Tests;

/// <summary>
/// Keeps the tests hermetic: the command line keeps its rig table cache on disk by default (RigTableStore), so before
/// any test runs, COURSESIM_CACHE_DIR points at a folder of this test run's own, removed when the run ends. The
/// library's RigCache has no disk cache unless given one.
/// </summary>
static class TestCacheFolder
{
    public static readonly string Root = Path.Combine(Path.GetTempPath(), $"coursesim-test-cache-{System.Environment.ProcessId}");

#pragma warning disable CA2255 // a test assembly's own set-up, not a library's
    [ModuleInitializer]
#pragma warning restore CA2255
    internal static void Init()
    {
        System.Environment.SetEnvironmentVariable("COURSESIM_CACHE_DIR", Root);
        AppDomain.CurrentDomain.ProcessExit += (_, _) =>
        {
            try { if (Directory.Exists(Root)) Directory.Delete(Root, true); }
            catch (IOException) { /* another process's files: left for the system's temp cleaner */ }
        };
    }
}
