using CopyNumber.MasterEquation;
using CopyNumber.Network;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// The transient master equation against laws known in closed form, and the finite state projection's
/// bound against the true error. The bound 1 − Σp must never be smaller than ‖p_true − p‖₁ (Munsky &amp;
/// Khammash 2006, J. Chem. Phys. 124:044104, Theorems 2.1–2.2: the projected solution lies below the true
/// one state by state); here the true law is known, so the true error is computed outright.
/// </summary>
public sealed class TransientLawTests
{
    // Round-off of sums over a few hundred states is below 1e-13; the checks allow 1e-12.
    private const double RoundOff = 1e-12;

    /// <summary>
    /// Immigration–death 0 → X (k), X → 0 (μ) from X(0) = 0: X(t) is Poisson with mean (k/μ)(1 − e^{−μt})
    /// (Bailey 1964, The Elements of Stochastic Processes with Applications to the Natural Sciences, Wiley; quoted from memory: the M/M/∞ queue started empty).
    /// </summary>
    [Theory]
    [InlineData(1e-6)]
    [InlineData(1e-9)]
    public void ImmigrationDeathIsPoissonAndTheBoundHoldsAtEveryTime(double tolerance)
    {
        const double k = 20, mu = 0.5;
        var grid = new TimeGrid(until: 10, every: 0.5);
        var solution = FiniteStateProjection.Solve(ExactModels.ImmigrationDeath(k, mu), grid, new ExactOptions(tolerance));
        for (var g = 0; g < grid.Count; g++)
        {
            var mean = k / mu * (1 - Math.Exp(-mu * grid[g]));
            var error = TrueError(solution, g, 0, x => ExactModels.Poisson(mean, x), upTo: 200);
            Assert.True(error <= solution.Bound[g] + RoundOff, $"t = {grid[g]}: true error {error:G3} above the bound {solution.Bound[g]:G3}");
            Assert.True(solution.Bound[g] <= tolerance, $"t = {grid[g]}: bound {solution.Bound[g]:G3} above the tolerance {tolerance:G3}");
            Assert.InRange(solution.Law(g, 0).Mean, mean - 2 * tolerance * 200, mean + 2 * tolerance * 200);
        }
    }

    /// <summary>
    /// The same Poisson law (Bailey 1964, quoted from memory) with every step taken by the Krylov exponential
    /// (Sidje 1998): the reported bound (1 − Σp plus twice the Krylov estimates) still covers the true error, and
    /// the Krylov estimates stay within the stepping share of the tolerance.
    /// </summary>
    [Fact]
    public void KrylovSteppingGivesThePoissonLawWithinTheReportedBound()
    {
        const double k = 20, mu = 0.5, tolerance = 1e-8;
        var grid = new TimeGrid(until: 10, every: 2.5);
        var solution = FiniteStateProjection.Solve(ExactModels.ImmigrationDeath(k, mu), grid, new ExactOptions(tolerance, Stepping: Stepping.Krylov));
        Assert.True(solution.KrylovSteps > 0);
        Assert.True(solution.KrylovError <= ExactOptions.SteppingShare * tolerance, $"Krylov estimates {solution.KrylovError:G3}");
        for (var g = 0; g < grid.Count; g++)
        {
            var mean = k / mu * (1 - Math.Exp(-mu * grid[g]));
            var error = TrueError(solution, g, 0, x => ExactModels.Poisson(mean, x), upTo: 200);
            Assert.True(error <= solution.Bound[g] + RoundOff, $"t = {grid[g]}: true error {error:G3} above the bound {solution.Bound[g]:G3}");
            Assert.True(solution.Bound[g] <= tolerance, $"t = {grid[g]}: bound {solution.Bound[g]:G3}");
        }
    }

    /// <summary>
    /// The joint law of two species that share no reaction: two immigration–death processes from 0 are
    /// independent, so their joint law is the product of two Poisson laws with means (k/μ)(1 − e^{−μt})
    /// (Bailey 1964, quoted from memory; independence is common practice for reactions sharing no species).
    /// </summary>
    [Fact]
    public void TheJointLawOfIndependentSpeciesIsTheProductOfTheirPoissonLaws()
    {
        var network = ExactModels.Load("species\n  X = 0\n  Y = 0\nreactions\n  bx: 0 -> X mass 4\n  dx: X -> 0 mass 1\n  by: 0 -> Y mass 2\n  dy: Y -> 0 mass 0.5\n");
        var grid = new TimeGrid(until: 3, every: 1.5);
        var solution = FiniteStateProjection.Solve(network, grid, new ExactOptions(1e-9) { Joint = (0, 1) });
        Assert.Equal(grid.Count, solution.Joint.Count);
        for (var g = 1; g < grid.Count; g++)
        {
            var mx = 4 * (1 - Math.Exp(-grid[g]));
            var my = 4 * (1 - Math.Exp(-0.5 * grid[g]));
            var error = solution.Joint[g].Sum(e => Math.Abs(e.Probability - ExactModels.Poisson(mx, e.First) * ExactModels.Poisson(my, e.Second)));
            Assert.True(error < 1e-7, $"t = {grid[g]}: joint law off by {error:G3} in total over its support");
            Assert.Equal(1, solution.Joint[g].Sum(e => e.Probability), 1e-12);
        }
    }

    /// <summary>
    /// Isomerisation A ⇄ B from A = n: B(t) is binomial(n, q(t)) with q(t) = c1/(c1+c2)·(1 − e^{−(c1+c2)t})
    /// (common practice: each molecule is an independent two-state chain; Jahnke &amp; Huisinga 2007, J. Math. Biol. 54:1).
    /// A + B = n is a conservation law, so only one coordinate is stored.
    /// </summary>
    [Fact]
    public void IsomerisationIsBinomialWithOneStoredCoordinate()
    {
        const long n = 40;
        const double c1 = 1.0, c2 = 0.5;
        var grid = new TimeGrid(until: 6, every: 0.25);
        var solution = FiniteStateProjection.Solve(ExactModels.Isomerisation(n, c1, c2), grid, new ExactOptions(1e-8));
        Assert.Equal(1, solution.Dimension);
        for (var g = 0; g < grid.Count; g++)
        {
            var q = c1 / (c1 + c2) * (1 - Math.Exp(-(c1 + c2) * grid[g]));
            var error = TrueError(solution, g, 1, b => b <= n ? ExactModels.Binomial(n, q, b) : 0, upTo: n);
            Assert.True(error <= solution.Bound[g] + RoundOff, $"t = {grid[g]}: true error {error:G3} above the bound {solution.Bound[g]:G3}");
            Assert.True(error < 1e-8 + RoundOff, $"t = {grid[g]}: error {error:G3}");
            Assert.Equal(n * q, solution.Law(g, 1).Mean, 1e-6);
        }
    }

    /// <summary>
    /// ‖p_true − p‖₁ for a one-dimensional joint law: p is the stored marginal times (1 − bound) (the
    /// unnormalised projected law), summed over 0..upTo, where the true law has all but a negligible mass.
    /// </summary>
    internal static double TrueError(ExactSolution solution, int g, int quantity, Func<long, double> truth, long upTo)
    {
        var law = solution.Law(g, quantity).Distribution!;
        var kept = 1 - solution.Bound[g];
        var computed = new Dictionary<long, double>();
        for (var i = 0; i < law.Values.Count; i++) computed[law.Values[i]] = law.Probabilities[i] * kept;
        var error = 0.0;
        for (long x = 0; x <= upTo; x++) error += Math.Abs(truth(x) - computed.GetValueOrDefault(x));
        return error;
    }
}
