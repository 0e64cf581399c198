using CourseSim.Engine;
using CourseSim.Experiments;
using CourseSim.Replay;
using CourseSim.Settings;
using CourseSim.Tests.Engine;

namespace CourseSim.Tests.Hardening;

/// <summary>
/// Seeded fuzzing of every input the tool reads: equipment, scenario and experiment files (TOML) and replays. Each
/// mutant is loaded in-process (only a located SettingsException or ReplayException may come out) and a share of them
/// go through the coursesim command (exit 0 or 2 only, never 1 "this is a bug"). The seed and the input of any failure
/// are in the message, so it can be replayed.
/// </summary>
public class FuzzTests(Xunit.Abstractions.ITestOutputHelper output)
{
    static readonly string[] Tokens =
    [
        "-1", "0", "1e308", "-1e308", "nan", "inf", "-inf", "\"x\"", "\"\"", "true", "[1, 2]", "{ a = 1 }", "2147483648", "9223372036854775807",
        "\"/dev/zero\"", "\"*\"", "1979-05-27T07:32:00Z", "\"0001-01-01T00:00:00Z\"", "[]", "\"../../etc/passwd\"", "0.5", "12", "\"header-tack\"",
        "\"\"\"a\nb\"\"\"", "'lit'", "[[1], [2]]", "-0.0", "1_000", "0x10",
    ];

    static readonly string[] Headers = ["[x]", "[boards.\"*\"]", "[[a]]", "[sail]", "[course.marks.m]", "[variants.v]", "[boards.b2]", "[wind]", "[\"\"]", "[a.b.c.d]"];

    static string Mutate(string text, SettingsSchema schema, System.Random rng)
    {
        var lines = text.Split('\n').ToList();
        int n = rng.Next(1, 4);
        for (int m = 0; m < n; m++)
        {
            int at = rng.Next(Math.Max(1, lines.Count));
            switch (rng.Next(8))
            {
                case 0: if (lines.Count > 0) lines.RemoveAt(at); break;
                case 1: if (lines.Count > 0) lines.Insert(at, lines[at]); break;
                case 2:
                    if (lines.Count > 0 && lines[at].IndexOf('=') is int eq and > 0) lines[at] = lines[at][..(eq + 1)] + " " + Tokens[rng.Next(Tokens.Length)];
                    break;
                case 3:
                {
                    var keys = schema.Keys.Keys.ToArray();
                    string key = keys[rng.Next(keys.Length)].Replace("*", rng.Next(3) == 0 ? "*" : "b" + rng.Next(3));
                    lines.Insert(at, $"{key} = {Tokens[rng.Next(Tokens.Length)]}");
                    break;
                }
                case 4: lines.Insert(at, Headers[rng.Next(Headers.Length)]); break;
                case 5:
                {
                    string joined = string.Join('\n', lines);
                    if (joined.Length == 0) break;
                    int p = rng.Next(joined.Length);
                    const string chars = "[]{}=\"'.#\n\\,*";
                    lines = (joined[..p] + chars[rng.Next(chars.Length)] + joined[(p + 1)..]).Split('\n').ToList();
                    break;
                }
                case 6:
                {
                    string joined = string.Join('\n', lines);
                    lines = joined[..rng.Next(joined.Length + 1)].Split('\n').ToList();
                    break;
                }
                default:
                    if (lines.Count > 0) { var l = lines[at]; lines.RemoveAt(at); lines.Insert(rng.Next(lines.Count + 1), l); }
                    break;
            }
        }
        return string.Join('\n', lines);
    }

    static (int Code, string Err) Cli(params string[] args)
    {
        var o = new StringWriter(); var e = new StringWriter();
        int code = CourseSim.Cli.Program.Run(args, o, e);
        return (code, e.ToString());
    }

    static readonly string Scenario = EngineTestKit.SteadyWind(12).Replace("gust_intensity = 0", "gust_intensity = 0.1") +
        "[race]\ntime_limit_s = 60\ncountdown_s = 20\nseed = 3\n[course]\nkind = \"windward-leeward\"\nbeat_m = 200\n" +
        $"[boards.a]\nequipment = \"{EngineTestKit.Equip("light-66.toml")}\"\ntactic = \"header-tack\"\n[boards.b]\nequipment = \"{EngineTestKit.Equip("heavy-86.toml")}\"\n";

