namespace CopyNumber.Sbml;

/// <summary>How an SBML model is turned into the network language.</summary>
public sealed record SbmlImportOptions
{
    /// <summary>
    /// Molecules per unit of substance. 1 (the default) reads SBML amounts as copy numbers, the convention of
    /// the Discrete Stochastic Models Test Suite (Evans, Gillespie &amp; Wilkinson 2008). For a model in moles,
    /// give Avogadro's number times the unit's scale (e.g. 6.02214076e23 · 1e-9 for nanomole): amounts are
    /// multiplied by it and every law rescaled, so the imported model counts molecules.
    /// </summary>
    public double MoleculesPerSubstanceUnit { get; init; } = 1;

    /// <summary>
    /// SBML variables to report as readouts besides the species, each as an amount or a concentration
    /// (amount / compartment size). The conformance runner asks for the columns a test case compares.
    /// </summary>
    public IReadOnlyList<SbmlOutput> Outputs { get; init; } = [];
}

/// <summary>An SBML variable wanted in the output: a species, compartment or parameter id; <paramref name="Concentration"/> for species only.</summary>
public sealed record SbmlOutput(string Id, bool Concentration);

/// <summary>
/// The result of an import: the network-language text (or the refusals), and where each requested
/// <see cref="SbmlOutput"/> is found among the compiled network's species and readouts.
/// </summary>
public sealed record SbmlImportResult(string? CnetText, IReadOnlyList<Language.Diagnostic> Diagnostics, IReadOnlyDictionary<SbmlOutput, string> OutputColumns)
{
    /// <summary>True when the text was written.</summary>
    public bool Succeeded => CnetText is not null && Diagnostics.Count == 0;
}
