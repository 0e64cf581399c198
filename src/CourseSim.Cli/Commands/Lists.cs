using System.Globalization;

namespace CourseSim.Cli.Commands;

/// <summary>Parses number lists ("6,8,10") and ranges ("30:180:5", start:stop:step inclusive) from the command line.</summary>
public static class Lists
{
    public static IReadOnlyList<double> Parse(string text, string option, double min, double max)
    {
        var result = new List<double>();
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            var r = part.Split(':');
            if (r.Length == 3)
            {
                double a = Num(r[0], option), b = Num(r[1], option), s = Num(r[2], option);
                if (s <= 0 || b < a) throw new UsageException($"{option}: range '{part}' must be start:stop:step with step > 0 and stop >= start");
                double count = Math.Floor((b - a) / s + 1e-9);
                if (!(count <= 2000)) throw new UsageException($"{option}: range '{part}' has more than 2000 values");
                int n = (int)count;
                for (int i = 0; i <= n; i++) result.Add(Math.Round(a + i * s, 9));
            }
            else if (r.Length == 1) result.Add(Num(part, option));
            else throw new UsageException($"{option}: '{part}' is neither a number nor start:stop:step");
        }
        if (result.Count == 0) throw new UsageException($"{option}: no values given");
        if (result.Count > CourseSim.Storage.Limits.MaxList)
            throw new UsageException($"{option}: {result.Count} values, over the limit of {CourseSim.Storage.Limits.MaxList} {CourseSim.Storage.Limits.Override("COURSESIM_MAX_LIST")}");
        foreach (var v in result)
            if (v < min || v > max) throw new UsageException($"{option}: {v.ToString(CultureInfo.InvariantCulture)} is out of range (accepted {min} to {max})");
        return result.Distinct().Order().ToList();
    }

    static double Num(string s, string option) =>
        double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out double v) && double.IsFinite(v)
            ? v : throw new UsageException($"{option}: '{s}' is not a number");
}