    /// <summary>Loads a mutant in-process and, for a share, through the command; returns a failure description or null.</summary>
    static string? Try(string kind, int seed, string text, string dir, bool viaCli, int[] outcomes)
    {
        string file = Path.Combine(dir, $"{kind}-{seed}.toml");
        File.WriteAllText(file, text);
        try
        {
            switch (kind)
            {
                case "equipment": CourseSim.Equilibrium.EquipmentFile.Load(file); break;
                case "scenario": ScenarioFile.LoadRace(file); break;
                default: ExperimentFile.Load(file); break;
            }
        }
        catch (SettingsException e)
        {
            // Located bad input, as wanted: the file's name and a line (or the whole file) are in the message.
            if (!e.Message.Contains($"{kind}-{seed}.toml") && !e.Message.Contains("race.toml") && !e.Message.Contains("--set") && !e.Message.Contains(".toml"))
                return $"{kind} seed {seed}: an error that names no file: {e.Message}";
            outcomes[1]++;
            goto cli;
        }
        catch (Exception e) { return $"{kind} seed {seed}: {e.GetType().Name}: {e.Message}\n--- input ---\n{text}\n"; }
        outcomes[0]++;
        cli:
        if (!viaCli) return null;
        string outDir = Path.Combine(dir, $"out-{kind}-{seed}");
        var (code, err) = kind switch
        {
            "equipment" => Cli("polar", file, "--wind", "12", "--angles", "60,120", "--format", "json", "--out", outDir),
            "scenario" => Cli("race", file, "--format", "json", "--out", outDir),
            _ => Cli("batch", file, "--races", "1", "--threads", "1", "--out", outDir),
        };
        outcomes[2 + Math.Min(code, 2)]++;
        return code is 0 or 2 && !err.Contains("bug") ? null : $"{kind} seed {seed} via the command: exit {code}: {err}\n--- input ---\n{text}\n";
    }

    [Theory]
    [InlineData("equipment", 400, 25)]
    [InlineData("scenario", 300, 12)]
    [InlineData("experiment", 200, 4)]
    public void MutatedSettingsFilesAreLoadedOrRefusedWithALocatedError(string kind, int count, int viaCli)
    {
        string dir = Directory.CreateTempSubdirectory("cs-fuzz-").FullName;
        File.WriteAllText(Path.Combine(dir, "race.toml"), Scenario);
        string baseText = kind switch
        {
            "equipment" => File.ReadAllText(EngineTestKit.Equip("light-66.toml")),
            "scenario" => Scenario,
            _ => "name = \"fuzz\"\nscenario = \"race.toml\"\nraces = 2\nseed = 4\nfocus = \"a\"\nwind_min_kn = 10\nwind_max_kn = 14\n" +
                 "[variants.one]\nset = \"\"\n[variants.two]\nset = \"boards.a.tactic=vmg-layline; course.beat_m=250\"\n",
        };
        var schema = kind switch { "equipment" => CourseSim.Equilibrium.EquipmentFile.Schema, "scenario" => ScenarioFile.Schema, _ => ExperimentFile.Schema };
        var failures = new List<string>();
        var outcomes = new int[5]; // loaded, refused; command exit 0, 1, 2
        int cliEvery = count / viaCli;
        for (int seed = 0; seed < count; seed++)
        {
            var text = Mutate(baseText, schema, new System.Random(1000 * kind.Length + seed));
            if (Try(kind, seed, text, dir, seed % cliEvery == 0, outcomes) is { } f) failures.Add(f);
        }
        Assert.True(failures.Count == 0, $"{failures.Count} of {count} mutants failed (loaded {outcomes[0]}, refused {outcomes[1]}):\n" + string.Join("\n", failures.Take(5)));
        output.WriteLine($"{kind}: {count} mutants, loaded {outcomes[0]}, refused {outcomes[1]}; through the command exit 0: {outcomes[2]}, 1: {outcomes[3]}, 2: {outcomes[4]}");
        // The mutants reach both sides: some still load, and most are refused (a mutator that broke nothing tests nothing).
        Assert.True(outcomes[0] >= count / 20 && outcomes[1] >= count / 4, $"loaded {outcomes[0]}, refused {outcomes[1]} of {count}");
        Assert.True(outcomes[2] + outcomes[4] >= viaCli, $"command exits 0: {outcomes[2]}, 2: {outcomes[4]}");
    }

