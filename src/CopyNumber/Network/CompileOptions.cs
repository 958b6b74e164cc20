namespace CopyNumber.Network;

/// <summary>How to compile a model.</summary>
/// <param name="SizeOverride">
/// A new system size Ω (for a sweep over Ω), or null to keep the model's own. Initial counts are scaled by
/// Ω/Ω₀ and rounded to the nearest integer (halves away from zero), so initial concentrations are kept;
/// mass-action constants k are in concentration units and stay as written; <c>size</c> in any
/// expression takes the new value. Schedule values are used as written.
/// </param>
/// <param name="SourceLines">
/// The model file's text split into lines, so diagnostics can show the offending line; null leaves
/// <see cref="Language.Diagnostic.SourceLine"/> empty.
/// </param>
public sealed record CompileOptions(double? SizeOverride = null, IReadOnlyList<string>? SourceLines = null);
