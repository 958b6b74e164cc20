using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>One column of N with its law, after reversible lines are split into <c>_fwd</c>/<c>_rev</c>.</summary>
/// <param name="Name">Unique reaction name.</param>
/// <param name="Reactants">Species index and stoichiometry consumed (empty for <c>0</c>).</param>
/// <param name="Products">Species index and stoichiometry produced (empty for <c>0</c>).</param>
/// <param name="Law">Mass action or a written-out rate.</param>
/// <param name="LawText">The law's expression as a readable string (the constant k for mass action).</param>
public sealed record Reaction(
    string Name,
    IReadOnlyList<(int Species, long Coefficient)> Reactants,
    IReadOnlyList<(int Species, long Coefficient)> Products,
    LawKind Law,
    string LawText);