    static object RandomValue(System.Random rng) => rng.Next(12) switch
    {
        0 => -1, 1 => int.MaxValue, 2 => uint.MaxValue, 3 => long.MinValue, 4 => ulong.MaxValue, 5 => double.NaN, 6 => -1e308,
        7 => "x", 8 => new object[] { 1, "a", null! }, 9 => new byte[rng.Next(0, 9)], 10 => new Dictionary<object, object> { ["nx"] = 1 }, _ => 0,
    };

    [Fact]
    public void MutatedReplaysAreReadOrRefusedWithAClearError()
    {
        var race = new Race(EngineTestKit.Parse(Scenario));
        var good = ReplayFile.Write(race, race.Run());
        string dir = Directory.CreateTempSubdirectory("cs-fuzzr-").FullName;
        var failures = new List<string>();
        int read = 0, refused = 0;
        for (int seed = 0; seed < 400; seed++)
        {
            var rng = new System.Random(seed);
            byte[] bytes;
            string what;
            var p = ReplayForge.Payload(good);
            switch (rng.Next(4))
            {
                case 0:
                {
                    // Replace a field (top level, or one inside the course, wind or columns) with a value of another kind or size.
                    var maps = new List<Dictionary<object, object>> { p };
                    foreach (var v in p.Values) if (v is Dictionary<object, object> d) maps.Add(d);
                    var map = maps[rng.Next(maps.Count)];
                    var key = map.Keys.ElementAt(rng.Next(map.Count));
                    map[key] = RandomValue(rng);
                    what = $"field {key}";
                    bytes = ReplayForge.Seal(p);
                    break;
                }
                case 1:
                {
                    // Flip bytes of the payload, then seal it again so the reader's own checks must catch the damage.
                    var payload = MessagePack.MessagePackSerializer.Serialize<object>(p);
                    int flips = rng.Next(1, 6);
                    for (int i = 0; i < flips; i++) payload[rng.Next(payload.Length)] = (byte)rng.Next(256);
                    what = $"{flips} payload bytes";
                    bytes = ReplayForge.SealBytes(payload);
                    break;
                }
                case 2:
                {
                    var payload = MessagePack.MessagePackSerializer.Serialize<object>(p);
                    int cut = rng.Next(payload.Length);
                    what = $"payload cut at {cut}";
                    bytes = ReplayForge.SealBytes(payload[..cut]);
                    break;
                }
                default:
                {
                    // Damage the file itself (the checksum should catch it).
                    bytes = (byte[])good.Clone();
                    int i = rng.Next(bytes.Length);
                    bytes[i] ^= (byte)(1 + rng.Next(255));
                    what = $"file byte {i}";
                    break;
                }
            }
            try { ReplayFile.Read(bytes, "fuzz"); read++; }
            catch (ReplayException) { refused++; }
            catch (Exception e) { failures.Add($"replay seed {seed} ({what}): {e.GetType().Name}: {e.Message}"); }
            if (seed % 8 == 0)
            {
                string f = Path.Combine(dir, $"r{seed}.msgpack");
                File.WriteAllBytes(f, bytes);
                var (code, err) = Cli("view", f, "--export", f + ".html");
                if (code is not (0 or 2) || err.Contains("bug")) failures.Add($"replay seed {seed} ({what}) via the command: exit {code}: {err}");
            }
        }
        Assert.True(failures.Count == 0, $"{failures.Count} mutants failed:\n" + string.Join("\n", failures.Take(8)));
        output.WriteLine($"replays: 400 mutants, read {read}, refused {refused}");
        Assert.True(refused >= 200 && read + refused == 400, $"read {read}, refused {refused}");
    }
}
