using CopyNumber.Analysis;
using CopyNumber.Analysis.Noise;
using CopyNumber.Analysis.Oscillation;
using CopyNumber.Analysis.Phases;
using System.Globalization;
using CopyNumber.Analysis.Verdicts;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>The contrast of one simulate run: every quantity's verdicts and the expansion it was set against.</summary>
/// <param name="Run">The run folder read back.</param>
/// <param name="Network">The network recompiled from the run's own model text.</param>
/// <param name="Quantities">One contrast per species and readout, in table order.</param>
/// <param name="Expansion">The LNA variance and EMRE mean along the rate equations, or null when they could not be computed.</param>
/// <param name="ExpansionFailure">Why the expansion is missing, if it is.</param>
public sealed record RunContrastResult(
    RunFolder Run,
    ReactionNetwork Network,
    IReadOnlyList<QuantityContrast> Quantities,
    SystemSizeExpansionSolution? Expansion,
    string? ExpansionFailure)
{
    /// <summary>Where the error bars of the means come from: the sampling error of an ensemble, or an exact run's bounds.</summary>
    public string ErrorSource { get; init; } = RunContrast.SamplingErrorSource;

    /// <summary>
    /// When parameters vary per cell: the rate equations averaged over the run's first cells ("the average of cells"), beside
    /// <see cref="RunFolder"/>'s deterministic column, which is the rate equations of the mean cell; null otherwise.
    /// </summary>
    public CellAverage? CellAverage { get; init; }

    /// <summary>Why <see cref="CellAverage"/> is missing although parameters vary (a cell's rate equations failed), or why its LNA parts are; null otherwise.</summary>
    public string? CellAverageFailure { get; init; }

    /// <summary>The intrinsic/extrinsic split of each pair of identical reporters the contrast was asked for (<c>--dual-reporters</c>); empty otherwise.</summary>
    public IReadOnlyList<DualReporterSplit> DualReporters { get; init; } = [];

    /// <summary>
    /// When the cells divide: the linear noise approximation with its variance split into the part fed by the reactions and
    /// the part fed by partitioning (<see cref="SystemSizeExpansionSolution.Sources"/>); null otherwise or when it failed.
    /// </summary>
    public SystemSizeExpansionSolution? NoiseSources { get; init; }

    /// <summary>Why <see cref="NoiseSources"/> is missing although the cells divide and the expansion solved; null otherwise.</summary>
    public string? NoiseSourcesFailure { get; init; }

    /// <summary>The oscillation analysis (rate equations, sample paths, spectra; docs/methods-analysis.md, section 7), or null for an exact run.</summary>
    public RunOscillation? Oscillation { get; init; }

    /// <summary>The switching between modes of the species the run followed at its events (<c>--switching</c> or steady-state cores); empty otherwise.</summary>
    public IReadOnlyList<ModeSwitching> ModeSwitching { get; init; } = [];

    /// <summary>Where the cores came from ("option" or "steady-states"), as the manifest records; null without cores.</summary>
    public string? SwitchingSource { get; init; }

    /// <summary>For each multimodal quantity whose switching was not followed: how to ask for its switching statistics.</summary>
    public IReadOnlyList<string> SwitchingHints { get; init; } = [];

    /// <summary>
    /// When the expansion stopped at a state-triggered change, the sentence saying so and that the
    /// verdicts cover only the times before it; null otherwise.
    /// </summary>
    public string? ExpansionStop => Expansion is { StoppedBy: { } trigger } expansion
        ? $"The linear noise approximation and the corrected mean stop at the first state-triggered change ('{trigger.Text}', line {trigger.Position.Line}) " +
          $"at t = {expansion.StoppedAt.ToString("G6", CultureInfo.InvariantCulture)}: the verdicts cover only the grid times before it."
        : null;
}

/// <summary>
/// Sets a finished run against its deterministic descriptions: recompiles the model from the text
/// stored with the run, solves the rate equations with the linear noise approximation and the
/// first-order mean correction on the run's grid, and contrasts every quantity, reading each count
/// quantity's histograms on the lattice its reactions and schedule allow (<see cref="QuantityLattice"/>).
/// </summary>
public static class RunContrast
{
    /// <summary>Why the expansions are left out while the rate equations run on a limit cycle.</summary>
    public const string OnCycleNote = "not used along the rate equations' limit cycle, where its covariance grows without bound as the replicates' phases diffuse";

