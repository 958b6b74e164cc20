using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>One mode of a count distribution.</summary>
/// <param name="Value">Copy number at the smoothed peak (the middle of a flat top), a point of the lattice counted on.</param>
/// <param name="SmoothedProbability">Height of the smoothed distribution there, per cell.</param>
/// <param name="Prominence">Height above the dip that separates it from any higher peak (topographic prominence).</param>
/// <param name="Dip">Height of that dip (the key col); for the highest peak, the lower of the two tails.</param>
public sealed record DistributionMode(long Value, double SmoothedProbability, double Prominence, double Dip);

/// <summary>The outcome of <see cref="ModeCount.Count"/>.</summary>
/// <param name="Count">Number of modes, at least 1.</param>
/// <param name="Modes">The modes, by increasing copy number.</param>
/// <param name="Bandwidth">Standard deviation of the smoothing kernel used, in copies.</param>
public sealed record ModeCountResult(int Count, IReadOnlyList<DistributionMode> Modes, double Bandwidth)
{
    /// <summary>The lattice the histogram was read on (the plain integers when none was given or the sample left it).</summary>
    public CountLattice Lattice { get; init; } = CountLattice.Integers;

    /// <summary>Width of one cell of the binned histogram, in copies: a whole number of lattice spacings.</summary>
    public long CellWidth { get; init; } = 1;

    /// <summary>Number of cells the histogram was binned into (at most <see cref="ModeCountRule.MaximumCells"/>).</summary>
    public int Cells { get; init; }
}

/// <summary>
/// Counts the modes of a count distribution robustly: read the histogram on the quantity's lattice
/// (<see cref="CountLattice"/>), bin it into a bounded number of cells of whole lattice spacings, smooth
/// with the discrete Gaussian kernel (<see cref="DiscreteGaussianKernel"/>) at a rule-of-thumb bandwidth,
/// then keep the local maxima whose topographic prominence is large against the highest peak, against
/// their own height, and (for sampled histograms) against the sampling error. A mode counted at the
/// previous grid time is held on looser terms (hysteresis), so the count does not flicker where the
/// distribution barely changes. docs/methods-analysis.md states the rule and its reasons.
/// </summary>
public static class ModeCount
{
    /// <summary>Counts the modes of <paramref name="distribution"/>.</summary>
    /// <param name="distribution">The histogram or exact law.</param>
    /// <param name="rule">The settings; <see cref="ModeCountRule.Default"/> when null.</param>
    /// <param name="lattice">The quantity's lattice from the model (<see cref="QuantityLattice"/>); the plain integers when null. A distribution with a value off it is read on the plain integers.</param>
    /// <param name="previous">The count at the previous grid time, whose modes are held on the looser terms of the rule; null for none.</param>
    /// <exception cref="AnalysisInputException">The rule has a setting out of range.</exception>
    public static ModeCountResult Count(CountDistribution distribution, ModeCountRule? rule = null, CountLattice? lattice = null, ModeCountResult? previous = null)
    {
        ArgumentNullException.ThrowIfNull(distribution);
        rule ??= ModeCountRule.Default;
        rule.Validate();

        var grid = lattice is { } given && distribution.Values.All(given.Contains) ? given : CountLattice.Integers;
        var first = grid.IndexOf(distribution.Minimum);
        // Spans up to 2^63 lattice points are binned with no overflow: the span is taken in double.
        var span = (double)grid.IndexOf(distribution.Maximum) - first + 1;
        var latticeBandwidth = Bandwidth(distribution, rule, grid.Spacing);
        var perCell = (long)Math.Max(1, Math.Max(Math.Ceiling(span / rule.MaximumCells), Math.Floor(latticeBandwidth / rule.CellsPerBandwidth)));
        var cells = (int)Math.Ceiling(span / perCell);
        var binned = new double[cells];
        for (var i = 0; i < distribution.Values.Count; i++)
            binned[(grid.IndexOf(distribution.Values[i]) - first) / perCell] += distribution.Probabilities[i];

        var cellBandwidth = Math.Max(rule.MinimumBandwidth, latticeBandwidth / perCell);
        var kernel = new DiscreteGaussianKernel(cellBandwidth);
        var smoothed = kernel.Smooth(binned);
        var reach = kernel.Reach;
        var cellWidth = perCell * grid.Spacing;
        // Copy number at the middle of smoothed cell c (lattice point nearest the middle).
        long ValueAt(int c) => grid.ValueAt(first + (c - reach) * perCell + (perCell - 1) / 2);
        double PositionOf(long value) => (double)(grid.IndexOf(value) - first) / perCell + reach;

        var peaks = LocalMaxima(smoothed);
        var highest = peaks.Max(p => smoothed[p]);
        var highestPeak = peaks.First(p => smoothed[p] == highest);
        var cols = peaks.Select(p => KeyCol(smoothed, p)).ToArray();
        var held = HeldPeaks(previous, peaks, smoothed, PositionOf,
            2 * Math.Max(cellBandwidth, previous is null ? 0 : previous.Bandwidth / cellWidth));
        var modes = new List<DistributionMode>();
        for (var m = 0; m < peaks.Count; m++)
        {
            var peak = peaks[m];
            var col = cols[m];
            var height = smoothed[peak];
            var prominence = height - col.Height;
            var (dipFraction, z) = held.Contains(peak) ? (rule.HoldDipFraction, rule.HoldResolutionZ) : (rule.MaximumDipFraction, rule.ResolutionZ);
            var qualifies = peak == highestPeak || (
                prominence >= rule.MinimumRelativeProminence * highest
                && col.Height < dipFraction * height
                && prominence > z * DifferenceStandardError(binned, kernel, peak, col.At, distribution.SampleSize));
            if (qualifies) modes.Add(new DistributionMode(ValueAt(peak), height, prominence, col.Height));
        }
        return new ModeCountResult(modes.Count, modes, cellBandwidth * cellWidth) { Lattice = grid, CellWidth = cellWidth, Cells = cells };
    }

