namespace CopyNumber.Language;

/// <summary>A model that did not load: every diagnostic that stopped it, each a complete <c>file:line:col: error: …</c> line.</summary>
public sealed class ModelInputException(IReadOnlyList<Diagnostic> diagnostics) : CopyNumberException(Summary(diagnostics), ErrorKind.BadInput)
{
    /// <summary>The diagnostics, in the order found.</summary>
    public IReadOnlyList<Diagnostic> Diagnostics { get; } = diagnostics;

    /// <inheritdoc/>
    public override IReadOnlyList<string> Lines =>
        [.. Diagnostics.Select(d => d.Format()), Diagnostics.Count == 1 ? "1 error" : $"{Diagnostics.Count} errors"];

    /// <inheritdoc/>
    public override bool LinesArePrefixed => true;

    private static string Summary(IReadOnlyList<Diagnostic> diagnostics) =>
        diagnostics.Count > 0 ? diagnostics[0].Format() + (diagnostics.Count > 1 ? $" (and {diagnostics.Count - 1} more)" : "") : "the model has errors";
}