    /// <summary><see cref="RunContrastResult.ErrorSource"/> of an ensemble run.</summary>
    public const string SamplingErrorSource = "sampling: the standard error of the ensemble mean";

    /// <summary>
    /// The replicate count an exact law stands in for: no sampling error at all. An exact folder (manifest
    /// <see cref="ExactRun.ErrorKindField"/>) stores the mean's error bar from the projection bound in
    /// std_error; it enters the contrast as z·SE, so the half-width of every band is that error bar.
    /// int.MaxValue (not more) because the exact binomial test of P(0) counts replicates in an int; at
    /// 2.1·10⁹ its sampling terms are far below any threshold.
    /// </summary>
    public const long ExactReplicates = int.MaxValue;

    /// <summary>Computes the contrast of <paramref name="run"/>.</summary>
    /// <exception cref="OutputException">The run folder lacks what a contrast needs (grid, model).</exception>
    /// <param name="run">The run folder read back.</param>
    /// <param name="thresholds">The verdicts' thresholds; the defaults when null.</param>
    /// <param name="solver">Options of the rate-equation solver; the defaults when null.</param>
    /// <param name="dualReporters">Pairs of species that are identical, independent reporters in one cell, whose noise is split
    /// by the dual-reporter identities (<see cref="DualReporterNoise"/>); each pair's covariance must be in the run.</param>
    /// <exception cref="AnalysisInputException">A dual-reporter pair names a species the run has no covariance for.</exception>
    public static RunContrastResult Compute(RunFolder run, ContrastThresholds? thresholds = null, SolverOptions? solver = null,
        IReadOnlyList<(string First, string Second)>? dualReporters = null)
    {
        var reporterSplits = (dualReporters ?? []).Select(pair => DualReporters(run, pair.First, pair.Second)).ToArray();
        var manifest = run.Manifest;
        CompileOptions? options = manifest.Arguments.TryGetValue("size", out var sizeText) && double.TryParse(sizeText, NumberStyles.Float, CultureInfo.InvariantCulture, out var size)
            ? new CompileOptions(SizeOverride: size)
            : null;
        var loaded = ModelLoader.LoadText(run.ModelText, manifest.ModelFile, options);
        if (loaded.Model is null)
            throw new RunFolderException($"the model stored with '{run.Path}' no longer compiles: {loaded.Diagnostics[0].Format()}", run.Path);
        var network = loaded.Model.Network;
        var grid = Grid(run);
        if (grid.Count != run.Times.Length)
            throw new RunFolderException($"the grid in '{run.Path}/manifest.json' has {grid.Count} points but the tables have {run.Times.Length}", run.Path);

        var exact = manifest.ExtraText(ExactRun.ErrorKindField) == ExactRun.ExactErrorKind;
        var z = (thresholds ?? ContrastThresholds.Default).Z;
        var zeroOne = ZeroOneSpecies.Of(network);
        var thresholdsInForce = thresholds ?? ContrastThresholds.Default;
        // Sample paths for the oscillation analysis are simulated here, from the run's seed, only when the rate equations
        // oscillate or ring; an exact run has no replicates to sample.
        var oscillation = exact ? null
            : RunOscillation.Analyse(network, grid.Until, manifest.ReplicatesFinished, manifest.Seed, Environment.ProcessorCount, thresholdsInForce.FalseAlarmRate);
        SystemSizeExpansionSolution? expansion = null;
        string? failure = null;
        if (oscillation?.RateEquations.Kind == OscillationKind.LimitCycle)
            failure = OnCycleNote;
        else
        {
            try
            {
                expansion = EffectiveMesoscopicRateEquations.Solve(network, grid, solver ?? new SolverOptions());
            }
            catch (Exception e) when (e is SolverFailureException or AnalysisInputException or ArithmeticException)
            {
                failure = e.Message;
            }
        }
        CellAverage? cellAverage = null;
        string? cellAverageFailure = null;
        if (!exact && network.Variability.Any)
        {
            try
            {
                // The LNA over the cells as well, where it describes the network at the mean cell: it predicts the noise split.
                cellAverage = CellAverageRateEquations.Solve(network, grid, solver ?? new SolverOptions(), manifest.Seed, withNoise: expansion is not null);
            }
            catch (Exception e) when (expansion is not null && e is SolverFailureException or AnalysisInputException or ArithmeticException)
            {
                try
                {
                    cellAverage = CellAverageRateEquations.Solve(network, grid, solver ?? new SolverOptions(), manifest.Seed);
                    cellAverageFailure = $"the linear noise approximation over cells could not be computed ({e.Message}); the rate equations could";
                }
                catch (Exception inner) when (inner is SolverFailureException or ArithmeticException)
                {
                    cellAverageFailure = inner.Message;
                }
            }
            catch (Exception e) when (e is SolverFailureException or ArithmeticException)
            {
                cellAverageFailure = e.Message;
            }
        }
        // The split by source is its own integration (three covariances in one state), so it costs nothing where no cell divides.
        SystemSizeExpansionSolution? sources = null;
        string? sourcesFailure = null;
        if (network.Cycle is not null && expansion is not null)
        {
            try
            {
                sources = LinearNoiseApproximation.SolveBySource(network, grid, solver ?? new SolverOptions());
            }
            catch (Exception e) when (e is SolverFailureException or ArithmeticException)
            {
                // The plain expansion solved; a failure of the larger system leaves out the split and nothing else.
                sourcesFailure = e.Message;
            }
        }
        var switching = SwitchingJson.Read(manifest, network, grid.Until).Where(x => x.Replicates > 0).ToDictionary(x => x.Species);
        // The phases between the schedule's changes, cut where the timeline cuts (its coincidence rule): verdicts per phase.
        var phases = ModelPhase.Of(Timeline.Of(network, grid));
        var contrasts = new List<QuantityContrast>();
        foreach (var series in run.Quantities)
        {
            var column = expansion?.ColumnIndex(series.Name) ?? -1;
            var points = new List<ContrastPoint>(run.Times.Length);
            for (var k = 0; k < run.Times.Length; k++)
            {
                if (!exact && series.Replicates[k] < 1) break; // replicates stopped early leave later times empty
                // Verdicts only before the first triggered change; a grid time that coincides with it (Timeline's rule)
                // is excluded too, since whether the rate equations hold the value before or after the change there is a convention.
                if (expansion is not null && run.Times[k] >= expansion.StoppedAt - Timeline.CoincidenceTolerance * grid.Every) break;
                var replicates = exact ? ExactReplicates : series.Replicates[k];
                var (counts, probabilities) = run.Distribution(series.Name, k);
                var histogram = counts.Length > 0 ? CountDistribution.FromProbabilities(counts, probabilities, exact ? double.PositiveInfinity : replicates) : null;
                var deterministic = double.IsNaN(series.Deterministic[k]) && column >= 0 ? expansion!.RateEquationValue(k, column) : series.Deterministic[k];
                points.Add(new ContrastPoint(run.Times[k], replicates, series.Mean[k], series.Variance[k], exact ? series.StandardError[k] / z : series.StandardError[k],
                    series.ZeroFraction[k], histogram, deterministic,
                    column >= 0 ? expansion!.Variance(k, column) : double.NaN,
                    column >= 0 && expansion!.HasMeanCorrection ? expansion.CorrectedMean(k, column) : double.NaN,
                    IsExactLaw: exact));
            }
            // The switches are counted over the whole run [0, T]: they belong to the final grid time, when the run reached it.
            if (points.Count > 0 && points[^1].Time == grid.Until && switching.TryGetValue(series.Name, out var switches))
                points[^1] = points[^1] with { SwitchesPerReplicate = switches.Mean };
            if (points.Count > 0) contrasts.Add(Contrast.Analyze(series.Name, points, thresholds, QuantityLattice.For(network, grid, series.Name), zeroOne.GetValueOrDefault(series.Name),
                OscillationOf(oscillation, series.Name, thresholdsInForce), phases));
        }
        IReadOnlyList<ModeSwitching> modeSwitching = exact ? [] : ModeSwitchingOf(run, network, grid.Until);
        return new RunContrastResult(run, network, contrasts, expansion, failure)
            { ErrorSource = exact ? ExactRun.ExactErrorKind : SamplingErrorSource, Oscillation = oscillation, DualReporters = reporterSplits,
              CellAverage = cellAverage, CellAverageFailure = cellAverageFailure, ModeSwitching = modeSwitching, NoiseSources = sources, NoiseSourcesFailure = sourcesFailure,
              SwitchingSource = modeSwitching.Count > 0 ? manifest.Arguments.GetValueOrDefault(ManifestFields.SwitchingSourceArgument) : null,
              SwitchingHints = exact ? [] : SwitchingHints(contrasts, network, modeSwitching) };
    }

