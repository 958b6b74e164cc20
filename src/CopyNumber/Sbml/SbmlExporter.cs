using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Sbml;

/// <summary>
/// A model in the network language written as SBML Level 3 Version 2 core (System.Xml only), the inverse of
/// <see cref="SbmlImporter"/>: importing the export compiles to the same network. Every convention is stated
/// in the file's notes and in docs/sbml.md, with its source (SBML L3V2 core specification, Hucka et al. 2019;
/// the propensity convention of Evans, Gillespie &amp; Wilkinson 2008). What SBML core cannot carry exactly is
/// refused with a diagnostic pointing at the model line, never written as a different model.
/// </summary>
public static class SbmlExporter
{
    /// <summary>Exports a loaded model. Never throws for a model the language accepted.</summary>
    public static SbmlExportResult Export(LoadedModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        return new SbmlExport(model).Run();
    }
}

/// <summary>The result of an export: the SBML text (or the refusals) and every name that had to change to become an SBML id.</summary>
/// <param name="Xml">The SBML document, or null when the model was refused.</param>
/// <param name="Diagnostics">Why the model was refused (empty on success).</param>
/// <param name="Renamed">Species, parameter or readout name → SBML id, for the names that changed.</param>
/// <param name="RenamedReactions">Compiled reaction name (<c>name_fwd</c>/<c>name_rev</c> for a reversible line) → SBML id, for the names that changed.</param>
public sealed record SbmlExportResult(string? Xml, IReadOnlyList<Diagnostic> Diagnostics, IReadOnlyDictionary<string, string> Renamed, IReadOnlyDictionary<string, string> RenamedReactions)
{
    /// <summary>True when the document was written.</summary>
    public bool Succeeded => Xml is not null && Diagnostics.Count == 0;
}
