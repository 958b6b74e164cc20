namespace CopyNumber.Language;

/// <summary>The result of reading a model: the syntax tree when the file is free of mistakes, and every mistake found.</summary>
/// <param name="Model">The parsed and checked model; null whenever <paramref name="Diagnostics"/> is not empty.</param>
/// <param name="Diagnostics">Every mistake of the file, ordered by line and column.</param>
public sealed record ParseOutcome(ModelSyntax? Model, IReadOnlyList<Diagnostic> Diagnostics)
{
    /// <summary>True when the model can be compiled.</summary>
    public bool Succeeded => Model is not null && Diagnostics.Count == 0;
}

/// <summary>
/// The entry point of the <c>.cnet</c> language (see docs/network-language.md): text in, a checked
/// <see cref="ModelSyntax"/> or the complete list of diagnostics out. Never throws on bad input and runs
/// in time linear in the length of the text.
/// </summary>
public static class ModelSource
{
    /// <summary>Parses and checks a model text, reporting all mistakes of the file at once.</summary>
    /// <param name="text">The model text.</param>
    /// <param name="file">The file name to put in diagnostics and in <see cref="ModelSyntax.File"/>.</param>
    public static ParseOutcome Parse(string text, string file)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(file);
        var bag = new DiagnosticBag(text, file);
        var parsed = ModelParser.Parse(bag);
        ModelChecker.Check(parsed, bag);
        if (bag.Count > 0) return new ParseOutcome(null, bag.Sorted());
        var model = new ModelSyntax(file, parsed.Size, parsed.Species, parsed.Parameters, parsed.Reactions, parsed.Schedule, parsed.Readouts,
            parsed.Triggers, parsed.TimeUnit, parsed.SizeUnit, parsed.Cycle.Build());
        return new ParseOutcome(model, []);
    }

    /// <summary>
    /// Reads and parses a model file. A missing or unreadable file is reported as a diagnostic at 1:1,
    /// not as an exception.
    /// </summary>
    /// <param name="path">Path of the <c>.cnet</c> file; also the file name used in diagnostics.</param>
    public static ParseOutcome ReadFile(string path)
    {
        var (text, problem) = ReadText(path);
        return text is null ? new ParseOutcome(null, [problem!]) : Parse(text, path);
    }

    /// <summary>
    /// The text of a model file, or the one diagnostic (at 1:1) that says why there is none: no path, a
    /// directory, a missing file, or the system's reason it cannot be read. The runtime's own words for the
    /// first three ("Access to the path … is denied", "The value cannot be an empty string") mislead.
    /// </summary>
    /// <param name="path">Path of the <c>.cnet</c> file; also the file name used in the diagnostic.</param>
    public static (string? Text, Diagnostic? Problem) ReadText(string path)
    {
        try
        {
            if (string.IsNullOrWhiteSpace(path)) return Unreadable(path ?? "", "no model file given");
            if (Directory.Exists(path)) return Unreadable(path, $"'{path}' is a directory, not a model file");
            if (!File.Exists(path)) return Unreadable(path, $"model file '{path}' not found");
            return (File.ReadAllText(path), null);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException or System.Security.SecurityException)
        {
            return Unreadable(path, $"cannot read model file '{path}': {e.Message.TrimEnd('.')}");
        }
    }

    private static (string? Text, Diagnostic? Problem) Unreadable(string path, string message) =>
        (null, new Diagnostic(path, new SourcePosition(1, 1), message, ""));
}
