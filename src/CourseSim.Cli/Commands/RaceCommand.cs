using System.CommandLine;
using System.Globalization;
using System.Text;
using CourseSim.Cli.Output;
using CourseSim.Engine;
using CourseSim.Replay;
using Spectre.Console;

namespace CourseSim.Cli.Commands;

/// <summary>
/// <c>coursesim race SCENARIO [--seed N] [--set k=v ...] [--out DIR]</c>: runs one race of a scenario's fleet and writes
/// results.csv, summary.json, replay.msgpack and a GPX track per board into DIR.
/// </summary>
public static class RaceCommand
{
    public static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("scenario") { Description = "scenario file (TOML) with [wind], [race], [course] and [boards.NAME] tables" };
        var seed = new Option<ulong?>("--seed") { Description = "random seed (default: race.seed in the scenario)" };
        var set = new Option<string[]>("--set") { Description = "override a scenario key, table.key=value (repeatable)" };
        var outDir = new Option<string?>("--out") { Description = "folder for results.csv, summary.json, replay.msgpack and tracks/ (default out/race-NAME)" };
        var format = new Option<string>("--format") { Description = "table (results table) or json (summary.json to standard output)", DefaultValueFactory = _ => "table" };
        format.AcceptOnlyFromAmong("table", "json");
        var view = new Option<bool>("--view") { Description = "watch the race live in the browser viewer as it runs (served on 127.0.0.1; Ctrl+C to stop)" };
        var port = new Option<int>("--port") { Description = "with --view: port to serve on (default: a free port)", DefaultValueFactory = _ => 0 };
        var host = new Option<string>("--host") { Description = "with --view: address to listen on (default 127.0.0.1)", DefaultValueFactory = _ => "127.0.0.1" };
        var pace = new Option<double>("--pace") { Description = "with --view: race seconds per real second (default 4; 0 = as fast as it runs)", DefaultValueFactory = _ => 4 };
        var fromBatch = new Option<string?>("--from-batch") { Description = "race again race --race of variant --variant of the batch in this folder, exactly (SCENARIO: the experiment or its scenario)" };
        var raceNo = new Option<int?>("--race") { Description = "with --from-batch: the race number (0 for the first, as in runs/VARIANT/NNNNNN.csv)" };
        var variant = new Option<string?>("--variant") { Description = "with --from-batch: the variant's name" };
        var noCache = TableCacheOption.Create();
        var cmd = new Command("race", "Race a scenario's fleet round its course in its wind, step by step from the board physics.") { file, seed, set, outDir, format, view, port, host, pace, fromBatch, raceNo, variant, noCache };
        cmd.SetAction(pr =>
        {
            var batch = pr.GetValue(fromBatch) is string dir
                ? FromBatch.Load(pr.GetValue(file)!, dir, pr.GetValue(raceNo), pr.GetValue(variant), pr.GetValue(seed), pr.GetValue(set) ?? [])
                : pr.GetValue(raceNo) is not null || pr.GetValue(variant) is not null ? throw new UsageException("--race and --variant go with --from-batch DIR") : null;
            var rigs = TableCacheOption.Rigs(pr.GetValue(noCache), stderr);
            return pr.GetValue(view)
                ? RunLive(pr.GetValue(file)!, pr.GetValue(seed), pr.GetValue(set) ?? [], pr.GetValue(outDir), pr.GetValue(host)!, pr.GetValue(port), pr.GetValue(pace), stdout, stderr, batch, rigs)
                : Run(pr.GetValue(file)!, pr.GetValue(seed), pr.GetValue(set) ?? [], pr.GetValue(outDir), pr.GetValue(format)!, stdout, stderr, batch, rigs);
        });
        return cmd;
    }

    static int Run(string path, ulong? seed, string[] sets, string? outDir, string format, TextWriter stdout, TextWriter stderr, FromBatch? batch,
        Equilibrium.RigCache rigs)
    {
        var setup = batch?.Setup ?? ScenarioFile.LoadRace(path, sets, seed);
        var (name, dir) = NameAndFolder(setup, path, outDir);
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var race = new Race(setup, rigs.For);
        double setupS = clock.Elapsed.TotalSeconds;
        var result = RunWithProgress(race, stdout, stderr, format == "json");
        double runS = clock.Elapsed.TotalSeconds - setupS;
        rigs.Save(); // the rig tables this race built, for the next run (once the race is over, not in its timing)
        var written = Write(dir, race, result);
        if (format == "json")
        {
            stdout.WriteLine(SummaryJson(race, result));
            return ExitCodes.Ok;
        }
        var console = Terminal.For(stdout);
        console.Write(ResultsTable(race, result, name, Terminal.FitWidth(stdout)));
        console.MarkupLine("[grey]T/G/F: tacks, gybes, falls. km: distance sailed from the signal. Legs from the signal.[/]");
        if (result.Incidents.Count > 0) console.Write(IncidentsTable(race, result));
        else console.MarkupLine("[grey]No contact between boards.[/]");
        int unfinished = result.Boards.Count(b => !b.Finished);
        long boardSteps = race.StepIndex * race.BoardCount;
        console.MarkupLine(Markup.Escape($"{result.Boards.Count - unfinished} of {result.Boards.Count} finished; seed {race.Seed}; " +
            $"{race.StepIndex} steps of {1000 * race.Dt:0} ms; set-up {setupS:0.0} s, race {runS:0.0} s ({boardSteps / Math.Max(runS, 1e-9) / 1e6:0.00} M board-steps/s)"));
        console.MarkupLine("[grey]" + Markup.Escape($"Wrote {string.Join(", ", written)} in {dir}") + "[/]");
        int code = ExitCodes.Ok;
        if (batch is not null)
        {
            var (same, message) = batch.Check(race, result);
            console.MarkupLine((same ? "[green]" : "[red]") + Markup.Escape(message) + "[/]");
            if (!same) code = ExitCodes.Failure;
        }
        console.MarkupLine("[yellow]" + Markup.Escape(Caution.Text) + "[/]");
        return code;
    }

    /// <summary>The race's display name (the scenario's, else the file's) and its output folder (default out/race-NAME).</summary>
    static (string Name, string Dir) NameAndFolder(RaceSetup setup, string path, string? outDir)
    {
        string name = setup.Name.Length > 0 ? setup.Name : Path.GetFileNameWithoutExtension(path);
        return (name, outDir ?? Path.Combine("out", $"race-{PolarCommand.Slug(name)}"));
    }

    /// <summary>The race, live in the viewer: paced to real time, streamed to the page, results written at the end.</summary>
    static int RunLive(string path, ulong? seed, string[] sets, string? outDir, string host, int port, double pace, TextWriter stdout, TextWriter stderr,
        FromBatch? batch, Equilibrium.RigCache rigs)
    {
        if (pace < 0 || !double.IsFinite(pace)) throw new UsageException($"--pace {pace}: give race seconds per real second (0 or more)");
        var setup = batch?.Setup ?? ScenarioFile.LoadRace(path, sets, seed);
        var (_, dir) = NameAndFolder(setup, path, outDir);
        var race = new Race(setup, rigs.For);
        var feed = new Viewer.LiveFeed(race);
        return ViewCommand.Serve(host, port, null, feed, stdout, stderr, cancel =>
        {
            feed.Run(pace, cancel);
            rigs.Save();
            if (feed.Result is { } result)
            {
                var written = Write(dir, race, result);
                stdout.WriteLine($"Race over: {result.Boards.Count(b => b.Finished)} of {result.Boards.Count} finished. Wrote {string.Join(", ", written)} in {dir}. The page stays up until Ctrl+C.");
            }
            else if (feed.Failure is { } e) stderr.WriteLine($"error: the race failed: {e.Message}");
        });
    }

    static RaceResult RunWithProgress(Race race, TextWriter stdout, TextWriter stderr, bool quiet)
    {
        bool interactive = !quiet && stdout == Console.Out && !Console.IsOutputRedirected && !Console.IsErrorRedirected;
        if (interactive)
        {
            RaceResult? res = null;
            AnsiConsole.Progress().AutoClear(true).Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new RemainingTimeColumn())
                .Start(ctx =>
                {
                    var task = ctx.AddTask($"racing {race.BoardCount} boards", maxValue: 1000);
                    res = race.Run(p => task.Value = 1000 * p);
                    task.Value = 1000;
                });
            return res!;
        }
        // Redirected output: a plain line every 10 % on the error stream (the progress bar would print nothing).
        int shown = -1;
        return race.Run(p =>
        {
            int tenth = (int)(p * 10);
            if (tenth > shown && !quiet)
            {
                shown = tenth;
                stderr.WriteLine($"race: {tenth * 10,3}% (race time {race.Time:0} s)");
            }
        });
    }

    static Table ResultsTable(Race race, RaceResult result, string name, int width)
    {
        string title = $"[bold]{Markup.Escape(name)}[/]: {Markup.Escape(race.Course.Kind)}, {race.BoardCount} boards, seed {race.Seed}";
        // On a narrow terminal whole columns are left out (legs first), never digits: results.csv has every column.
        FitColumn[] columns = [new("place", true, 0), new("board", false, 0), new("elapsed", true, 0), new("gap", true, 3), new("legs (m:ss)", false, 5),
            new("km", true, 4), new("avg kn", true, 2), new("T/G/F", true, 1), new("notes", false, 0, Wraps: true)];
        var rows = new List<string[]>();
        foreach (var b in result.ByPlace)
        {
            var notes = new List<string>();
            if (!b.Finished) notes.Add("did not finish");
            if (b.Ocs) notes.Add("early start");
            if (b.WrongSide > 0) notes.Add($"wrong side x{b.WrongSide}");
            if (b.Penalties > 0) notes.Add($"penalty turn x{b.Penalties}");
            if (b.PenaltiesNotTaken > 0) notes.Add($"penalty not taken x{b.PenaltiesNotTaken}");
            rows.Add([b.Place?.ToString(CultureInfo.InvariantCulture) ?? "-", b.Name, b.ElapsedS is double e ? Clock(e) : "-",
                b.GapS is double g ? "+" + Clock(g) : "-", Legs(b.SplitsS), F(b.DistanceM / 1000, "0.00"), F(b.AverageSpeedMs / 0.514444, "0.0"),
                string.Create(CultureInfo.InvariantCulture, $"{b.Tacks}/{b.Gybes}/{b.Falls}"), string.Join("; ", notes)]);
        }
        return TableFit.Build(title, columns, rows, width);
    }

    /// <summary>Every contact: when (from the signal), where, who was to keep clear, under which rule, and the outcome.</summary>
    static Table IncidentsTable(Race race, RaceResult result)
    {
        var t = new Table().Border(TableBorder.Simple).Title("[bold]Contacts[/] (rules as applied: docs/tactics.md)");
        foreach (var h in new[] { "time", "x, y m", "keep clear", "other", "rule", "penalty", "judgement" }) t.AddColumn(new TableColumn(h));
        foreach (var i in result.Incidents)
        {
            string who(int b) => b < 0 ? "-" : race.Setup.Boards[b].Name;
            t.AddRow(Markup.Escape(Clock(Math.Abs(i.TimeS)) + (i.TimeS < 0 ? " before" : "")), Markup.Escape(F(i.X, "0") + ", " + F(i.Y, "0")),
                Markup.Escape(who(i.KeepClear)), Markup.Escape(who(i.RightOfWay)), i.Rule, Markup.Escape(i.Penalty ? "one turn: " + who(i.Penalised) : "-"), Markup.Escape(i.Detail));
        }
        return t;
    }

    /// <summary>Leg times from the split times (the first leg from the signal).</summary>
    static string Legs(IReadOnlyList<double> splits)
    {
        var parts = new List<string>();
        double prev = 0;
        foreach (var s in splits) { parts.Add(Short(s - prev)); prev = s; }
        return string.Join(" ", parts);
    }

    static string Clock(double s)
    {
        double tenths = Math.Round(s * 10);
        long whole = (long)(tenths / 10);
        int frac = (int)(tenths - whole * 10);
        return whole >= 3600 ? $"{whole / 3600}:{whole / 60 % 60:00}:{whole % 60:00}.{frac}" : $"{whole / 60}:{whole % 60:00}.{frac}";
    }

    static string F(double v, string fmt) => v.ToString(fmt, CultureInfo.InvariantCulture);

    /// <summary>A leg time to the second, m:ss (the table's legs column; results.csv keeps the decimals).</summary>
    static string Short(double s)
    {
        long whole = (long)Math.Round(s);
        return $"{whole / 60}:{whole % 60:00}";
    }

    static List<string> Write(string dir, Race race, RaceResult result)
    {
        Directory.CreateDirectory(dir);
        var tracks = Path.Combine(dir, "tracks");
        Directory.CreateDirectory(tracks);
        AtomicFile.WriteAllText(Path.Combine(dir, "results.csv"), ResultsCsv(race, result));
        AtomicFile.WriteAllText(Path.Combine(dir, "summary.json"), SummaryJson(race, result) + "\n");
        AtomicFile.WriteAllText(Path.Combine(dir, "incidents.csv"), IncidentsCsv(race, result));
        AtomicFile.WriteAllBytes(Path.Combine(dir, "replay.msgpack"), ReplayFile.Write(race, result));
        for (int b = 0; b < race.BoardCount; b++)
            AtomicFile.WriteAllText(Path.Combine(tracks, $"{b + 1:00}-{PolarCommand.Slug(race.Setup.Boards[b].Name)}.gpx"), Gpx.Track(race, b));
        return ["results.csv", "summary.json", "incidents.csv", "replay.msgpack", $"tracks/ ({race.BoardCount} GPX files)"];
    }

    static string ResultsCsv(Race race, RaceResult result)
    {
        int legs = race.Course.Steps.Count;
        var sb = new StringBuilder();
        sb.Append("place,board,name,equipment,finished,elapsed_s,gap_s,distance_m,avg_speed_kn,tacks,gybes,falls,ocs,wrong_side,penalties,give_ways,penalties_not_taken");
        for (int i = 1; i <= legs; i++) sb.Append(CultureInfo.InvariantCulture, $",leg_{i}_s");
        sb.Append('\n');
        foreach (var b in result.ByPlace)
        {
            sb.Append(b.Place?.ToString(CultureInfo.InvariantCulture) ?? "").Append(',').Append(b.Board + 1).Append(',')
              .Append(Csv(b.Name)).Append(',').Append(Csv(b.Equipment)).Append(',').Append(b.Finished ? "true" : "false").Append(',')
              .Append(N(b.ElapsedS)).Append(',').Append(N(b.GapS)).Append(',').Append(N(b.DistanceM)).Append(',').Append(N(b.AverageSpeedMs / 0.514444))
              .Append(',').Append(b.Tacks).Append(',').Append(b.Gybes).Append(',').Append(b.Falls).Append(',').Append(b.Ocs ? "true" : "false")
              .Append(',').Append(b.WrongSide).Append(',').Append(b.Penalties).Append(',').Append(b.GiveWays).Append(',').Append(b.PenaltiesNotTaken);
            double prev = 0;
            for (int i = 0; i < legs; i++)
            {
                sb.Append(',');
                if (i < b.SplitsS.Count) { sb.Append(N(b.SplitsS[i] - prev)); prev = b.SplitsS[i]; }
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    static string IncidentsCsv(Race race, RaceResult result)
    {
        var sb = new StringBuilder("time_s,x_m,y_m,keep_clear,right_of_way,rule,penalty,penalised,avoidable,detail\n");
        string who(int b) => b < 0 ? "" : Csv(race.Setup.Boards[b].Name);
        foreach (var i in result.Incidents)
            sb.Append(N(i.TimeS)).Append(',').Append(N(i.X)).Append(',').Append(N(i.Y)).Append(',').Append(who(i.KeepClear)).Append(',')
              .Append(who(i.RightOfWay)).Append(',').Append(i.Rule).Append(',').Append(i.Penalty ? "true" : "false").Append(',')
              .Append(who(i.Penalised)).Append(',').Append(i.Avoidable ? "true" : "false").Append(',').Append(Csv(i.Detail)).Append('\n');
        return sb.ToString();
    }

    static string N(double? v) => v is double d ? Math.Round(d, 3).ToString("0.###", CultureInfo.InvariantCulture) : "";

    static string Csv(string s) => s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;

    static string SummaryJson(Race race, RaceResult result) => Json.Serialize(new
    {
        seed = race.Seed,
        scenario = race.Setup.Name,
        engine = Race.EngineVersion,
        course = race.Course.Kind,
        duration_s = result.DurationS,
        boards = result.ByPlace.Select(b => new
        {
            name = b.Name, place = b.Place, elapsed_s = b.ElapsedS, finished = b.Finished, distance_m = b.DistanceM, tacks = b.Tacks, gybes = b.Gybes,
            falls = b.Falls, gap_s = b.GapS, equipment = b.Equipment, ocs = b.Ocs, wrong_side = b.WrongSide, splits_s = b.SplitsS,
            average_speed_kn = b.AverageSpeedMs / 0.514444, penalties = b.Penalties, give_ways = b.GiveWays, penalties_not_taken = b.PenaltiesNotTaken,
        }),
        incidents = result.Incidents.Select(i => new
        {
            time_s = i.TimeS, x_m = i.X, y_m = i.Y,
            keep_clear = i.KeepClear < 0 ? null : race.Setup.Boards[i.KeepClear].Name,
            right_of_way = i.RightOfWay < 0 ? null : race.Setup.Boards[i.RightOfWay].Name,
            rule = i.Rule, penalty = i.Penalty, penalised = i.Penalised < 0 ? null : race.Setup.Boards[i.Penalised].Name,
            avoidable = i.Avoidable, detail = i.Detail,
        }),
        caution = Caution.Text,
    });
}

/// <summary>Writes a file through a temporary file in the same folder, flushed to disk before the rename, so a crash
/// or a power cut never leaves half a file and a failed write leaves no temporary file (<see cref="CourseSim.Storage.DurableFile"/>).</summary>
public static class AtomicFile
{
    public static void WriteAllBytes(string path, byte[] bytes) => CourseSim.Storage.DurableFile.Write(path, bytes);

    public static void WriteAllText(string path, string text) => WriteAllBytes(path, new UTF8Encoding(false).GetBytes(text));
}
