using System.Globalization;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Output;

/// <summary>Everything one <c>simulate</c> run needs: the model, the ensemble settings and where to write.</summary>
/// <param name="Model">The loaded model.</param>
/// <param name="Ensemble">Ensemble settings (grid, replicates, seed, method, threads, paths).</param>
/// <param name="Folder">An existing, empty output folder.</param>
/// <param name="Solver">Settings for the rate-equation solution computed beside the ensemble.</param>
/// <param name="Arguments">The run's settings as text, for provenance.</param>
/// <param name="MethodReason">Why this simulation method was chosen, for the manifest and console.</param>
public sealed record SimulationRequest(
    LoadedModel Model,
    EnsembleOptions Ensemble,
    string Folder,
    SolverOptions Solver,
    IReadOnlyDictionary<string, string> Arguments,
    string MethodReason);

/// <summary>What a run produced.</summary>
/// <param name="Ensemble">The ensemble summaries.</param>
/// <param name="Deterministic">The rate-equation solution, or null when its solver failed.</param>
/// <param name="DeterministicFailure">Why the rate equations could not be solved, if they could not.</param>
/// <param name="Manifest">The manifest as written.</param>
/// <param name="Files">The files written, in the order written.</param>
public sealed record SimulationOutcome(
    EnsembleResult Ensemble,
    DeterministicSolution? Deterministic,
    string? DeterministicFailure,
    RunManifest Manifest,
    IReadOnlyList<string> Files);

/// <summary>
/// Runs the ensemble and the rate equations of one model and writes the run's folder: the rate-equation
/// solution, moments, distributions, optional paths and manifest.json. An interrupted run still
/// writes complete files for the replicates finished, marked partial.
/// </summary>
public static class SimulationRun
{
    /// <summary>File names inside a run folder.</summary>
    public const string MomentsFile = "moments.parquet", DistributionsFile = "distributions.parquet",
        DeterministicFile = "deterministic.parquet", PathsFile = "paths.parquet", ManifestFile = "manifest.json";

    /// <summary>Runs and writes; see the type's remarks.</summary>
    public static SimulationOutcome Execute(SimulationRequest request, EnsembleMonitor? monitor = null, CancellationToken cancel = default)
    {
        var started = DateTimeOffset.UtcNow;
        var model = request.Model;
        var files = new List<string>();
        var baseProvenance = Provenance.For(model.Path, model.Text, request.Arguments, started);

        DeterministicSolution? deterministic = null;
        string? failure = null;
        try
        {
            deterministic = RateEquationSolver.Solve(model.Network, request.Ensemble.Grid, request.Solver);
        }
        catch (SolverFailureException e)
        {
            failure = e.Message;
        }
        if (deterministic is not null)
        {
            var path = Path.Combine(request.Folder, DeterministicFile);
            DeterministicTable.Write(path, deterministic, baseProvenance);
            files.Add(path);
        }

        PathsTable? paths = null;
        var ensembleOptions = request.Ensemble;
        if (ensembleOptions.PathReplicates > 0)
            paths = new PathsTable(Path.Combine(request.Folder, PathsFile), model.Network, ensembleOptions.Grid, baseProvenance);
        EnsembleResult result;
        try
        {
            result = EnsembleRunner.Run(model.Network, ensembleOptions, paths, monitor, cancel);
            if (paths is not null)
            {
                paths.Complete();
                files.Add(Path.Combine(request.Folder, PathsFile));
            }
        }
        finally
        {
            paths?.Dispose();
        }

        var summary = new Dictionary<string, string>
        {
            ["replicates_finished"] = result.ReplicatesFinished.ToString(CultureInfo.InvariantCulture),
            ["partial"] = result.Interrupted ? "true" : "false",
        };
        var provenance = Provenance.For(model.Path, model.Text, request.Arguments, started, summary);
        var moments = Path.Combine(request.Folder, MomentsFile);
        MomentsTable.Write(moments, result, deterministic, provenance);
        files.Add(moments);
        var distributions = Path.Combine(request.Folder, DistributionsFile);
        DistributionsTable.Write(distributions, result, provenance);
        files.Add(distributions);

        var manifest = new RunManifest
        {
            ModelFile = model.Path,
            ModelSha256 = Provenance.Sha256Hex(model.Text),
            Seed = ensembleOptions.Seed,
            Method = ensembleOptions.Method.ToString(),
            Threads = ensembleOptions.Threads,
            ReplicatesRequested = ensembleOptions.Replicates,
            ReplicatesFinished = result.ReplicatesFinished,
            EventsFired = result.EventsFired,
            WallSeconds = result.WallTime.TotalSeconds,
            StartedUtc = started,
            Partial = result.Interrupted,
        };
        foreach (var (key, value) in request.Arguments) manifest.Arguments[key] = value;
        manifest.Extra["method_reason"] = request.MethodReason;
        manifest.Extra["replicates_stopped_early"] = result.ReplicatesStoppedEarly;
        manifest.Extra["grid_points"] = ensembleOptions.Grid.Count;
        manifest.Extra["block_size"] = ensembleOptions.BlockSize;
        manifest.Extra["finished_blocks"] = BlockRanges.Format(result.FinishedBlocks);
        if (failure is not null) manifest.Extra["deterministic_failure"] = failure;
        var manifestPath = Path.Combine(request.Folder, ManifestFile);
        manifest.WriteAtomic(manifestPath);
        files.Add(manifestPath);
        return new SimulationOutcome(result, deterministic, failure, manifest, files);
    }
}
