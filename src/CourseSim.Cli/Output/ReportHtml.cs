using System.Net;
using System.Text;
using System.Text.RegularExpressions;

namespace CourseSim.Cli.Output;

/// <summary>
/// The report as one self-contained HTML page: the Markdown's headings, paragraphs, lists and tables (wide tables
/// scroll inside their box, headers wrap rather than squeeze), with each chart (PNG, embedded) after the section it
/// belongs to.
/// </summary>
public static partial class ReportHtml
{
    const string Style = "body{font-family:system-ui,sans-serif;max-width:1100px;margin:2em auto;padding:0 1em;color:#1d2a33;line-height:1.45}" +
        ".wide{overflow-x:auto;margin:1em 0}table{border-collapse:collapse;font-size:14px}" +
        "td,th{border-bottom:1px solid #c9d3da;padding:4px 10px;text-align:left;vertical-align:top}" +
        "th{background:#eef3f6;min-width:6em;white-space:normal}td:first-child{min-width:10em}" +
        "ul.headline{background:#f3f7ee;border-left:4px solid #009E73;padding:.6em 1em .6em 2em}img{max-width:100%}" +
        ".warn{background:#fff4e0;border-left:4px solid #E69F00;padding:.5em 1em}blockquote{color:#7a4b00;border-left:4px solid #E69F00;padding-left:1em}";

    [GeneratedRegex(@"\*\*(.+?)\*\*")]
    private static partial Regex Bold();

    static string Inline(string s) => Bold().Replace(WebUtility.HtmlEncode(s), "<strong>$1</strong>");

    static string Img(string alt, byte[] png) => $"<img alt=\"{WebUtility.HtmlEncode(alt)}\" src=\"data:image/png;base64,{Convert.ToBase64String(png)}\">";

    /// <summary>The page; <paramref name="charts"/> go at the end of the section whose heading is the key.</summary>
    public static string Of(string title, string markdown, IReadOnlyDictionary<string, List<(string Alt, byte[] Png)>> charts)
    {
        var sb = new StringBuilder();
        sb.Append("<!doctype html><html lang=\"en\"><head><meta charset=\"utf-8\"><title>").Append(WebUtility.HtmlEncode(title))
          .Append("</title><style>").Append(Style).Append("</style></head><body>");
        string? section = null;
        void Close()
        {
            if (section is not null && charts.TryGetValue(section, out var list)) foreach (var (alt, png) in list) sb.Append(Img(alt, png));
        }
        foreach (var block in markdown.Split("\n\n"))
        {
            var lines = block.Split('\n', StringSplitOptions.RemoveEmptyEntries);
            if (lines.Length == 0) continue;
            if (lines[0].StartsWith("# ", StringComparison.Ordinal)) sb.Append("<h1>").Append(Inline(lines[0][2..])).Append("</h1>");
            else if (lines[0].StartsWith("## ", StringComparison.Ordinal))
            {
                Close();
                section = lines[0][3..];
                sb.Append("<h2>").Append(Inline(section)).Append("</h2>");
            }
            else if (lines[0].StartsWith('|'))
            {
                sb.Append("<div class=\"wide\"><table>");
                for (int i = 0; i < lines.Length; i++)
                {
                    if (i == 1) continue; // the Markdown separator row
                    sb.Append("<tr>");
                    foreach (var c in lines[i].Trim().Trim('|').Split('|')) sb.Append(i == 0 ? "<th>" : "<td>").Append(Inline(c.Trim())).Append(i == 0 ? "</th>" : "</td>");
                    sb.Append("</tr>");
                }
                sb.Append("</table></div>");
            }
            else if (lines[0].StartsWith("- ", StringComparison.Ordinal))
                sb.Append("<ul class=\"headline\">").Append(string.Concat(lines.Select(l => "<li>" + Inline(l[2..]) + "</li>"))).Append("</ul>");
            else if (lines[0].StartsWith("> ", StringComparison.Ordinal))
            {
                Close();
                section = null;
                sb.Append("<blockquote>").Append(Inline(lines[0][2..])).Append("</blockquote>");
            }
            else if (lines[0].StartsWith("**Warning:**", StringComparison.Ordinal)) sb.Append("<p class=\"warn\">").Append(Inline(string.Join(' ', lines))).Append("</p>");
            else sb.Append("<p>").Append(Inline(string.Join(' ', lines))).Append("</p>");
        }
        Close();
        sb.Append("</body></html>\n");
        return sb.ToString();
    }
}