    /// <summary>The switching statistics the run's manifest records for the cores it followed; empty when it followed none.</summary>
    private static IReadOnlyList<ModeSwitching> ModeSwitchingOf(RunFolder run, ReactionNetwork network, double until) =>
        ModeSwitchingJson.Read(run.Manifest, ModeSwitchingJson.Cores(run.Manifest, network, run.Path), until);

    // A multimodal species not followed gets the option with cores from its two outermost modes at the last grid time
    // that had two or more; a multimodal readout, the pointer to the option (switching is followed for species).
    private static IReadOnlyList<string> SwitchingHints(IReadOnlyList<QuantityContrast> contrasts, ReactionNetwork network, IReadOnlyList<ModeSwitching> followed)
    {
        var hints = new List<string>();
        foreach (var c in contrasts)
        {
            if (!c.Verdicts.Any(v => v.Kind == VerdictKind.Multimodal) || followed.Any(f => f.Species == c.Name)) continue;
            if (network.SpeciesIndex(c.Name) < 0)
            {
                if (followed.Count > 0) continue; // a readout of followed species (U − V) switches with them
                hints.Add($"{c.Name} is multimodal: switching statistics are counted for species; name a species and its cores with --switching NAME=LOW..HIGH");
                continue;
            }
            var last = c.Modes.LastOrDefault(m => m is { Count: > 1 });
            if (last is null) continue;
            if (SwitchingSentence.Hint(c.Name, last.Modes.Min(m => m.Value), last.Modes.Max(m => m.Value)) is { } hint) hints.Add(hint);
        }
        return hints;
    }

