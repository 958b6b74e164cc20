using System.Globalization;
using System.Text;
using System.Xml;
using System.Xml.Linq;
using CopyNumber.Language;

namespace CopyNumber.Sbml;

/// <summary>
/// SBML (Level 2 Version 4, Level 3 Versions 1 and 2, core only) into the network language, second edition.
/// The translation is text, so `copynumber import` can show it; every mapping rule is stated in the text's
/// header and in docs/sbml.md, with its source (SBML L3V2 core specification, Hucka et al. 2019; the
/// propensity convention of Evans, Gillespie &amp; Wilkinson 2008). What the language cannot say exactly is
/// refused with a diagnostic pointing into the XML, never translated into a different model.
/// </summary>
public static class SbmlImporter
{
    /// <summary>True for a file name the commands read as SBML rather than as the network language.</summary>
    public static bool IsSbmlPath(string path) =>
        path.EndsWith(".xml", StringComparison.OrdinalIgnoreCase) || path.EndsWith(".sbml", StringComparison.OrdinalIgnoreCase);

    /// <summary>Translates SBML text; <paramref name="file"/> names it in diagnostics. Never throws for bad input.</summary>
    public static SbmlImportResult Import(string xml, string file, SbmlImportOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(xml);
        var lines = xml.Split('\n').Select(l => l.TrimEnd('\r')).ToArray();
        XDocument document;
        try
        {
            document = XDocument.Parse(xml, LoadOptions.SetLineInfo);
        }
        catch (XmlException e)
        {
            var line = Math.Max(1, e.LineNumber);
            return Failed(new Diagnostic(file, new SourcePosition(line, Math.Max(1, e.LinePosition)),
                $"not well-formed XML: {e.Message.Split(" Line ")[0].TrimEnd('.')}", line <= lines.Length ? lines[line - 1] : ""));
        }
        var translation = new SbmlTranslation(document, file, lines, options ?? new SbmlImportOptions());
        return translation.Run();
    }

    private static SbmlImportResult Failed(Diagnostic d) => new(null, [d], new Dictionary<SbmlOutput, string>());
}
