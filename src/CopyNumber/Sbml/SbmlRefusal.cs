using System.Xml;
using System.Xml.Linq;
using CopyNumber.Language;

namespace CopyNumber.Sbml;

/// <summary>
/// Something in an SBML file the importer will not translate, with the element it stands in: the importer
/// refuses rather than produce a different model (docs/sbml.md lists every refusal).
/// </summary>
internal sealed class SbmlRefusal(XObject? where, string message) : CopyNumberException(message, ErrorKind.BadInput)
{
    /// <summary>The element (or attribute) at fault; its line and column come from <see cref="IXmlLineInfo"/>.</summary>
    public XObject? Where { get; } = where;

    /// <summary>The refusal as a diagnostic <c>file:line:col: error: message</c> pointing into the XML.</summary>
    public Diagnostic ToDiagnostic(string file, IReadOnlyList<string> lines) => At(file, lines, Where, Message);

    /// <summary>A diagnostic at an XML node, quoting its source line.</summary>
    public static Diagnostic At(string file, IReadOnlyList<string> lines, XObject? where, string message)
    {
        var (line, column) = where is IXmlLineInfo info && info.HasLineInfo() ? (info.LineNumber, info.LinePosition) : (1, 1);
        // System.Xml counts an element's position from its name, after '<'.
        if (where is XElement) column = Math.Max(1, column - 1);
        var source = line >= 1 && line <= lines.Count ? lines[line - 1] : "";
        var length = where is XElement e ? e.Name.LocalName.Length + 1 : 1;
        return new Diagnostic(file, new SourcePosition(line, column, length), message, source);
    }

    /// <summary>How an element is named in messages: its kind and, where it has one, its id.</summary>
    public static string Describe(XElement element)
    {
        var id = (string?)element.Attribute("id") ?? (string?)element.Attribute("variable") ?? (string?)element.Attribute("symbol");
        return id is null ? $"<{element.Name.LocalName}>" : $"<{element.Name.LocalName}> '{id}'";
    }
}
