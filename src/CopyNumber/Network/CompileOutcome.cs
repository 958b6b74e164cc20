using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>The result of compiling a model: a network, or the reasons there is none.</summary>
/// <param name="Network">The compiled network; null exactly when <paramref name="Diagnostics"/> is not empty.</param>
/// <param name="Diagnostics">Every compile-time mistake found, in file order of discovery.</param>
public sealed record CompileOutcome(ReactionNetwork? Network, IReadOnlyList<Diagnostic> Diagnostics);
