using Spectre.Console;

namespace CourseSim.Cli.Output;

/// <summary>A column of a fitted table: header, alignment, and the order it is dropped in when the table is too wide
/// (0 never; higher numbers go first). A column that wraps (free text) is narrowed rather than dropped.</summary>
public sealed record FitColumn(string Header, bool Right, int DropOrder, bool Wraps = false);

/// <summary>
/// Tables that fit the terminal: each column as wide as its widest value, never cut; when the table is wider than the
/// terminal, whole columns are left out (highest drop order first) and the title says which, so no number is ever
/// shown with digits missing.
/// </summary>
public static class TableFit
{
    public static Table Build(string title, IReadOnlyList<FitColumn> columns, IReadOnlyList<string[]> rows, int width) =>
        Build(title, columns, rows, width, out _);

    public static Table Build(string title, IReadOnlyList<FitColumn> columns, IReadOnlyList<string[]> rows, int width, out IReadOnlyList<string> dropped)
    {
        var widths = columns.Select((c, i) => Math.Max(c.Header.Length, rows.Count == 0 ? 0 : rows.Max(r => r[i].Length))).ToArray();
        var keep = Enumerable.Range(0, columns.Count).ToList();
        var left = new List<string>();
        // A simple-bordered table takes each column's width plus 3 (padding and rule), and one more.
        int Total() => keep.Sum(i => columns[i].Wraps ? Math.Min(widths[i], 20) : widths[i]) + 3 * keep.Count + 1;
        while (Total() > width)
        {
            var drop = keep.Where(i => columns[i].DropOrder > 0).OrderByDescending(i => columns[i].DropOrder).Cast<int?>().FirstOrDefault();
            if (drop is null) break;
            keep.Remove(drop.Value);
            left.Add(columns[drop.Value].Header);
        }
        dropped = left;
        var t = new Table().Border(TableBorder.Simple)
            .Title(title + (left.Count == 0 ? "" : Markup.Escape($" (left out to fit {width} columns: {string.Join(", ", left)})")));
        int fixedWidth = keep.Where(i => !columns[i].Wraps).Sum(i => widths[i]) + 3 * keep.Count + 1;
        foreach (int i in keep)
        {
            var col = new TableColumn(columns[i].Header);
            if (columns[i].Wraps) col.Width(Math.Max(10, Math.Min(widths[i], width - fixedWidth)));
            else col.NoWrap().Width(Math.Max(1, widths[i]));
            t.AddColumn(columns[i].Right ? col.RightAligned() : col);
        }
        foreach (var r in rows) t.AddRow(keep.Select(i => Markup.Escape(r[i])).ToArray());
        return t;
    }
}
