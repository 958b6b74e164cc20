using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>One species or readout at one system size in a sweep.</summary>
/// <param name="Size">System size Ω.</param>
/// <param name="Quantity">Species or readout name.</param>
/// <param name="RelativeDeviation">Largest resolved |relative deviation| of the mean from the rate equations; NaN when none is resolved.</param>
/// <param name="RelativeHalfWidth">Its confidence half-width (same units), NaN when none is resolved.</param>
/// <param name="CoefficientOfVariation">Ensemble CV at the final time.</param>
/// <param name="VarianceRatio">Ensemble variance over LNA variance at the final time.</param>
/// <param name="Verdicts">The verdict labels, comma-separated.</param>
/// <param name="Adequate">True when the only verdict is adequate.</param>
/// <param name="Folder">The size's run folder, relative to the sweep's folder (its own report is there).</param>
public sealed record SweepPoint(
    double Size,
    string Quantity,
    double RelativeDeviation,
    double RelativeHalfWidth,
    double CoefficientOfVariation,
    double VarianceRatio,
    string Verdicts,
    bool Adequate,
    string Folder = "");

/// <summary>
/// The summary of a system-size sweep: per quantity and size the deviation, noise and verdicts, and
/// the smallest size tried from which the rate equations are adequate at every larger size tried.
/// </summary>
public sealed class SizeSweep
{
    private SizeSweep(IReadOnlyList<SweepPoint> points, IReadOnlyDictionary<string, double?> adequateFrom)
    {
        Points = points;
        AdequateFrom = adequateFrom;
    }

    /// <summary>All points, sizes ascending within each quantity.</summary>
    public IReadOnlyList<SweepPoint> Points { get; }

    /// <summary>Per quantity, the smallest size from which every larger tried size is adequate; null when even the largest is not.</summary>
    public IReadOnlyDictionary<string, double?> AdequateFrom { get; }

    /// <summary>Summarises a scan over <c>size</c> (its only varied name): one point per size and quantity, in the scan's order.</summary>
    public static SizeSweep Summarise(IReadOnlyList<ScanCell> cells)
    {
        ArgumentNullException.ThrowIfNull(cells);
        var order = cells.Select(c => c.Quantity).Distinct().Select((q, i) => (q, i)).ToDictionary(p => p.q, p => p.i);
        var points = cells
            .Select(c => new SweepPoint(c.Values[0], c.Quantity, c.LargestRelativeDeviation, c.LargestRelativeDeviationError,
                c.CoefficientOfVariation, c.LnaRatio, c.Verdicts, c.Flags[0] == 1, c.Folder))
            .OrderBy(p => order[p.Quantity]).ThenBy(p => p.Size).ToArray();
        var adequateFrom = new Dictionary<string, double?>();
        foreach (var group in points.GroupBy(p => p.Quantity))
        {
            double? from = null;
            foreach (var p in group.OrderByDescending(p => p.Size))
            {
                if (!p.Adequate) break;
                from = p.Size;
            }
            adequateFrom[group.Key] = from;
        }
        return new SizeSweep(points, adequateFrom);
    }
}
