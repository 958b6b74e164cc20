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

    /// <summary>
    /// Smallest kernel width in lattice spacings (or cells, when the histogram is binned coarser), used
    /// for exact distributions too. Default 1.
    /// </summary>
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

    /// <summary>
    /// A mode counted at the previous grid time is held while the dip separating it stays below this
    /// fraction of its height (hysteresis; see <see cref="MaximumDipFraction"/> for a new mode). Default 0.85.
    /// </summary>
    public double HoldDipFraction { get; init; } = 0.85;

    /// <summary>
    /// A mode counted at the previous grid time is held while its drop to the dip exceeds this many
    /// standard errors (hysteresis; see <see cref="ResolutionZ"/> for a new mode). Default 2.
    /// </summary>
    public double HoldResolutionZ { get; init; } = 2.0;

    /// <summary>
    /// The histogram is binned into at most this many cells of whole lattice spacings, which bounds the
    /// memory and time of a count on any range of copy numbers. Default 8192.
    /// </summary>
    public int MaximumCells { get; init; } = 8192;

    /// <summary>
    /// Cells are made as wide as the kernel width divided by this (in whole lattice spacings), since finer
    /// cells change the smoothed histogram by less than its sampling error. Default 4.
    /// </summary>
    public double CellsPerBandwidth { get; init; } = 4.0;

    /// <summary>Checks that every setting is in range.</summary>
    /// <exception cref="AnalysisInputException">A setting is out of range.</exception>
    public void Validate()
    {
        if (!(BandwidthFactor >= 0) || double.IsInfinity(BandwidthFactor)) throw new AnalysisInputException($"the bandwidth factor must be a nonnegative number, not {BandwidthFactor}");
        if (!(MinimumBandwidth > 0) || double.IsInfinity(MinimumBandwidth)) throw new AnalysisInputException($"the minimum bandwidth must be a positive number of copies, not {MinimumBandwidth}");
        if (!(MinimumRelativeProminence >= 0 && MinimumRelativeProminence <= 1)) throw new AnalysisInputException($"the minimum relative prominence lies in [0, 1], not {MinimumRelativeProminence}");
        if (!(MaximumDipFraction > 0 && MaximumDipFraction <= 1)) throw new AnalysisInputException($"the maximum dip fraction lies in (0, 1], not {MaximumDipFraction}");
        if (!(ResolutionZ >= 0) || double.IsInfinity(ResolutionZ)) throw new AnalysisInputException($"the resolution z must be a nonnegative number, not {ResolutionZ}");
        if (!(HoldDipFraction >= MaximumDipFraction && HoldDipFraction <= 1)) throw new AnalysisInputException($"the hold dip fraction lies in [maximum dip fraction, 1], not {HoldDipFraction}");
        if (!(HoldResolutionZ >= 0 && HoldResolutionZ <= ResolutionZ)) throw new AnalysisInputException($"the hold resolution z lies in [0, resolution z], not {HoldResolutionZ}");
        if (MaximumCells < 16) throw new AnalysisInputException($"a histogram needs at least 16 cells, not {MaximumCells}");
        if (!(CellsPerBandwidth >= 1) || double.IsInfinity(CellsPerBandwidth)) throw new AnalysisInputException($"the cells per kernel width must be a number ≥ 1, not {CellsPerBandwidth}");
    }
}
