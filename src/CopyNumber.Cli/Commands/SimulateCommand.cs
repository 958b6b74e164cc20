using CopyNumber.Runs;
using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Cli.Rendering;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Storage;
using CopyNumber.Stochastic;

namespace CopyNumber.Cli.Commands;

/// <summary><c>copynumber simulate MODEL --until T --every DT --replicates R</c>: a stochastic ensemble.</summary>
internal static class SimulateCommand
{
    private static readonly string[] MethodNames = MethodArgument.Names;

    /// <summary>Most worker threads accepted; more only add memory and contention.</summary>
    public static readonly int MaxThreads = Math.Max(1024, 4 * Environment.ProcessorCount);

    public static Command Create(CliSession session)
    {
        var model = ModelArgument.CreateOptional();
        var grid = new GridOptions(required: false);
        var replicates = new Option<long?>("--replicates") { Description = "Number of independent replicates (required unless --resume)." };
        var method = new Option<string>("--method") { Description = "auto (chosen from the network's size and copy numbers; the reason is printed), direct (Gillespie's direct method), next-reaction (Gibson-Bruck), tau-leap (adaptive explicit tau-leaping) or composition-rejection (for large networks).", DefaultValueFactory = _ => "auto" };
        method.AcceptOnlyFromAmong(MethodNames);
        var epsilon = new Option<double>("--epsilon") { Description = "Tau-leaping error control: the largest relative change of any propensity in one leap, in (0, 1).", DefaultValueFactory = _ => 0.03 };
        var seed = new Option<ulong?>("--seed") { Description = "Run seed; without it one is drawn and recorded in manifest.json." };
        var threads = new Option<int>("--threads") { Description = "Worker threads (default: all cores).", DefaultValueFactory = _ => Environment.ProcessorCount };
        var output = new Option<string?>("--out") { Description = "Output folder (default: <model>-<start time> in the current folder)." };
        var paths = new Option<string?>("--paths") { Description = "Also write paths.parquet for the first N replicates, or 'all'." };
        var force = new Option<bool>("--force") { Description = "Write into an existing, non-empty output folder." };
        var maxEvents = new Option<long?>("--max-events") { Description = "Stop a replicate after this many events; such replicates are counted and reported." };
        var maxWall = new Option<double?>("--max-wall") { Description = "Stop the run after this many seconds of wall-clock time, writing the blocks finished (partial; exit code 0 with a warning)." };
        var shard = new Option<string?>("--shard") { Description = "Run part i of n of the replicates (e.g. 2/8), for a job array; combine the parts with 'copynumber merge'." };
        var resume = new Option<string?>("--resume") { Description = "Continue the interrupted run in this folder; MODEL and every option may be left out (they take the stored values), options given must agree with the stored run; finished blocks are kept." };
        var validationReplicates = new Option<long?>("--validation-replicates") { Description = "Exact replicates in the validation sample of a tau-leaping run (default: as many as about 10% of the run's time allows, at most 1024; see docs/methods.md)." };
        var noContrast = new Option<bool>("--no-contrast") { Description = "Skip the contrast with the rate equations at the end (run 'copynumber contrast DIR' later)." };
        var contrastOptions = new ContrastOptions();

        var command = new Command("simulate", "Run an ensemble of stochastic replicates and summarise it on the time grid beside the rate equations.");
        command.Arguments.Add(model);
        grid.AddTo(command);
        foreach (var option in new Option[] { replicates, method, epsilon, seed, threads, output, paths, force, maxEvents, maxWall, shard, resume, validationReplicates, noContrast })
            command.Options.Add(option);
        contrastOptions.AddTo(command);

        command.SetAction(parsed =>
        {
            using var honouring = session.Honour();
            var resumeFolder = parsed.GetValue(resume);
            var stored = resumeFolder is null ? null : StoredRun.OpenForResume(resumeFolder);
            foreach (var warning in stored?.Warnings ?? []) parsed.InvocationConfiguration.Error.WriteLine($"warning: {warning}");
            if (stored is not null && parsed.GetResult(output) is { Implicit: false })
                throw new UserInputException("--resume continues the run in its own folder; leave out --out");
            // With --resume, an option left out takes the value the stored run recorded.
            T Pick<T>(Option<T> option, string key, Func<string, T> fromText)
            {
                if (stored is null || parsed.GetResult(option) is { Implicit: false } || !stored.Manifest.Arguments.TryGetValue(key, out var text))
                    return parsed.GetValue(option)!;
                try
                {
                    return fromText(text);
                }
                catch (Exception e) when (e is FormatException or OverflowException)
                {
                    throw new RunFolderException($"The manifest of '{stored.Folder}' records {option.Name} '{text}', which is not a valid value.", stored.Folder, e);
                }
            }

            var timeGrid = grid.Read(parsed, stored?.Grid);
            var thresholds = contrastOptions.Thresholds(parsed);
            var replicateCount = Pick(replicates, "replicates", t => (long?)long.Parse(t, CultureInfo.InvariantCulture))
                ?? throw new UserInputException("--replicates is required (or --resume DIR, which takes it from the stored run)");
            if (replicateCount < 1) throw new UserInputException($"--replicates must be at least 1 (got {replicateCount})");
            var eps = Pick(epsilon, "epsilon", ParseDouble);
            if (!(eps > 0 && eps < 1)) throw new UserInputException($"--epsilon must lie in (0, 1) (got {eps})");
            var threadCount = parsed.GetValue(threads);
            if (threadCount < 1 || threadCount > MaxThreads) throw new UserInputException($"--threads must be between 1 and {MaxThreads} (got {threadCount})");
            var limit = Pick(maxEvents, "max_events", t => t == "none" ? null : long.Parse(t, CultureInfo.InvariantCulture)) ?? long.MaxValue;
            if (limit < 1) throw new UserInputException($"--max-events must be at least 1 (got {limit})");
            var wall = parsed.GetValue(maxWall);
            if (wall is { } w && !(w > 0 && w <= TimeSpan.MaxValue.TotalSeconds / 2)) throw new UserInputException($"--max-wall must be a positive number of seconds (got {w})");
            var pathCount = ReadPaths(Pick(paths, "paths", t => t == "0" ? null : t), replicateCount);
            var runShard = ReadShard(Pick(shard, ManifestFields.ShardArgument, t => t), replicateCount);
            var chosen = Pick(method, "method", t => MethodNames.Contains(t) ? t : throw new FormatException($"unknown method '{t}'"));
            var sampleSize = Pick(validationReplicates, "validation_replicates", t => (long?)long.Parse(t, CultureInfo.InvariantCulture));
            if (sampleSize is { } fixedSample && fixedSample < 2) throw new UserInputException($"--validation-replicates must be at least 2 (got {fixedSample})");
            var runSeed = Pick(seed, "seed", t => (ulong?)ulong.Parse(t, CultureInfo.InvariantCulture)) ?? BitConverter.ToUInt64(RandomNumberGenerator.GetBytes(8));

            var loaded = parsed.GetValue(model) is { } modelPath ? ModelArgument.Load(modelPath)
                : stored is not null ? ModelArgument.LoadStored(stored)
                : throw new UserInputException("simulate needs a MODEL file (or --resume DIR, which reads the stored model)");
            var (histogramTimes, heatmap) = contrastOptions.Figures(parsed, loaded.Network, timeGrid.Until);
            var (simulationMethod, methodReason) = MethodArgument.Resolve(chosen, loaded.Network, timeGrid);
            // A resumed run goes on with the method its stored blocks were made with (auto may have fallen back).
            if (stored is not null && Enum.TryParse<SimulationMethod>(stored.Manifest.Method, out var storedMethod) && storedMethod != simulationMethod)
                (simulationMethod, methodReason) = (storedMethod, stored.Manifest.ExtraText(ManifestFields.MethodReason) ?? methodReason);
            var options = new EnsembleOptions
            {
                Grid = timeGrid,
                Replicates = replicateCount,
                Seed = runSeed,
                Method = simulationMethod,
                Simulator = new SimulatorOptions(Epsilon: eps, MaxEvents: limit),
                Threads = threadCount,
                PathReplicates = pathCount,
                Shard = runShard,
            };
            var memory = EnsembleMemory.For(loaded.Network, options);
            if (memory.Problem(GC.GetGCMemoryInfo().TotalAvailableMemoryBytes) is { } tooLarge) throw new UserInputException(tooLarge);
            var arguments = new Dictionary<string, string>
            {
                ["command"] = "simulate",
                ["until"] = Invariant(timeGrid.Until),
                ["every"] = Invariant(timeGrid.Every),
                ["replicates"] = replicateCount.ToString(CultureInfo.InvariantCulture),
                ["method"] = chosen,
                ["epsilon"] = Invariant(eps),
                ["seed"] = runSeed.ToString(CultureInfo.InvariantCulture),
                ["paths"] = pathCount.ToString(CultureInfo.InvariantCulture),
                ["max_events"] = limit == long.MaxValue ? "none" : limit.ToString(CultureInfo.InvariantCulture),
                [ManifestFields.ShardArgument] = runShard.ToString(),
            };
            // Recorded only when given, so folders written before the option existed can still be resumed.
            if (sampleSize is { } size) arguments["validation_replicates"] = size.ToString(CultureInfo.InvariantCulture);
            var error = parsed.InvocationConfiguration.Error;
            var writer = parsed.InvocationConfiguration.Output;
            stored?.EnsureSameRun(new RunSettings(Provenance.Sha256Hex(loaded.Text), arguments, options.BlockSize));
            if (stored is not null && !stored.NeedsResuming)
            {
                error.WriteLine($"nothing to resume: the run in {stored.Folder} has all its {stored.Manifest.ReplicatesFinished} replicates");
                return ExitCodes.Done;
            }
            var folder = stored?.Folder ?? OutputFolder.CreateFresh(parsed.GetValue(output), loaded.Network.Name, DateTimeOffset.Now, parsed.GetValue(force));
            var request = new SimulationRequest(loaded, options, folder, new SolverOptions(), arguments, methodReason)
            {
                WallLimit = wall is { } seconds ? TimeSpan.FromSeconds(seconds) : null,
                Resume = stored is not null,
                MethodChosenAutomatically = chosen == "auto",
                ValidationReplicates = sampleSize,
            };

            var shardText = runShard.IsWhole ? "" : $", shard {runShard}";
            var toRun = ShardReplicates(options) - (stored?.Manifest.ReplicatesFinished ?? 0);
            error.WriteLine(stored is null
                ? $"simulating {loaded.Network.Name}: {replicateCount} replicates{shardText}, method {MethodArgument.NameOf(simulationMethod)} ({methodReason}), seed {runSeed}, {threadCount} threads -> {Paths.Shown(folder)}"
                : $"resuming {loaded.Network.Name} in {Paths.Shown(folder)}: {stored.Manifest.ReplicatesFinished} replicates kept, {toRun} to run{shardText}, method {MethodArgument.NameOf(simulationMethod)}, seed {runSeed}, {threadCount} threads");
            var monitor = new EnsembleMonitor();
            SimulationOutcome outcome;
            using (new ProgressDisplay(monitor, toRun, error, terminal: !Console.IsErrorRedirected && error == Console.Error))
                outcome = SimulationRun.Execute(request, monitor, session.Interrupt);
            var code = Report(outcome, folder, writer, error);
            // A shard is only part of a run: its contrast waits for the merged folder.
            if (code == ExitCodes.Done && outcome.StopReason == StopReason.Finished && runShard.IsWhole && !parsed.GetValue(noContrast))
            {
                var (contrast, files) = Reports.ContrastOutputs.Write(folder, thresholds, histogramTimes, heatmap);
                writer.Write("\n" + ContrastOptions.RenderVerdicts(contrast));
                writer.WriteLine($"wrote {Paths.Shown(files)}");
            }
            return code;
        });
        return command;
    }

