namespace CopyNumber.Language;

/// <summary>
/// The lines of one model file and the diagnostics found in it so far. Every stage of the front end
/// reports here instead of throwing, so a file's mistakes come out together.
/// </summary>
internal sealed class DiagnosticBag
{
    private readonly List<Diagnostic> _diagnostics = [];

    /// <summary>Splits <paramref name="text"/> at \n, \r\n and \r.</summary>
    public DiagnosticBag(string text, string file)
    {
        File = file;
        Lines = SplitLines(text);
    }

    /// <summary>The file name as the user gave it.</summary>
    public string File { get; }

    /// <summary>The file's lines without their line breaks; line n is <c>Lines[n - 1]</c>.</summary>
    public IReadOnlyList<string> Lines { get; }

    /// <summary>Number of diagnostics so far.</summary>
    public int Count => _diagnostics.Count;

    /// <summary>Records a mistake at <paramref name="position"/>.</summary>
    public void Report(SourcePosition position, string message)
    {
        var line = position.Line >= 1 && position.Line <= Lines.Count ? Lines[position.Line - 1] : "";
        _diagnostics.Add(new Diagnostic(File, position, message, line));
    }

    /// <summary>All diagnostics ordered by line and column (stable, so one place keeps its report order).</summary>
    public IReadOnlyList<Diagnostic> Sorted() =>
        _diagnostics.OrderBy(d => d.Position.Line).ThenBy(d => d.Position.Column).ToArray();

    private static List<string> SplitLines(string text)
    {
        var lines = new List<string>();
        var start = 0;
        for (var i = 0; i < text.Length; i++)
        {
            if (text[i] is not ('\n' or '\r')) continue;
            lines.Add(text[start..i]);
            if (text[i] == '\r' && i + 1 < text.Length && text[i + 1] == '\n') i++;
            start = i + 1;
        }
        if (start < text.Length || lines.Count == 0) lines.Add(text[start..]);
        return lines;
    }
}
