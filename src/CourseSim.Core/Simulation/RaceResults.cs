using CourseSim.Engine;
using CourseSim.Equilibrium;
using CourseSim.Units;

namespace CourseSim.Simulation;

/// <summary>A race's result from its state: places, times, legs and counters per board, events in time order, incidents.</summary>
static class RaceResults
{
    public static RaceResult Build(Race race, RaceContext c)
    {
        var f = c.Fleet; var w = c.World;
        var order = new List<(int Board, double T)>();
        for (int b = 0; b < f.Count; b++)
        {
            var st = w.Get<RaceStatus>(f.Entities[b]);
            if (st.State == RaceState.Finished) order.Add((b, st.FinishedS));
        }
        // Ties on the finishing time (to the step's interpolation) in the canonical order of the ids.
        order.Sort((a, b) => a.T != b.T ? a.T.CompareTo(b.T) : f.Rank[a.Board].CompareTo(f.Rank[b.Board]));
        var place = new int[f.Count];
        for (int i = 0; i < order.Count; i++) place[order[i].Board] = i + 1;
        double? best = order.Count > 0 ? order[0].T : null;
        var rows = new List<BoardResult>();
        for (int b = 0; b < f.Count; b++)
        {
            var e = f.Entities[b];
            var st = w.Get<RaceStatus>(e); var m = w.Get<Motion>(e); var pen = w.Get<Penalty>(e); var gw = w.Get<GiveWay>(e);
            bool fin = st.State == RaceState.Finished;
            double sailing = fin ? st.FinishedS : Math.Max(c.Time, 1e-9);
            rows.Add(new BoardResult(b, f.Names[b], race.Setup.Boards[b].Equipment.Name, place[b] > 0 ? place[b] : null, fin, fin ? st.FinishedS : null,
                fin && best is double bt ? st.FinishedS - bt : null, c.Log.Splits[b].ToArray(), m.Distance,
                m.Distance / Math.Max(sailing, 1e-9), st.Tacks, st.Gybes, st.Falls, st.Ocs, st.WrongSide, pen.Taken, gw.Episodes, pen.Owed));
        }
        // Events in time order (ties: the boards' canonical order, then kind, then as logged).
        var events = c.Log.Events.Select((e, n) => (e, n)).OrderBy(x => x.e.TimeS).ThenBy(x => f.Rank[x.e.Board]).ThenBy(x => x.e.Kind).ThenBy(x => x.n)
            .Select(x => x.e).ToArray();
        return new RaceResult(race.Seed, race.Setup.Name, c.Time, rows, events, Race.EngineVersion) { Incidents = c.Log.Incidents.ToArray() };
    }

    /// <summary>Estimated race duration for one rig at the mean wind, s: each leg at the polar's VMG or reaching speed.</summary>
    public static double Estimate(RaceSetup setup, RigPolar rig)
    {
        double tws = Unit.KnotsToMs(setup.Wind.SpeedKn), t = 0;
        var prev = setup.Course.Start.Mid;
        var up = Courses.Vec2.FromBearing(setup.Wind.DirectionDeg);
        foreach (var s in setup.Course.Steps)
        {
            var leg = s.Target - prev;
            double cos = Courses.Vec2.Dot(leg.Unit(), up), twa = Math.Acos(Math.Clamp(cos, -1, 1));
            double up0 = rig.BestTwa(tws, true), down0 = rig.BestTwa(tws, false);
            double vmg = twa < up0 ? rig.BestVmg(tws, true) / Math.Max(cos, 0.2) : twa > down0 ? rig.BestVmg(tws, false) / Math.Max(-cos, 0.2) : rig.Speed(tws, twa);
            t += leg.Length / Math.Max(vmg, 0.5);
            prev = s.Target;
        }
        return t;
    }
}
