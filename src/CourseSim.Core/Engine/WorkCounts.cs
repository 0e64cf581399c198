namespace CourseSim.Engine;

/// <summary>
/// Counts of the rules' costliest calls in one race, for the benchmark: counts do not swing with the machine's load as
/// times do, so a change's effect on the work can be shown on a shared machine. Plain counters on the race's own
/// context (no process-wide state); no system reads them, so they cannot change a result.
/// </summary>
public sealed class WorkCounts
{
    /// <summary>Neighbours checked for a conflict in the lookout's threat scans (a closest approach each).</summary>
    public long NeighbourChecks;
    /// <summary>Give-way searches (the candidate courses of a rider who must keep clear).</summary>
    public long GiveWaySearches;
    /// <summary>Candidate courses vetted in give-way searches (each checked against the threats or every neighbour).</summary>
    public long CandidatesVetted;
    /// <summary>Hull-gap predictions asked for (the search's costliest call).</summary>
    public long HullGapProbes;
    /// <summary>Boards the neighbour grid's rebuilds looked at (a distance each).</summary>
    public long GridCandidates;
}
