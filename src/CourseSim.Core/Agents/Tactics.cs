using CourseSim.Courses;
using CourseSim.Units;

namespace CourseSim.Agents;

public sealed class TacticLoadException(string message) : Exception(message);

/// <summary>The built-in tactics. Each one's parameters are what a coach would tune; defaults are model values.</summary>
public static class BuiltInTactics
{
    static TacticParam MinTurn(double def) => new("min_turn_s", 3, 600, def, "least time between two tacks or gybes the tactic starts, s");

    public static readonly TacticSpec VmgLayline = new("vmg-layline",
        "sail the best VMG angle on a beat or run and tack or gybe on the layline; straight at the mark on a reach",
        [MinTurn(12)], a => new VmgLaylineTactic(a));

    public static readonly TacticSpec HeaderTack = new("header-tack",
        "on a beat tack when headed by header_deg against the rider's running mean of the wind; on a run gybe when lifted by lift_deg",
        [
            new("header_deg", 1, 45, 5, "tack when the wind has headed this much against the rider's running mean, deg"),
            new("lift_deg", 1, 45, 5, "downwind, gybe when the wind has lifted this much against the running mean, deg"),
            new("min_tack_s", 5, 600, 20, "least time between tacks or gybes, s"),
            new("mean_s", 10, 1200, 90, "time constant of the rider's running mean of the wind direction, s"),
        ], a => new HeaderTackTactic(a));

    public static readonly TacticSpec Pressure = new("pressure",
        "on a beat or run, go to the side where more wind is felt and seen on other boards; otherwise sail to the laylines",
        [
            new("sight_m", 50, 2000, 400, "how far the rider reads the wind off the water and other boards, m"),
            new("gain_kn", 0.2, 10, 1.0, "tack or gybe when the other side looks this much windier, kn"),
            new("min_tack_s", 5, 600, 30, "least time between tacks or gybes, s"),
        ], a => new PressureTactic(a));

    public static readonly TacticSpec Conservative = new("conservative",
        "on a beat or run, stay inside a cone around the direct line to the mark (apex at the mark), tacking or gybing at its edges",
        [
            new("cone_deg", 2, 45, 10, "half-angle of the cone around the leg's direct line, deg"),
            MinTurn(12),
        ], a => new ConservativeTactic(a));

    public static readonly TacticSpec Cover = new("cover",
        "when ahead of the rival on the same leg, stay on the rival's tack (between them and the mark); otherwise sail to the laylines",
        [
            new("sight_m", 50, 2000, 400, "how far away the rival can be seen, m"),
            new("min_tack_s", 5, 600, 15, "least time between tacks or gybes, s"),
        ], a => new CoverTactic(a), NeedsRival: true);

    public static IReadOnlyList<TacticSpec> All => [VmgLayline, HeaderTack, Pressure, Conservative, Cover];

    /// <summary>Signed true wind angle (deg, positive = starboard) of a heading in a wind from <paramref name="fromDeg"/>.</summary>
    public static double Twa(double fromDeg, double headingDeg) => Unit.WrapDeg180(fromDeg - headingDeg);

    /// <summary>Layline sailing to the aim point, turning no sooner than the engine's least time between turns: the
    /// course the tactics below fall back on.</summary>
    public static double ToMark(Observation o, INavigator nav) =>
        nav.ToTarget(o.AimPoint, o.TimeS - o.LastTurnS >= Navigation.MinTimeBetweenTurnsS);

    /// <summary>The heading on the other tack or gybe at the best VMG angle of this leg.</summary>
    public static double Turn(Observation o, INavigator nav) =>
        nav.AtTrueWindAngle(-o.Tack * nav.BestAngle(o.Leg != LegKind.Run));

    sealed class VmgLaylineTactic(TacticArgs a) : ITactic
    {
        readonly double _minTurn = a["min_turn_s"];
        public Decision Decide(Observation o, INavigator nav) => new(nav.ToTarget(o.AimPoint, o.TimeS - o.LastTurnS >= _minTurn));
    }

    sealed class HeaderTackTactic(TacticArgs a) : ITactic
    {
        readonly double _header = a["header_deg"], _lift = a["lift_deg"], _minTack = a["min_tack_s"], _meanS = a["mean_s"];
        double _mean = double.NaN, _lastT = double.NaN;

        public Decision Decide(Observation o, INavigator nav)
        {
            // The rider's running mean of the wind direction (exponential, time constant mean_s).
            double k = double.IsNaN(_lastT) ? 1 : Math.Min(1, (o.TimeS - _lastT) / _meanS);
            _mean = double.IsNaN(_mean) ? o.WindFromDeg : Unit.WrapDeg360(_mean + k * Unit.WrapDeg180(o.WindFromDeg - _mean));
            _lastT = o.TimeS;
            double heading = ToMark(o, nav);
            if (o.TimeS - o.LastTurnS < _minTack || o.Leg == LegKind.Reach) return new(heading);
            double shift = Unit.WrapDeg180(o.WindFromDeg - _mean); // positive: veered
            // Starboard tack is headed when the wind backs, port when it veers; downwind a lift on the present gybe is
            // the shift that would lift it upwind (the board is pushed away from the mark), the time to gybe.
            bool turn = o.Leg == LegKind.Beat
                ? (o.Tack > 0 ? shift <= -_header : shift >= _header)
                : (o.Tack > 0 ? shift >= _lift : shift <= -_lift);
            return new(turn ? Turn(o, nav) : heading);
        }
    }

