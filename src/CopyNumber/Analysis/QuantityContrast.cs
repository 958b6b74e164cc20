namespace CopyNumber.Analysis;

/// <summary>The ensemble mean's deviation from the rate equations at one grid time.</summary>
/// <param name="Time">The grid time.</param>
/// <param name="Absolute">Ensemble mean − rate-equation value, in copies.</param>
/// <param name="AbsoluteHalfWidth">z·SE, the half-width of the confidence interval of <paramref name="Absolute"/>.</param>
/// <param name="Relative">Absolute / |rate-equation value|; NaN below the deterministic floor.</param>
/// <param name="RelativeHalfWidth">z·SE / |rate-equation value|; NaN below the floor.</param>
public sealed record MeanDeviation(double Time, double Absolute, double AbsoluteHalfWidth, double Relative, double RelativeHalfWidth);

/// <summary>
/// The contrast of one quantity's ensemble with its deterministic descriptions over the grid, and the
/// verdicts drawn from it. Every array has one entry per grid time; NaN where a value is undefined
/// (a zero mean, a missing LNA variance, a relative deviation below the floor).
/// </summary>
public sealed class QuantityContrast
{
    internal QuantityContrast(string name) => Name = name;

    /// <summary>The species or readout name.</summary>
    public string Name { get; }

    /// <summary>The grid times.</summary>
    public IReadOnlyList<double> Times { get; internal init; } = [];

    /// <summary>Per time: the deviation of the ensemble mean from the rate equations with its z·SE interval.</summary>
    public IReadOnlyList<MeanDeviation> Deviations { get; internal init; } = [];

    /// <summary>Per time: whether the sampling error resolves the deviation, |mean − RE| &gt; z·SE.</summary>
    public IReadOnlyList<bool> Resolved { get; internal init; } = [];

    /// <summary>Per time: ensemble mean − EMRE mean, in copies (NaN without the correction).</summary>
    public IReadOnlyList<double> DeviationFromCorrectedMean { get; internal init; } = [];

    /// <summary>Per time: the linear noise approximation's variance along the rate equations, copies² (NaN when it is not computed).</summary>
    public IReadOnlyList<double> LnaVariance { get; internal init; } = [];

    /// <summary>Per time: the first-order corrected (EMRE) mean φ + δ, copies (NaN without the correction).</summary>
    public IReadOnlyList<double> CorrectedMean { get; internal init; } = [];

    /// <summary>Per time: ensemble variance / LNA variance (NaN when the LNA variance is missing or not positive).</summary>
    public IReadOnlyList<double> VarianceRatio { get; internal init; } = [];

    /// <summary>Per time: the coefficient of variation √variance / mean (NaN for a mean ≤ 0).</summary>
    public IReadOnlyList<double> CoefficientOfVariation { get; internal init; } = [];

    /// <summary>Per time: the Fano factor variance / mean (NaN for a mean ≤ 0).</summary>
    public IReadOnlyList<double> FanoFactor { get; internal init; } = [];

    /// <summary>Per time: the modes of the histogram; null where there is no histogram.</summary>
    public IReadOnlyList<ModeCountResult?> Modes { get; internal init; } = [];

    /// <summary>The grid times at which the histogram has more than one mode.</summary>
    public IReadOnlyList<double> MultimodalTimes { get; internal init; } = [];

    /// <summary>The resolved deviation of largest magnitude (in copies), or null when none is resolved.</summary>
    public MeanDeviation? LargestResolvedDeviation { get; internal init; }

    /// <summary>The resolved relative deviation of largest magnitude (where the rate equations are above the floor), or null.</summary>
    public MeanDeviation? LargestResolvedRelativeDeviation { get; internal init; }

    /// <summary>P(0) at the final grid time (NaN for a quantity that is not a count).</summary>
    public double FinalProbabilityOfZero { get; internal init; }

    /// <summary>The fewest replicates at any grid time.</summary>
    public long MinimumReplicates { get; internal init; }

    /// <summary>The verdicts, in the order of <see cref="VerdictKind"/>; "adequate" only when no other applies.</summary>
    public IReadOnlyList<QuantityVerdict> Verdicts { get; internal init; } = [];

    /// <summary>The grid times on which "mean shifted" was tested (above the floor and near normal); 0 when no verdict was drawn.</summary>
    public int MeanShiftTimesJudged { get; internal init; }

    /// <summary>The grid times Holm's procedure flagged as beyond the threshold; "mean shifted" fires when this is at least 1.</summary>
    public int MeanShiftTimesFlagged { get; internal init; }

    /// <summary>The false-alarm rate α at which these verdicts were drawn (per phase: the run's α shared out over the phases).</summary>
    public double FalseAlarmRate { get; internal init; }

    /// <summary>
    /// The verdicts per phase of the schedule (docs/methods-analysis.md, section 4), in time order, when the run has more than one
    /// phase with grid times; empty otherwise. <see cref="Verdicts"/> stay the verdicts over the whole grid.
    /// </summary>
    public IReadOnlyList<Phases.PhaseContrast> Phases { get; internal set; } = [];
}