    private static string NameOf(SimulationMethod method) => method switch
    {
        SimulationMethod.NextReaction => "next-reaction",
        SimulationMethod.TauLeap => "tau-leap",
        SimulationMethod.CompositionRejection => "composition-rejection",
        _ => "direct",
    };

    private static long ReadPaths(string? text, long replicates)
    {
        if (text is null) return 0;
        if (text == "all") return replicates;
        if (!long.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var n) || n < 1)
            throw new UserInputException($"--paths takes a positive number of replicates or 'all' (got '{text}')");
        return Math.Min(n, replicates);
    }

    private static Shard ReadShard(string? text, long replicates)
    {
        if (text is null) return Shard.Whole;
        if (!Shard.TryParse(text, out var shard, out var problem)) throw new UserInputException($"--shard: {problem}");
        var blocks = BlockRanges.BlocksFor(replicates, EnsembleOptions.DefaultBlockSize);
        if (shard.Count > blocks)
            throw new UserInputException($"--shard {shard}: {replicates} replicates make {blocks} block{(blocks == 1 ? "" : "s")} of {EnsembleOptions.DefaultBlockSize}, so at most {blocks} shard{(blocks == 1 ? "" : "s")}; use fewer shards or more replicates");
        return shard;
    }

    private static long ShardReplicates(EnsembleOptions options)
    {
        var (first, end) = options.Shard.Blocks(options.TotalBlocks);
        return BlockRanges.ReplicatesIn(options.Replicates, options.BlockSize, first, end);
    }

    private static double ParseDouble(string text) => double.Parse(text, NumberStyles.Float, CultureInfo.InvariantCulture);

    private static string Invariant(double value) => value.ToString("R", CultureInfo.InvariantCulture);

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
        writer.Write(RenderFinal(outcome));
        writer.WriteLine($"{result.ReplicatesFinished} replicates, {result.EventsFired} events in {result.WallTime.TotalSeconds:0.00} s ({Numbers.Format(outcome.Manifest.EventsPerSecond ?? 0, 3)} events/s); wrote {Paths.Shown(folder)}");
        if (result.ReplicatesStoppedEarly > 0)
            error.WriteLine($"warning: {result.ReplicatesStoppedEarly} replicates reached --max-events before the final time; they count at the times they reached and are missing from later ones (manifest: replicates_stopped_early)");
        var partial = $"summaries cover the {result.ReplicatesFinished} replicates finished and are marked partial; continue with --resume {Paths.Shown(folder)}";
        switch (outcome.StopReason)
        {
            case StopReason.Failed:
                error.WriteLine($"error: {outcome.Failure}");
                error.WriteLine($"the run stopped; {partial}");
                return ExitCodes.RunFailed;
            case StopReason.WallLimit:
                error.WriteLine($"warning: stopped at --max-wall; {partial}");
                return ExitCodes.Done;
            case StopReason.Interrupted:
                error.WriteLine($"interrupted: {partial}");
                return ExitCodes.Interrupted;
            default:
                return ExitCodes.Done;
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
        return $"at t = {Numbers.Format(result.Grid[last], 6)}:\n{table}";
    }
}
