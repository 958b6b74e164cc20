namespace CopyNumber.Analysis;

/// <summary>
/// The thresholds behind the verdicts of <see cref="Contrast"/>. The defaults are the documented ones
/// (docs/methods-analysis.md); callers may change any of them with a <c>with</c> expression.
/// </summary>
public sealed record ContrastThresholds
{
    /// <summary>The documented defaults.</summary>
    public static ContrastThresholds Default { get; } = new();

    /// <summary>
    /// Half-width, in standard errors, of the pointwise intervals of the per-time table (a deviation is
    /// "resolved" at one time when |dev| &gt; z·SE), and the number of standard errors by which a mean must
    /// exceed 0 for a coefficient of variation and a Fano factor to be given. The verdicts themselves use
    /// family-wise rules at <see cref="FalseAlarmRate"/>. Default 3.
    /// </summary>
    public double Z { get; init; } = 3.0;

    /// <summary>
    /// α, the chance that a verdict fires, per quantity and run, when what it says is false (at the boundary of
    /// its threshold), over the whole grid: Holm over grid times for "mean shifted", a median of lower bounds for
    /// "noise-dominated", an exact binomial test for "extinction-prone" (docs/methods-analysis.md). Default 0.01.
    /// </summary>
    public double FalseAlarmRate { get; init; } = 0.01;

    /// <summary>Fewer replicates than this (at any grid time) gives only the verdict "too few replicates". Default 100.</summary>
    public long MinimumReplicates { get; init; } = 100;

    /// <summary>"mean shifted" when a relative deviation beyond this is resolved, family-wise over the grid. Default 0.05 (5%).</summary>
    public double RelativeDeviation { get; init; } = 0.05;

    /// <summary>Relative deviations are judged only where |rate-equation value| ≥ this, in copies. Default 1.</summary>
    public double DeterministicFloor { get; init; } = 1.0;

    /// <summary>"noise-dominated" when the median over the late window of the coefficient of variation's lower confidence bounds exceeds this. Default 0.5.</summary>
    public double CoefficientOfVariation { get; init; } = 0.5;

    /// <summary>The late window is the last part of the run of this fraction of its duration (it always holds the final time). Default 0.25.</summary>
    public double LateFraction { get; init; } = 0.25;

    /// <summary>"multimodal" when ≥ 2 modes at the final time or at least this fraction of the grid times with a histogram. Default 0.2.</summary>
    public double MultimodalFraction { get; init; } = 0.2;

    /// <summary>"extinction-prone" when P(0) at the final time is shown to exceed this by an exact binomial test (and see <see cref="ExtinctionFloor"/>). Default 0.05.</summary>
    public double ExtinctionProbability { get; init; } = 0.05;

    /// <summary>"extinction-prone" needs the rate equations to hold at least this many copies at the final time. Default 1.</summary>
    public double ExtinctionFloor { get; init; } = 1.0;

    /// <summary>How modes are counted.</summary>
    public ModeCountRule ModeRule { get; init; } = ModeCountRule.Default;

    /// <summary>Checks that every threshold is in range.</summary>
    /// <exception cref="AnalysisInputException">A threshold is out of range.</exception>
    public void Validate()
    {
        if (!(Z > 0) || double.IsInfinity(Z)) throw new AnalysisInputException($"the confidence z must be a positive number, not {Z}");
        if (!(FalseAlarmRate > 0 && FalseAlarmRate < 0.5)) throw new AnalysisInputException($"the false-alarm rate lies in (0, 0.5), not {FalseAlarmRate}");
        if (MinimumReplicates < 1) throw new AnalysisInputException($"the minimum number of replicates must be at least 1, not {MinimumReplicates}");
        if (!(RelativeDeviation > 0) || double.IsInfinity(RelativeDeviation)) throw new AnalysisInputException($"the relative-deviation threshold must be a positive number, not {RelativeDeviation}");
        if (!(DeterministicFloor >= 0) || double.IsInfinity(DeterministicFloor)) throw new AnalysisInputException($"the deterministic floor must be a nonnegative number of copies, not {DeterministicFloor}");
        if (!(CoefficientOfVariation > 0) || double.IsInfinity(CoefficientOfVariation)) throw new AnalysisInputException($"the coefficient-of-variation threshold must be a positive number, not {CoefficientOfVariation}");
        if (!(LateFraction > 0 && LateFraction <= 1)) throw new AnalysisInputException($"the late fraction lies in (0, 1], not {LateFraction}");
        if (!(MultimodalFraction > 0 && MultimodalFraction <= 1)) throw new AnalysisInputException($"the multimodal fraction lies in (0, 1], not {MultimodalFraction}");
        if (!(ExtinctionProbability > 0 && ExtinctionProbability <= 1)) throw new AnalysisInputException($"the extinction probability lies in (0, 1], not {ExtinctionProbability}");
        if (!(ExtinctionFloor >= 0) || double.IsInfinity(ExtinctionFloor)) throw new AnalysisInputException($"the extinction floor must be a nonnegative number of copies, not {ExtinctionFloor}");
        ArgumentNullException.ThrowIfNull(ModeRule);
        ModeRule.Validate();
    }
}
