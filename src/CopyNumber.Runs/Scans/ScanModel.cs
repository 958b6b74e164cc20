using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// The model at one scan point. A varied parameter or initial count is written into the model's text
/// (the value replaces the definition on its own line; line numbers and comments stay), so each point's
/// run folder stores the model it ran, and <c>contrast</c> or <c>simulate --resume</c> on that folder needs
/// no knowledge of the scan. A varied size is the run's size override, recorded in its manifest as a sweep's.
/// </summary>
public static class ScanModel
{
    /// <summary>The point's model text and compiled model, and the size override (null when size is not varied).</summary>
    /// <exception cref="ScanInputException">The point's model does not compile (e.g. a parameter value a law cannot take).</exception>
    public static (LoadedModel Model, double? Size) At(LoadedModel baseModel, IReadOnlyList<ScanAxis> axes, ScanPoint point)
    {
        ArgumentNullException.ThrowIfNull(baseModel);
        var lines = baseModel.Text.Split('\n');
        double? size = null;
        for (var a = 0; a < axes.Count; a++)
        {
            var value = ScanAxis.Format(point.Values[a]);
            switch (axes[a].Target)
            {
                case ScanTarget.Size:
                    size = point.Values[a];
                    break;
                case ScanTarget.Parameter:
                    var parameter = baseModel.Syntax.Parameters.First(p => p.Name == axes[a].Name);
                    Replace(lines, parameter.Position, value, wholeDefinition: true);
                    break;
                default:
                    var species = baseModel.Syntax.Species.First(s => s.Name == axes[a].Name);
                    Replace(lines, species.Position, value, wholeDefinition: false);
                    break;
            }
        }
        var text = string.Join('\n', lines);
        var outcome = ModelLoader.LoadText(text, baseModel.Path, size is { } s ? new CompileOptions(SizeOverride: s) : null);
        if (outcome.Model is null)
            throw new ScanInputException($"the model at scan point {point.Index} ({Describe(axes, point)}) does not compile: {outcome.Diagnostics[0].Format()}");
        return (outcome.Model, size);
    }

    /// <summary>The point's values in words, <c>k = 2, size = 10</c>.</summary>
    public static string Describe(IReadOnlyList<ScanAxis> axes, ScanPoint point) =>
        string.Join(", ", axes.Select((a, i) => $"{a.Name} = {ScanAxis.Format(point.Values[i])}"));

    /// <summary>
    /// Replaces what follows the '=' after the name at <paramref name="name"/>: the whole expression up to a
    /// comment for a parameter, the amount (the first word) for a species, which may be followed by <c>held</c>.
    /// </summary>
    private static void Replace(string[] lines, SourcePosition name, string value, bool wholeDefinition)
    {
        var line = lines[name.Line - 1];
        var equals = line.IndexOf('=', name.Column - 1);
        var start = equals + 1;
        while (start < line.Length && line[start] is ' ' or '\t') start++;
        var end = line.IndexOf('#', start);
        if (end < 0) end = line.Length;
        if (!wholeDefinition)
        {
            var word = start;
            while (word < end && !char.IsWhiteSpace(line[word])) word++;
            end = word;
        }
        else
        {
            while (end > start && char.IsWhiteSpace(line[end - 1])) end--;
        }
        lines[name.Line - 1] = line[..start] + value + line[end..];
    }
}
