using System.Text;

namespace CourseSim.Settings;

/// <summary>
/// Finds the line of every key of a TOML text (after Tomlyn has accepted it): [table] headers with bare, quoted and
/// dotted names, dotted keys, inline tables (each inner key on its own line), multi-line arrays and strings. A key or
/// table given twice is refused (TOML forbids it; left alone the last one would win) at the line of the second one.
/// </summary>
public sealed class TomlKeyLines
{
    readonly string _t;
    readonly string _path;
    int _i, _line = 1;
    readonly Dictionary<string, int> _keys = new(StringComparer.Ordinal);
    readonly Dictionary<string, int> _tables = new(StringComparer.Ordinal);

    TomlKeyLines(string text, string path) { _t = text; _path = path; }

    /// <summary>Full dotted key (table.key) to its line.</summary>
    public static Dictionary<string, int> Of(string text, string path)
    {
        var s = new TomlKeyLines(text, path);
        s.Document();
        return s._keys;
    }

    char C => _i < _t.Length ? _t[_i] : '\0';
    bool End => _i >= _t.Length;

    void Advance()
    {
        if (C == '\n') _line++;
        _i++;
    }

    void SkipSpace(bool newlines)
    {
        while (!End)
        {
            if (C == ' ' || C == '\t' || C == '\r' || (newlines && C == '\n')) Advance();
            else if (C == '#') { while (!End && C != '\n') _i++; }
            else break;
        }
    }

    void Document()
    {
        string table = "";
        while (true)
        {
            SkipSpace(true);
            if (End) return;
            if (C == '[')
            {
                bool array = _i + 1 < _t.Length && _t[_i + 1] == '[';
                _i += array ? 2 : 1;
                int line = _line;
                var path = KeyPath();
                SkipSpace(false);
                _i += array ? 2 : 1;
                table = string.Join('.', path);
                if (!array)
                {
                    if (_tables.TryGetValue(table, out int first))
                        throw new SettingsException(_path, line, table, $"table [{table}] is defined twice (first at line {first}); TOML allows each table once");
                    if (_keys.TryGetValue(table, out int asKey))
                        throw new SettingsException(_path, line, table, $"[{table}] names a key already given a value at line {asKey}");
                    _tables[table] = line;
                }
                continue;
            }
            KeyValue(table.Length == 0 ? "" : table + ".");
        }
    }

    void KeyValue(string prefix)
    {
        int line = _line;
        string key = prefix + string.Join('.', KeyPath());
        SkipSpace(false);
        if (C != '=') { Skip(); return; }
        _i++;
        SkipSpace(false);
        if (C == '{') { InlineTable(key + "."); return; }
        Value();
        if (_keys.TryGetValue(key, out int first))
            throw new SettingsException(_path, line, key, $"given twice (first at line {first}); TOML allows each key once");
        if (_tables.TryGetValue(key, out int table))
            throw new SettingsException(_path, line, key, $"names the table defined at line {table}");
        _keys[key] = line;
    }

    void InlineTable(string prefix)
    {
        _i++; // {
        while (!End)
        {
            SkipSpace(true);
            if (C == '}') { _i++; return; }
            if (C == ',') { _i++; continue; }
            int before = _i;
            KeyValue(prefix);
            if (_i == before) _i++;
        }
    }

    /// <summary>A dotted key of bare and quoted parts.</summary>
    List<string> KeyPath()
    {
        var parts = new List<string>();
        while (!End)
        {
            SkipSpace(false);
            if (C == '"' || C == '\'') parts.Add(QuotedKey());
            else
            {
                var sb = new StringBuilder();
                while (!End && (char.IsAsciiLetterOrDigit(C) || C == '_' || C == '-')) sb.Append(_t[_i++]);
                parts.Add(sb.ToString());
            }
            SkipSpace(false);
            if (C != '.') break;
            _i++;
        }
        return parts;
    }

    string QuotedKey()
    {
        char q = C; _i++;
        var sb = new StringBuilder();
        while (!End && C != q && C != '\n')
        {
            if (q == '"' && C == '\\' && _i + 1 < _t.Length) { _i++; sb.Append(C switch { 'n' => '\n', 't' => '\t', _ => C }); _i++; continue; }
            sb.Append(_t[_i++]);
        }
        _i++;
        return sb.ToString();
    }

    /// <summary>Skips one value: a string (basic, literal, multi-line), an array (any depth, over lines), an inline
    /// table inside an array, or a bare value.</summary>
    void Value()
    {
        if (C == '"' || C == '\'') { String(); return; }
        if (C == '[')
        {
            _i++;
            while (!End)
            {
                SkipSpace(true);
                if (C == ']') { _i++; return; }
                if (C == ',') { _i++; continue; }
                int before = _i;
                if (C == '{') SkipBraces(); else Value();
                if (_i == before) _i++;
            }
            return;
        }
        while (!End && C != ',' && C != ']' && C != '}' && C != '\n' && C != '#') _i++;
    }

    void SkipBraces()
    {
        int depth = 0;
        while (!End)
        {
            if (C == '"' || C == '\'') { String(); continue; }
            if (C == '{') depth++;
            else if (C == '}' && --depth == 0) { _i++; return; }
            Advance();
        }
    }

    void String()
    {
        char q = C;
        bool multi = _i + 2 < _t.Length && _t[_i + 1] == q && _t[_i + 2] == q;
        _i += multi ? 3 : 1;
        while (!End)
        {
            if (q == '"' && C == '\\') { _i++; Advance(); continue; }
            if (C == q)
            {
                if (!multi) { _i++; return; }
                if (_i + 2 < _t.Length && _t[_i + 1] == q && _t[_i + 2] == q)
                {
                    _i += 3;
                    while (C == q) _i++; // up to two quotes may close the content
                    return;
                }
            }
            if (!multi && C == '\n') return;
            Advance();
        }
    }

    void Skip()
    {
        while (!End && C != '\n') _i++;
    }
}
