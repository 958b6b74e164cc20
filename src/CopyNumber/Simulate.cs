using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber;

/// <summary>
/// The engine from C#, without files: compile a model's text, run an ensemble, solve the rate equations.
/// Everything the command line does to a run folder is built on these (docs/library.md shows an example).
/// </summary>
public static class Simulate
{
    /// <summary>Compiles a model written in the network language.</summary>
    /// <param name="modelText">The model, as a <c>.cnet</c> file would hold it.</param>
    /// <param name="name">The name diagnostics give the text, e.g. "gene.cnet".</param>
    /// <exception cref="ModelInputException">The model has errors; each diagnostic says where and what.</exception>
    public static ReactionNetwork Network(string modelText, string name = "model.cnet")
    {
        ArgumentNullException.ThrowIfNull(modelText);
        var outcome = ModelLoader.LoadText(modelText, name);
        return outcome.Model?.Network ?? throw new ModelInputException(outcome.Diagnostics);
    }

    /// <summary>
    /// Runs an ensemble of replicates in parallel and returns its exact histograms and moments per grid
    /// time. The result depends only on the network and the options (seed included), never on the threads.
    /// </summary>
    /// <exception cref="EnsembleFailureException">A replicate failed (e.g. a rate law went negative); it holds the blocks finished.</exception>
    public static EnsembleResult Ensemble(ReactionNetwork network, EnsembleOptions options, CancellationToken cancel = default) =>
        EnsembleRunner.Run(network, options, paths: null, monitor: null, cancel);

    /// <summary>Solves the rate equations dx/dt = N·v(x) on <paramref name="grid"/> (automatic stiff/non-stiff switching).</summary>
    /// <exception cref="SolverFailureException">The solver could not reach the final time.</exception>
    public static DeterministicSolution RateEquations(ReactionNetwork network, TimeGrid grid, SolverOptions? options = null) =>
        RateEquationSolver.Solve(network, grid, options ?? new SolverOptions());
}
