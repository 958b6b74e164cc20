using CopyNumber.Analysis;
using CopyNumber.Storage;
using CopyNumber.Deterministic;

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
public sealed record SweepPoint(
    double Size,
    string Quantity,
    double RelativeDeviation,
    double RelativeHalfWidth,
    double CoefficientOfVariation,
    double VarianceRatio,
    string Verdicts,
    bool Adequate);

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

    /// <summary>Summarises the contrasts of the runs, one per size.</summary>
    public static SizeSweep Summarise(IReadOnlyList<(double Size, RunContrastResult Contrast)> runs)
    {
        var ordered = runs.OrderBy(r => r.Size).ToArray();
        var points = new List<SweepPoint>();
        foreach (var (size, contrast) in ordered)
        {
            foreach (var q in contrast.Quantities)
            {
                var largest = q.LargestResolvedRelativeDeviation;
                var last = q.Times.Count - 1;
                var verdicts = string.Join(", ", q.Verdicts.Select(v => v.Label));
                points.Add(new SweepPoint(size, q.Name,
                    largest is null ? double.NaN : Math.Abs(largest.Relative),
                    largest?.RelativeHalfWidth ?? double.NaN,
                    q.CoefficientOfVariation[last],
                    q.VarianceRatio[last],
                    verdicts,
                    q.Verdicts.All(v => v.Kind == VerdictKind.Adequate)));
            }
        }
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
        var sorted = points.OrderBy(p => p.Quantity, StringComparer.Ordinal).ThenBy(p => p.Size).ToArray();
        // Keep the network's quantity order rather than alphabetical.
        var order = ordered.Length > 0 ? ordered[0].Contrast.Quantities.Select((q, i) => (q.Name, i)).ToDictionary(p => p.Name, p => p.i) : [];
        return new SizeSweep(sorted.OrderBy(p => order.GetValueOrDefault(p.Quantity, int.MaxValue)).ThenBy(p => p.Size).ToArray(), adequateFrom);
    }
}
