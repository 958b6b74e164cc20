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

    /// <summary>Opens the temporary file paths.parquet is built in; tests put a disk that fills up here. Null for the real file.</summary>
    internal Func<string, Stream>? OpenPathsFile { get; init; }
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
        var priorHasPaths = false;
        if (request.Resume)
        {
            var stored = StoredRun.Open(request.Folder);
            stored.EnsureSameRun(new RunSettings(Provenance.Sha256Hex(model.Text), arguments, options.BlockSize));
            prior = stored.Load(model.Network);
            priorHasPaths = options.PathReplicates > 0 && File.Exists(Path.Combine(request.Folder, RunFiles.Paths));
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
        var (combined, failure, pathsFailure) = RunEnsemble(request, options, prior, priorHasPaths, identity, monitor, stop.Token, files);

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
                    (combined, failure, pathsFailure) = RunEnsemble(request, exact, prior: null, priorHasPaths: false, identity, monitor, stop.Token, files: null);
                    method = SimulationMethod.Direct;
                    options = exact;
                    methodReason += "; the validation sample found a tau-leaping error beyond the tolerance, so the run was redone with the exact direct method";
                }
            }
        }
        files.AddRange(SummaryFiles.WriteTables(request.Folder, combined, deterministic, identity, validation is { Action: not ValidationAction.FellBack } ? validation : null));

        var reason = failure is not null ? StopReason.Failed
            : !combined.Interrupted ? StopReason.Finished
            : wallLimit.IsCancellationRequested && !cancel.IsCancellationRequested ? StopReason.WallLimit
            : StopReason.Interrupted;
        var manifest = SummaryFiles.Manifest(identity, combined, method.ToString(), options.Threads, reason, failure, methodReason, deterministicFailure, validation);
        if (pathsFailure is not null) manifest.Extra[ManifestFields.PathsFailure] = pathsFailure;
        var manifestPath = Path.Combine(request.Folder, RunFiles.Manifest);
        manifest.WriteAtomic(manifestPath);
        files.Add(manifestPath);
        return new SimulationOutcome(combined, deterministic, deterministicFailure, manifest, files)
        {
            StopReason = reason,
            Failure = failure,
            ReplicatesResumed = prior?.ReplicatesFinished ?? 0,
            Validation = validation,
            ValidationFailure = validationFailure,
            Method = method,
            PathsFailure = pathsFailure,
        };
    }

    /// <summary>Runs the ensemble (writing paths as it goes) and combines it with the resumed part; the failure message, if a replicate failed, and why the paths were dropped, if they were.</summary>
    private static (EnsembleResult Combined, string? Failure, string? PathsFailure) RunEnsemble(
        SimulationRequest request, EnsembleOptions options, EnsembleResult? prior, bool priorHasPaths, RunIdentity identity,
        EnsembleMonitor? monitor, CancellationToken cancel, List<string>? files)
    {
        var model = request.Model;
        var pathsFile = Path.Combine(request.Folder, priorHasPaths ? RunFiles.ResumedPaths : RunFiles.Paths);
        PathsTable? paths = options.PathReplicates > 0 ? new PathsTable(pathsFile, model.Network, options.Grid, identity.Provenance(null), request.OpenPathsFile) : null;
        EnsembleResult result;
        string? failure = null;
        try
        {
            try
            {
                result = EnsembleRunner.Run(model.Network, options, paths, monitor, cancel);
            }
            catch (EnsembleFailureException e)
            {
                result = e.Partial;
                failure = e.Message;
            }
            paths?.Complete();
        }
        finally
        {
            paths?.Dispose();
        }

        var combined = prior is null ? result : EnsembleResult.Combine(prior, result);
        // A paths table that failed (a full disk) was dropped and its space given back: the summaries still get written.
        if (paths?.FailureText is { } pathsFailure) return (combined, failure, pathsFailure);
        if (paths is not null)
        {
            var final = Path.Combine(request.Folder, RunFiles.Paths);
            if (priorHasPaths)
            {
                PathsMerge.Write([final, pathsFile], final, PathsTable.ColumnsFor(model.Network), identity.Provenance(null));
                File.Delete(pathsFile);
            }
            if (files is not null && !files.Contains(final)) files.Add(final);
        }
        return (combined, failure, null);
    }

    private static TimeSpan ClampedDelay(TimeSpan delay) =>
        delay < TimeSpan.FromMilliseconds(1) ? TimeSpan.FromMilliseconds(1)
        : delay > TimeSpan.FromMilliseconds(int.MaxValue - 1) ? TimeSpan.FromMilliseconds(int.MaxValue - 1)
        : delay;
}
