using CopyNumber.Storage;
using System.Globalization;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Runs;

/// <summary>One planned run and where it goes.</summary>
/// <param name="Plan">The run, planned: specification, method, rate equations.</param>
/// <param name="Folder">A claimed, empty output folder; or, with <see cref="Resume"/>, the folder of the run to continue.</param>
public sealed record SimulationRequest(RunPlan Plan, string Folder)
{
    /// <summary>The loaded model.</summary>
    public LoadedModel Model => Plan.Specification.Model;

    /// <summary>The ensemble's options.</summary>
    public EnsembleOptions Ensemble => Plan.Ensemble;

    /// <summary>The run's settings as the manifest records them.</summary>
    public IReadOnlyDictionary<string, string> Arguments => Plan.Specification.ToArguments();

    /// <summary>Why the method was chosen, for the manifest and console.</summary>
    public string MethodReason => Plan.MethodReason;

    /// <summary>Stop the ensemble once this much wall-clock time has passed since the start (like an interruption); null for no limit.</summary>
    public TimeSpan? WallLimit => Plan.Specification.WallLimit;

    /// <summary>
    /// <see cref="Folder"/> holds an interrupted run with the same model and settings: its finished
    /// blocks are kept, the others are run, and the folder's files are replaced by the summaries of both.
    /// </summary>
    public bool Resume { get; init; }

    /// <summary>
    /// The method was chosen by "auto": a tau-leaping run whose validation sample establishes an error
    /// beyond the tolerances is then redone with the exact direct method (a whole run only; a shard
    /// reports it). Otherwise the method was asked for and is kept, and a disagreement is reported.
    /// </summary>
    public bool MethodChosenAutomatically => Plan.Specification.MethodRequested == "auto";

    /// <summary>A fixed size for the validation sample (no time rule); null for the sizing rule of <see cref="ValidationSample"/>.</summary>
    public long? ValidationReplicates => Plan.Specification.ValidationReplicates;

    /// <summary>Opens the temporary files the paths are built in; tests put a disk that fills up here. Null for the real files.</summary>
    internal Func<string, Stream>? OpenPathsFile { get; init; }

    /// <summary>
    /// The shortest time between two checkpoints of the running ensemble (docs/conventions.md,
    /// "Checkpoints"); a checkpoint also waits 20 times as long as the last one took to write.
    /// </summary>
    public TimeSpan CheckpointInterval { get; init; } = CheckpointStore.DefaultMinimumInterval;
}

/// <summary>What a run produced.</summary>
/// <param name="Ensemble">The ensemble summaries (with <see cref="SimulationRequest.Resume"/>, those of the earlier run and this one together).</param>
/// <param name="Deterministic">The rate-equation solution, or null when its solver failed.</param>
/// <param name="DeterministicFailure">Why the rate equations could not be solved, if they could not.</param>
/// <param name="Manifest">The manifest as written.</param>
/// <param name="Files">The files written, in the order written.</param>
public sealed record SimulationOutcome(
    EnsembleResult Ensemble,
    DeterministicSolution? Deterministic,
    string? DeterministicFailure,
    RunManifest Manifest,
    IReadOnlyList<string> Files)
{
    /// <summary>Why the run ended.</summary>
    public StopReason StopReason { get; init; }

    /// <summary>When <see cref="StopReason"/> is <see cref="StopReason.Failed"/>: which replicate failed and why.</summary>
    public string? Failure { get; init; }

    /// <summary>Replicates taken over from the earlier run when resuming; 0 otherwise.</summary>
    public long ReplicatesResumed { get; init; }

    /// <summary>The validation sample of a tau-leaping run and its verdict; null for an exact method, a shard other than the first, or an unfinished run.</summary>
    public ValidationResult? Validation { get; init; }

    /// <summary>Why the validation sample could not be run, when it could not (e.g. an exact replicate failed).</summary>
    public string? ValidationFailure { get; init; }

    /// <summary>The method the summaries come from: the request's, or the direct method after a fallback.</summary>
    public SimulationMethod Method { get; init; }

    /// <summary>The control of the partitioning noise (<c>--partition-noise</c>), when it was asked for and finished; null otherwise.</summary>
    public PartitionControl? Partition { get; init; }

    /// <summary>Why <see cref="Partition"/> is missing although it was asked for (a control replicate failed, or an interruption); null otherwise.</summary>
    public string? PartitionFailure { get; init; }

    /// <summary>Why paths.parquet could not be written (e.g. the disk filled); the paths were dropped, the summaries written, and the manifest says so. Null when the paths were written or not asked for.</summary>
    public string? PathsFailure { get; init; }
}

