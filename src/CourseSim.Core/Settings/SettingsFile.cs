using System.Globalization;
using Tomlyn;
using Tomlyn.Model;

namespace CourseSim.Settings;

/// <summary>A value read from a file or an override, with where it came from.</summary>
public readonly record struct SettingValue(object Value, string Source, int Line);

/// <summary>
/// Reads a TOML settings file into flat dotted keys with their line numbers, applies "--set table.key=value"
/// overrides, and checks every key against a schema: unknown keys, wrong types and out-of-range values are errors
/// naming file, line, key and the accepted range.
/// </summary>
public sealed class SettingsFile
{
    readonly Dictionary<string, SettingValue> _values = new(StringComparer.Ordinal);
    public SettingsSchema Schema { get; }
    public string Path { get; }
    /// <summary>Folder of the file, for resolving relative paths inside it.</summary>
    public string Directory { get; }

    SettingsFile(SettingsSchema schema, string path)
    {
        Schema = schema;
        Path = path;
        Directory = System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(path)) ?? ".";
    }

    public static SettingsFile Load(string path, SettingsSchema schema, IEnumerable<string>? overrides = null, Func<string, bool>? acceptExtra = null)
    {
        if (!File.Exists(path) && !System.IO.Directory.Exists(path)) throw new SettingsException(path, 0, null, $"file not found (expected {A(schema.Kind)} file in TOML)");
        var bytes = Storage.InputFile.TryRead(path, Storage.Limits.MaxInputMb, "COURSESIM_MAX_INPUT_MB", out string problem)
            ?? throw new SettingsException(path, 0, null, $"{problem} (expected {A(schema.Kind)} file in TOML)");
        string text;
        try { text = new System.Text.UTF8Encoding(false, true).GetString(bytes).TrimStart('\uFEFF'); }
        catch (System.Text.DecoderFallbackException) { throw new SettingsException(path, 0, null, $"not UTF-8 text (expected {A(schema.Kind)} file in TOML)"); }
        return Parse(text, path, schema, overrides, acceptExtra);
    }

    public static SettingsFile Parse(string text, string path, SettingsSchema schema, IEnumerable<string>? overrides = null, Func<string, bool>? acceptExtra = null)
    {
        TomlTable? table;
        try { table = TomlSerializer.Deserialize<TomlTable>(text, (TomlSerializerOptions?)null!); }
        catch (TomlException e)
        {
            string msg = e.Message;
            int cut = msg.IndexOf(" : error : ", StringComparison.Ordinal);
            if (cut >= 0) msg = msg[(cut + 11)..];
            throw new SettingsException(path, e.Line ?? 0, null, $"not valid TOML: {msg}");
        }
        table ??= new TomlTable();
        var lines = TomlKeyLines.Of(text, path);
        var file = new SettingsFile(schema, path);
        foreach (var (key, value) in Flatten(table, ""))
        {
            int line = lines.TryGetValue(key, out int l) ? l : 0;
            file.Put(key, value, path, line, acceptExtra);
        }
        foreach (var o in overrides ?? [])
            file.ApplyOverride(o, acceptExtra);
        return file;
    }

    void ApplyOverride(string o, Func<string, bool>? acceptExtra)
    {
        int eq = o.IndexOf('=');
        if (eq <= 0) throw new SettingsException("--set", 0, null, $"'{o}' is not of the form table.key=value");
        string key = o[..eq].Trim(), raw = o[(eq + 1)..].Trim();
        object value = raw;
        try
        {
            var t = TomlSerializer.Deserialize<TomlTable>("v = " + raw, (TomlSerializerOptions?)null!);
            value = t?["v"] ?? raw;
        }
        catch (TomlException) { /* a bare word: keep it as text */ }
        Put(key, value, "--set", 0, acceptExtra);
    }

    void Put(string key, object value, string source, int line, Func<string, bool>? acceptExtra)
    {
        if (key.Split('.').Any(p => p.Length == 0 || p.Contains('*')))
            throw new SettingsException(source, line, key, key.Contains('*')
                ? "'*' is not a name: in the key list it stands for a name you choose, so give that name (such as boards.maren.equipment); no key applies to all entries at once"
                : "a key has no empty part (write table.key)");
        if (!Schema.TryFind(key, out var spec))
        {
            if (acceptExtra?.Invoke(key) == true) { _values[key] = new SettingValue(value, source, line); return; }
            throw new SettingsException(source, line, key, $"unknown key in {A(Schema.Kind)} file; known keys here: {string.Join(", ", Schema.KnownKeysNear(key))}");
        }
        _values[key] = new SettingValue(Check(spec with { Key = key }, value, source, line), source, line);
    }

    static object Check(KeySpec spec, object value, string source, int line)
    {
        switch (spec.Kind)
        {
            case KeyKind.Number:
            {
                double? d = value switch { long l => l, double x => x, int i => i, _ => null };
                if (d is null) throw new SettingsException(source, line, spec.Key, $"expected a number, {spec.RangeText} ({spec.Help}), got '{value}'");
                if (double.IsNaN(d.Value) || d < spec.Min || d > spec.Max)
                    throw new SettingsException(source, line, spec.Key, $"{Fmt(d.Value)} is out of range: accepted {spec.RangeText} ({spec.Help})");
                return d.Value;
            }
            case KeyKind.NumberList:
            {
                if (value is not TomlArray arr) throw new SettingsException(source, line, spec.Key, $"expected a list of numbers, each {spec.RangeText}");
                if (arr.Count > Storage.Limits.MaxList)
                    throw new SettingsException(source, line, spec.Key, $"{arr.Count} items, over the limit of {Storage.Limits.MaxList} {Storage.Limits.Override("COURSESIM_MAX_LIST")}");
                var list = new List<double>();
                foreach (var item in arr)
                {
                    double? d = item switch { long l => l, double x => x, _ => null };
                    if (d is null || double.IsNaN(d.Value) || d < spec.Min || d > spec.Max)
                        throw new SettingsException(source, line, spec.Key, $"list item '{item}' is not a number in {spec.RangeText}");
                    list.Add(d.Value);
                }
                return list.ToArray();
            }
            case KeyKind.Boolean:
                if (value is bool b) return b;
                throw new SettingsException(source, line, spec.Key, $"expected true or false, got '{value}'");
            default:
                if (value is Tomlyn.TomlDateTime dt) value = Tomlyn.Helpers.TomlFormatHelper.ToString(dt);
                if (value is not string s) throw new SettingsException(source, line, spec.Key, $"expected a string ({spec.Help}), got '{value}'");
                if (spec.Choices is not null && !spec.Choices.Contains(s))
                    throw new SettingsException(source, line, spec.Key, $"'{s}' is not accepted: {spec.RangeText}");
                return s;
        }
    }

    static string A(string kind) => ("aeiou".Contains(kind[0]) ? "an " : "a ") + kind;

    static string Fmt(double d) => d.ToString("G", CultureInfo.InvariantCulture);

    static IEnumerable<(string, object)> Flatten(TomlTable t, string prefix)
    {
        foreach (var kv in t)
        {
            string key = prefix + kv.Key;
            if (kv.Value is TomlTable sub) foreach (var x in Flatten(sub, key + ".")) yield return x;
            else yield return (key, kv.Value);
        }
    }

    public bool Has(string key) => _values.ContainsKey(key);

    /// <summary>
    /// Names given under a prefix ("boards" gives the X of every boards.X.* key), in the order they first appear in the
    /// file (overrides after), so a fleet keeps the order it was written in.
    /// </summary>
    public IReadOnlyList<string> Names(string prefix)
    {
        var seen = new Dictionary<string, (int Order, int Line)>(StringComparer.Ordinal);
        int order = 0;
        foreach (var (k, v) in _values)
        {
            if (!k.StartsWith(prefix + ".", StringComparison.Ordinal)) continue;
            var rest = k[(prefix.Length + 1)..];
            int dot = rest.IndexOf('.');
            if (dot <= 0) continue;
            var name = rest[..dot];
            int line = v.Line > 0 ? v.Line : int.MaxValue;
            if (!seen.TryGetValue(name, out var prev)) seen[name] = (order++, line);
            else if (line < prev.Line) seen[name] = (prev.Order, line);
        }
        return seen.OrderBy(p => p.Value.Line).ThenBy(p => p.Value.Order).Select(p => p.Key).ToList();
    }
    public IEnumerable<string> KeysGiven => _values.Keys;
    public SettingValue? Raw(string key) => _values.TryGetValue(key, out var v) ? v : null;

    public double Number(string key)
    {
        if (_values.TryGetValue(key, out var v)) return (double)v.Value;
        return Schema.Find(key).Default;
    }

    public string Text(string key) => _values.TryGetValue(key, out var v) ? (string)v.Value : Schema.Find(key).TextDefault ?? "";
    public bool Flag(string key) => _values.TryGetValue(key, out var v) ? (bool)v.Value : Schema.Find(key).Default != 0;

    /// <summary>Raises an error located at the key (or the file) for a cross-field problem.</summary>
    public SettingsException ErrorAt(string key, string problem)
    {
        if (_values.TryGetValue(key, out var v)) return new SettingsException(v.Source, v.Line, key, problem);
        return new SettingsException(Path, 0, key, problem);
    }
}
