namespace CopyNumber.Analysis.Phases;

/// <summary>
/// A quantity's contrast within one phase: the verdicts drawn from the grid times of that phase alone, each at the
/// false-alarm rate shared out over the phases (<see cref="FalseAlarmRate"/>).
/// </summary>
/// <param name="Phase">The phase.</param>
/// <param name="Contrast">The contrast of the phase's grid times; its verdicts speak of the phase's final time as "the final time".</param>
/// <param name="FalseAlarmRate">α/P, the run's false-alarm rate α divided among the P phases (Bonferroni), so that the chance that a
/// verdict fires falsely in any phase of the quantity stays at most α.</param>
public sealed record PhaseContrast(ModelPhase Phase, QuantityContrast Contrast, double FalseAlarmRate);
