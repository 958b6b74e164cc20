using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>The mode count over a grid and the verdict "multimodal" (docs/methods-analysis.md).</summary>
public static partial class Contrast
{
    // The count at each grid time, on the quantity's lattice in force then, each count holding the
    // previous time's modes on the rule's looser terms (hysteresis). Null where there is no histogram;
    // a gap in the histograms ends the hold.
    private static ModeCountResult?[] CountModes(IReadOnlyList<ContrastPoint> points, ModeCountRule rule, QuantityLattice? lattice)
    {
        var modes = new ModeCountResult?[points.Count];
        for (var k = 0; k < points.Count; k++)
        {
            var histogram = points[k].Histogram;
            if (histogram is null) continue;
            modes[k] = ModeCount.Count(histogram, rule, lattice?.At(points[k].Time), k > 0 ? modes[k - 1] : null);
        }
        return modes;
    }

    // "multimodal": ≥ 2 modes at the final time, or at ≥ MultimodalFraction of the grid times with a
    // histogram. Its false-alarm rate per quantity and run is measured in docs/methods-analysis.md.
    private static QuantityVerdict? Multimodal(Evidence e)
    {
        var t = e.Thresholds;
        var counted = Enumerable.Range(0, e.Points.Count).Where(k => e.Modes[k] is not null).ToArray();
        if (counted.Length == 0) return null;
        var many = counted.Where(k => e.Modes[k]!.Count > 1).ToArray();
        var final = e.Modes[^1];
        var atEnd = final is { Count: > 1 };
        var fraction = (double)many.Length / counted.Length;
        if (!atEnd && !(fraction >= t.MultimodalFraction)) return null;
        var rule = $"threshold: ≥ 2 modes at the final time or at ≥ {Percent(t.MultimodalFraction)} of the grid times";
        var spread = $"≥ 2 modes at {many.Length} of {counted.Length} grid times" + (many.Length > 0 ? $" from t = {Time(e.Points[many[0]].Time)}" : "");
        var text = atEnd
            ? $"{final!.Count} modes at the final time t = {Time(e.Points[^1].Time)} (near {Modes(final)} copies); {spread}; {rule}"
            : $"{spread} ({Percent(fraction)}), {(final is null ? "no histogram" : "1 mode")} at the final time; {rule}";
        if (final is { Lattice.Spacing: > 1 } read)
            text += $"; counted on the lattice the model allows, values {read.Lattice.Spacing} copies apart";
        return new QuantityVerdict(e.Quantity, VerdictKind.Multimodal, text);
    }

    private static string Modes(ModeCountResult result) =>
        string.Join(" and ", result.Modes.Select(m => m.Value.ToString(CultureInfo.InvariantCulture)));
}
