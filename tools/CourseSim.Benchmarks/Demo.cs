using CourseSim.Engine;

namespace CourseSim.Benchmarks;

/// <summary>The demo scenarios the report races, and fleets built from them.</summary>
public static class Demo
{
    public static string Root()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "CourseSim.sln"))) dir = dir.Parent;
        return dir?.FullName ?? Directory.GetCurrentDirectory();
    }

    public static string Fleet40Path => Path.Combine(Root(), "scenarios", "korrin-bay-fleet40.toml");

    /// <summary>The 40-board demo as the file gives it (its own seed), with optional overrides.</summary>
    public static RaceSetup Fleet40(params string[] overrides) => ScenarioFile.LoadRace(Fleet40Path, overrides);

    /// <summary>
    /// A fleet of <paramref name="n"/> boards from the demo's rigs and tactics (board i is a copy of demo board i mod 40,
    /// its rival the same copy's rival), all with the line-position start plan, spread evenly along the line. Copies get
    /// their own ids (the engine keys random streams and defaults by id).
    /// </summary>
    public static RaceSetup Scaled(RaceSetup demo, int n)
    {
        var src = demo.Boards;
        int m = src.Count;
        var list = new BoardEntry[n];
        for (int i = 0; i < n; i++)
        {
            var b = src[i % m];
            int copy = i / m, first = copy * m;
            int rival = b.RivalIndex < 0 ? -1 : first + b.RivalIndex < n ? first + b.RivalIndex : b.RivalIndex % n;
            if (rival == i) rival = (i + 1) % n;
            list[i] = b with
            {
                Id = copy == 0 ? b.Id : $"{b.Id}-{copy}", Name = copy == 0 ? b.Name : $"{b.Name} {copy}",
                Start = "line-position", LinePosition = (i + 0.5) / n, StartMarginS = null, RivalIndex = rival,
            };
        }
        return demo with { Boards = list };
    }

    /// <summary>The first <paramref name="n"/> boards of the demo, rivals outside the subset remapped inside it.</summary>
    public static RaceSetup Subset(RaceSetup demo, int n)
    {
        var list = new BoardEntry[n];
        for (int i = 0; i < n; i++)
        {
            var b = demo.Boards[i];
            int rival = b.RivalIndex < 0 ? -1 : b.RivalIndex % n;
            if (rival == i) rival = (i + 1) % n;
            list[i] = b with { RivalIndex = rival };
        }
        return demo with { Boards = list };
    }

    /// <summary>Boards still in the race (neither finished nor out): the board-steps the next step does.</summary>
    public static int Active(Race r)
    {
        int n = 0;
        foreach (var chunk in r.Context.Active) n += chunk.Count;
        return n;
    }
}
