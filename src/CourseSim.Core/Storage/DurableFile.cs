using System.Security.Cryptography;
using System.Text;

namespace CourseSim.Storage;

/// <summary>
/// Files that a crash, a power cut or a full disk cannot leave half-written: the bytes go to PATH.tmp, are flushed to
/// the disk (fsync), and only then renamed over PATH; on any failure the temporary file is removed and the error
/// passed on. Sealed text files carry their own SHA-256 on a last line, so a file that a power cut emptied or a disk
/// damaged is recognised as such when read back.
/// </summary>
public static class DurableFile
{
    /// <summary>Opens the temporary file to write; tests swap it for a stream that fails part way (a full disk).</summary>
    public delegate Stream Opener(string tmpPath);

    public static readonly Opener OpenOnDisk = tmp => new FileStream(tmp, FileMode.Create, FileAccess.Write, FileShare.None);

    public static void Write(string path, byte[] bytes, Opener? open = null)
    {
        string tmp = path + ".tmp";
        try
        {
            using (var s = (open ?? OpenOnDisk)(tmp))
            {
                s.Write(bytes);
                if (s is FileStream fs) fs.Flush(flushToDisk: true); else s.Flush();
            }
            File.Move(tmp, path, true);
        }
        catch
        {
            TryDelete(tmp);
            throw;
        }
    }

    public static void WriteText(string path, string text, Opener? open = null) => Write(path, new UTF8Encoding(false).GetBytes(text), open);

    const string SealPrefix = "# sha256 ";

    /// <summary>The text with a last line holding the SHA-256 of everything before it.</summary>
    public static string Seal(string text) => text + SealPrefix + Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text))) + "\n";

    /// <summary>The content of a sealed file, or why it cannot be trusted (missing, empty, no seal, checksum mismatch).</summary>
    public static bool TryReadSealed(string path, out string content, out string problem)
    {
        content = ""; problem = "";
        if (!File.Exists(path)) { problem = "missing"; return false; }
        string text;
        try { text = File.ReadAllText(path, Encoding.UTF8); }
        catch (IOException e) { problem = $"cannot be read ({e.Message})"; return false; }
        if (text.Length == 0) { problem = "empty"; return false; }
        int cut = text.LastIndexOf(SealPrefix, StringComparison.Ordinal);
        if (cut < 0 || (cut > 0 && text[cut - 1] != '\n')) { problem = "no checksum line (incomplete or damaged)"; return false; }
        string body = text[..cut], sum = text[(cut + SealPrefix.Length)..].TrimEnd('\n');
        if (!string.Equals(sum, Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(body))), StringComparison.Ordinal))
        {
            problem = "checksum mismatch (damaged)";
            return false;
        }
        content = body;
        return true;
    }

    public static void TryDelete(string path)
    {
        try { File.Delete(path); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    /// <summary>Whether an IO error is the disk (or quota) being full.</summary>
    public static bool IsDiskFull(IOException e) => (e.HResult & 0xFFFF) is 28 or 112 || e.Message.Contains("No space left", StringComparison.OrdinalIgnoreCase);
}
