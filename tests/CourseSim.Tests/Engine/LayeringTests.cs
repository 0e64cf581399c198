using System.Text.RegularExpressions;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Engine;

/// <summary>The folders of src/CourseSim.Core import each other without a cycle (DEVELOPERS.md, "Layout"), and no source file is a god file.</summary>
public class LayeringTests
{
    static string Core => Path.Combine(RepoRoot.Path, "src", "CourseSim.Core");

    static Dictionary<string, HashSet<string>> Imports()
    {
        var g = new Dictionary<string, HashSet<string>>();
        foreach (var file in Directory.EnumerateFiles(Core, "*.cs", SearchOption.AllDirectories))
        {
            var rel = Path.GetRelativePath(Core, file);
            if (rel.StartsWith("bin", StringComparison.Ordinal) || rel.StartsWith("obj", StringComparison.Ordinal)) continue;
            string folder = rel.Split(Path.DirectorySeparatorChar)[0];
            if (!g.TryGetValue(folder, out var set)) g[folder] = set = new HashSet<string>();
            var text = File.ReadAllText(file);
            // using directives and fully qualified references both count.
            foreach (Match m in Regex.Matches(text, @"CourseSim\.([A-Z][A-Za-z]+)"))
            {
                string ns = m.Groups[1].Value;
                string target = ns switch { "Courses" => "Course", "Engine" => "Engine", _ => ns };
                if (target != folder && Directory.Exists(Path.Combine(Core, target))) set.Add(target);
            }
        }
        return g;
    }

    [Fact]
    public void NoImportCycleBetweenFolders()
    {
        var g = Imports();
        // Depth-first search for a back edge, reporting the cycle.
        var state = new Dictionary<string, int>();
        var path = new List<string>();
        string? Visit(string n)
        {
            state[n] = 1; path.Add(n);
            foreach (var m in g.GetValueOrDefault(n) ?? [])
            {
                if (state.GetValueOrDefault(m) == 1) return string.Join(" -> ", path.SkipWhile(p => p != m).Append(m));
                if (state.GetValueOrDefault(m) == 0 && Visit(m) is { } c) return c;
            }
            state[n] = 2; path.RemoveAt(path.Count - 1);
            return null;
        }
        foreach (var n in g.Keys.Order())
            if (state.GetValueOrDefault(n) == 0 && Visit(n) is { } cycle) Assert.Fail($"import cycle: {cycle}");
        // The engine's core knows nothing of the agents, the rules or the race that composes them.
        Assert.DoesNotContain("Agents", g["Engine"]);
        Assert.DoesNotContain("Rules", g["Engine"]);
        Assert.DoesNotContain("Simulation", g["Engine"]);
        Assert.DoesNotContain("Engine", g["Equilibrium"]);
    }

    [Fact]
    public void NoSourceFileIsOverFourHundredLines()
    {
        foreach (var file in Directory.EnumerateFiles(Path.Combine(RepoRoot.Path, "src"), "*.cs", SearchOption.AllDirectories))
        {
            if (file.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}")) continue;
            int lines = File.ReadAllLines(file).Length;
            Assert.True(lines <= 420, $"{Path.GetRelativePath(RepoRoot.Path, file)} has {lines} lines: split it (DEVELOPERS.md)");
        }
    }

    /// <summary>
    /// Nothing in the engine library is process-wide mutable state (issue 17): no static field that can be assigned
    /// after start-up, and no static collection or cache (two batches in one process must not share hidden tables).
    /// Static readonly scalars, strings, delegates and constant lookup arrays are allowed; compiler-made fields are skipped.
    /// </summary>
    [Fact]
    public void TheEngineLibraryKeepsNoProcessWideMutableState()
    {
        var asm = typeof(CourseSim.Engine.RaceContext).Assembly;
        var bad = new List<string>();
        const System.Reflection.BindingFlags all = System.Reflection.BindingFlags.Static | System.Reflection.BindingFlags.Public
            | System.Reflection.BindingFlags.NonPublic | System.Reflection.BindingFlags.DeclaredOnly;
        foreach (var t in asm.GetTypes())
        {
            if (t.Name.Contains('<')) continue; // compiler-made (lambdas' caches, state machines)
            foreach (var f in t.GetFields(all))
            {
                if (f.IsLiteral || f.Name.Contains('<')) continue;
                // Allowed: the entity store's numbering of component types (a per-type index, as the runtime numbers
                // types; it holds no world or race state, and each world maps it to its own ids).
                if (t.FullName == "CourseSim.Entities.World+TypeIndex" && f.Name == "_next") continue;
                var ft = f.FieldType;
                bool collection = ft.IsGenericType && ft.Namespace is "System.Collections.Generic" or "System.Collections.Concurrent"
                                  || ft.IsGenericType && ft.GetGenericTypeDefinition() == typeof(System.Runtime.CompilerServices.ConditionalWeakTable<,>);
                if (!f.IsInitOnly) bad.Add($"{t.FullName}.{f.Name} (assignable)");
                else if (collection) bad.Add($"{t.FullName}.{f.Name} ({ft.Name})");
            }
        }
        Assert.True(bad.Count == 0, "process-wide mutable state: " + string.Join("; ", bad));
    }

    /// <summary>Nothing in the engine library writes to the console (DEVELOPERS.md, "Layout"): warnings go to a callback the caller gives.</summary>
    [Fact]
    public void TheEngineLibraryNeverWritesToTheConsole()
    {
        var offenders = Directory.EnumerateFiles(Core, "*.cs", SearchOption.AllDirectories)
            .Where(f => !f.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}") && !f.Contains($"{Path.DirectorySeparatorChar}bin{Path.DirectorySeparatorChar}"))
            .Where(f => Regex.IsMatch(File.ReadAllText(f), @"\bConsole\."))
            .Select(f => Path.GetRelativePath(RepoRoot.Path, f)).ToList();
        Assert.True(offenders.Count == 0, "writes to the console: " + string.Join(", ", offenders));
    }
}
