using CopyNumber.Runs;
using System.Globalization;
using CopyNumber.Analysis;

namespace CopyNumber.Reports;

/// <summary>
/// Turns the contrast of a run into a report: the caution, the verdict table with thresholds, and per
/// species the mean with its bands, histograms at chosen times, and a distribution heatmap.
/// </summary>
public static class ContrastReport
{
    /// <summary>Builds the report.</summary>
    /// <param name="contrast">The run's contrast.</param>
    /// <param name="thresholds">The thresholds the verdicts used, printed beside them.</param>
    /// <param name="histogramTimes">Times for the histogram figures (nearest grid time is used); empty: the middle and the final time.</param>
    /// <param name="heatmapQuantity">The quantity of the heatmap; null: the first species with a verdict other than adequate, else the first species.</param>
    /// <param name="pair">Two species asked for as a joint histogram, or null.</param>
    /// <param name="joint">Their joint histogram from the stored paths; null when none was asked for or the run stored no paths.</param>
    public static Report Build(RunContrastResult contrast, ContrastThresholds thresholds, IReadOnlyList<double> histogramTimes, string? heatmapQuantity,
        (string First, string Second)? pair = null, PairHistogram? joint = null)
    {
        var run = contrast.Run;
        var times = run.Times;
        var cautions = new List<string>
        {
            Contrast.Caution,
            $"Sampling error: each verdict fires on a model where it is false with a chance of at most {Percent(thresholds.FalseAlarmRate)} per quantity over the whole grid "
            + $"(docs/methods-analysis.md gives each rule and its measured rate); in the tables a deviation at one time counts as resolved beyond {Format(thresholds.Z)} standard errors; "
            + $"verdicts need at least {thresholds.MinimumReplicates} replicates.",
        };
        if (contrast.ExpansionFailure == RunContrast.OnCycleNote)
            cautions.Add($"The linear noise approximation and the corrected mean are {RunContrast.OnCycleNote}; the replicates are compared by their periods and amplitudes instead (section 'Oscillation').");
        else if (contrast.ExpansionFailure is not null)
            cautions.Add($"The linear noise approximation could not be computed ({contrast.ExpansionFailure}); its bands and variance ratios are missing.");
        if (contrast.ExpansionStop is { } stop) cautions.Add(stop);
        if (run.PartOfRun is { } part) cautions.Insert(0, part);

        var verdictRows = contrast.Quantities
            .SelectMany(q => q.Verdicts.Select(v => (IReadOnlyList<string>)[q.Name, v.Label, v.Sentence]))
            .ToList();
        var summary = new ReportSection(
            "Verdicts",
            [
                $"Model {run.Manifest.ModelFile} (sha256 {run.Manifest.ModelSha256[..12]}…), {run.Manifest.ReplicatesFinished} replicates, method {run.Manifest.Method}, seed {run.Manifest.Seed}.",
                $"Thresholds: relative mean deviation {Percent(thresholds.RelativeDeviation)} (rate-equation value at least {Format(thresholds.DeterministicFloor)}), " +
                $"coefficient of variation {Format(thresholds.CoefficientOfVariation)} over the last {Percent(thresholds.LateFraction)} of the run, " +
                $"several modes at {Percent(thresholds.MultimodalFraction)} of grid times or more, P(0) at the end {Percent(thresholds.ExtinctionProbability)}; "
                + $"false-alarm rate {Percent(thresholds.FalseAlarmRate)} per quantity and run.",
            ],
            [new ReportTable(["quantity", "verdict", "reason"], verdictRows)],
            []);

        var sections = new List<ReportSection> { summary };
        if (PhaseSection(contrast, thresholds) is { } phases) sections.Add(phases);
        if (ValidationSection.For(run.Manifest, cautions) is { } validation) sections.Add(validation);
        if (ExactCheckSection.For(run.Manifest) is { } exactCheck) sections.Add(exactCheck);
        var chosenTimes = ChooseTimes(times, histogramTimes);
        var timeUnit = TimeUnit(run.Manifest);
        var scheduleChanges = ScheduleMarks.Of(contrast.Network, RunContrast.Grid(run));
        foreach (var q in contrast.Quantities)
        {
            var series = run.Quantities.First(s => s.Name == q.Name);
            var figures = new List<ReportFigure>();
            var lnaColumn = contrast.Expansion?.ColumnIndex(q.Name) ?? -1;
            double[]? lnaLower = null, lnaUpper = null;
            var lnaClipped = false;
            if (lnaColumn >= 0)
                (lnaLower, lnaUpper, lnaClipped) = LnaBand.Of(contrast.Expansion!.RateEquationColumn(lnaColumn), contrast.Expansion.VarianceColumn(lnaColumn),
                    isSpecies: contrast.Network.Species.Contains(q.Name));
            var safe = SafeName(q.Name);
            var isCount = IsCount(contrast.Network, q.Name);
            var countUnit = isCount ? "copies" : "";
            var band = new BandSeries(q.Name, times, series.Mean, series.Quantile05, series.Quantile95, series.Deterministic,
                lnaLower, lnaUpper, run.SamplePaths(q.Name, 5)) { TimeUnit = timeUnit, CountUnit = countUnit, IsCount = isCount, ScheduleChanges = scheduleChanges };
            figures.Add(new ReportFigure($"{safe}-mean.png",
                $"{q.Name}: ensemble mean with its 5–95% band, the rate equations{(lnaColumn >= 0 ? " and the LNA ±2σ band" : "")}.{(lnaClipped ? LnaBand.ClippedNote : "")}",
                MeanBandFigure.Render(band, 900, 500)));

            if (q.Deviations.Any(d => double.IsFinite(d.Relative)))
                figures.Add(new ReportFigure($"{safe}-deviation.png",
                    $"{q.Name}: relative deviation of the ensemble mean from the rate equations over time, with its ±{Format(thresholds.Z)} standard-error band "
                    + $"and the verdict's threshold ±{Percent(thresholds.RelativeDeviation)} (no value where the rate equations lie below {Format(thresholds.DeterministicFloor)}).",
                    FigureLook.Render(DeviationFigure.Build(q.Name, [.. q.Times], q.Deviations.Select(d => d.Relative).ToArray(),
                        q.Deviations.Select(d => d.RelativeHalfWidth).ToArray(), thresholds.RelativeDeviation, thresholds.Z, timeUnit, scheduleChanges), 900, 450)));

            var snapshots = chosenTimes
                .Select(k => (k, run.Distribution(q.Name, k)))
                .Where(p => p.Item2.Counts.Length > 0)
                .Select(p => new HistogramSnapshot(q.Name, times[p.k], p.Item2.Counts, p.Item2.Probabilities, series.Deterministic[p.k])
                    { TimeUnit = timeUnit, CountUnit = countUnit, IsCount = isCount })
                .ToList();
            if (snapshots.Count > 0)
                figures.Add(new ReportFigure($"{safe}-histograms.png",
                    $"{q.Name}: distribution {(isCount ? "of copy numbers " : "")}at t = {string.Join(", ", snapshots.Select(s => Format(s.Time)))}, rate-equation value marked.",
                    HistogramFigure.Render(snapshots, 900, 500)));

            var sentences = q.Verdicts.Select(v => $"{v.Label}: {v.Sentence}").ToList();
            if (q.LargestResolvedRelativeDeviation is { } largest)
                sentences.Add($"Largest resolved relative deviation {Percent(largest.Relative)} (±{Percent(largest.RelativeHalfWidth)}) at t = {Format(largest.Time)}.");
            sentences.Add($"P(0) at the final time: {Format(q.FinalProbabilityOfZero)}.");
            sections.Add(new ReportSection(q.Name, sentences, [], figures));
        }

        if (OscillationSection.Build(contrast.Oscillation, contrast.Network, timeUnit) is { } oscillationSection) sections.Add(oscillationSection);
        if (NoiseSection.For(contrast, timeUnit, scheduleChanges, thresholds.Z) is { } noiseSection) sections.Add(noiseSection);
        if (PartitionSection.For(contrast, timeUnit, scheduleChanges) is { } partitionSection) sections.Add(partitionSection);
        if (SwitchingSection.For(contrast, timeUnit) is { } switchingSection) sections.Add(switchingSection);
        if (SnapshotSection.For(run.Path) is { } snapshotSection) sections.Add(snapshotSection);

        var heat = heatmapQuantity
            ?? contrast.Quantities
                .Where(q => q.Verdicts.Any(v => v.Kind != VerdictKind.Adequate) && run.Distribution(q.Name, times.Length - 1).Counts.Length > 0)
                .OrderByDescending(q => run.Distribution(q.Name, times.Length - 1).Counts[^1]) // the widest distribution shows most
                .FirstOrDefault()?.Name
            ?? contrast.Network.Species[0];
        var heatmap = Heatmap(run, heat) is { } map ? map with { CountUnit = IsCount(contrast.Network, heat) ? "copies" : "" } : null;
        if (heatmap is not null) heatmap = heatmap with { ScheduleChanges = scheduleChanges };
        if (heatmap is not null)
            sections.Add(new ReportSection($"Distribution of {heat} over time", [], [],
                [new ReportFigure($"{SafeName(heat)}-heatmap.png", $"Probability of each copy number of {heat} over time.", HeatmapFigure.Render(heatmap, 900, 500))]));

        if (pair is { } asked)
        {
            if (joint is null)
                sections.Add(new ReportSection($"Joint histogram of {asked.First} and {asked.Second}",
                    ["The run stored no paths to count: simulate with --paths N (or 'all') to draw it."], [], []));
            else
            {
                var jointSnapshots = chosenTimes.Select(k => new JointSnapshot(joint.First, joint.Second, times[k], joint.Laws[k], joint.Replicates, timeUnit)).ToList();
                sections.Add(new ReportSection($"Joint histogram of {joint.First} and {joint.Second}",
                    [$"Counted over the {joint.Replicates} replicates whose paths were stored (pair.parquet holds every grid time); colours are scaled per time to the largest cell, so each state the pair can be in shows as its own blob, the lighter one holding more replicates."],
                    [], [new ReportFigure($"{SafeName(joint.First)}-{SafeName(joint.Second)}-joint.png",
                        $"Joint histogram of {joint.First} (horizontal) and {joint.Second} (vertical) at t = {string.Join(", ", jointSnapshots.Select(s => Format(s.Time)))}; colour: {JointHistogramFigure.ScaleLabel}.",
                        JointHistogramFigure.Render(jointSnapshots, 900, jointSnapshots.Count > 3 ? 800 : 420))]));
            }
        }

        return new Report($"CopyNumber contrast: {Path.GetFileNameWithoutExtension(run.Manifest.ModelFile)}", cautions, sections);
    }