/// <summary>
/// Runs the ensemble and the rate equations of one model and writes the run's folder: the rate-equation
/// solution, moments, distributions, the real readouts' state, optional paths and manifest.json. A run
/// that is interrupted, reaches its wall-clock limit or loses a replicate to a failure still writes
/// complete files for the blocks finished, marked partial; such a folder can be resumed.
/// </summary>
public static class SimulationRun
{
    /// <summary>Runs and writes; see the type's remarks.</summary>
    /// <exception cref="RunFolderException">Resuming, and the folder cannot be resumed or its settings differ from the request's.</exception>
    /// <exception cref="OutputException">A file could not be written.</exception>
    public static SimulationOutcome Execute(SimulationRequest request, EnsembleMonitor? monitor = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        // The folder is held for the whole run (nested in the caller's claim when it holds it already).
        using var claim = FolderClaim.Take(request.Folder, "simulate", takeOverStale: request.Resume, takeOver: false);
        var started = DateTimeOffset.UtcNow;
        var clock = System.Diagnostics.Stopwatch.StartNew();
        var model = request.Model;
        var options = request.Ensemble;
        var arguments = new Dictionary<string, string>(request.Arguments, StringComparer.Ordinal);
        arguments.TryAdd(ManifestFields.ShardArgument, options.Shard.ToString());
        arguments.TryAdd("seed", options.Seed.ToString(CultureInfo.InvariantCulture));
        var identity = new RunIdentity(model.Path, model.Text, arguments, started, model.Network.Units.Time);
        var files = new List<string>();

        EnsembleResult? prior = null;
        StoredRun? stored = null;
        if (request.Resume)
        {
            // Checkpoints (issue 10): the newest complete checkpoint if the run was killed, else the folder's tables.
            stored = StoredRun.OpenForResume(request.Folder);
            stored.EnsureSameRun(new RunSettings(Provenance.Sha256Hex(model.Text), arguments, options.BlockSize));
            prior = stored.Load(model.Network);
            options = options with { SkipBlocks = options.SkipBlocks.Union(prior.FinishedBlocks).ToHashSet() };
            // The stored run has started the clock; this run's time adds to it.
            identity = identity with { Started = stored.Manifest.StartedUtc };
        }

        // Solved once, by the plan: the method choice, this table and the console share the solution.
        var deterministic = request.Plan.Deterministic;
        var deterministicFailure = request.Plan.DeterministicFailure;
        if (deterministic is not null)
        {
            var path = Path.Combine(request.Folder, RunFiles.Deterministic);
            DeterministicTable.Write(path, deterministic, identity.Provenance(null));
            files.Add(path);
        }

        using var wallLimit = new CancellationTokenSource();
        if (request.WallLimit is { } limit) wallLimit.CancelAfter(ClampedDelay(limit - clock.Elapsed));
        using var stop = CancellationTokenSource.CreateLinkedTokenSource(cancel, wallLimit.Token);
        // Checkpoints (issue 10): the finished blocks and the paths reach the disk as the run goes.
        var priorPaths = stored is { FromCheckpoint: false } && options.PathReplicates > 0 && File.Exists(Path.Combine(request.Folder, RunFiles.Paths))
            ? Path.Combine(request.Folder, RunFiles.Paths) : null;
        using var store = new CheckpointStore(request.Folder, identity, prior, stored?.PathParts ?? new Dictionary<string, string>(), priorPaths,
            state => SummaryFiles.Manifest(identity, state, options.Method.ToString(), options.Threads, StopReason.Interrupted, null, request.MethodReason, deterministicFailure),
            model.Network, options.Grid, request.CheckpointInterval, request.OpenPathsFile);
        var pathsStore = store;
        var (combined, failure) = RunEnsemble(request, options, prior, store, monitor, stop.Token);

        // The validation sample (docs/methods.md): a finished tau-leaping run, and of a sharded run the first
        // shard only, compares itself with exact replicates; a stored sample is reused on resuming.
        ValidationResult? validation = null;
        string? validationFailure = null;
        var method = options.Method;
        var methodReason = request.MethodReason;
        if (method == SimulationMethod.TauLeap && failure is null && !combined.Interrupted && options.Shard.Number == 1)
        {
            try
            {
                var sample = (request.Resume ? ValidationTable.Read(request.Folder, combined) : null)
                    ?? ValidationSample.Run(model.Network, options, combined.WallTime, request.ValidationReplicates, stop.Token);
                validation = ValidationResult.Of(combined, sample, combined.WallTime);
            }
            catch (EnsembleFailureException e)
            {
                validationFailure = e.Message;
            }
            if (validation is not null)
            {
                validation = validation with { Action = validation.Decide(request.MethodChosenAutomatically, options.Shard.IsWhole) };
                if (validation.Action == ValidationAction.FellBack)
                {
                    // auto falls back to the exact method: the whole run again, every replicate with its own stream.
                    var exact = options with { Method = SimulationMethod.Direct, SkipBlocks = new HashSet<long>() };
                    monitor?.Restart();
                    // No checkpoints while redoing: a kill resumes from the tau-leaping run's final checkpoint and decides again.
                    using var exactStore = new CheckpointStore(request.Folder, identity, null, new Dictionary<string, string>(), null, _ => new RunManifest(), model.Network, options.Grid, null, request.OpenPathsFile);
                    pathsStore = exactStore;
                    (combined, failure) = RunEnsemble(request, exact, prior: null, exactStore, monitor, stop.Token);
                    method = SimulationMethod.Direct;
                    options = exact;
                    methodReason += "; the validation sample found a tau-leaping error beyond the tolerance, so the run was redone with the exact direct method";
                }
            }
        }
        var pathsFile = Path.Combine(request.Folder, RunFiles.Paths);
        // Paths that could not be written (a full disk) are dropped and their space given back: the summaries still get written.
        var pathsFailure = options.PathReplicates > 0 ? pathsStore.WritePaths(pathsFile) : null;
        if (options.PathReplicates > 0 && pathsFailure is null) files.Add(pathsFile);
        files.AddRange(SummaryFiles.WriteTables(request.Folder, combined, deterministic, identity, validation is { Action: not ValidationAction.FellBack } ? validation : null));
        var (partition, partitionFailure) = request.Plan.Specification.PartitionNoise && failure is null && combined.IsComplete && !combined.Interrupted
            ? RunPartitionControl(request, options, combined, identity, files, monitor, stop.Token)
            : (null, null);

        var reason = failure is not null ? StopReason.Failed
            : !combined.Interrupted ? StopReason.Finished
            : wallLimit.IsCancellationRequested && !cancel.IsCancellationRequested ? StopReason.WallLimit
            : StopReason.Interrupted;
        var manifest = SummaryFiles.Manifest(identity, combined, method.ToString(), options.Threads, reason, failure, methodReason, deterministicFailure, validation);
        if (pathsFailure is not null) manifest.Extra[ManifestFields.PathsFailure] = pathsFailure;
        if (partitionFailure is not null) manifest.Extra[ManifestFields.PartitionFailure] = partitionFailure;
        SummaryFiles.RecordChecksums(manifest, request.Folder, files);
        var manifestPath = Path.Combine(request.Folder, RunFiles.Manifest);
        manifest.WriteAtomic(manifestPath);
        files.Add(manifestPath);
        // The manifest now names complete tables, so the checkpoints have served their purpose.
        Checkpoints.Clear(request.Folder);
        return new SimulationOutcome(combined, deterministic, deterministicFailure, manifest, files)
        {
            StopReason = reason,
            Failure = failure,
            ReplicatesResumed = prior?.ReplicatesFinished ?? 0,
            Validation = validation,
            ValidationFailure = validationFailure,
            Method = method,
            PathsFailure = pathsFailure,
            Partition = partition,
            PartitionFailure = partitionFailure,
        };
    }

