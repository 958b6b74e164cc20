using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Bursts of geometric size. Birth in bursts at rate k, each burst B ~ geometric on 0, 1, 2, … with mean b,
/// and first-order loss d·x: the stationary law is negative binomial with r = k/d and success probability
/// 1/(1 + b), P(n) = Γ(n + r)/(Γ(r)·n!)·(1/(1 + b))^r·(b/(1 + b))^n, mean k·b/d, variance mean·(1 + b)
/// (Friedman, Cai &amp; Xie 2006, Phys. Rev. Lett. 97:168302; Shahrezaei &amp; Swain 2008, PNAS 105:17256, the
/// protein law in the bursty limit). The pmf is MathNet's negative binomial, computed in the test.
/// </summary>
public sealed class BurstTests
{
    private static ReactionNetwork Network(double k, double b, double d, long start = 0) =>
        ModelLoader.LoadText($"""
            # bursty birth and death, illustrative
            species
              M = {start}
            parameters
              k = {k}
              b = {b}
              d = {d}
            reactions
              make: 0 -> burst(b) M  mass k
              loss: M -> 0           mass d
            """, "bursts.cnet").Model!.Network;

    private static Func<long, double> NegativeBinomial(double k, double b, double d) =>
        n => MathNet.Numerics.Distributions.NegativeBinomial.PMF(k / d, 1 / (1 + b), (int)n);

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void StationaryLawIsNegativeBinomial(SimulationMethod method)
    {
        // From 0, the mean at t = 15 is within e^(−15)·kb/d ≈ 2·10⁻⁶ of the stationary mean: far below the
        // sampling error (SE ≈ 0.06), so the law at t = 15 is the stationary one for the test.
        const double k = 2, b = 4, d = 1;
        var grid = new TimeGrid(until: 15, every: 5);
        var samples = GridSamples.Run(Network(k, b, d), method, grid, 10_000, seed: 2006);
        var column = samples.Column(3, 0);
        var mean = k * b / d;
        SamplingChecks.MeanAgrees(column, mean, mean * (1 + b), $"{method}");
        SamplingChecks.VarianceAgrees(column, mean * (1 + b), $"{method}");
        SamplingChecks.FollowsDistribution(column, NegativeBinomial(k, b, d), $"{method}");
    }

    [Fact]
    public void TauLeapingLeapsTheLossAndKeepsTheBurstyLaw()
    {
        // Thousands of copies: the loss leaps, the bursts fire one by one as critical reactions.
        const double k = 40, b = 10, d = 0.1;
        var grid = new TimeGrid(until: 120, every: 60);
        var samples = GridSamples.Run(Network(k, b, d, start: 4000), SimulationMethod.TauLeap, grid, 4_000, seed: 2008);
        Assert.True(samples.Steps < samples.Events / 2, $"{samples.Steps} steps for {samples.Events} events: no leaps");
        var column = samples.Column(2, 0);
        var mean = k * b / d;
        SamplingChecks.MeanAgrees(column, mean, mean * (1 + b), "tau-leaping");
        SamplingChecks.VarianceAgrees(column, mean * (1 + b), "tau-leaping");
    }

    [Fact]
    public void RateEquationsUseTheMeanBurstAndTheLinearNoiseApproximationItsSecondMoment()
    {
        // Linear network: the rate equation is the mean's equation and the LNA covariance the exact variance,
        // mean·(1 + b) at stationarity (same sources as above).
        const double k = 2, b = 4, d = 1;
        var grid = new TimeGrid(until: 30, every: 10);
        var lna = LinearNoiseApproximation.Solve(Network(k, b, d), grid, new SolverOptions());
        var mean = k * b / d;
        Assert.True(Math.Abs(lna.RateEquationValue(3, 0) - mean) <= 1e-5 * mean, $"LNA mean {lna.RateEquationValue(3, 0)} vs {mean}");
        Assert.True(Math.Abs(lna.Variance(3, 0) - mean * (1 + b)) <= 1e-4 * mean * (1 + b), $"LNA variance {lna.Variance(3, 0)} vs {mean * (1 + b)}");
        var solution = RateEquationSolver.Solve(Network(k, b, d), grid, new SolverOptions());
        var exact = mean * (1 - Math.Exp(-d * 10));
        Assert.True(Math.Abs(solution[1, 0] - exact) <= 1e-5 * exact, $"rate equations {solution[1, 0]} vs {exact}");
    }

    [Theory]
    [InlineData("make: burst(b) M -> 0  mass k", "a burst makes products")]
    [InlineData("make: 0 -> burst(b) M  mass k  back mass d", "makes a burst and cannot be reversible")]
    [InlineData("make: M -> burst(b) M  mass k", "both consumed and made in a burst")]
    [InlineData("make: 0 -> burst(M) M  mass k", "a mean burst size may not depend on species 'M'")]
    [InlineData("make: 0 -> burst(-1) M  mass k", "must be a positive finite number")]
    [InlineData("make: 0 -> burst(b) M + M  mass k", "a burst's species stands alone")]
    public void BadBurstsAreReported(string reaction, string message)
    {
        var outcome = ModelLoader.LoadText($"species\n  M = 0\nparameters\n  k = 1\n  b = 2\n  d = 1\nreactions\n  {reaction}\n", "bad.cnet");
        Assert.Null(outcome.Model);
        Assert.Contains(outcome.Diagnostics, x => x.Format().Contains(message));
    }

    [Fact]
    public void TheMasterEquationRefusesBursts() =>
        Assert.Contains(ModelSupport.StochasticProblems(Network(1, 2, 1)), p => p.Message.Contains("burst of random size"));
}
