using System.Reflection;

namespace CourseSim.Agents;

/// <summary>
/// The tactics a scenario can name (docs/tactics.md): the built-in ones and any registered by code or loaded from a
/// user's class library. An instance, owned by whoever builds races from it (a scenario's loader, a race, a test): no
/// process-wide table, so two races never see each other's tactics. Names are unique; registering a name twice replaces
/// the earlier one (so a test or plug-in can redefine its own tactic).
/// </summary>
public sealed class TacticRegistry
{
    readonly object _gate = new();
    readonly Dictionary<string, TacticSpec> _specs = new(StringComparer.Ordinal);

    /// <summary>A registry holding the built-in tactics.</summary>
    public TacticRegistry()
    {
        foreach (var s in BuiltInTactics.All) _specs[s.Name] = s;
    }

    /// <summary>The built-in tactics and those of the given class libraries (full paths).</summary>
    public static TacticRegistry With(IEnumerable<string> assemblies)
    {
        var r = new TacticRegistry();
        foreach (var a in assemblies) r.LoadAssembly(a);
        return r;
    }

    /// <summary>Adds a tactic (a user's own, written in C#): afterwards scenarios built with this registry can name it.</summary>
    public void Register(TacticSpec spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        if (string.IsNullOrWhiteSpace(spec.Name) || spec.Name.Any(char.IsWhiteSpace)) throw new ArgumentException("a tactic name is one word, such as \"my-tactic\"");
        if (spec.Params.Select(p => p.Name).Distinct().Count() != spec.Params.Count) throw new ArgumentException($"tactic '{spec.Name}' names a parameter twice");
        foreach (var p in spec.Params)
            if (!(p.Min <= p.Default && p.Default <= p.Max)) throw new ArgumentException($"tactic '{spec.Name}': default of '{p.Name}' is outside {p.Min}..{p.Max}");
        lock (_gate) _specs[spec.Name] = spec;
    }

    public bool TryGet(string name, out TacticSpec spec) { lock (_gate) return _specs.TryGetValue(name, out spec!); }

    /// <summary>
    /// Registers the tactics of a compiled assembly (a class library built against CourseSim.Core): every public static
    /// property or field of type <see cref="TacticSpec"/> on its public types. Returns their names. Loading the same
    /// file again is harmless; a name that is a built-in tactic, or one another assembly already gave, is an error.
    /// <paramref name="shown"/> is the path as the user wrote it, for messages.
    /// </summary>
    public IReadOnlyList<string> LoadAssembly(string path, string? shown = null)
    {
        shown ??= path;
        string full = System.IO.Path.GetFullPath(path);
        if (!File.Exists(full)) throw new TacticLoadException($"tactic assembly '{shown}' not found (looked for {full})");
        Assembly asm;
        try { asm = Assembly.LoadFrom(full); }
        catch (BadImageFormatException) { throw new TacticLoadException($"'{shown}' is not a .NET assembly (build your tactics as a class library: docs/tactics.md)"); }
        catch (FileLoadException e) { throw new TacticLoadException($"'{shown}' could not be loaded: {e.Message}"); }
        var found = new List<TacticSpec>();
        Type[] types;
        try { types = asm.GetExportedTypes(); }
        catch (Exception e) when (e is ReflectionTypeLoadException or FileNotFoundException or FileLoadException)
        {
            throw new TacticLoadException($"'{shown}' needs an assembly that cannot be found or loaded ({e.Message}); build it against this CourseSim.Core");
        }
        const BindingFlags Flags = BindingFlags.Public | BindingFlags.Static;
        foreach (var t in types)
        {
            foreach (var p in t.GetProperties(Flags))
                if (p.PropertyType == typeof(TacticSpec) && p.GetIndexParameters().Length == 0 && p.GetValue(null) is TacticSpec s) found.Add(s);
            foreach (var fld in t.GetFields(Flags))
                if (fld.FieldType == typeof(TacticSpec) && fld.GetValue(null) is TacticSpec s) found.Add(s);
        }
        if (found.Count == 0) throw new TacticLoadException($"'{shown}' has no tactic: expose one as a public static TacticSpec property on a public class (docs/examples/LullTackTactic.cs)");
        var names = new List<string>();
        foreach (var s in found.DistinctBy(s => s.Name))
        {
            if (BuiltInTactics.All.Any(b => b.Name == s.Name)) throw new TacticLoadException($"'{shown}': tactic '{s.Name}' has the name of a built-in tactic; choose another");
            lock (_gate)
                if (_specs.TryGetValue(s.Name, out var had) && !ReferenceEquals(had, s) && had.Create.Method.Module != s.Create.Method.Module)
                    throw new TacticLoadException($"'{shown}': tactic '{s.Name}' is already given by another assembly ({had.Create.Method.Module.Assembly.Location})");
            try { Register(s); }
            catch (ArgumentException e) { throw new TacticLoadException($"'{shown}': {e.Message}"); }
            names.Add(s.Name);
        }
        return names;
    }

    /// <summary>Known names, sorted.</summary>
    public IReadOnlyList<string> Names { get { lock (_gate) return _specs.Keys.Order(StringComparer.Ordinal).ToArray(); } }

    public IReadOnlyList<TacticSpec> All { get { lock (_gate) return _specs.Values.OrderBy(s => s.Name, StringComparer.Ordinal).ToArray(); } }
}
