using CopyNumber.Runs;
using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Analysis.Verdicts;
using CopyNumber.Cli.Rendering;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Storage;
using CopyNumber.Stochastic;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber simulate MODEL --until T --every DT --replicates R</c>: a stochastic ensemble.</summary>
internal static class SimulateCommand
{
    public static Command Create(CliSession session)
    {
        var model = ModelArgument.CreateOptional();
        var grid = new GridOptions(required: false);
        var ensemble = new EnsembleOptionSet("Number of independent replicates (required unless --resume).", withShard: true);
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-<start time> in the current folder)." };
        var force = new Option<bool>("--force") { Description = "Replace the run in an existing, non-empty output folder: its files are removed first (a folder holding files copynumber did not write is refused)." };
        var takeOver = TakeOverOption.Create();
        var resume = new Option<string?>("--resume") { Description = "Continue the interrupted run in this folder; MODEL and every option may be left out (they take the stored values), options given must agree with the stored run; finished blocks are kept." };
        var noContrast = new Option<bool>("--no-contrast") { Description = "Skip the contrast with the rate equations at the end (run 'copynumber contrast DIR' later)." };
        var contrastOptions = new ContrastOptions();
        var partitionNoise = new Option<bool>("--partition-noise")
        {
            Description = "For a model whose cells divide with 'split binomial': also run a control ensemble of as many replicates whose cells split in halves "
                + "(independent streams; twice the cost) and write partition.parquet, the variance binomial partitioning adds with its standard error.",
        };
        var checkExact = new Option<bool?>("--check-exact") { Description = "Also solve the master equation on the grid and test the ensemble against the exact law (default: only when that solve is small; 'false' turns it off)." };
        var view = new Option<string>("--view")
        {
            Description = "For a model with a cycle: 'lineage' (default) follows one lineage, what a mother machine sees; 'population' adds, after the run, "
                + "the snapshot of a culture in balanced exponential growth, what flow cytometry sees, beside the lineage's time average (snapshot.parquet, snapshot-moments.parquet; docs/methods.md).",
            DefaultValueFactory = _ => "lineage",
        };
        view.AcceptOnlyFromAmong("lineage", "population");
        var burnIn = new Option<int>("--burn-in")
        {
            Description = $"With --view population: divisions each lineage goes through before its cycles are sampled (default {PopulationSnapshot.DefaultBurnIn}); the whole mean cycles of --until after them are sampled.",
            DefaultValueFactory = _ => PopulationSnapshot.DefaultBurnIn,
        };