    // The verdicts per phase of the schedule, when it cuts the run into more than one (docs/methods-analysis.md, section 4).
    private static ReportSection? PhaseSection(RunContrastResult contrast, ContrastThresholds thresholds)
    {
        var rows = contrast.Quantities.SelectMany(q => q.Phases.Select(p => (q, p))).OrderBy(x => x.p.Phase.Index)
            .SelectMany(x => x.p.Contrast.Verdicts.Select(v => (IReadOnlyList<string>)[x.p.Phase.Index.ToString(CultureInfo.InvariantCulture), x.p.Phase.Span, x.q.Name, v.Label, v.Sentence]))
            .ToList();
        if (rows.Count == 0) return null;
        var count = contrast.Quantities.Max(q => q.Phases.Count);
        return new ReportSection("Verdicts per phase",
            [$"The schedule changes the model {count - 1} time{(count == 2 ? "" : "s")} on the grid, so each of the {count} phases between changes is also judged on its own grid times "
             + $"(a grid time at a change belongs to the phase it starts). Each phase's verdicts are drawn at the false-alarm rate {Percent(thresholds.FalseAlarmRate)} shared out over the phases "
             + $"({Percent(thresholds.FalseAlarmRate / count)} each), so a verdict fires falsely in some phase with a chance of at most {Percent(thresholds.FalseAlarmRate)} per quantity; numbers in phases.parquet."],
            [new ReportTable(["phase", "span", "quantity", "verdict", "reason"], rows)],
            []);
    }

