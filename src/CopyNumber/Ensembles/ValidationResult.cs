namespace CopyNumber.Ensembles;

/// <summary>What was done about the validation sample's verdict.</summary>
public enum ValidationAction
{
    /// <summary>Tau-leaping kept: the sample found no error beyond the tolerances (or could not judge).</summary>
    Kept,

    /// <summary>The method was chosen by auto and the sample established an error: the run was redone with the direct method.</summary>
    FellBack,

    /// <summary>Tau-leaping was asked for (or the run is a shard), so the disagreement is reported and the method kept.</summary>
    Reported,
}

/// <summary>The validation sample of a tau-leaping run and its comparison with the run's ensemble.</summary>
/// <param name="Sample">The exact replicates' moments.</param>
/// <param name="Cells">Every compared grid time and quantity with its simultaneous intervals.</param>
/// <param name="Intervals">C, the intervals in the family.</param>
/// <param name="Z">The normal quantile each interval uses, Φ⁻¹(1 − α/(2C)).</param>
/// <param name="Verdict">What the intervals establish.</param>
/// <param name="MainWallTime">The tau-leaping ensemble's wall time the sample's cost is measured against.</param>
public sealed record ValidationResult(
    ExactSample Sample,
    IReadOnlyList<ValidationCell> Cells,
    int Intervals,
    double Z,
    ValidationVerdict Verdict,
    TimeSpan MainWallTime)
{
    /// <summary>What was done about <see cref="Verdict"/>.</summary>
    public ValidationAction Action { get; init; } = ValidationAction.Kept;

    /// <summary>The sample's cost as a percentage of the tau-leaping ensemble's wall time.</summary>
    public double CostPercent => MainWallTime > TimeSpan.Zero ? 100 * Sample.WallTime / MainWallTime : double.NaN;

    /// <summary>The reported mean cell (worst-grid-time rule of <see cref="ValidationComparison.Worst"/>).</summary>
    public ValidationCell? WorstMean => ValidationComparison.Worst(Cells, c => c.Mean, ValidationComparison.MeanTolerance);

    /// <summary>The reported standard-deviation cell.</summary>
    public ValidationCell? WorstStandardDeviation => ValidationComparison.Worst(Cells, c => c.StandardDeviation, ValidationComparison.StandardDeviationTolerance);

    /// <summary>The widest half-width among the mean intervals: the smallest mean error the check is sure to resolve.</summary>
    public double MeanResolution => Cells.Where(c => c.Mean is not null).Select(c => c.Mean!.Value.HalfWidth).DefaultIfEmpty(double.NaN).Max();

    /// <summary>The widest half-width among the standard-deviation intervals.</summary>
    public double StandardDeviationResolution => Cells.Where(c => c.StandardDeviation is not null).Select(c => c.StandardDeviation!.Value.HalfWidth).DefaultIfEmpty(double.NaN).Max();

    /// <summary>
    /// What to do about the verdict: fall back when the method was chosen automatically, the run can be
    /// redone whole (not a shard) and the error exceeds the tolerance; report when the method was asked for
    /// (or the run is a shard) and any error is detected; keep otherwise.
    /// </summary>
    public ValidationAction Decide(bool chosenAutomatically, bool wholeRun) => Verdict switch
    {
        ValidationVerdict.OutsideTolerance when chosenAutomatically && wholeRun => ValidationAction.FellBack,
        ValidationVerdict.OutsideTolerance => ValidationAction.Reported,
        ValidationVerdict.WithinTolerance when !chosenAutomatically => ValidationAction.Reported,
        _ => ValidationAction.Kept,
    };

    /// <summary>Compares <paramref name="leap"/> with <paramref name="sample"/>.</summary>
    public static ValidationResult Of(EnsembleResult leap, ExactSample sample, TimeSpan mainWallTime)
    {
        ArgumentNullException.ThrowIfNull(leap);
        ArgumentNullException.ThrowIfNull(sample);
        var (cells, intervals, z) = ValidationComparison.Compare(leap, sample.Moments);
        return new ValidationResult(sample, cells, intervals, z, ValidationComparison.Judge(cells), mainWallTime);
    }

    /// <summary>
    /// One paragraph for the console and the report: the sample, the worst intervals, the resolution, the
    /// verdict and what was done.
    /// </summary>
    public string Describe()
    {
        var text = new System.Text.StringBuilder();
        text.Append($"validation sample: {Sample.Replicates} exact (direct-method) replicates, {Format(Sample.WallTime.TotalSeconds)} s = {Format(CostPercent)}% of the tau-leaping run's {Format(MainWallTime.TotalSeconds)} s (it may take 10% of the run or 1 s, whichever is longer); ");
        if (Verdict == ValidationVerdict.NotJudged)
        {
            text.Append("no grid time could be compared (too few replicates, or means indistinguishable from 0), so the leaping error is not measured.");
            return text.ToString();
        }
        text.Append($"{Intervals} simultaneous {100 * (1 - ValidationComparison.FamilyAlpha):0}% intervals (Bonferroni, z = {Z:0.00}) for the relative error of tau-leaping against the exact sample.");
        if (WorstMean is { Mean: { } m } wm)
            text.Append($" Mean: worst at t = {Format(wm.Time)} for '{wm.Quantity}', {Percent(m.Estimate)} [{Percent(m.Lower)}, {Percent(m.Upper)}].");
        if (WorstStandardDeviation is { StandardDeviation: { } s } ws)
            text.Append($" Standard deviation: worst at t = {Format(ws.Time)} for '{ws.Quantity}', {Percent(s.Estimate)} [{Percent(s.Lower)}, {Percent(s.Upper)}].");
        text.Append($" Resolution (widest half-width): mean ±{Percent(MeanResolution).TrimStart('+')}, standard deviation ±{Percent(StandardDeviationResolution).TrimStart('+')}; a sample this size catches errors larger than that, not smaller ones.");
        text.Append(Verdict switch
        {
            ValidationVerdict.OutsideTolerance => $" Verdict: the leaping error exceeds the tolerance (1% on the mean, 2% on the standard deviation).",
            ValidationVerdict.WithinTolerance => " Verdict: a leaping error is detected, but it is not shown to exceed the tolerance (1% mean, 2% standard deviation).",
            _ => " Verdict: no leaping error detected at this resolution.",
        });
        text.Append(Action switch
        {
            ValidationAction.FellBack => " The method was chosen automatically, so the run was redone with the exact direct method; its numbers are exact.",
            ValidationAction.Reported when Verdict != ValidationVerdict.Consistent =>
                " Tau-leaping was kept as asked: where the ensemble mean departs from the rate equations and the exact sample does not, that departure is the method's error, not the model's.",
            _ => "",
        });
        return text.ToString();
    }

    private static string Format(double value) =>
        double.IsFinite(value) ? value.ToString(Math.Abs(value) >= 100 ? "0" : "0.###", System.Globalization.CultureInfo.InvariantCulture) : "n/a";

    /// <summary>A relative error as a percentage; below 0.005% it prints as 0%.</summary>
    private static string Percent(double value) =>
        !double.IsFinite(value) ? "n/a"
        : Math.Abs(value) < 5e-5 ? "0%"
        : (100 * value).ToString("+0.00;-0.00", System.Globalization.CultureInfo.InvariantCulture) + "%";
}