        var command = new Command("simulate", "Run an ensemble of stochastic replicates and summarise it on the time grid beside the rate equations.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        ensemble.AddTo(command);
        foreach (var option in new Option[] { output, force, resume, noContrast, takeOver, checkExact, view, burnIn, partitionNoise })
            command.Options.Add(option);
        contrastOptions.AddTo(command);

        command.SetAction(parsed =>
        {
            var resumeFolder = parsed.GetValue(resume);
            // The run's claim on its folder lasts until the contrast is written (issue 10: exclusive output folders).
            using var resumeClaim = resumeFolder is not null && Directory.Exists(resumeFolder)
                ? FolderClaim.Take(resumeFolder, "simulate --resume", takeOverStale: true, parsed.GetValue(takeOver)) : null;
            var stored = resumeFolder is null ? null : StoredRun.OpenForResume(resumeFolder);
            foreach (var warning in stored?.Warnings ?? []) parsed.InvocationConfiguration.Error.WriteLine($"warning: {warning}");
            if (stored is not null && parsed.GetResult(output) is { Implicit: false })
                throw new UserInputException("--resume continues the run in its own folder; leave out --out");
            var storedSettings = stored is null ? null : StoredSettings.Read(stored);
            var timeGrid = grid.Read(parsed, stored?.Grid);
            var thresholds = contrastOptions.Thresholds(parsed);
            var loaded = parsed.GetValue(model) is { } modelPath ? ModelArgument.Load(modelPath, warnings: parsed.InvocationConfiguration.Error)
                : stored is not null ? ModelArgument.LoadStored(stored)
                : throw new UserInputException("simulate needs a MODEL file (or --resume DIR, which reads the stored model)");
            var (histogramTimes, heatmap) = contrastOptions.Figures(parsed, loaded.Network, timeGrid.Until);
            var pair = contrastOptions.PairOf(parsed, loaded.Network.Species);
            var reporters = contrastOptions.DualReportersOf(parsed, loaded.Network.Species);
            var specification = ensemble.Bind(parsed, loaded, timeGrid, storedSettings, "simulate");
            specification = specification with { PartitionNoise = parsed.GetValue(partitionNoise) || storedSettings?.PartitionNoise == true };
            if (specification.PartitionNoise && Ensembles.PartitionControl.Refusal(loaded.Network) is { } refusal)
                throw new UserInputException($"--partition-noise: {refusal}");
            if (specification.PartitionNoise && !specification.Shard.IsWhole)
                throw new UserInputException("--partition-noise runs its control over the whole run; it cannot be combined with --shard");
            // A joint histogram is counted over stored paths: with --pair and no --paths, every replicate's path is kept.
            if (pair is not null && stored is null && !ensemble.PathsGiven(parsed))
                specification = specification with { PathReplicates = specification.Replicates };
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;
            stored?.EnsureSameRun(specification.Settings(EnsembleOptions.DefaultBlockSize));
            // The population view is checked before anything runs, so a run that cannot have it writes nothing.
            var population = parsed.GetValue(view) == "population";
            if (!population && parsed.GetResult(burnIn) is { Implicit: false })
                throw new UserInputException("--burn-in applies to --view population only");
            if (population && SnapshotRun.Problem(specification, parsed.GetValue(burnIn)) is { } snapshotProblem)
                throw new UserInputException($"--view population: {snapshotProblem}");
            if (stored is not null && !stored.NeedsResuming)
            {
                error.WriteLine($"nothing to resume: the run in {Paths.Shown(stored.Folder)} has all its {stored.Manifest.ReplicatesFinished} replicates");
                return ExitCodes.Done;
            }

            // Planning (the rate equations) computes nothing a signal could lose, so a signal ends the process at
            // once; from the ensemble to the last table a signal stops the run and what is finished is written.
            var plan = RunPlan.Make(specification, storedSettings);
            SimulationOutcome outcome;
            string folder;
            // The run's claim on its folder lasts until the contrast is written (exclusive output folders).
            using var freshClaim = stored is null ? OutputFolder.Claim(parsed.GetValue(output), loaded.Network.Name, DateTimeOffset.Now, parsed.GetValue(force), parsed.GetValue(takeOver)) : null;
            if ((freshClaim ?? resumeClaim)?.Replaced is { } replaced)
                error.WriteLine($"warning: took over the claim on {Paths.Shown(stored?.Folder ?? freshClaim!.Folder)} left by {replaced.Describe()}");
            using (session.Honour())
            {
                folder = stored?.Folder ?? freshClaim!.Folder;
                var request = new SimulationRequest(plan, folder) { Resume = stored is not null };
                var shardText = specification.Shard.IsWhole ? "" : $", shard {specification.Shard}";
                var toRun = ShardReplicates(plan.Ensemble) - (stored?.Manifest.ReplicatesFinished ?? 0);
                var method = MethodChoice.NameOf(plan.Method);
                error.WriteLine(stored is null
                    ? $"simulating {loaded.Network.Name}: {specification.Replicates} replicates{shardText}, method {method} ({plan.MethodReason}), seed {specification.Seed}, {specification.Threads} threads -> {Paths.Shown(folder)}"
                      + (specification.PartitionNoise ? $"; then as many again whose cells split in halves (--partition-noise)" : "")
                    : $"resuming {loaded.Network.Name} in {Paths.Shown(folder)}: {stored.Manifest.ReplicatesFinished} replicates kept, {toRun} to run{shardText}, method {method}, seed {specification.Seed}, {specification.Threads} threads");
                var monitor = new EnsembleMonitor();
                using (new ProgressDisplay(monitor, toRun, error, terminal: !Console.IsErrorRedirected && error == Console.Error))
                    outcome = SimulationRun.Execute(request, monitor, session.Interrupt);
            }
            var code = Report(outcome, folder, writer, error);
            // The exact check (issue 11): the master equation on the run's grid against the finished ensemble.
            if (code == ExitCodes.Done && outcome.StopReason == StopReason.Finished && specification.Shard.IsWhole && parsed.GetValue(checkExact) is not false)
                writer.Write(ExactCheck.Run(folder, loaded.Network, timeGrid, parsed.GetValue(checkExact) is true, specification.Threads, session.Interrupt).Describe());
            // The population snapshot (issue 13): its own lineages, after the finished run, before the report that shows it.
            if (population && code == ExitCodes.Done && outcome.StopReason == StopReason.Finished)
            {
                error.WriteLine("population snapshot: simulating the lineages of a growing culture (the run's tables are complete; an interruption here loses nothing)");
                var snapshot = SnapshotRun.Run(folder, specification, parsed.GetValue(burnIn), session.Interrupt);
                writer.Write(SnapshotRun.Describe(snapshot));
                foreach (var warning in SnapshotRun.Warnings(snapshot)) error.WriteLine($"warning: {warning}");
            }
            // A shard is only part of a run: its contrast waits for the merged folder.
            if (code == ExitCodes.Done && outcome.StopReason == StopReason.Finished && specification.Shard.IsWhole && !parsed.GetValue(noContrast))
            {
                error.WriteLine("contrasting with the rate equations (the tables are complete; an interruption here loses nothing)");
                var (contrast, files) = Reports.ContrastOutputs.Write(folder, thresholds, histogramTimes, heatmap, pair: pair, dualReporters: reporters);
                writer.Write("\n" + ContrastOptions.RenderVerdicts(contrast));
                writer.WriteLine($"wrote {Paths.Shown(files)}");
            }
            return code;
        });
        return command;
    }