    /// <summary>
    /// The control ensemble of <c>--partition-noise</c> (cells split in halves, independent streams; docs/methods.md
    /// "Partitioning noise") over the whole run, and partition.parquet. It keeps no checkpoint: a run interrupted in it
    /// keeps its own tables and says that the split is missing.
    /// </summary>
    private static (PartitionControl?, string?) RunPartitionControl(SimulationRequest request, EnsembleOptions options, EnsembleResult combined,
        RunIdentity identity, List<string> files, EnsembleMonitor? monitor, CancellationToken cancel)
    {
        monitor?.Restart();
        PartitionControl? partition;
        try
        {
            partition = PartitionControl.Run(request.Model.Network, options with { SkipBlocks = new HashSet<long>() }, combined, monitor, cancel);
        }
        catch (EnsembleFailureException e)
        {
            return (null, $"a replicate of the control ensemble (cells split in halves) failed: {e.Message}");
        }
        if (partition is null) return (null, "the control ensemble (cells split in halves) was interrupted before it finished; rerun with --partition-noise for the split");
        var path = Path.Combine(request.Folder, RunFiles.Partition);
        PartitionTable.Write(path, partition, identity.Provenance(combined));
        files.Add(path);
        return (partition, null);
    }

    /// <summary>Runs the ensemble (checkpoints and paths going to <paramref name="store"/>) and combines it with the resumed part; the failure message, if a replicate failed.</summary>
    private static (EnsembleResult Combined, string? Failure) RunEnsemble(
        SimulationRequest request, EnsembleOptions options, EnsembleResult? prior, CheckpointStore store, EnsembleMonitor? monitor, CancellationToken cancel)
    {
        EnsembleResult result;
        string? failure = null;
        try
        {
            result = EnsembleRunner.Run(request.Model.Network, options, options.PathReplicates > 0 ? store : null, monitor, cancel, store);
        }
        catch (EnsembleFailureException e)
        {
            result = e.Partial;
            failure = e.Message;
        }
        // The final checkpoint: from here on a kill, even one during the final write, loses no finished block.
        store.Seal();
        store.Save(result);
        return (prior is null ? result : EnsembleResult.Combine(prior, result), failure);
    }

    private static TimeSpan ClampedDelay(TimeSpan delay) =>
        delay < TimeSpan.FromMilliseconds(1) ? TimeSpan.FromMilliseconds(1)
        : delay > TimeSpan.FromMilliseconds(int.MaxValue - 1) ? TimeSpan.FromMilliseconds(int.MaxValue - 1)
        : delay;
}
