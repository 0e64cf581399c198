using System.Globalization;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Units;

namespace CourseSim.Experiments;

/// <summary>
/// What an organiser asks of one race: how long it ran, how biased the start line
/// was, which side of the first beat each board took, and how boards bunched at the marks.
/// </summary>
public sealed record RaceMetrics(double WinnerS, double LineBiasDeg, double LineBiasM, double PeakAtMark, int CloseArrivals,
    IReadOnlyDictionary<int, string> FirstBeatSide, double WindKn = double.NaN, int Contacts = 0, int AvoidableContacts = 0)
{
    /// <summary>Radius around a mark counted as "at the mark" for congestion, m (about three board lengths and room; model value).</summary>
    public const double MarkRadiusM = 30;
    /// <summary>Two roundings of the same mark this close in time count as a close arrival, s.</summary>
    public const double CloseArrivalS = 5;

    public const string Header = "variant,race,winner_s,line_bias_deg,line_bias_m,peak_boards_at_mark,close_arrivals,wind_kn,contacts,avoidable_contacts";

    public string ToCsv(string variant, int race) => string.Join(',', variant, race.ToString(CultureInfo.InvariantCulture), F(WinnerS), F(LineBiasDeg),
        F(LineBiasM), F(PeakAtMark), CloseArrivals.ToString(CultureInfo.InvariantCulture), F(WindKn), Contacts.ToString(CultureInfo.InvariantCulture), AvoidableContacts.ToString(CultureInfo.InvariantCulture));

    static string F(double v) => double.IsFinite(v) ? Math.Round(v, 3).ToString("0.###", CultureInfo.InvariantCulture) : "";

    public static RaceMetrics Of(Race race, RaceResult result)
    {
        var course = race.Course;
        double winner = result.Boards.Where(b => b.Finished).Select(b => b.ElapsedS!.Value).DefaultIfEmpty(double.NaN).Min();
        // Line bias: the wind at the middle of the line at the signal against the line's square (the course axis). A wind
        // veered to the right makes the right-hand (starboard) end favoured; the advantage is the line length x sin(bias).
        var w = race.Wind.Sample(course.Start.Mid.X, course.Start.Mid.Y, 0);
        double bias = Unit.WrapDeg180(w.FromDeg - course.AxisDeg);
        double advantage = course.Start.Length * Math.Sin(Unit.DegToRad(Math.Abs(bias)));
        // First beat side: mean offset from the line start -> first target, looking up it, while on leg 1 after the signal.
        var rec = race.Recorder;
        var a = course.Start.Mid; var t = course.Steps[0].Target;
        var dir = (t - a).Unit(); var right = new Vec2(dir.Y, -dir.X);
        var sides = new Dictionary<int, string>();
        for (int b = 0; b < race.BoardCount; b++)
        {
            double sum = 0; int n = 0;
            for (int k = 0; k < rec.Frames; k++)
            {
                if (rec.TimeOf(k) < 0) continue;
                ref readonly var s = ref rec.At(k, b);
                if (s.NextStep != 0 || (s.Flags & 64) != 0) { if (n > 0) break; continue; }
                sum += Vec2.Dot(new Vec2(s.X, s.Y) - a, right); n++;
            }
            if (n > 0) sides[b] = sum / n < 0 ? "left" : "right";
        }
        // Congestion: the most boards within MarkRadiusM of any one mark at one recorded instant; roundings of a mark
        // within CloseArrivalS of the previous one.
        double peak = 0;
        for (int k = 0; k < rec.Frames; k++)
            foreach (var m in course.Marks)
            {
                int c = 0;
                foreach (var s in rec.Frame(k)) if ((s.Flags & 32) == 0 && (new Vec2(s.X, s.Y) - m.Position).Length <= MarkRadiusM) c++;
                peak = Math.Max(peak, c);
            }
        int close = 0;
        foreach (var g in result.Events.Where(e => e.Kind == RaceEventKind.Rounded).GroupBy(e => e.Detail))
        {
            var times = g.Select(e => e.TimeS).Order().ToArray();
            for (int i = 1; i < times.Length; i++) if (times[i] - times[i - 1] <= CloseArrivalS) close++;
        }
        // Incidents: the contacts the engine judged (every step, docs/tactics.md), and those it classed as ones the
        // give-way logic could have avoided.
        int contacts = result.Incidents.Count, avoidable = result.Incidents.Count(i => i.Avoidable);
        return new RaceMetrics(winner, bias, advantage, peak, close, sides, race.Setup.Wind.SpeedKn, contacts, avoidable);
    }
}