    private static long ShardReplicates(EnsembleOptions options)
    {
        var (first, end) = options.Shard.Blocks(options.TotalBlocks);
        return BlockRanges.ReplicatesIn(options.Replicates, options.BlockSize, first, end);
    }

    /// <summary>The closing lines and the exit code: 0 done or stopped at --max-wall, 1 a replicate failed, 130 interrupted.</summary>
    private static int Report(SimulationOutcome outcome, string folder, TextWriter writer, TextWriter error)
    {
        var result = outcome.Ensemble;
        if (outcome.DeterministicFailure is not null)
            error.WriteLine($"warning: the rate equations could not be solved ({outcome.DeterministicFailure}); the 'deterministic' column is empty");
        if (outcome.Validation is { } validation)
        {
            if (validation.Action == ValidationAction.FellBack)
                error.WriteLine("warning: tau-leaping failed its validation sample; auto redid the run with the exact direct method (manifest: validation, method_reason)");
            else if (validation.Verdict == ValidationVerdict.OutsideTolerance)
                error.WriteLine("warning: the validation sample shows a tau-leaping error beyond the tolerance (1% mean, 2% standard deviation); see below and manifest.json 'validation'");
            writer.WriteLine(validation.Describe());
        }
        if (outcome.ValidationFailure is not null)
            error.WriteLine($"warning: the validation sample could not be run ({outcome.ValidationFailure}); the leaping error is not measured");
        if (outcome.PartitionFailure is not null)
            error.WriteLine($"warning: {outcome.PartitionFailure}; partition.parquet was not written (manifest: {ManifestFields.PartitionFailure})");
        if (outcome.PathsFailure is not null)
            error.WriteLine($"error: {outcome.PathsFailure}; the summary tables and manifest.json were written without them (manifest: {ManifestFields.PathsFailure})");
        writer.Write(RenderFinal(outcome));
        writer.WriteLine($"{result.ReplicatesFinished} replicates, {result.EventsFired} events in {result.WallTime.TotalSeconds:0.00} s ({Numbers.Format(outcome.Manifest.EventsPerSecond ?? 0, 3)} events/s); wrote {Paths.Shown(folder)}");
        if (result.ModeSwitching.Count > 0)
        {
            var manifest = outcome.Manifest;
            var unit = manifest.Extra.TryGetValue(ManifestFields.TimeUnit, out var declared) ? declared?.ToString() : null;
            var source = manifest.Arguments.GetValueOrDefault(ManifestFields.SwitchingSourceArgument);
            foreach (var s in result.ModeSwitching)
                writer.WriteLine($"switching of {SwitchingSentence.Describe(s, source, unit)} ({RunFiles.Switching})");
        }
        if (result.ReplicatesStoppedEarly > 0)
            error.WriteLine($"warning: {result.ReplicatesStoppedEarly} replicates reached --max-events before the final time; they count at the times they reached and are missing from later ones (manifest: replicates_stopped_early)");
        var covered = $"summaries cover the {result.ReplicatesFinished} replicates finished and are marked partial";
        var partial = $"{covered}; continue with --resume {Paths.Shown(folder)}";
        switch (outcome.StopReason)
        {
            case StopReason.Failed:
                // A replicate's random stream is fixed by the seed, so resuming would fail at the same replicate
                // (EnsembleFailureException): the model has to change, and --resume is not offered.
                error.WriteLine($"error: {outcome.Failure}");
                error.WriteLine($"the run stopped; {covered}; the failure repeats with the same seed, so correct the model and start a new run");
                return ExitCodes.RunFailed;
            case StopReason.WallLimit:
                error.WriteLine($"warning: stopped at --max-wall; {partial}");
                return ExitCodes.Done;
            case StopReason.Interrupted:
                error.WriteLine($"interrupted: {partial}");
                return ExitCodes.Interrupted;
            default:
                return outcome.PathsFailure is null ? ExitCodes.Done : ExitCodes.RunFailed;
        }
    }