    /// <summary>Unit vector across the wind, to the right looking upwind.</summary>
    static Vec2 RightOfWind(Observation o) { var up = Vec2.FromBearing(o.WindFromDeg); return new Vec2(up.Y, -up.X); }

    sealed class PressureTactic(TacticArgs a) : ITactic
    {
        readonly double _sight = a["sight_m"], _gain = Unit.KnotsToMs(a["gain_kn"]), _minTack = a["min_tack_s"];
        public bool WantsNearby => true;

        public Decision Decide(Observation o, INavigator nav)
        {
            double heading = ToMark(o, nav);
            if (o.Leg == LegKind.Reach || o.TimeS - o.LastTurnS < _minTack) return new(heading);
            // Which way the present tack takes the rider across the wind.
            var right = RightOfWind(o);
            double going = Vec2.Dot(Vec2.FromBearing(o.HeadingDeg), right);
            double here = o.WindSpeedMs, sumAhead = here, nAhead = 1, sumOther = 0, nOther = 0;
            var nearby = o.Nearby;
            for (int i = 0; i < nearby.Count; i++) // by index: a foreach over the interface would allocate an enumerator
            {
                var s = nearby[i];
                if (s.DistanceM > _sight) continue;
                double side = Vec2.Dot(s.Position - o.Position, right); // m to the right of the rider, looking upwind
                if (Math.Abs(side) < 20) continue; // abeam in line with the rider: tells nothing about a side
                if (Math.Sign(side) == Math.Sign(going)) { sumAhead += s.WindSpeedMs; nAhead++; }
                else { sumOther += s.WindSpeedMs; nOther++; }
            }
            if (nOther == 0) return new(heading);
            return new(sumOther / nOther - sumAhead / nAhead >= _gain ? Turn(o, nav) : heading);
        }
    }

    /// <summary>Where the present leg starts: the previous step's point, or the middle of the start line.</summary>
    public static Vec2 LegStart(Observation o) => o.NextStep == 0 ? o.Course.Start.Mid : o.Course.Steps[o.NextStep - 1].Target;

    sealed class ConservativeTactic(TacticArgs a) : ITactic
    {
        readonly double _cone = a["cone_deg"], _minTurn = a["min_turn_s"];

        public Decision Decide(Observation o, INavigator nav)
        {
            bool may = o.TimeS - o.LastTurnS >= _minTurn;
            double heading = nav.ToTarget(o.AimPoint, may);
            if (o.Leg == LegKind.Reach || !may) return new(heading);
            var mark = o.AimPoint;
            var axis = LegStart(o) - mark;
            var rel = o.Position - mark;
            if (axis.Length < 1 || rel.Length < 30) return new(heading);
            double off = Unit.WrapDeg180(rel.Bearing - axis.Bearing); // positive: clockwise of the axis seen from the mark
            if (Math.Abs(off) < _cone) return new(heading);
            // Outside the cone and still heading further out: turn back towards the direct line.
            var au = axis.Unit();
            var side = new Vec2(au.Y, -au.X); // the way the bearing from the mark grows (clockwise)
            bool goingOut = Math.Sign(Vec2.Dot(Vec2.FromBearing(o.HeadingDeg), side)) == Math.Sign(off);
            return new(goingOut ? Turn(o, nav) : heading);
        }
    }

    sealed class CoverTactic(TacticArgs a) : ITactic
    {
        readonly double _sight = a["sight_m"], _minTack = a["min_tack_s"];
        readonly int _rival = a.Rival;
        public bool WantsNearby => true;

        public Decision Decide(Observation o, INavigator nav)
        {
            double heading = ToMark(o, nav);
            if (o.Leg == LegKind.Reach || o.TimeS - o.LastTurnS < _minTack) return new(heading);
            var nearby = o.Nearby;
            for (int i = 0; i < nearby.Count; i++)
            {
                var s = nearby[i];
                if (s.Board != _rival || s.DistanceM > _sight || s.NextStep != o.NextStep) continue;
                // Ahead when nearer the mark (by distance to the aim point): then match the rival's tack.
                bool ahead = (o.AimPoint - o.Position).Length < (o.AimPoint - s.Position).Length;
                int rivalTack = Twa(o.WindFromDeg, s.HeadingDeg) >= 0 ? 1 : -1;
                if (ahead && rivalTack != o.Tack) return new(Turn(o, nav));
                break;
            }
            return new(heading);
        }
    }
}
