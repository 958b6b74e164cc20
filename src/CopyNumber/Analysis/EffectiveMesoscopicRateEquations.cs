using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The first-order system-size correction of the mean, the effective mesoscopic rate equations (EMRE)
/// of Grima (2010, J. Chem. Phys. 133:035101; with the linear noise approximation as the inhomogeneous
/// noise approximation of Ramaswamy, González-Segredo, Sbalzarini &amp; Grima 2012, Nat. Commun. 3:779),
/// written in copy numbers: ⟨x⟩ ≈ φ + δ with
/// dδ/dt = J_a·δ + N·[(a − v)(φ) + ½·Σ_kl ∂²a/∂x_k∂x_l·C_kl], δ(0) = 0,
/// where v is the macroscopic rate, a the propensity on a real state (mass action with the real falling
/// factorial; a = v for a rate law), J_a = N·∂a/∂x, and C the linear-noise covariance integrated alongside.
/// docs/methods-analysis.md derives it.
/// </summary>
public static class EffectiveMesoscopicRateEquations
{
    /// <summary>Integrates φ, C and δ over <paramref name="grid"/>.</summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="grid">Recording times, in model time units.</param>
    /// <param name="options">Method and tolerances; the absolute tolerance applies to counts, covariances and corrections alike.</param>
    /// <returns>φ, the linear-noise variances, C and the corrected means φ + δ at every grid point.</returns>
    /// <exception cref="ArgumentException">The options are unusable.</exception>
    /// <exception cref="SolverFailureException">The integration failed; the message names the time and the component.</exception>
    public static SystemSizeExpansionSolution Solve(ReactionNetwork network, TimeGrid grid, SolverOptions options) =>
        ExpansionIntegration.Solve(network, grid, options, withMeanCorrection: true);
}
