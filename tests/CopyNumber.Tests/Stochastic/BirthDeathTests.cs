using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The linear birth–death process, X → 2X at rate λx and X → 0 at rate μx, from X(0) = X0: mean
/// X0·e^((λ−μ)t) and variance X0·(λ+μ)/(λ−μ)·e^((λ−μ)t)·(e^((λ−μ)t) − 1) (Bailey 1964, The Elements of
/// Stochastic Processes, Wiley, the simple birth-and-death process; quoted from memory).
/// </summary>
public sealed class BirthDeathTests
{
    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void MeanAndVarianceMatchTheLinearBirthDeathProcess(SimulationMethod method)
    {
        const double lambda = 1.0, mu = 0.5;
        const long x0 = 10;
        const int replicates = 10_000;
        var grid = new TimeGrid(until: 2, every: 0.5);
        var samples = GridSamples.Run(TestNetworks.BirthDeath(lambda, mu, x0), method, grid, replicates, seed: 1939);

        for (var k = 1; k < grid.Count; k++)
        {
            var growth = Math.Exp((lambda - mu) * grid[k]);
            var mean = x0 * growth;
            var variance = x0 * (lambda + mu) / (lambda - mu) * growth * (growth - 1);
            var column = samples.Column(k, 0);
            SamplingChecks.MeanAgrees(column, mean, variance, $"{method}, t = {grid[k]}");
            SamplingChecks.VarianceAgrees(column, variance, $"{method}, t = {grid[k]}");
        }
    }
}