    /// <summary>
    /// Refuses figure choices the run cannot honour, before anything is computed: a heatmap quantity that is
    /// neither a species nor a readout, a histogram time outside [0, T]. Silently drawing something else
    /// (the nearest grid time, no heatmap) would answer a question that was not asked.
    /// </summary>
    /// <param name="quantities">The run's species and readouts.</param>
    /// <param name="until">The final time T of the run's grid, model time units.</param>
    /// <param name="histogramTimes">The requested histogram times.</param>
    /// <param name="heatmapQuantity">The requested heatmap quantity, or null for the default.</param>
    /// <exception cref="AnalysisInputException">A choice names a quantity or time the run does not have.</exception>
    public static void CheckChoices(IReadOnlyCollection<string> quantities, double until, IReadOnlyList<double> histogramTimes, string? heatmapQuantity)
    {
        if (heatmapQuantity is not null && !quantities.Contains(heatmapQuantity, StringComparer.Ordinal))
            throw new AnalysisInputException($"--heatmap '{heatmapQuantity}' is not a species or readout of the model; it has {string.Join(", ", quantities.Select(q => $"'{q}'"))}");
        // The grid's own slack (TimeGrid) lets T itself be asked for despite rounding in its text.
        foreach (var t in histogramTimes)
            if (t > until * (1 + 1e-9))
                throw new AnalysisInputException($"--at {Format(t)} is after the final time {Format(until)} of the run; histogram times lie in [0, {Format(until)}]");
    }

