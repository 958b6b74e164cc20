using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Runs;

/// <summary>
/// What a run will do before it does it: the rate equations solved once on the run's grid (shared by the
/// method choice, deterministic.parquet and the console), the method and why, the ensemble's options,
/// and the memory it will take, checked against what the machine has.
/// </summary>
/// <param name="Specification">The run asked for.</param>
/// <param name="Method">The method the replicates are simulated with.</param>
/// <param name="MethodReason">Why this method, in words for the manifest and the console.</param>
/// <param name="Ensemble">The ensemble's options.</param>
/// <param name="Deterministic">The rate-equation solution on the grid, or null when the solver failed.</param>
/// <param name="DeterministicFailure">Why the rate equations could not be solved, if they could not.</param>
public sealed record RunPlan(
    RunSpecification Specification,
    SimulationMethod Method,
    string MethodReason,
    EnsembleOptions Ensemble,
    DeterministicSolution? Deterministic,
    string? DeterministicFailure)
{
    /// <summary>
    /// Plans <paramref name="specification"/>. A resumed run goes on with the method its stored blocks were
    /// made with (<paramref name="stored"/>), whatever "auto" would choose now.
    /// </summary>
    /// <exception cref="RunPlanException">The run would need more memory than the machine has.</exception>
    /// <exception cref="OperationCanceledException"><paramref name="cancel"/> fired while the rate equations were solved.</exception>
    public static RunPlan Make(RunSpecification specification, StoredSettings? stored = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(specification);
        var network = specification.Model.Network;
        ModelSupport.RequireSimulation(network); // a model the simulators cannot carry out is refused before anything is written
        ModelSupport.RequireRateEquations(network); // the contrast needs the rate equations too
        // Sized before anything is solved, so an impossible run is refused at once.
        var sized = specification.EnsembleOptions(SimulationMethod.Direct);
        var memory = EnsembleMemory.For(network, sized);
        if (memory.Problem(GC.GetGCMemoryInfo().TotalAvailableMemoryBytes) is { } tooLarge) throw new RunPlanException(tooLarge);

        DeterministicSolution? deterministic = null;
        string? failure = null;
        try
        {
            deterministic = RateEquationSolver.Solve(network, specification.Grid, new SolverOptions { Cancel = cancel });
        }
        catch (SolverFailureException e)
        {
            failure = e.Message;
        }
        var (method, reason) = stored?.MethodUsed is { } used
            ? (used, stored.MethodReason ?? $"{MethodChoice.NameOf(used)}, as the stored blocks were made")
            : MethodChoice.Resolve(specification.MethodRequested, network, deterministic);
        SimulatorFactory.RequireMethod(method, network); // refused before the run folder is made
        return new RunPlan(specification, method, reason, specification.EnsembleOptions(method), deterministic, failure);
    }
}

/// <summary>A run that cannot be planned as asked (e.g. it would not fit in memory); the input is at fault.</summary>
public sealed class RunPlanException(string message) : CopyNumberException(message, ErrorKind.BadInput);
