namespace CopyNumber.Analysis;

/// <summary>
/// The settings of <see cref="ModeCount"/>; the defaults are those documented in docs/methods-analysis.md.
/// </summary>
public sealed record ModeCountRule
{
    /// <summary>The documented defaults.</summary>
    public static ModeCountRule Default { get; } = new();

    /// <summary>
    /// Factor of the rule-of-thumb bandwidth h = factor·s·n^(−1/5), s = min(σ, IQR/1.34) (Silverman 1986,
    /// Density Estimation for Statistics and Data Analysis, eq. 3.31). Default 0.9.
    /// </summary>
    public double BandwidthFactor { get; init; } = 0.9;

    /// <summary>Smallest kernel width in copies, used for exact distributions too. Default 1.</summary>
    public double MinimumBandwidth { get; init; } = 1.0;

    /// <summary>A mode's prominence must be at least this fraction of the highest smoothed peak. Default 0.05.</summary>
    public double MinimumRelativeProminence { get; init; } = 0.05;

    /// <summary>
    /// The dip separating a mode from any higher one must fall below this fraction of the mode's own
    /// smoothed height. Default 0.70.
    /// </summary>
    public double MaximumDipFraction { get; init; } = 0.70;

    /// <summary>
    /// For a sampled histogram the drop from a mode to its dip must exceed this many standard errors of
    /// the smoothed difference (multinomial sampling); ignored for exact distributions. Default 3.
    /// </summary>
    public double ResolutionZ { get; init; } = 3.0;

    /// <summary>Checks that every setting is in range.</summary>
    /// <exception cref="AnalysisInputException">A setting is out of range.</exception>
    public void Validate()
    {
        if (!(BandwidthFactor >= 0) || double.IsInfinity(BandwidthFactor)) throw new AnalysisInputException($"the bandwidth factor must be a nonnegative number, not {BandwidthFactor}");
        if (!(MinimumBandwidth > 0) || double.IsInfinity(MinimumBandwidth)) throw new AnalysisInputException($"the minimum bandwidth must be a positive number of copies, not {MinimumBandwidth}");
        if (!(MinimumRelativeProminence >= 0 && MinimumRelativeProminence <= 1)) throw new AnalysisInputException($"the minimum relative prominence lies in [0, 1], not {MinimumRelativeProminence}");
        if (!(MaximumDipFraction > 0 && MaximumDipFraction <= 1)) throw new AnalysisInputException($"the maximum dip fraction lies in (0, 1], not {MaximumDipFraction}");
        if (!(ResolutionZ >= 0) || double.IsInfinity(ResolutionZ)) throw new AnalysisInputException($"the resolution z must be a nonnegative number, not {ResolutionZ}");
    }
}
