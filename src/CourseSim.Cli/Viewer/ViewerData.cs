using System.Globalization;
using System.Text;
using CourseSim.Engine;
using CourseSim.Replay;

namespace CourseSim.Cli.Viewer;

/// <summary>
/// The viewer's data: a replay as one JSON document the page reads (docs/viewer.md). Per-sample columns are flat arrays
/// frame-major (frame k, board b at k x boards + b), numbers rounded to what the page can show.
/// </summary>
public static class ViewerData
{
    /// <summary>The JSON of a whole replay.</summary>
    public static string Json(ReplayData r, bool live = false)
    {
        var sb = new StringBuilder(1 << 20);
        sb.Append('{');
        Head(sb, r.Scenario, r.Venue, r.Seed, r.StepHz, r.IntervalS, r.StartS, r.Boards, r.CourseKind, r.CourseAxisDeg, r.StartLine, r.Steps, r.Wind);
        sb.Append(",\"frames\":").Append(r.Frames);
        sb.Append(",\"columns\":{");
        bool first = true;
        foreach (var name in ReplayFile.ColumnNames)
        {
            if (!r.Columns.TryGetValue(name, out var col)) continue;
            if (!first) sb.Append(','); first = false;
            Str(sb, name); sb.Append(':'); Floats(sb, col, Decimals(name));
        }
        sb.Append('}');
        sb.Append(",\"flags\":"); Bytes(sb, r.Flags);
        sb.Append(",\"next_step\":"); Bytes(sb, r.NextStep);
        Tail(sb, r.Events, r.Incidents, r.Results, live);
        sb.Append('}');
        return sb.ToString();
    }

    /// <summary>Decimals kept per column: centimetres for positions, thousandths for shares, tenths for the rest.</summary>
    internal static int Decimals(string column) => column switch { "x_m" or "y_m" => 2, "sheet" or "heel_use" or "reserve" => 3, _ => 1 };

    internal static void Head(StringBuilder sb, string scenario, string venue, ulong seed, double stepHz, double intervalS, double startS,
        IReadOnlyList<ReplayBoard> boards, string courseKind, double axisDeg, double[] startLine, IReadOnlyList<ReplayStep> steps, ReplayWind? wind)
    {
        sb.Append("\"format\":\"coursesim-viewer/1\",\"scenario\":"); Str(sb, scenario);
        sb.Append(",\"venue\":"); Str(sb, venue);
        sb.Append(",\"seed\":\"").Append(seed.ToString(CultureInfo.InvariantCulture)).Append('"');
        sb.Append(",\"step_hz\":"); Num(sb, stepHz, 3);
        sb.Append(",\"interval_s\":"); Num(sb, intervalS, 4);
        sb.Append(",\"start_s\":"); Num(sb, startS, 3);
        sb.Append(",\"boards\":[");
        for (int b = 0; b < boards.Count; b++)
        {
            if (b > 0) sb.Append(',');
            var x = boards[b];
            sb.Append("{\"name\":"); Str(sb, x.Name); sb.Append(",\"equipment\":"); Str(sb, x.Equipment);
            sb.Append(",\"sail_m2\":"); Num(sb, x.SailAreaM2, 2); sb.Append(",\"rider_kg\":"); Num(sb, x.RiderMassKg, 1);
            sb.Append(",\"skill\":"); Num(sb, x.Skill, 2); sb.Append('}');
        }
        sb.Append("],\"course_kind\":"); Str(sb, courseKind);
        sb.Append(",\"axis_deg\":"); Num(sb, axisDeg, 2);
        sb.Append(",\"start_line\":"); Doubles(sb, startLine, 3);
        sb.Append(",\"steps\":[");
        for (int i = 0; i < steps.Count; i++)
        {
            if (i > 0) sb.Append(',');
            sb.Append("{\"kind\":"); Str(sb, steps[i].Kind); sb.Append(",\"name\":"); Str(sb, steps[i].Name);
            sb.Append(",\"rounding\":"); Str(sb, steps[i].Rounding); sb.Append(",\"points\":"); Doubles(sb, steps[i].Points, 2); sb.Append('}');
        }
        sb.Append(']');
        sb.Append(",\"wind\":");
        if (wind is null) sb.Append("null");
        else
        {
            sb.Append("{\"x0_m\":"); Num(sb, wind.X0, 2); sb.Append(",\"y0_m\":"); Num(sb, wind.Y0, 2); sb.Append(",\"cell_m\":"); Num(sb, wind.CellM, 3);
            sb.Append(",\"nx\":").Append(wind.Nx).Append(",\"ny\":").Append(wind.Ny);
            sb.Append(",\"start_s\":"); Num(sb, wind.StartS, 3); sb.Append(",\"interval_s\":"); Num(sb, wind.IntervalS, 3);
            sb.Append(",\"frames\":").Append(wind.Frames);
            sb.Append(",\"speed_ms\":"); Floats(sb, wind.SpeedMs, 2); sb.Append(",\"from_deg\":"); Floats(sb, wind.FromDeg, 1); sb.Append('}');
        }
    }

