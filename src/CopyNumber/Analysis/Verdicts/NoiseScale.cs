using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>What kind of values a quantity takes, which decides whether a coefficient of variation and a Fano factor mean anything.</summary>
internal enum NoiseScaleKind
{
    /// <summary>Nonnegative with more than two values: CV and Fano factor are noise measures.</summary>
    Positive,
    /// <summary>Takes negative values (a difference, a signed readout): its mean can be 0 whatever the noise, CV and Fano factor are meaningless.</summary>
    Signed,
    /// <summary>Only 0 and 1 (a single gene's state): its CV √((1 − p)/p) and Fano factor 1 − p are fixed by the occupancy p.</summary>
    ZeroOne,
}

/// <summary>
/// The scale of a quantity over the grid: from the model when it bounds a species to {0, 1} by a
/// conservation law, otherwise from the histograms' support (or, without histograms, the minimum and the means).
/// </summary>
internal sealed record NoiseScale(NoiseScaleKind Kind, string Source, double Lowest, double LowestAt)
{
    public static NoiseScale Of(IReadOnlyList<ContrastPoint> points, string? zeroOneLaw)
    {
        if (zeroOneLaw is not null) return new NoiseScale(NoiseScaleKind.ZeroOne, $"bounded to 0 or 1 by the conservation law {zeroOneLaw}", 0, double.NaN);
        double lowest = double.PositiveInfinity, lowestAt = double.NaN;
        var onlyZeroOne = true;
        bool seenZero = false, seenOne = false;
        foreach (var p in points)
        {
            var low = p.Histogram is { } h ? h.Minimum : Math.Min(p.Minimum, p.Mean);
            if (low < lowest) (lowest, lowestAt) = (low, p.Time);
            if (p.Histogram is { } histogram)
            {
                onlyZeroOne &= histogram.Minimum >= 0 && histogram.Maximum <= 1;
                seenZero |= histogram.Minimum == 0;
                seenOne |= histogram.Maximum == 1;
            }
            else onlyZeroOne = false;
        }
        if (lowest < 0) return new NoiseScale(NoiseScaleKind.Signed, $"takes negative values (down to {Number(lowest)} at t = {Time(lowestAt)})", lowest, lowestAt);
        // Both values must occur: a quantity that is 1 in every replicate (a conserved total) is a constant, not an on/off state.
        if (onlyZeroOne && seenZero && seenOne) return new NoiseScale(NoiseScaleKind.ZeroOne, "only 0 and 1 are seen in any replicate", 0, double.NaN);
        return new NoiseScale(NoiseScaleKind.Positive, "", lowest, lowestAt);
    }

    /// <summary>A CV and a Fano factor are reported at this point: a positive quantity whose mean is resolved from 0 (mean &gt; z·SE).</summary>
    public bool Measurable(ContrastPoint p, double z) => Kind == NoiseScaleKind.Positive && p.Mean > 0 && p.Mean > z * p.StandardError;
}
