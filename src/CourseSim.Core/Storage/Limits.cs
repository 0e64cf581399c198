using System.Globalization;

namespace CourseSim.Storage;

/// <summary>
/// Upper limits on inputs, so that a wrong or hostile file is refused with a message rather than filling the memory
/// (docs/limits.md). Each has a default and an environment variable that raises (or lowers) it.
/// </summary>
public static class Limits
{
    /// <summary>Largest settings file (TOML: equipment, scenario, experiment), MB. COURSESIM_MAX_INPUT_MB.</summary>
    public static double MaxInputMb => Get("COURSESIM_MAX_INPUT_MB", 8);
    /// <summary>Largest replay file read by the viewer, MB. COURSESIM_MAX_REPLAY_MB.</summary>
    public static double MaxReplayMb => Get("COURSESIM_MAX_REPLAY_MB", 256);
    /// <summary>Most boards in one race. COURSESIM_MAX_BOARDS.</summary>
    public static int MaxBoards => (int)Get("COURSESIM_MAX_BOARDS", 500);
    /// <summary>Most items in one list (a settings list, --wind, --angles, course.order). COURSESIM_MAX_LIST.</summary>
    public static int MaxList => (int)Get("COURSESIM_MAX_LIST", 1000);
    /// <summary>Most variants in one experiment. COURSESIM_MAX_VARIANTS.</summary>
    public static int MaxVariants => (int)Get("COURSESIM_MAX_VARIANTS", 100);

    public static string Override(string variable) => $"(raise it with the environment variable {variable})";

    static double Get(string variable, double fallback)
    {
        string? v = System.Environment.GetEnvironmentVariable(variable);
        return v is not null && double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out double d) && d > 0 && d < 1e9 ? d : fallback;
    }
}

/// <summary>
/// Reads an input file whole, refusing what is not an ordinary file (a device such as /dev/zero, a pipe or terminal
/// such as /dev/stdin, a folder) and what is larger than a limit, before reading it.
/// </summary>
public static class InputFile
{
    /// <summary>The bytes of the file, or why it cannot be read (null problem when read).</summary>
    public static byte[]? TryRead(string path, double maxMb, string limitVariable, out string problem)
    {
        problem = "";
        if (Directory.Exists(path)) { problem = "is a folder, not a file"; return null; }
        if (!File.Exists(path)) { problem = "not found"; return null; }
        if (UnixFileType.IsSpecial(path)) { problem = "is not an ordinary file (a device, pipe or socket): give the path of a file"; return null; }
        try
        {
            using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1, FileOptions.SequentialScan);
            // Pipes and terminals cannot seek; devices and /proc files report no length yet give bytes.
            if (!fs.CanSeek) { problem = "is not an ordinary file (a pipe or terminal): give the path of a file"; return null; }
            long length = fs.Length;
            long max = (long)(maxMb * 1024 * 1024);
            if (length > max) { problem = $"is {length / 1048576.0:0.#} MB, over the limit of {maxMb:0.#} MB {Limits.Override(limitVariable)}"; return null; }
            var bytes = new byte[length];
            fs.ReadExactly(bytes);
            if (fs.Read(new byte[1]) > 0) { problem = "is not an ordinary file (a device or a file that grows while read): give the path of a file"; return null; }
            return bytes;
        }
        catch (EndOfStreamException) { problem = "changed while it was read"; return null; }
        catch (UnauthorizedAccessException e) { problem = $"cannot be read ({e.Message})"; return null; }
        catch (IOException e) { problem = $"cannot be read ({e.Message})"; return null; }
    }
}

/// <summary>
/// The file type from stat(2) on Linux (x64 and arm64 glibc layouts), so a named pipe is refused before opening it
/// (opening one waits for a writer). Elsewhere it answers false and the checks after opening apply.
/// </summary>
static class UnixFileType
{
    [System.Runtime.InteropServices.DllImport("libc", EntryPoint = "stat", SetLastError = true)]
    static extern unsafe int Stat(string path, byte* buffer);

    public static unsafe bool IsSpecial(string path)
    {
        if (!OperatingSystem.IsLinux()) return false;
        int offset = System.Runtime.InteropServices.RuntimeInformation.ProcessArchitecture switch
        {
            System.Runtime.InteropServices.Architecture.X64 => 24,
            System.Runtime.InteropServices.Architecture.Arm64 => 16,
            _ => -1,
        };
        if (offset < 0) return false;
        byte* buffer = stackalloc byte[512];
        try
        {
            if (Stat(path, buffer) != 0) return false;
        }
        catch (EntryPointNotFoundException) { return false; }
        catch (DllNotFoundException) { return false; }
        uint mode = *(uint*)(buffer + offset);
        const uint Format = 0xF000, Regular = 0x8000, Folder = 0x4000;
        uint kind = mode & Format;
        return kind != Regular && kind != Folder;
    }
}
