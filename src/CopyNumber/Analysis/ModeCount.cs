namespace CopyNumber.Analysis;

/// <summary>One mode of a count distribution.</summary>
/// <param name="Value">Copy number at the smoothed peak (the middle of a flat top).</param>
/// <param name="SmoothedProbability">Height of the smoothed distribution there.</param>
/// <param name="Prominence">Height above the dip that separates it from any higher peak (topographic prominence).</param>
/// <param name="Dip">Height of that dip (the key col); for the highest peak, the lower of the two tails.</param>
public sealed record DistributionMode(long Value, double SmoothedProbability, double Prominence, double Dip);

/// <summary>The outcome of <see cref="ModeCount.Count"/>.</summary>
/// <param name="Count">Number of modes, at least 1.</param>
/// <param name="Modes">The modes, by increasing copy number.</param>
/// <param name="Bandwidth">Standard deviation of the smoothing kernel used, in copies.</param>
public sealed record ModeCountResult(int Count, IReadOnlyList<DistributionMode> Modes, double Bandwidth);

/// <summary>
/// Counts the modes of a count distribution robustly: smooth with the discrete Gaussian kernel
/// (<see cref="DiscreteGaussianKernel"/>) at a rule-of-thumb bandwidth, then keep the local maxima whose
/// topographic prominence is large against the highest peak, against their own height, and (for sampled
/// histograms) against the sampling error. docs/methods-analysis.md states the rule and its reasons.
/// </summary>
public static class ModeCount
{
    /// <summary>Counts the modes of <paramref name="distribution"/> under <paramref name="rule"/> (default <see cref="ModeCountRule.Default"/>).</summary>
    /// <exception cref="AnalysisInputException">The rule has a setting out of range, or the range of copy numbers is too wide to smooth.</exception>
    public static ModeCountResult Count(CountDistribution distribution, ModeCountRule? rule = null)
    {
        ArgumentNullException.ThrowIfNull(distribution);
        rule ??= ModeCountRule.Default;
        rule.Validate();

        var span = distribution.Maximum - distribution.Minimum + 1;
        if (span > 50_000_000)
            throw new AnalysisInputException($"copy numbers from {distribution.Minimum} to {distribution.Maximum} span too wide a range to count modes");
        var dense = new double[span];
        for (var i = 0; i < distribution.Values.Count; i++)
            dense[distribution.Values[i] - distribution.Minimum] = distribution.Probabilities[i];

        var bandwidth = Bandwidth(distribution, rule);
        var kernel = new DiscreteGaussianKernel(bandwidth);
        var smoothed = kernel.Smooth(dense);
        var origin = distribution.Minimum - kernel.Reach; // copy number of smoothed[0]

        var peaks = LocalMaxima(smoothed);
        var highest = peaks.Max(p => smoothed[p]);
        var highestPeak = peaks.First(p => smoothed[p] == highest);
        var modes = new List<DistributionMode>();
        foreach (var peak in peaks)
        {
            var (dip, dipAt) = KeyCol(smoothed, peak);
            var height = smoothed[peak];
            var prominence = height - dip;
            var qualifies = peak == highestPeak || (
                prominence >= rule.MinimumRelativeProminence * highest
                && dip < rule.MaximumDipFraction * height
                && prominence > rule.ResolutionZ * DifferenceStandardError(dense, kernel, peak, dipAt, distribution.SampleSize));
            if (qualifies) modes.Add(new DistributionMode(origin + peak, height, prominence, dip));
        }
        return new ModeCountResult(modes.Count, modes, bandwidth);
    }

    /// <summary>
    /// The kernel width the rule gives for a distribution: max(minimum, factor·s·n^(−1/5)) with
    /// s = min(σ, IQR/1.34), or σ when the interquartile range is 0; the minimum for an exact distribution.
    /// </summary>
    public static double Bandwidth(CountDistribution distribution, ModeCountRule rule)
    {
        ArgumentNullException.ThrowIfNull(distribution);
        ArgumentNullException.ThrowIfNull(rule);
        if (double.IsPositiveInfinity(distribution.SampleSize)) return rule.MinimumBandwidth;
        var sigma = Math.Sqrt(distribution.Variance);
        var iqr = distribution.Quantile(0.75) - distribution.Quantile(0.25);
        var spread = iqr > 0 ? Math.Min(sigma, iqr / 1.34) : sigma;
        return Math.Max(rule.MinimumBandwidth, rule.BandwidthFactor * spread * Math.Pow(distribution.SampleSize, -0.2));
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

    // The key col of a peak: on each side, the lowest value met before reaching a strictly higher point
    // (or the end of the array); the col is the higher of the two sides' lows. Returns its height and index.
    private static (double Height, int Index) KeyCol(double[] f, int peak)
    {
        var height = f[peak];
        var (leftLow, leftAt) = SideLow(f, peak, -1, height);
        var (rightLow, rightAt) = SideLow(f, peak, +1, height);
        return leftLow >= rightLow ? (leftLow, leftAt) : (rightLow, rightAt);
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

    // Standard error of f̂(peak) − f̂(dip) when the histogram is a multinomial sample of size n:
    // Var = [Σ_k (K(peak−k) − K(dip−k))²·p(k) − (f(peak) − f(dip))²] / n, evaluated at the sample p.
    private static double DifferenceStandardError(double[] dense, DiscreteGaussianKernel kernel, int peak, int dip, double n)
    {
        if (double.IsPositiveInfinity(n)) return 0.0;
        var reach = kernel.Reach;
        double second = 0, first = 0;
        for (var k = 0; k < dense.Length; k++)
        {
            if (dense[k] == 0) continue;
            var position = k + reach; // index of input k in the smoothed array
            var w = kernel[peak - position] - kernel[dip - position];
            second += w * w * dense[k];
            first += w * dense[k];
        }
        return Math.Sqrt(Math.Max(0.0, second - first * first) / n);
    }
}