    internal static void Tail(StringBuilder sb, IReadOnlyList<ReplayEvent> events, IReadOnlyList<ReplayIncident> incidents, IReadOnlyList<ReplayResult> results, bool live)
    {
        sb.Append(",\"events\":[");
        for (int i = 0; i < events.Count; i++)
        {
            if (i > 0) sb.Append(',');
            var e = events[i];
            sb.Append('['); Num(sb, e.TimeS, 2); sb.Append(',').Append(e.Board).Append(','); Str(sb, e.Kind); sb.Append(',');
            Num(sb, e.X, 1); sb.Append(','); Num(sb, e.Y, 1); sb.Append(','); Str(sb, e.Detail); sb.Append(']');
        }
        sb.Append("],\"incidents\":[");
        for (int i = 0; i < incidents.Count; i++)
        {
            if (i > 0) sb.Append(',');
            var c = incidents[i];
            sb.Append("{\"time_s\":"); Num(sb, c.TimeS, 2); sb.Append(",\"x_m\":"); Num(sb, c.X, 1); sb.Append(",\"y_m\":"); Num(sb, c.Y, 1);
            sb.Append(",\"keep_clear\":").Append(c.KeepClear).Append(",\"right_of_way\":").Append(c.RightOfWay).Append(",\"rule\":"); Str(sb, c.Rule);
            sb.Append(",\"penalty\":").Append(c.Penalty ? "true" : "false").Append(",\"detail\":"); Str(sb, c.Detail); sb.Append('}');
        }
        sb.Append("],\"results\":[");
        for (int i = 0; i < results.Count; i++)
        {
            if (i > 0) sb.Append(',');
            var x = results[i];
            sb.Append("{\"board\":").Append(x.Board).Append(",\"place\":").Append(x.Place is int p ? p.ToString(CultureInfo.InvariantCulture) : "null");
            sb.Append(",\"finished\":").Append(x.Finished ? "true" : "false").Append(",\"elapsed_s\":");
            if (x.ElapsedS is double el) Num(sb, el, 2); else sb.Append("null");
            sb.Append('}');
        }
        sb.Append("],\"live\":").Append(live ? "true" : "false");
    }

    internal static void Str(StringBuilder sb, string s)
    {
        sb.Append('"');
        foreach (char c in s)
        {
            switch (c)
            {
                case '"': sb.Append("\\\""); break;
                case '\\': sb.Append("\\\\"); break;
                case '<': sb.Append("\\u003c"); break; // safe inside an HTML script element
                case '>': sb.Append("\\u003e"); break;
                case '&': sb.Append("\\u0026"); break;
                default:
                    if (c < 0x20) sb.Append("\\u").Append(((int)c).ToString("x4", CultureInfo.InvariantCulture)); else sb.Append(c);
                    break;
            }
        }
        sb.Append('"');
    }

    internal static void Num(StringBuilder sb, double v, int decimals)
    {
        if (!double.IsFinite(v)) { sb.Append("null"); return; }
        sb.Append(Math.Round(v, decimals).ToString("0.######", CultureInfo.InvariantCulture));
    }

    internal static void Floats(StringBuilder sb, IReadOnlyList<float> v, int decimals)
    {
        sb.Append('[');
        for (int i = 0; i < v.Count; i++) { if (i > 0) sb.Append(','); Num(sb, v[i], decimals); }
        sb.Append(']');
    }

    static void Doubles(StringBuilder sb, double[] v, int decimals)
    {
        sb.Append('[');
        for (int i = 0; i < v.Length; i++) { if (i > 0) sb.Append(','); Num(sb, v[i], decimals); }
        sb.Append(']');
    }

    static void Bytes(StringBuilder sb, byte[] v)
    {
        sb.Append('[');
        for (int i = 0; i < v.Length; i++) { if (i > 0) sb.Append(','); sb.Append(v[i]); }
        sb.Append(']');
    }
}
