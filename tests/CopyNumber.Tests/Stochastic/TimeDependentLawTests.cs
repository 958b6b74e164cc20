using CopyNumber.Deterministic;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Laws that read <c>time</c>. The check: immigration–death with a periodic immigration rate
/// k(t) = k0·(1 + a·sin(ωt)) and death d·x, from X(0) = 0. A linear network with a time-dependent rate keeps
/// X(t) Poisson with mean μ(t) = ∫₀ᵗ k(s)·e^(−d(t−s)) ds, the time-integrated rate filtered by the death
/// (common practice: linear network with a time-dependent rate; the Poisson law of a time-inhomogeneous
/// immigration–death process). Here, integrated in closed form in the test:
/// μ(t) = (k0/d)(1 − e^(−dt)) + k0·a·(d·sin ωt − ω·cos ωt + ω·e^(−dt))/(d² + ω²).
/// </summary>
public sealed class TimeDependentLawTests
{
    private const double Omega = 2 * Math.PI / 5; // period 5

    private static string Model(double k0, double a, double d) => $"""
        # periodic immigration, illustrative
        species
          X = 0
        parameters
          k0 = {k0}
          a = {a}
          w = {Omega:R}
          d = {d}
        reactions
          arrive: 0 -> X  rate k0 * (1 + a * sin(w * time))
          leave:  X -> 0  mass d
        """;

    private static double ExactMean(double k0, double a, double d, double t) =>
        k0 / d * (1 - Math.Exp(-d * t))
        + k0 * a * (d * Math.Sin(Omega * t) - Omega * Math.Cos(Omega * t) + Omega * Math.Exp(-d * t)) / (d * d + Omega * Omega);

    private static ReactionNetwork Network(double k0, double a, double d) =>
        ModelLoader.LoadText(Model(k0, a, d), "periodic.cnet").Model!.Network;

    [Fact]
    public void DirectMethodByThinningFollowsThePoissonLawWithTheIntegratedMean()
    {
        const double k0 = 20, a = 0.9, d = 0.5;
        const int replicates = 10_000;
        var grid = new TimeGrid(until: 10, every: 1);
        var network = Network(k0, a, d);
        Assert.True(network.TimeDependence.ReadsTime(0));
        Assert.False(network.TimeDependence.ReadsTime(1));
        var samples = GridSamples.Run(network, SimulationMethod.Direct, grid, replicates, seed: 2016);
        for (var k = 1; k < grid.Count; k++)
        {
            var mu = ExactMean(k0, a, d, grid[k]);
            var column = samples.Column(k, 0);
            SamplingChecks.MeanAgrees(column, mu, mu, $"t = {grid[k]}");
            SamplingChecks.VarianceAgrees(column, mu, $"t = {grid[k]}");
            SamplingChecks.FollowsDistribution(column, SamplingChecks.Poisson(mu), $"t = {grid[k]}");
        }
    }

    [Fact]
    public void ThinningIsExactAlsoWhenTheRateVanishes()
    {
        // a = 1: k(t) touches 0 once a period, where a bound taken at the window's start alone would be 0.
        const double k0 = 6, a = 1, d = 1;
        var grid = new TimeGrid(until: 6, every: 0.75);
        var samples = GridSamples.Run(Network(k0, a, d), SimulationMethod.Direct, grid, 8_000, seed: 7);
        for (var k = 1; k < grid.Count; k++)
        {
            var mu = ExactMean(k0, a, d, grid[k]);
            SamplingChecks.FollowsDistribution(samples.Column(k, 0), SamplingChecks.Poisson(mu), $"t = {grid[k]}");
        }
    }

    [Fact]
    public void TauLeapingTracksTheIntegratedMeanAtHighCounts()
    {
        // Counts in the thousands, so tau-leaping leaps (trapezoidal leaps are exact in the mean of a linear
        // network with constant rates; the time-varying rate enters through the midpoint rule). Tolerance: 5
        // standard errors of the Poisson sample plus the midpoint rule's error over the run,
        // t·τ²·max|k''|/24 (common practice for the midpoint rule), with max|k''| = k0·a·ω² and τ at most what
        // the leap condition in time allows, a change of k by ε·k(t) ≤ ε·k0(1 + a) at a slope of at most
        // k0·a·ω: τ ≤ ε(1 + a)/(a·ω).
        const double k0 = 5_000, a = 0.8, d = 0.5, epsilon = 0.03;
        const int replicates = 400;
        var grid = new TimeGrid(until: 10, every: 1);
        var samples = GridSamples.Run(Network(k0, a, d), SimulationMethod.TauLeap, grid, replicates, seed: 2001,
            new SimulatorOptions(Epsilon: epsilon));
        Assert.True(samples.Steps < samples.Events / 20, $"tau-leaping took {samples.Steps} steps for {samples.Events} events: it did not leap");
        for (var k = 1; k < grid.Count; k++)
        {
            var t = grid[k];
            var mu = ExactMean(k0, a, d, t);
            var mean = SamplingChecks.Mean(samples.Column(k, 0));
            var tau = epsilon * (1 + a) / (a * Omega);
            var quadrature = t * tau * tau * k0 * a * Omega * Omega / 24;
            var allowed = SamplingChecks.StandardErrors * Math.Sqrt(mu / replicates) + quadrature;
            Assert.True(Math.Abs(mean - mu) <= allowed, $"t = {t}: tau-leaping mean {mean} vs exact {mu}, allowed {allowed}");
            SamplingChecks.VarianceAgrees(samples.Column(k, 0), mu, $"t = {t}");
        }
    }

    [Fact]
    public void RateEquationsFollowTheIntegratedMean()
    {
        // For a linear network the rate equation is the mean's own equation, so it must give μ(t).
        const double k0 = 20, a = 0.9, d = 0.5;
        var grid = new TimeGrid(until: 20, every: 0.5);
        var solution = RateEquationSolver.Solve(Network(k0, a, d), grid, new SolverOptions());
        for (var k = 0; k < grid.Count; k++)
        {
            var mu = ExactMean(k0, a, d, grid[k]);
            Assert.True(Math.Abs(solution[k, 0] - mu) <= 1e-5 * (1 + mu), $"t = {grid[k]}: {solution[k, 0]} vs {mu}");
        }
    }

    [Theory]
    [InlineData(SimulationMethod.NextReaction, "the next reaction method")]
    [InlineData(SimulationMethod.CompositionRejection, "composition-rejection")]
    public void MethodsWithFixedPropensitiesBetweenEventsRefuseLawsThatReadTime(SimulationMethod method, string name)
    {
        var error = Assert.Throws<UnsupportedModelException>(() => SimulatorFactory.Create(method, Network(1, 0.5, 1), new SimulatorOptions()));
        Assert.Contains($"reaction 'arrive' has a rate law that reads time, which {name} does not carry out", error.Message);
    }

    [Fact]
    public void TheMasterEquationRefusesLawsThatReadTime() =>
        Assert.NotEmpty(ModelSupport.StochasticProblems(Network(1, 0.5, 1)));
}
