using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Immigration–death, 0 → X at rate α and X → 0 at rate μ·x, from X(0) = 0: X(t) is Poisson with mean
/// λ(t) = (α/μ)(1 − e^(−μt)) at every t (Bailey 1964, The Elements of Stochastic Processes, Wiley, the chapter on
/// homogeneous birth-and-death processes, the effect of immigration; quoted from memory).
/// </summary>
public sealed class ImmigrationDeathTests
{
    private static double PoissonMean(double alpha, double mu, double t) => alpha / mu * (1 - Math.Exp(-mu * t));

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void CountIsPoissonAtEveryGridTime(SimulationMethod method)
    {
        // At means near 16 tau-leaping's τ' is below 10/a0, so it takes exact steps: it must be exact here too.
        const double alpha = 8, mu = 0.5;
        const int replicates = 10_000;
        var grid = new TimeGrid(until: 8, every: 1);
        var samples = GridSamples.Run(TestNetworks.ImmigrationDeath(alpha, mu), method, grid, replicates, seed: 1964);

        Assert.All(samples.Column(0, 0), x => Assert.Equal(0, x));
        for (var k = 1; k < grid.Count; k++)
        {
            var lambda = PoissonMean(alpha, mu, grid[k]);
            var column = samples.Column(k, 0);
            SamplingChecks.MeanAgrees(column, lambda, lambda, $"{method}, t = {grid[k]}");
            SamplingChecks.FollowsDistribution(column, SamplingChecks.Poisson(lambda), $"{method}, t = {grid[k]}");
        }
    }

    [Fact]
    public void TauLeapingMeanAtHighCountsIsWithinItsErrorBound()
    {
        // α = 10⁴, μ = 1 from 0: λ(t) = 10⁴(1 − e^(−t)).
        // Bound on the bias. With linear propensities a Poisson leap of size τ from x has conditional mean
        // x + τ(α − μx), one explicit Euler step of the mean equation m' = α − μm, whose exact flow moves
        // the deviation x − α/μ by e^(−μτ) instead of 1 − μτ: a one-step error of at most
        // |x − α/μ|(μτ)²/2. The leap size of Cao, Gillespie & Petzold (2006, J. Chem. Phys. 124:044109)
        // keeps the expected change τ·μ|x − α/μ| ≤ ε·x, so each leap errs by at most ε·x·μτ/2, and since
        // the exact flow contracts, the errors add to at most ε·x_max·μt/2 at time t (exact steps add
        // none). x_max is bounded by λ(t) + 5√λ(t). The sampling error adds 5 SE (Poisson variance λ).
        const double alpha = 1e4, mu = 1, epsilon = 0.03;
        const int replicates = 2_000;
        var grid = new TimeGrid(until: 1, every: 0.25);
        var samples = GridSamples.Run(TestNetworks.ImmigrationDeath(alpha, mu), SimulationMethod.TauLeap, grid, replicates, seed: 2006,
            new SimulatorOptions(Epsilon: epsilon));

        for (var k = 1; k < grid.Count; k++)
        {
            var t = grid[k];
            var lambda = PoissonMean(alpha, mu, t);
            var mean = SamplingChecks.Mean(samples.Column(k, 0));
            var bias = epsilon * (lambda + 5 * Math.Sqrt(lambda)) * mu * t / 2;
            var se = Math.Sqrt(lambda / replicates);
            Assert.True(Math.Abs(mean - lambda) <= SamplingChecks.StandardErrors * se + bias,
                $"t = {t}: tau-leap mean {mean} vs exact {lambda}; allowed {SamplingChecks.StandardErrors} SE = {5 * se} + bias bound {bias}");
        }
        // The bound above would also hold for an exact method; this shows the run really leapt
        // (an exact run fires every event as its own step).
        Assert.True(samples.Steps * 10 < samples.Events, $"{samples.Steps} steps for {samples.Events} firings: tau-leaping did not leap");
    }
}
