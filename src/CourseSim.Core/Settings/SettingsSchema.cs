using System.Globalization;

namespace CourseSim.Settings;

public enum KeyKind { Number, Text, Boolean, NumberList }

/// <summary>One accepted key: its full dotted name ("sail.area_m2"), kind, accepted range, default and help.</summary>
public sealed record KeySpec(string Key, KeyKind Kind, double Min, double Max, string Help, double Default = double.NaN, string? TextDefault = null,
    IReadOnlyList<string>? Choices = null)
{
    public static KeySpec Number(string key, double min, double max, double def, string help) => new(key, KeyKind.Number, min, max, help, def);
    /// <summary>A number whose default is derived from other settings (NaN until given).</summary>
    public static KeySpec Derived(string key, double min, double max, string help) => new(key, KeyKind.Number, min, max, help);
    public static KeySpec Text(string key, string def, string help, IReadOnlyList<string>? choices = null) => new(key, KeyKind.Text, 0, 0, help, TextDefault: def, Choices: choices);
    public static KeySpec Flag(string key, bool def, string help) => new(key, KeyKind.Boolean, 0, 1, help, def ? 1 : 0);

    public string RangeText => Kind switch
    {
        KeyKind.Number or KeyKind.NumberList => $"{Min.ToString(CultureInfo.InvariantCulture)} to {Max.ToString(CultureInfo.InvariantCulture)}",
        KeyKind.Boolean => "true or false",
        _ => Choices is null ? "a string" : "one of " + string.Join(", ", Choices),
    };
}

/// <summary>The set of keys a kind of file accepts. Unknown keys are errors, never silently ignored.</summary>
public sealed class SettingsSchema(string kind, IEnumerable<KeySpec> keys)
{
    public string Kind { get; } = kind;
    public IReadOnlyDictionary<string, KeySpec> Keys { get; } = keys.ToDictionary(k => k.Key, StringComparer.Ordinal);

    /// <summary>
    /// The spec for a key. A spec's key may hold a "*" segment that stands for any name (boards.*.equipment matches
    /// boards.maren.equipment), so a file can define its own named entries.
    /// </summary>
    public bool TryFind(string key, out KeySpec spec)
    {
        if (Keys.TryGetValue(key, out spec!)) return true;
        var parts = key.Split('.');
        foreach (var k in Keys.Values)
        {
            if (!k.Key.Contains('*')) continue;
            var pp = k.Key.Split('.');
            if (pp.Length != parts.Length) continue;
            bool ok = true;
            for (int i = 0; i < pp.Length && ok; i++)
                ok = pp[i] == "*" ? IsName(parts[i]) : pp[i] == parts[i];
            if (ok) { spec = k; return true; }
        }
        spec = null!;
        return false;
    }

    static bool IsName(string s) => s.Length > 0 && s.All(c => char.IsAsciiLetterOrDigit(c) || c == '_' || c == '-');

    public KeySpec Find(string key) => TryFind(key, out var s) ? s : throw new KeyNotFoundException($"no setting '{key}' in a {Kind} file");

    /// <summary>Tables a key may sit in, for error messages about unknown keys.</summary>
    public IEnumerable<string> KnownKeysNear(string key)
    {
        var parts = key.Split('.');
        var near = Keys.Keys.Where(k =>
        {
            var kp = k.Split('.');
            if (kp.Length != parts.Length) return false;
            for (int i = 0; i < kp.Length - 1; i++) if (kp[i] != "*" && kp[i] != parts[i]) return false;
            return true;
        }).Order().ToList();
        return near.Count > 0 ? near : Keys.Keys.Order();
    }
}
