using System.Globalization;
using System.Text;

namespace CourseSim.RigFit;

/// <summary>
/// The calibrated equipment file: the original text, with each fitted key set in its table (or the table added) and a
/// comment saying where the value came from. Everything else of the original is kept as written.
/// </summary>
public static class CalibratedFile
{
    public static string Write(string original, IReadOnlyList<FittedKey> keys, string source)
    {
        var lines = original.Replace("\r\n", "\n").Split('\n').ToList();
        foreach (var k in keys)
        {
            int dot = k.Key.IndexOf('.');
            string table = k.Key[..dot], name = k.Key[(dot + 1)..];
            string ci = double.IsFinite(k.Low) ? $", 95 % {F(k.Low)} .. {F(k.High)}" : "";
            string line = $"{name} = {F(k.Value)}  # fitted by coursesim rig-fit from {source}{ci}; was {F(k.Original)}";
            int header = lines.FindIndex(l => l.Trim() == $"[{table}]");
            if (header < 0)
            {
                if (lines.Count > 0 && lines[^1].Length == 0) lines.RemoveAt(lines.Count - 1);
                lines.Add(""); lines.Add($"[{table}]"); lines.Add(line); lines.Add("");
                continue;
            }
            int end = header + 1;
            while (end < lines.Count && !lines[end].TrimStart().StartsWith('[')) end++;
            int at = -1;
            for (int i = header + 1; i < end; i++)
            {
                string t = lines[i].TrimStart();
                if (t.StartsWith(name, StringComparison.Ordinal) && t[name.Length..].TrimStart().StartsWith('=')) { at = i; break; }
            }
            if (at >= 0) lines[at] = line;
            else
            {
                int ins = end;
                while (ins > header + 1 && lines[ins - 1].Trim().Length == 0) ins--;
                lines.Insert(ins, line);
            }
        }
        // The set-up's label says it is the fitted one, so a comparison with the original tells them apart.
        int firstTable = lines.FindIndex(l => l.TrimStart().StartsWith('['));
        int nameAt = lines.FindIndex(l => l.TrimStart().StartsWith("name", StringComparison.Ordinal) && l.Contains('='));
        if (nameAt >= 0 && (firstTable < 0 || nameAt < firstTable))
        {
            string v = lines[nameAt][(lines[nameAt].IndexOf('=') + 1)..].Trim();
            int hash = v.IndexOf('#'); if (hash > 0 && v.LastIndexOf('"', hash) > 0) v = v[..hash].Trim();
            if (v.Length >= 2 && v[0] == '"' && v[^1] == '"') lines[nameAt] = $"name = \"{v[1..^1]} (fitted)\"  # was {v}";
        }
        var sb = new StringBuilder();
        sb.Append($"# Calibrated by coursesim rig-fit from {source} (docs/rig-fit.md): the fitted keys say so beside them.\n");
        sb.Append(string.Join("\n", lines));
        if (!sb.ToString().EndsWith('\n')) sb.Append('\n');
        return sb.ToString();
    }

    static string F(double v) => v.ToString("0.###", CultureInfo.InvariantCulture);
}
