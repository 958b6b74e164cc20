using CopyNumber.Ensembles;

namespace CopyNumber.Analysis;

/// <summary>
/// What <see cref="Contrast"/> needs about one quantity at one grid time: the ensemble's summary and the
/// deterministic descriptions. Values in copies (or the readout's unit); missing values are NaN.
/// </summary>
/// <param name="Time">The grid time, in model time units.</param>
/// <param name="Replicates">n, the number of replicates summarised.</param>
/// <param name="Mean">The ensemble mean.</param>
/// <param name="Variance">The ensemble (unbiased) variance.</param>
/// <param name="StandardError">The standard error of the mean, √(variance/n).</param>
/// <param name="ProbabilityOfZero">The fraction of replicates at exactly 0; NaN for a quantity that is not a count.</param>
/// <param name="Histogram">The exact histogram for a count quantity; null otherwise (no mode count).</param>
/// <param name="RateEquationValue">The rate-equation value at this time.</param>
/// <param name="LnaVariance">The linear-noise variance, or NaN.</param>
/// <param name="CorrectedMean">The first-order corrected (EMRE) mean, or NaN.</param>
/// <param name="Minimum">The smallest value over the replicates, or NaN when unknown (the histogram's is used when there is one).</param>
/// <param name="SwitchesPerReplicate">For a 0/1 quantity, the mean number of 0↔1 transitions per replicate from the first grid time
/// to this one, counted at the events; NaN when unknown.</param>
/// <param name="IsExactLaw">True when the point is an exact law (the master equation) rather than a sample: <paramref name="Replicates"/>
/// is then a stand-in for "no sampling error" and verdict texts speak of probabilities, not of replicates.</param>
public sealed record ContrastPoint(
    double Time,
    long Replicates,
    double Mean,
    double Variance,
    double StandardError,
    double ProbabilityOfZero,
    CountDistribution? Histogram,
    double RateEquationValue,
    double LnaVariance = double.NaN,
    double CorrectedMean = double.NaN,
    double Minimum = double.NaN,
    double SwitchesPerReplicate = double.NaN,
    bool IsExactLaw = false)
{
    /// <summary>A point from the ensemble statistics of a count quantity and its histogram.</summary>
    /// <param name="time">The grid time.</param>
    /// <param name="summary">The summary of the histogram.</param>
    /// <param name="histogram">The exact histogram of the replicates' counts.</param>
    /// <param name="rateEquationValue">The rate-equation value.</param>
    /// <param name="lnaVariance">The linear-noise variance, or NaN.</param>
    /// <param name="correctedMean">The EMRE mean, or NaN.</param>
    public static ContrastPoint FromHistogram(double time, DistributionSummary summary, CountHistogram histogram,
        double rateEquationValue, double lnaVariance = double.NaN, double correctedMean = double.NaN)
    {
        ArgumentNullException.ThrowIfNull(summary);
        ArgumentNullException.ThrowIfNull(histogram);
        return new ContrastPoint(time, summary.Replicates, summary.Mean, summary.Variance, summary.StandardError,
            summary.ZeroFraction, CountDistribution.FromHistogram(histogram), rateEquationValue, lnaVariance, correctedMean, summary.Minimum);
    }
    /// <summary>A point from the moments of a quantity that is not a count (no histogram, no P(0)).</summary>
    /// <param name="time">The grid time.</param>
    /// <param name="moments">The replicates' moments.</param>
    /// <param name="rateEquationValue">The rate-equation value.</param>
    /// <param name="lnaVariance">The linear-noise variance, or NaN.</param>
    /// <param name="correctedMean">The EMRE mean, or NaN.</param>
    public static ContrastPoint FromMoments(double time, MomentAccumulator moments,
        double rateEquationValue, double lnaVariance = double.NaN, double correctedMean = double.NaN)
    {
        ArgumentNullException.ThrowIfNull(moments);
        return new ContrastPoint(time, moments.Count, moments.Mean, moments.Variance, moments.StandardError,
            double.NaN, null, rateEquationValue, lnaVariance, correctedMean, moments.Minimum);
    }
}
