using CopyNumber.Storage;
using System.Globalization;
using System.Text.Json.Nodes;
using CopyNumber.Deterministic;
using CopyNumber.MasterEquation;
using CopyNumber.Network;

namespace CopyNumber.Runs;

/// <summary>What one <c>exact</c> run needs.</summary>
/// <param name="Model">The loaded model.</param>
/// <param name="Grid">The recording grid.</param>
/// <param name="Options">Tolerance, state limit, threads.</param>
/// <param name="Folder">An existing, empty output folder.</param>
/// <param name="Arguments">The run's settings as text, for provenance.</param>
/// <param name="Stationary">Also solve for the stationary law on the final projection (written to stationary.parquet).</param>
public sealed record ExactRequest(LoadedModel Model, TimeGrid Grid, ExactOptions Options, string Folder, IReadOnlyDictionary<string, string> Arguments, bool Stationary = false);

/// <summary>What an exact run produced.</summary>
/// <param name="Solution">The transient laws on the grid.</param>
/// <param name="Stationary">The stationary law, when asked for.</param>
/// <param name="Deterministic">The rate-equation solution, or null when its solver failed.</param>
/// <param name="Manifest">The manifest as written.</param>
/// <param name="Files">The files written, in order.</param>
public sealed record ExactOutcome(ExactSolution Solution, StationaryLaw? Stationary, DeterministicSolution? Deterministic, RunManifest Manifest, IReadOnlyList<string> Files);

/// <summary>
/// Solves the master equation of a model and writes a run folder in the layout of <c>simulate</c>, so that
/// <c>contrast</c> reads it: deterministic.parquet, moments.parquet, distributions.parquet and manifest.json
/// (plus stationary.parquet with <see cref="ExactRequest.Stationary"/>). An exact law has no replicates:
/// <c>replicates</c> and <c>frequency</c> are 0, probabilities are the law's (normalised on the projection),
/// and <c>std_error</c> holds the mean's error bar from the projection bound (<see cref="ExactLaw.MeanErrorBar"/>),
/// not a standard error. The manifest's <see cref="ErrorKindField"/> is <see cref="ExactErrorKind"/>, which
/// is how <c>contrast</c> knows to use that error bar; <c>projection_bound</c> and <c>stepping_error</c> list
/// the bounds per grid time.
/// </summary>
public static class ExactRun
{
    /// <summary>Manifest field saying where the error bars of the folder's means come from.</summary>
    public const string ErrorKindField = ManifestFields.ErrorKind;

    /// <summary>The value of <see cref="ErrorKindField"/> for an exact folder.</summary>
    public const string ExactErrorKind = ManifestFields.ExactErrorKind;

    /// <summary>The stationary law's file (the distributions layout, time = +∞).</summary>
    public const string StationaryFile = RunFiles.Stationary;

    /// <summary>The manifest's method.</summary>
    public const string Method = "exact (finite state projection; uniformisation or Krylov by the stepper rule)";