    /// <summary>
    /// The kernel width the rule gives for a distribution, in copies: max(minimum·spacing, factor·s·n^(−1/5))
    /// with s = min(σ, IQR/1.34), or σ when the interquartile range is 0; the minimum for an exact distribution.
    /// </summary>
    public static double Bandwidth(CountDistribution distribution, ModeCountRule rule) => Bandwidth(distribution, rule, 1);

    // The same in lattice spacings: the spread and the minimum are measured on the lattice, whose
    // neighbouring points are one step apart however many copies they differ by.
    private static double Bandwidth(CountDistribution distribution, ModeCountRule rule, long spacing)
    {
        ArgumentNullException.ThrowIfNull(distribution);
        ArgumentNullException.ThrowIfNull(rule);
        if (double.IsPositiveInfinity(distribution.SampleSize)) return rule.MinimumBandwidth;
        var sigma = Math.Sqrt(distribution.Variance) / spacing;
        var iqr = (distribution.Quantile(0.75) - distribution.Quantile(0.25)) / (double)spacing;
        var spread = iqr > 0 ? Math.Min(sigma, iqr / 1.34) : sigma;
        return Math.Max(rule.MinimumBandwidth, rule.BandwidthFactor * spread * Math.Pow(distribution.SampleSize, -0.2));
    }

    // Each mode of the previous count vouches for one peak now: the highest peak within two kernel
    // widths (the wider of now and then) of where it was. A mode that moved further than that between
    // neighbouring grid times is not "the same distribution, barely changed", and must qualify afresh.
    private static HashSet<int> HeldPeaks(ModeCountResult? previous, List<int> peaks, double[] smoothed, Func<long, double> positionOf, double reachInCells)
    {
        var held = new HashSet<int>();
        if (previous is null) return held;
        foreach (var mode in previous.Modes)
        {
            var position = positionOf(mode.Value);
            var best = -1;
            foreach (var peak in peaks)
                if (Math.Abs(peak - position) <= reachInCells && (best < 0 || smoothed[peak] > smoothed[best]))
                    best = peak;
            if (best >= 0) held.Add(best);
        }
        return held;
    }

    // Indices of strict local maxima; a flat top (a run of equal values higher than both neighbours)
    // is one maximum, placed at the run's middle. Outside the array the sequence is taken as 0.
    private static List<int> LocalMaxima(double[] f)
    {
        var peaks = new List<int>();
        var i = 0;
        while (i < f.Length)
        {
            var end = i;
            while (end + 1 < f.Length && f[end + 1] == f[i]) end++;
            var left = i > 0 ? f[i - 1] : 0.0;
            var right = end + 1 < f.Length ? f[end + 1] : 0.0;
            if (f[i] > left && f[i] > right) peaks.Add((i + end) / 2);
            i = end + 1;
        }
        return peaks;
    }

    // A peak's key col: its height and index.
    private readonly record struct Col(double Height, int At);

    // The key col of a peak: on each side, the lowest value met before reaching a strictly higher point
    // (or the end of the array); the col is the higher of the two sides' lows.
    private static Col KeyCol(double[] f, int peak)
    {
        var height = f[peak];
        var (leftLow, leftAt) = SideLow(f, peak, -1, height);
        var (rightLow, rightAt) = SideLow(f, peak, +1, height);
        return leftLow >= rightLow ? new Col(leftLow, leftAt) : new Col(rightLow, rightAt);
    }

    private static (double Low, int At) SideLow(double[] f, int peak, int step, double height)
    {
        var low = height;
        var at = peak;
        for (var i = peak + step; i >= 0 && i < f.Length; i += step)
        {
            if (f[i] > height) return (low, at);
            if (f[i] < low) { low = f[i]; at = i; }
        }
        // Past the end the smoothed sequence is 0 (the kernel's reach holds all the mass).
        return (0.0, at);
    }

    // Standard error of f̂(peak) − f̂(dip) when the binned histogram is a multinomial sample of size n:
    // Var = [Σ_k (K(peak−k) − K(dip−k))²·p(k) − (f(peak) − f(dip))²] / n, evaluated at the sample p.
    private static double DifferenceStandardError(double[] binned, DiscreteGaussianKernel kernel, int peak, int dip, double n)
    {
        if (double.IsPositiveInfinity(n)) return 0.0;
        var reach = kernel.Reach;
        double second = 0, first = 0;
        for (var k = 0; k < binned.Length; k++)
        {
            if (binned[k] == 0) continue;
            var position = k + reach; // index of cell k in the smoothed array
            var w = kernel[peak - position] - kernel[dip - position];
            second += w * w * binned[k];
            first += w * binned[k];
        }
        return Math.Sqrt(Math.Max(0.0, second - first * first) / n);
    }
}
