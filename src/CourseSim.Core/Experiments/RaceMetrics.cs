using System.Globalization;
using CourseSim.Courses;
using CourseSim.Engine;
using CourseSim.Simulation;
using CourseSim.Units;

namespace CourseSim.Experiments;

/// <summary>
/// What an organiser asks of one race: how long it ran (first and last finisher), the wind over the start sequence and
/// the start line's signed bias, which side of the first beat each board took, how boards bunched at the marks, the
/// contacts, and the legs of the course with their kind.
/// Line bias is signed: positive when the mean wind over the start sequence is veered from the line's square, which
/// favours the right-hand (boat) end looking upwind; negative favours the left-hand (pin) end. The advantage is
/// line length x sin(bias), signed alike.
/// </summary>
public sealed record RaceMetrics(double FirstFinisherS, double LastFinisherS, double LineBiasDeg, double LineBiasM, double PeakAtMark, int CloseArrivals,
    IReadOnlyDictionary<int, string> FirstBeatSide, double WindKn = double.NaN, int Contacts = 0, int AvoidableContacts = 0,
    double StartWindFromDeg = double.NaN, double StartWindKn = double.NaN, int Boards = 0, int Finishers = 0, string Legs = "")
{
    /// <summary>Radius around a mark counted as "at the mark" for congestion, m (about three board lengths and room; model value).</summary>
    public const double MarkRadiusM = 30;
    /// <summary>Two roundings of the same mark this close in time count as a close arrival, s.</summary>
    public const double CloseArrivalS = 5;
    /// <summary>Interval at which the wind at the middle of the line is sampled over the start sequence, s.</summary>
    public const double StartSampleS = 2;
    /// <summary>A leg within this angle of the wind axis is a beat, beyond 180 minus it a run, else a reach, deg (common practice).</summary>
    public const double BeatRunDeg = 60;

    public const string Header = "variant,race,first_finisher_s,last_finisher_s,line_bias_deg,line_bias_m,start_wind_from_deg,start_wind_kn,wind_kn," +
        "peak_boards_at_mark,close_arrivals,contacts,avoidable_contacts,boards,finishers,legs";
    static readonly string[] Columns = Header.Split(',');

    public string ToCsv(string variant, int race) => string.Join(',', variant, I(race), F(FirstFinisherS), F(LastFinisherS), F(LineBiasDeg),
        F(LineBiasM), F(StartWindFromDeg), F(StartWindKn), F(WindKn), F(PeakAtMark), I(CloseArrivals), I(Contacts), I(AvoidableContacts), I(Boards),
        I(Finishers), Legs);

    static string F(double v) => double.IsFinite(v) ? Math.Round(v, 3).ToString("0.###", CultureInfo.InvariantCulture) : "";
    static string I(int v) => v.ToString(CultureInfo.InvariantCulture);

    /// <summary>The leg labels (e.g. "beat to 1"), in course order.</summary>
    public string[] LegLabels => Legs.Length == 0 ? [] : Legs.Split(';');

    /// <summary>Reads a per-race figures file (header line, then one line); the variant and race are returned beside.</summary>
    public static (string Variant, int Race, RaceMetrics Metrics) ParseFile(IReadOnlyList<string> lines, string source)
    {
        if (lines.Count < 2 || !RaceRow.SplitCsv(lines[0]).SequenceEqual(Columns))
            throw new InvalidDataException($"{source}:1: expected the header '{Header}' and one line (a file from an older version of coursesim? run the batch again without --resume)");
        var p = RaceRow.SplitCsv(lines[1]);
        if (p.Count != Columns.Length) throw new InvalidDataException($"{source}:2: expected {Columns.Length} fields, found {p.Count}");
        try
        {
            static double D(string s) => s.Length == 0 ? double.NaN : double.Parse(s, CultureInfo.InvariantCulture);
            static int N(string s) => int.Parse(s, CultureInfo.InvariantCulture);
            return (p[0], N(p[1]), new RaceMetrics(D(p[2]), D(p[3]), D(p[4]), D(p[5]), D(p[9]), N(p[10]), new Dictionary<int, string>(), D(p[8]),
                N(p[11]), N(p[12]), D(p[6]), D(p[7]), N(p[13]), N(p[14]), p[15]));
        }
        catch (FormatException e) { throw new InvalidDataException($"{source}:2: {e.Message}"); }
    }

    public static RaceMetrics Of(Race race, RaceResult result)
    {
        var course = race.Course;
        var done = result.Boards.Where(b => b.Finished).Select(b => b.ElapsedS!.Value).ToList();
        double first = done.Count == 0 ? double.NaN : done.Min(), last = done.Count == 0 ? double.NaN : done.Max();
        // Line bias: the vector mean of the wind at the middle of the line over the start sequence (the countdown up to
        // the signal) against the line's square (the course axis).
        double countdown = race.Setup.Race.CountdownS, sx = 0, sy = 0, speed = 0;
        int samples = 0;
        for (double ts = -countdown; ts <= 1e-9; ts += StartSampleS)
        {
            var ws = race.Wind.Sample(course.Start.Mid.X, course.Start.Mid.Y, ts);
            double r = Unit.DegToRad(ws.FromDeg);
            sx += ws.SpeedMs * Math.Sin(r); sy += ws.SpeedMs * Math.Cos(r); speed += ws.SpeedMs; samples++;
        }
        double fromDeg = Unit.WrapDeg360(Unit.RadToDeg(Math.Atan2(sx, sy)));
        double bias = Unit.WrapDeg180(fromDeg - course.AxisDeg);
        double advantage = course.Start.Length * Math.Sin(Unit.DegToRad(bias));
        // Legs: from the line (or the previous target) to each step's target, named by their angle to the wind axis.
        var up = Vec2.FromBearing(course.AxisDeg);
        var legs = new List<string>();
        var from = course.Start.Mid;
        foreach (var step in course.Steps)
        {
            var d = step.Target - from;
            double ang = d.Length > 0 ? Unit.RadToDeg(Math.Acos(Math.Clamp(Vec2.Dot(d.Unit(), up), -1, 1))) : 90;
            string kind = ang <= BeatRunDeg ? "beat" : ang >= 180 - BeatRunDeg ? "run" : "reach";
            legs.Add($"{kind} to {(step.Kind == StepKind.Finish ? "finish" : step.Name)}");
            from = step.Target;
        }
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
        return new RaceMetrics(first, last, bias, advantage, peak, close, sides, race.Setup.Wind.SpeedKn, contacts, avoidable, fromDeg,
            Unit.MsToKnots(speed / Math.Max(1, samples)), result.Boards.Count, done.Count, string.Join(';', legs).Replace(",", " "));
    }
}