    private static DistributionHeatmap? Heatmap(Storage.RunFolder run, string quantity)
    {
        var times = run.Times;
        long min = long.MaxValue, max = long.MinValue;
        for (var k = 0; k < times.Length; k++)
        {
            var (counts, _) = run.Distribution(quantity, k);
            if (counts.Length == 0) continue;
            min = Math.Min(min, counts[0]);
            max = Math.Max(max, counts[^1]);
        }
        if (min > max || max - min > 5000) return null;
        var probability = new double[times.Length, max - min + 1];
        for (var k = 0; k < times.Length; k++)
        {
            var (counts, probabilities) = run.Distribution(quantity, k);
            for (var i = 0; i < counts.Length; i++) probability[k, counts[i] - min] = probabilities[i];
        }
        var deterministic = run.Quantities.First(s => s.Name == quantity).Deterministic;
        return new DistributionHeatmap(quantity, times, min, max, probability, deterministic) { TimeUnit = TimeUnit(run.Manifest) };
    }

    /// <summary>The model's declared time unit from the manifest (<see cref="Storage.ManifestFields.TimeUnit"/>), or "time" (no unit shown) when it declares none.</summary>
    private static string TimeUnit(Storage.RunManifest manifest) =>
        manifest.Extra.TryGetValue(Storage.ManifestFields.TimeUnit, out var unit) && unit?.ToString() is { Length: > 0 } text ? text : "time";

    /// <summary>A species, or a readout that is an integer combination of species (<see cref="Network.Readout.IsCount"/>): its axis says "copies".</summary>
    internal static bool IsCount(Network.ReactionNetwork network, string name) =>
        network.SpeciesIndex(name) >= 0 || network.Readouts.Any(r => r.Name == name && r.IsCount);

    private static int[] ChooseTimes(double[] times, IReadOnlyList<double> requested)
    {
        if (requested.Count == 0) return new[] { times.Length / 2, times.Length - 1 }.Distinct().ToArray();
        return requested.Select(t =>
        {
            var best = 0;
            for (var k = 1; k < times.Length; k++) if (Math.Abs(times[k] - t) < Math.Abs(times[best] - t)) best = k;
            return best;
        }).Distinct().ToArray();
    }

    private static string SafeName(string name) => new(name.Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' ? c : '_').ToArray());

    private static string Format(double value) => value.ToString("0.###", CultureInfo.InvariantCulture);

    private static string Percent(double fraction) => (fraction * 100).ToString("0.#", CultureInfo.InvariantCulture) + "%";
}
