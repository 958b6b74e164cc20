using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The linear noise approximation (van Kampen 2007, Stochastic Processes in Physics and Chemistry, 3rd
/// ed., ch. X; Elf &amp; Ehrenberg 2003, Genome Res. 13:2475): along the rate-equation solution φ(t), in
/// copy numbers, the covariance obeys dC/dt = J·C + C·Jᵀ + N·diag(v(φ))·Nᵀ with J the exact Jacobian of
/// N·v and C(0) = 0 (the initial counts are exact). φ and the upper triangle of C are integrated together
/// with the project's integrator. For a network whose propensities are all of order ≤ 1 (constant or
/// linear in the counts) the result is the exact mean and covariance of the chemical master equation.
/// </summary>
/// <remarks>
/// Conservation laws make C singular (lᵀ·C·l = 0 for every law l, since lᵀN = 0 keeps lᵀC l at its
/// initial 0); the forward equation for the full C is still well posed, so the full covariance is
/// integrated and no reduction to independent species is needed. Schedule events act as
/// <see cref="ExpansionIntegration"/> describes: adding a constant leaves C unchanged.
/// </remarks>
public static class LinearNoiseApproximation
{
    /// <summary>Integrates φ and C over <paramref name="grid"/>.</summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="grid">Recording times, in model time units.</param>
    /// <param name="options">Method and tolerances; the absolute tolerance applies to counts and to covariances (copies²) alike.</param>
    /// <returns>φ, the variances of species and readouts, and C at every grid point; <see cref="SystemSizeExpansionSolution.CorrectedMean"/> is NaN.</returns>
    /// <exception cref="ArgumentException">The options are unusable.</exception>
    /// <exception cref="SolverFailureException">The integration failed; the message names the time and the species or covariance.</exception>
    /// <param name="parameterValues">Values of every parameter at time 0 in place of the model's (one cell's draw of the
    /// parameters that vary per cell); null for the model's own.</param>
    public static SystemSizeExpansionSolution Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options, IReadOnlyList<double>? parameterValues = null) =>
        ExpansionIntegration.Solve(network, grid, options, withMeanCorrection: false, parameterValues);

    /// <summary>
    /// As <see cref="Solve"/>, with the covariance also integrated once per noise source, the reactions and the
    /// partitioning at divisions (<see cref="Noise.LnaNoiseSources"/>), in the same steps; the parts add up to C to
    /// rounding, which is checked.
    /// </summary>
    /// <returns>The solution with <see cref="SystemSizeExpansionSolution.Sources"/> set.</returns>
    /// <exception cref="ArgumentException">The options are unusable.</exception>
    /// <exception cref="SolverFailureException">The integration failed.</exception>
    /// <exception cref="InvalidOperationException">The parts do not add up to C (a defect, never an input's fault).</exception>
    public static SystemSizeExpansionSolution SolveBySource(ReactionNetwork network, TimeGrid grid, SolverOptions options)
    {
        var solution = ExpansionIntegration.Solve(network, grid, options, withMeanCorrection: false, splitSources: true);
        // Linearity in the source makes the misfit rounding; anything larger is a defect of the split.
        if (!(solution.Sources!.Mismatch <= MismatchAllowed))
            throw new InvalidOperationException($"the LNA's noise sources add up to the covariance only to {solution.Sources.Mismatch:G3} (relative), beyond rounding");
        return solution;
    }

    /// <summary>The largest relative misfit of C_r + C_p against C accepted as rounding.</summary>
    public const double MismatchAllowed = 1e-9;
}
