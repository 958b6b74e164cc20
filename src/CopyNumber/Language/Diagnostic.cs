namespace CopyNumber.Language;

/// <summary>
/// One mistake found in a model file. Diagnostics are values: the language collects every one of a
/// file and the command line prints them in one place.
/// </summary>
/// <param name="File">The file name as the user gave it.</param>
/// <param name="Position">Where the mistake is.</param>
/// <param name="Message">What is wrong, in one sentence without a trailing full stop.</param>
/// <param name="SourceLine">The text of the offending line (without its line break), for the caret display.</param>
public sealed record Diagnostic(string File, SourcePosition Position, string Message, string SourceLine)
{
    /// <summary>
    /// <c>file:line:col: error: message</c>, then the source line and a caret under the column
    /// (a run of carets as long as <see cref="SourcePosition.Length"/>); only the first line when there is no
    /// source line, as for a file that cannot be read.
    /// </summary>
    public string Format() => Format("error");

    /// <summary>As <see cref="Format()"/>, with <paramref name="severity"/> (<c>error</c>, <c>warning</c>) after the position.</summary>
    public string Format(string severity)
    {
        var head = $"{File}:{Position.Line}:{Position.Column}: {severity}: {Message}";
        // A problem with the file as a whole (missing, a directory, too large) has no line to point into.
        if (SourceLine.Length == 0) return head;
        var caretColumn = Math.Max(1, Position.Column);
        var expandedPrefix = new string(SourceLine.Take(caretColumn - 1).Select(c => c == '\t' ? '\t' : ' ').ToArray());
        var carets = new string('^', Math.Max(1, Position.Length));
        return $"{head}\n  {SourceLine}\n  {expandedPrefix}{carets}";
    }
}
