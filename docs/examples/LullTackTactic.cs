// A worked example of a tactic of your own (docs/tactics.md, "Writing your own tactic"). It is compiled and run by the
// test suite (tests/CourseSim.Tests/Agents/UserTacticTests.cs), so it stays in step with the interface.
using CourseSim.Agents;
using CourseSim.Units;

namespace CourseSim.Examples;

/// <summary>
/// "lull-tack": on a beat, when the wind the rider feels has dropped by lull_kn below their running mean of it, tack
/// (the pressure is more likely elsewhere); otherwise sail to the laylines as the engine's navigator does.
/// </summary>
public sealed class LullTackTactic(TacticArgs args) : ITactic
{
    readonly double _lull = Unit.KnotsToMs(args["lull_kn"]), _minTack = args["min_tack_s"];
    double _mean = double.NaN, _last = double.NaN;

    /// <summary>The name, parameters and factory a scenario uses: register once, then name it in [boards.NAME].</summary>
    public static TacticSpec Spec { get; } = new("lull-tack",
        "on a beat, tack when the felt wind drops lull_kn below the rider's running mean",
        [
            new TacticParam("lull_kn", 0.5, 10, 2, "tack when the wind felt is this much below the running mean, kn"),
            new TacticParam("min_tack_s", 5, 600, 30, "least time between tacks, s"),
        ],
        a => new LullTackTactic(a));

    public Decision Decide(Observation o, INavigator nav)
    {
        // A 60-s running mean of the wind speed the rider feels (the observation is already lagged and noisy).
        double k = double.IsNaN(_last) ? 1 : Math.Min(1, (o.TimeS - _last) / 60);
        _mean = double.IsNaN(_mean) ? o.WindSpeedMs : _mean + k * (o.WindSpeedMs - _mean);
        _last = o.TimeS;
        double toMark = BuiltInTactics.ToMark(o, nav); // layline sailing to the aim point, as the built-in tactics do
        bool lull = o.Leg == LegKind.Beat && o.WindSpeedMs < _mean - _lull && o.TimeS - o.LastTurnS >= _minTack;
        return new Decision(lull ? nav.AtTrueWindAngle(-o.Tack * nav.BestAngle(upwind: true)) : toMark);
    }
}