    /// <summary>The dual-reporter split of species <paramref name="first"/> and <paramref name="second"/> at every grid time, from the run's moments and covariances.</summary>
    private static DualReporterSplit DualReporters(RunFolder run, string first, string second)
    {
        var c = run.Quantities.FirstOrDefault(q => q.Name == first) ?? throw new AnalysisInputException($"--dual-reporters: '{first}' is not a species of the run");
        var y = run.Quantities.FirstOrDefault(q => q.Name == second) ?? throw new AnalysisInputException($"--dual-reporters: '{second}' is not a species of the run");
        var stored = run.Covariances.FirstOrDefault(p => (p.First == first && p.Second == second) || (p.First == second && p.Second == first))
            ?? throw new AnalysisInputException($"--dual-reporters {first}:{second}: the run holds no covariance of the two (covariances.parquet); "
                + $"run simulate again with --covariance-pairs {first}:{second}");
        var points = run.Times.Select((_, k) => DualReporterNoise.At(stored.Replicates[k], c.Mean[k], c.Variance[k], y.Mean[k], y.Variance[k],
            stored.Covariance[k], stored.StandardError[k])).ToArray();
        return new DualReporterSplit(first, second, points);
    }

    private static QuantityOscillation? OscillationOf(RunOscillation? run, string quantity, ContrastThresholds thresholds)
    {
        if (run is null) return null;
        var cycle = CycleVerdict.For(run, quantity, thresholds);
        if (cycle.OnCycle) return cycle;
        return RingingVerdict.For(run, quantity, thresholds) is { } ringing ? new QuantityOscillation(false, double.NaN, ringing) : null;
    }

    /// <summary>The run's recording grid, from the --until and --every its manifest records.</summary>
    /// <exception cref="RunFolderException">The manifest does not record them.</exception>
    public static TimeGrid Grid(RunFolder run) => new(ReadArgument(run, "until"), ReadArgument(run, "every"));

    private static double ReadArgument(RunFolder run, string name) =>
        run.Manifest.Arguments.TryGetValue(name, out var text) && double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value)
            ? value
            : throw new RunFolderException($"'{run.Path}/manifest.json' does not record --{name}", run.Path);
}
