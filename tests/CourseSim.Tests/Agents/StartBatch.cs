using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Tests.Settings;

namespace CourseSim.Tests.Agents;

/// <summary>
/// Sails the start of a race (the countdown and until every board has started, or a time limit after the signal) and
/// reports, per board: whether any part of its hull was over the line at the signal (the bow, half a hull length ahead
/// of the centre along the heading, within the line's ends), whether it was called, its tacks and gybes before it
/// started, and when it started.
/// </summary>
public static class StartBatch
{
    public sealed record BoardStart(string Id, double Skill, bool HullOver, double BowAheadM, bool Called, int Manoeuvres, double StartedS, double BowAtLineS = double.NaN, double PlannedS = double.NaN, double LineErrorM = double.NaN);

    /// <summary>One cache of rig tables for every race these tests sail (a batch does the same).</summary>
    static readonly CourseSim.Equilibrium.RigCache Rigs = new();

    public static string Demo => Path.Combine(RepoRoot.Path, "scenarios", "korrin-bay-race.toml");

    /// <summary>The 12-board demo, or with only its first board (a lone board), each board's line_position set if given.</summary>
    public static RaceSetup Setup(ulong seed, double? linePosition = null, bool alone = false, bool allAtPosition = false)
    {
        string text = File.ReadAllText(Demo);
        if (alone)
        {
            // Keep the header and the first [boards.*] table.
            int first = text.IndexOf("[boards.", StringComparison.Ordinal);
            int second = text.IndexOf("[boards.", first + 1, StringComparison.Ordinal);
            text = text[..second];
        }
        var sets = new List<string>();
        if (linePosition is { } lp)
        {
            var ids = System.Text.RegularExpressions.Regex.Matches(text, @"^\[boards\.([a-z]+)\]", System.Text.RegularExpressions.RegexOptions.Multiline)
                .Select(m => m.Groups[1].Value).ToList();
            foreach (var id in allAtPosition || alone ? ids : ids.Take(1))
                sets.Add($"boards.{id}.line_position={lp.ToString(System.Globalization.CultureInfo.InvariantCulture)}");
        }
        string path = Path.Combine(Path.GetDirectoryName(Demo)!, $"start-{Guid.NewGuid():N}.toml");
        File.WriteAllText(path, text);
        try { return ScenarioFile.LoadRace(path, sets, seed); }
        finally { File.Delete(path); }
    }

    /// <summary>Sails the start; boards not started <paramref name="afterS"/> after the signal count with StartedS = +infinity.</summary>
    public static List<BoardStart> Sail(RaceSetup setup, double afterS = 300)
    {
        var race = new Race(setup, Rigs.For);
        var f = race.Fleet;
        var over = new bool[f.Count]; var ahead = new double[f.Count];
        var line0 = race.Course.Start;
        var bowAt = Enumerable.Repeat(double.NaN, f.Count).ToArray();
        double BowAhead(int b)
        {
            var pose = race.World.Get<Pose>(race.EntityOf(b));
            return line0.Ahead(new Vec2(pose.X, pose.Y) + 0.5 * f.LengthM[b] * new Vec2(Math.Sin(pose.Heading), Math.Cos(pose.Heading)));
        }
        var plans = Enumerable.Range(0, f.Count).Select(b => race.World.Get<StartPlan>(race.EntityOf(b))).ToArray();
        void Watch() { for (int b = 0; b < f.Count; b++) if (double.IsNaN(bowAt[b]) && race.Time > -20 && BowAhead(b) > 0) bowAt[b] = race.Time; }
        while (race.Time < 0) { race.Step(); Watch(); }
        // The step that crossed the signal has been judged: where was each hull then?
        var line = race.Course.Start;
        var along = (line.B - line.A).Unit();
        for (int b = 0; b < f.Count; b++)
        {
            var pose = race.World.Get<Pose>(race.EntityOf(b));
            var centre = new Vec2(pose.X, pose.Y);
            var bow = centre + 0.5 * f.LengthM[b] * new Vec2(Math.Sin(pose.Heading), Math.Cos(pose.Heading));
            double u = Vec2.Dot(bow - line.A, along);
            ahead[b] = Math.Max(line.Ahead(bow), line.Ahead(centre - 0.5 * f.LengthM[b] * new Vec2(Math.Sin(pose.Heading), Math.Cos(pose.Heading))));
            over[b] = ahead[b] > 0 && u >= -5 && u <= line.Length + 5;
        }
        bool AllStarted() => Enumerable.Range(0, f.Count).All(b => race.World.Get<RaceStatus>(race.EntityOf(b)).State is RaceState.Racing or RaceState.Finished);
        while (race.Time < afterS && !race.IsOver && !AllStarted()) { race.Step(); Watch(); }
        var res = new List<BoardStart>();
        for (int b = 0; b < f.Count; b++)
        {
            var st = race.World.Get<RaceStatus>(race.EntityOf(b));
            bool started = st.State is RaceState.Racing or RaceState.Finished;
            double at = started ? st.StartedS : double.PositiveInfinity;
            int turns = race.Events.Count(e => e.Board == b && (e.Kind == RaceEventKind.Tack || e.Kind == RaceEventKind.Gybe) && e.TimeS <= at);
            res.Add(new BoardStart(f.Ids[b], f.Skill[b], over[b], ahead[b], st.Ocs, turns, at, bowAt[b], plans[b].GoMarginS, plans[b].LineErrorM));
        }
        return res;
    }
}
