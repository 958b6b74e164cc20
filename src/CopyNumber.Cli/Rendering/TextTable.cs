using System.Text;

namespace CopyNumber.Cli.Rendering;

/// <summary>
/// A plain-text table: a header row, a rule, then rows; numbers right-aligned, text left-aligned. Each row stays one
/// line (scripts grep them); the rule under a text last column stops at <see cref="LongestRule"/> characters, so one
/// long sentence (a verdict's reason) does not draw hundreds of dashes.
/// </summary>
internal sealed class TextTable(params string[] headers)
{
    /// <summary>The longest rule drawn under a text last column.</summary>
    public const int LongestRule = 100;

    private readonly List<string[]> _rows = [];

    public TextTable Add(params string[] cells)
    {
        _rows.Add(cells);
        return this;
    }

    public override string ToString()
    {
        var columns = headers.Length;
        var widths = new int[columns];
        foreach (var row in _rows.Prepend(headers))
            for (var c = 0; c < columns && c < row.Length; c++) widths[c] = Math.Max(widths[c], row[c].Length);
        var rightAligned = Enumerable.Range(0, columns)
            .Select(c => _rows.Count > 0 && _rows.All(r => c >= r.Length || LooksNumeric(r[c])))
            .ToArray();
        var text = new StringBuilder();
        void Line(string[] cells)
        {
            for (var c = 0; c < columns; c++)
            {
                var cell = c < cells.Length ? cells[c] : "";
                if (c > 0) text.Append("  ");
                text.Append(rightAligned[c] ? cell.PadLeft(widths[c]) : cell.PadRight(widths[c]));
            }
            while (text.Length > 0 && text[^1] == ' ') text.Length--;
            text.Append('\n');
        }
        Line(headers);
        var last = columns - 1;
        text.Append(string.Join("  ", widths.Select((w, c) => new string('-', c == last && !rightAligned[c] ? Math.Min(w, Math.Max(LongestRule, headers[c].Length)) : w)))).Append('\n');
        foreach (var row in _rows) Line(row);
        return text.ToString();
    }

    private static bool LooksNumeric(string cell) =>
        cell.Length == 0 || cell == "-" || double.TryParse(cell.Split(' ')[0], System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out _);
}
