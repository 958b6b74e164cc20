using System.Globalization;
using CopyNumber.Analysis;
using CopyNumber.Analysis.Oscillation;
using CopyNumber.Analysis.SteadyStates;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Runs.Scans;

/// <summary>The rows of <c>scan.parquet</c> for one point: one per quantity, from its contrast and the rate equations' steady states.</summary>
public static class ScanCells
{
    /// <summary>The verdict kinds in the order of <see cref="ScanTable.VerdictColumns"/>.</summary>
    public static readonly IReadOnlyList<VerdictKind> VerdictOrder =
        [VerdictKind.Adequate, VerdictKind.MeanShifted, VerdictKind.NoiseDominated, VerdictKind.Multimodal, VerdictKind.ExtinctionProne, VerdictKind.TooFewReplicates,
         VerdictKind.CyclesWithRateEquations, VerdictKind.CycleLostToNoise, VerdictKind.NoiseDrivenRinging];

    /// <summary>The point's rows.</summary>
    /// <param name="point">The point.</param>
    /// <param name="network">The point's compiled network (for the steady states).</param>
    /// <param name="contrast">The point's contrast, judged at the map's per-point thresholds.</param>
    /// <param name="seed">The scan seed (the steady-state search's random starts).</param>
    public static IReadOnlyList<ScanCell> Of(ScanPoint point, ReactionNetwork network, RunContrastResult contrast, ulong seed)
    {
        ArgumentNullException.ThrowIfNull(point);
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(contrast);
        var steady = SteadyStateSearch.Find(network, seed);
        // A limit cycle never counts as a steady state (its starts are unsettled); the oscillation analysis names it.
        var behaviour = contrast.Oscillation?.RateEquations.Kind switch
        {
            OscillationKind.LimitCycle => "limit cycle",
            OscillationKind.DampedOscillation => "damped oscillation",
            OscillationKind.None => "settles",
            _ => "",
        };
        var cells = new List<ScanCell>();
        foreach (var q in contrast.Quantities)
        {
            var last = q.Times.Count - 1;
            var largest = q.LargestResolvedDeviation;
            var relative = q.LargestResolvedRelativeDeviation;
            var final = last >= 0 ? q.Deviations[last] : null;
            var species = network.SpeciesIndex(q.Name);
            var states = species >= 0
                ? string.Join("; ", steady.Stable.Select(s => s.State[species].ToString("G6", CultureInfo.InvariantCulture)))
                : "";
            cells.Add(new ScanCell(
                point.Index, point.Values, q.Name,
                string.Join(", ", q.Verdicts.Select(v => v.Label)),
                VerdictOrder.Select(kind => q.Verdicts.Any(v => v.Kind == kind) ? 1L : 0L).ToArray(),
                largest is null ? double.NaN : Math.Abs(largest.Absolute), largest?.AbsoluteHalfWidth ?? double.NaN,
                relative is null ? double.NaN : Math.Abs(relative.Relative), relative?.RelativeHalfWidth ?? double.NaN,
                final?.Relative ?? double.NaN, final?.RelativeHalfWidth ?? double.NaN,
                last >= 0 ? q.CoefficientOfVariation[last] : double.NaN,
                last >= 0 ? q.VarianceRatio[last] : double.NaN,
                last >= 0 && q.Modes[last] is { } modes ? modes.Count : 0,
                q.FinalProbabilityOfZero,
                steady.Stable.Count, states, steady.Unsettled, point.FolderName,
                behaviour, contrast.Oscillation?.RateEquations.Kind is OscillationKind.LimitCycle or OscillationKind.DampedOscillation ? contrast.Oscillation.RateEquations.Period : double.NaN));
        }
        return cells;
    }
}