    /// <summary>Solves and writes; see the type's remarks.</summary>
    /// <exception cref="MasterEquationException">The master equation cannot be solved as asked.</exception>
    /// <exception cref="OutputException">A file could not be written.</exception>
    public static ExactOutcome Execute(ExactRequest request, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(request);
        var started = DateTimeOffset.UtcNow;
        var network = request.Model.Network;
        ExactSolution solution;
        StationaryLaw? stationary = null;
        if (request.Stationary) (solution, stationary) = StationarySolver.Solve(network, request.Grid, request.Options, cancel: cancel);
        else solution = FiniteStateProjection.Solve(network, request.Grid, request.Options, cancel);

        var provenance = Provenance.For(request.Model.Path, request.Model.Text, request.Arguments, started);
        var files = new List<string>();
        DeterministicSolution? deterministic = null;
        string? deterministicFailure = null;
        try
        {
            deterministic = RateEquationSolver.Solve(network, request.Grid, new SolverOptions());
        }
        catch (SolverFailureException e)
        {
            deterministicFailure = e.Message;
        }
        if (deterministic is not null)
        {
            var path = Path.Combine(request.Folder, RunFiles.Deterministic);
            DeterministicTable.Write(path, deterministic, provenance);
            files.Add(path);
        }
        var moments = Path.Combine(request.Folder, RunFiles.Moments);
        MomentsTable.Write(moments, MomentRows(solution, deterministic), provenance);
        files.Add(moments);
        var distributions = Path.Combine(request.Folder, RunFiles.Distributions);
        DistributionsTable.Write(distributions, DistributionRows(solution.Grid.Times.ToArray(), solution.Quantities.Count, (k, q) => solution.Law(k, q), solution.Quantities.Select(q => q.Name).ToArray()), provenance);
        files.Add(distributions);
        if (request.Options.Joint is { } pair && solution.Joint.Count > 0)
        {
            var path = Path.Combine(request.Folder, RunFiles.Joint);
            JointTable.Write(path, network.Species[pair.First], network.Species[pair.Second], solution.Grid.Times.ToArray(), solution.Joint, provenance);
            files.Add(path);
        }
        if (stationary is not null)
        {
            var path = Path.Combine(request.Folder, StationaryFile);
            DistributionsTable.Write(path, DistributionRows([double.PositiveInfinity], stationary.Quantities.Count, (_, q) => stationary.Laws[q], stationary.Quantities.Select(q => q.Name).ToArray()), provenance);
            files.Add(path);
        }

        var manifest = new RunManifest
        {
            ModelFile = request.Model.Path,
            ModelSha256 = Provenance.Sha256Hex(request.Model.Text),
            Method = Method,
            Threads = request.Options.Threads > 0 ? request.Options.Threads : Environment.ProcessorCount,
            WallSeconds = Math.Max(0, solution.WallTime.TotalSeconds),
            StartedUtc = started,
        };
        foreach (var (key, value) in request.Arguments) manifest.Arguments[key] = value;
        manifest.Extra[ErrorKindField] = ExactErrorKind;
        manifest.Extra[ManifestFields.GridPoints] = solution.Grid.Count;
        manifest.Extra[ManifestFields.StopReason] = StopReason.Finished.Name();
        manifest.Extra["states"] = solution.States[^1];
        manifest.Extra["stored_coordinates"] = solution.Dimension;
        manifest.Extra["projection_bound"] = new JsonArray(solution.Bound.Select(b => (JsonNode)b).ToArray());
        manifest.Extra["stepping_error"] = new JsonArray(solution.SteppingError.Select(b => (JsonNode)b).ToArray());
        manifest.Extra["states_per_time"] = new JsonArray(solution.States.Select(s => (JsonNode)s).ToArray());
        manifest.Extra["uniformisation_rate"] = solution.LargestRate;
        manifest.Extra["matrix_vector_products"] = solution.Products;
        manifest.Extra["krylov_steps"] = solution.KrylovSteps;
        manifest.Extra["krylov_error_estimate"] = solution.KrylovError;
        if (stationary is not null)
        {
            manifest.Extra["stationary_residual"] = stationary.Residual;
            manifest.Extra["stationary_boundary_mass"] = stationary.BoundaryMass;
            manifest.Extra["stationary_sweeps"] = stationary.Sweeps;
        }
        if (deterministicFailure is not null) manifest.Extra[ManifestFields.DeterministicFailure] = deterministicFailure;
        var manifestPath = Path.Combine(request.Folder, RunFiles.Manifest);
        manifest.WriteAtomic(manifestPath);
        files.Add(manifestPath);
        return new ExactOutcome(solution, stationary, deterministic, manifest, files);
    }

    private static IEnumerable<MomentRow> MomentRows(ExactSolution solution, DeterministicSolution? deterministic)
    {
        var columns = solution.Quantities.Select(q => deterministic is null ? -1 : MomentsTable.ColumnOf(deterministic.Columns, q.Name)).ToArray();
        for (var k = 0; k < solution.Grid.Count; k++)
        {
            for (var q = 0; q < solution.Quantities.Count; q++)
            {
                var law = solution.Law(k, q);
                var d = law.Distribution;
                var minimum = d is null ? double.NaN : d.Minimum;
                double[] statistics =
                [
                    law.Mean, law.Variance, law.MeanErrorBar,
                    Ensembles.NoiseRatios.Fano(law.Mean, law.Variance, d is null ? double.NaN : minimum),
                    Ensembles.NoiseRatios.SquaredCoefficientOfVariation(law.Mean, law.Variance, d is null ? double.NaN : minimum),
                    minimum,
                    d?.Quantile(0.05) ?? double.NaN, d?.Quantile(0.25) ?? double.NaN, d?.Quantile(0.5) ?? double.NaN,
                    d?.Quantile(0.75) ?? double.NaN, d?.Quantile(0.95) ?? double.NaN,
                    d is null ? double.NaN : d.Maximum, d?.ProbabilityOfZero ?? double.NaN,
                ];
                yield return new MomentRow(solution.Grid[k], solution.Quantities[q].Name, 0, statistics,
                    columns[q] >= 0 ? deterministic!.Values[k, columns[q]] : double.NaN);
            }
        }
    }

    private static IEnumerable<DistributionRow> DistributionRows(double[] times, int quantities, Func<int, int, ExactLaw> law, string[] names)
    {
        for (var k = 0; k < times.Length; k++)
            for (var q = 0; q < quantities; q++)
            {
                if (law(k, q).Distribution is not { } d) continue;
                for (var i = 0; i < d.Values.Count; i++)
                    yield return new DistributionRow(times[k], names[q], d.Values[i], d.Probabilities[i], 0);
            }
    }
}
