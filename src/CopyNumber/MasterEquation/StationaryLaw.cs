using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.MasterEquation;

/// <summary>The stationary law on a projection and how well it solves A·π = 0.</summary>
/// <param name="Quantities">Species, then readouts.</param>
/// <param name="Laws">One law per quantity.</param>
/// <param name="States">States in the projection.</param>
/// <param name="Residual">‖A_R·π‖₁ / max a₀ with Σπ = 1: the relative residual of the reflected generator A_R.</param>
/// <param name="BoundaryMass">π's mass on states with a transition out of the projection: when it is not small, the
/// projection is too small for the stationary law (probability is being reflected where it would have gone on).</param>
/// <param name="Sweeps">Gauss–Seidel sweeps done.</param>
public sealed record StationaryLaw(IReadOnlyList<Quantity> Quantities, IReadOnlyList<ExactLaw> Laws, int States, double Residual, double BoundaryMass, int Sweeps);

/// <summary>
/// The stationary distribution of the master equation on a finite projection: transitions that would
/// leave the projection are dropped (the boundary reflects), which makes the projected generator A_R a
/// proper generator, and π with A_R·π = 0, Σπ = 1 is found by Gauss–Seidel sweeps over the rows
/// (π_k ← Σ_in rate·π_source / a₀,R(k); a standard iterative method for Markov chains, Stewart 1994,
/// Introduction to the Numerical Solution of Markov Chains, ch. 3), renormalised after each sweep,
/// until the relative residual ‖A_R·π‖₁ / max a₀ falls below the tolerance or the sweep limit is hit.
/// The projection is the one a transient solve to the final time reached (and it is grown by
/// reachability first, see <see cref="Solve"/>); its boundary mass says whether it was large enough.
/// Sweeps are sequential: Gauss–Seidel uses each new value at once, which is what makes it converge
/// where power iteration creeps.
/// </summary>
public static class StationarySolver
{
    /// <summary>
    /// Solves the transient problem on <paramref name="grid"/> to find the projection, then the stationary
    /// law on it, to a relative residual of <paramref name="residualTolerance"/> in at most <paramref name="maxSweeps"/> sweeps.
    /// </summary>
    /// <exception cref="MasterEquationException">The transient solve fails, or the projection has an absorbing state (the stationary law is then concentrated on absorbing states).</exception>
    public static (ExactSolution Transient, StationaryLaw Stationary) Solve(ReactionNetwork network, TimeGrid grid, ExactOptions options,
        double residualTolerance = 1e-10, int maxSweeps = 100_000, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        var (transient, solver) = FiniteStateProjection.SolveKeepingState(network, grid, options, cancel);
        var (space, p, parameters) = solver.Final;
        var constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(parameters, constants);
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = options.Threads > 0 ? options.Threads : Environment.ProcessorCount };
        var generator = Generator.Build(space, network, constants, parameters, parallel);
        var n = generator.States;
        var exit = new double[n];
        for (var k = 0; k < n; k++)
        {
            exit[k] = generator.Exit[k] - generator.Leak[k];
            if (exit[k] <= 0 && generator.RowStart[k + 1] > generator.RowStart[k])
                throw new MasterEquationException("the projection has an absorbing state that probability flows into; the stationary law is then concentrated on absorbing states, so --stationary does not apply (solve the transient law instead)");
        }
        var pi = p.ToArray();
        var sum = pi.Sum();
        if (!(sum > 0)) throw new MasterEquationException("no probability is left on the projection to start the stationary solve from");
        for (var k = 0; k < n; k++) pi[k] /= sum;
        var scale = Math.Max(generator.LargestExitRate, double.Epsilon);
        var residual = double.PositiveInfinity;
        var sweeps = 0;
        while (sweeps < maxSweeps)
        {
            cancel.ThrowIfCancellationRequested();
            for (var k = 0; k < n; k++)
            {
                if (exit[k] <= 0) continue;
                var inflow = 0.0;
                for (var e = generator.RowStart[k]; e < generator.RowStart[k + 1]; e++) inflow += generator.Rate[e] * pi[generator.Source[e]];
                pi[k] = inflow / exit[k];
            }
            sweeps++;
            var total = pi.Sum();
            for (var k = 0; k < n; k++) pi[k] /= total;
            if (sweeps % 10 == 0 || sweeps == maxSweeps)
            {
                residual = Residual(generator, exit, pi) / scale;
                if (residual <= residualTolerance) break;
            }
        }
        var boundary = 0.0;
        for (var k = 0; k < n; k++) if (generator.Leak[k] > 0) boundary += pi[k];
        return (transient, new StationaryLaw(transient.Quantities, Laws(network, space, pi, parameters, transient.Quantities), n, residual, boundary, sweeps));
    }

    private static double Residual(Generator generator, double[] exit, double[] pi)
    {
        var residual = 0.0;
        for (var k = 0; k < generator.States; k++)
        {
            var r = -exit[k] * pi[k];
            for (var e = generator.RowStart[k]; e < generator.RowStart[k + 1]; e++) r += generator.Rate[e] * pi[generator.Source[e]];
            residual += Math.Abs(r);
        }
        return residual;
    }

    private static ExactLaw[] Laws(ReactionNetwork network, StateSpace space, double[] pi, double[] parameters, IReadOnlyList<Quantity> quantities)
    {
        var counts = new long[network.Species.Count];
        var laws = new ExactLaw[quantities.Count];
        for (var q = 0; q < quantities.Count; q++)
        {
            var quantity = quantities[q];
            var marginal = new Dictionary<long, double>();
            double s1 = 0, s2 = 0;
            for (var i = 0; i < space.Count; i++)
            {
                space.Counts(i, counts);
                var value = quantity.SpeciesIndex >= 0 ? counts[quantity.SpeciesIndex] : network.Readouts[quantity.ReadoutIndex].OnCounts(counts, parameters);
                if (quantity.IsCount) marginal[(long)Math.Round(value)] = marginal.GetValueOrDefault((long)Math.Round(value)) + pi[i];
                s1 += pi[i] * value;
                s2 += pi[i] * value * value;
            }
            if (quantity.IsCount)
            {
                var d = CountDistribution.FromProbabilities(marginal.Keys.ToArray(), marginal.Values.ToArray());
                laws[q] = new ExactLaw(d, d.Mean, d.Variance, double.NaN);
            }
            else laws[q] = new ExactLaw(null, s1, Math.Max(0, s2 - s1 * s1), double.NaN);
        }
        return laws;
    }
}
