namespace CourseSim.Engine;

/// <summary>What a race has written down so far: events, judged contacts and each board's splits (s from the signal).</summary>
public sealed class RaceLog
{
    public List<RaceEvent> Events { get; private set; } = new();
    public List<RaceIncident> Incidents { get; private set; } = new();
    public List<double>[] Splits { get; private set; }

    /// <summary>Room for the events of a typical race up front (tens per board), so the step does not grow the list.</summary>
    public RaceLog(int boards)
    {
        Splits = Enumerable.Range(0, boards).Select(_ => new List<double>(16)).ToArray();
        Events = new List<RaceEvent>(64 * Math.Max(1, boards));
        Incidents = new List<RaceIncident>(Math.Max(16, boards));
    }

    /// <summary>Room for this many events in all (the race sizes it from its estimated length), so the step does not grow the list.</summary>
    public void Reserve(int events)
    {
        if (Events.Capacity < events) Events.Capacity = events;
    }

    public void Add(double timeS, int board, RaceEventKind kind, double x, double y, string detail = "") =>
        Events.Add(new RaceEvent(timeS, board, kind, x, y, detail));

    /// <summary>An event whose text is made when read (<see cref="RaceEvent.Detail"/>): nothing allocated here.</summary>
    public void Add(double timeS, int board, RaceEventKind kind, double x, double y, string format, string? a, string? b, double value) =>
        Events.Add(new RaceEvent(timeS, board, kind, x, y, format, a, b, value));

    /// <summary>Judges a contact: the incident and its event (whose text is the incident's), nothing allocated here.</summary>
    public void AddContact(in RaceIncident incident, int board)
    {
        Incidents.Add(incident);
        Events.Add(new RaceEvent(incident.TimeS, board, RaceEventKind.Contact, incident.X, incident.Y, Incidents, Incidents.Count - 1));
    }

    /// <summary>A deep copy (events and incidents are immutable values).</summary>
    public RaceLog Copy()
    {
        // With the same room as this log, so a race restored from a copy does not grow its lists in the step either.
        var c = new RaceLog(0) { Events = new(Math.Max(Events.Capacity, 1)), Incidents = new(Math.Max(Incidents.Capacity, 1)) };
        c.Events.AddRange(Events); c.Incidents.AddRange(Incidents);
        c.Splits = Splits.Select(s => new List<double>(s)).ToArray();
        return c;
    }
}
