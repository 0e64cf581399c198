namespace CourseSim.Settings;

/// <summary>
/// A bad settings file or value: names the file (or "--set"), the line, the key and what was expected.
/// The CLI prints <see cref="Exception.Message"/> and exits with code 2.
/// </summary>
public sealed class SettingsException(string source, int line, string? key, string problem)
    : Exception(Format(source, line, key, problem))
{
    public string Origin { get; } = source;
    public int Line { get; } = line;
    public string? Key { get; } = key;
    public string Problem { get; } = problem;

    static string Format(string source, int line, string? key, string problem)
    {
        string where = line > 0 ? $"{source}:{line}" : source;
        return key is null ? $"{where}: {problem}" : $"{where}: key '{key}': {problem}";
    }
}