    /// <summary>Per species and readout at the final time: ensemble mean ± standard error, rate-equation value, Fano factor.</summary>
    internal static string RenderFinal(SimulationOutcome outcome)
    {
        var result = outcome.Ensemble;
        var last = result.Grid.Count - 1;
        var table = new TextTable("quantity", "mean", "± s.e.", "rate eq.", "fano", "P(0)");
        int countIndex = 0, realIndex = 0;
        foreach (var q in result.Quantities)
        {
            var deterministic = outcome.Deterministic is { } d ? d.Values[last, d.Columns.ToList().IndexOf(q.Name)] : double.NaN;
            if (q.IsCount && result.Histogram(last, countIndex).IsEmpty)
            {
                countIndex++;
                table.Add(q.Name, "-", "-", Numbers.Format(deterministic, 5), "-", "-");
            }
            else if (q.IsCount)
            {
                var s = DistributionSummary.From(result.Histogram(last, countIndex++));
                table.Add(q.Name, Numbers.Format(s.Mean, 5), Numbers.Format(s.StandardError, 2), Numbers.Format(deterministic, 5), Numbers.Format(s.FanoFactor, 3), Numbers.Format(s.ZeroFraction, 3));
            }
            else
            {
                var m = result.Moments(last, realIndex++);
                table.Add(q.Name, Numbers.Format(m.Mean, 5), Numbers.Format(Math.Sqrt(m.Variance / m.Count), 2), Numbers.Format(deterministic, 5), Numbers.Format(NoiseRatios.Fano(m.Mean, m.Variance, m.Minimum), 3), "-");
            }
        }
        // The heading says the time the rows are for, in the model's declared unit (manifest: time_unit).
        var unit = outcome.Manifest.Extra.TryGetValue(ManifestFields.TimeUnit, out var declared) && declared?.ToString() is { Length: > 0 } text ? " " + text : "";
        return $"at t = {Numbers.Format(result.Grid[last], 6)}{unit}:\n{table}{RenderNoise(result, last)}{RenderPartition(outcome.Partition, last)}";
    }

    /// <summary>
    /// With <c>--partition-noise</c>, at the final time: each varying count's variance, the control's (cells split in halves) and what
    /// binomial partitioning adds, ± standard errors, and its share (docs/methods.md, "Partitioning noise").
    /// </summary>
    private static string RenderPartition(PartitionControl? partition, int last)
    {
        if (partition is null) return "";
        var table = new TextTable("quantity", "variance", "halves", "partitioning adds", "± s.e.", "share");
        for (var q = 0; q < partition.Quantities.Count; q++)
        {
            var e = partition.At(last, q);
            if (!(e.Model.Variance > 0)) continue; // a count that never varies (a gene copy number) has nothing to split
            table.Add(partition.Quantities[q].Name, Numbers.Format(e.Model.Variance, 4), Numbers.Format(e.Control.Variance, 4),
                Numbers.Format(e.Added, 4), Numbers.Format(e.AddedStandardError, 2), $"{Numbers.Format(100 * e.Share, 3)} ± {Numbers.Format(100 * e.ShareStandardError, 2)}%");
        }
        return $"\npartitioning noise (binomial split against a control whose cells split in halves; partition.parquet):\n{table}";
    }

    /// <summary>
    /// The law-of-total-variance split at the final time when some parameter varies: each part's squared CV
    /// (variance over the squared mean) ± its standard error (docs/methods.md, "Extrinsic variability").
    /// </summary>
    private static string RenderNoise(EnsembleResult result, int last)
    {
        if (result.Noise is not { } noise) return "";
        var table = new TextTable("quantity", "intrinsic CV²", "± s.e.", "extrinsic CV²", "± s.e.");
        for (var q = 0; q < noise.Quantities.Count; q++)
        {
            var mean = NoiseDecomposition.MeanOf(result, last, q);
            var square = mean * mean;
            var (intrinsic, extrinsic) = (noise.Intrinsic(last, q), noise.Extrinsic(last, q));
            table.Add(noise.Quantities[q].Name, Numbers.Format(intrinsic.Mean / square, 4), Numbers.Format(intrinsic.StandardError / square, 2),
                Numbers.Format(extrinsic.Mean / square, 4), Numbers.Format(extrinsic.StandardError / square, 2));
        }
        return $"\nnoise by source ({noise.ReplicatesPerDraw} replicates per draw of the varying parameters; noise.parquet):\n{table}";
    }
}
