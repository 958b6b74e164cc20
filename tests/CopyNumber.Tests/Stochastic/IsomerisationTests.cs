using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Isomerisation A ⇄ B (A → B at c1·a, B → A at c2·b) with A + B = n. Each molecule is an independent
/// two-state Markov chain, so from A(0) = n, A(t) is binomial(n, p(t)) with
/// p(t) = c2/(c1+c2) + c1/(c1+c2)·e^(−(c1+c2)t), stationary binomial(n, c2/(c1+c2)) (Jahnke &amp;
/// Huisinga 2007, J. Math. Biol. 54:1, monomolecular networks have multinomial distributions).
/// </summary>
public sealed class IsomerisationTests
{
    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void CountIsBinomialAndAPlusBIsConserved(SimulationMethod method)
    {
        const long n = 20;
        const double c1 = 1.0, c2 = 0.5;
        const int replicates = 5_000;
        var grid = new TimeGrid(until: 10, every: 0.5);
        var samples = GridSamples.Run(TestNetworks.Isomerisation(n, 0, c1, c2), method, grid, replicates, seed: 2007);

        for (var r = 0; r < replicates; r++)
            for (var k = 0; k < grid.Count; k++)
                Assert.Equal(n, samples.At(r, k, 0) + samples.At(r, k, 1));

        // t = 10: e^(−15) ≈ 3·10⁻⁷, the stationary distribution to far better than the test can resolve.
        foreach (var t in new[] { 0.5, 1.0, 2.0, 10.0 })
        {
            var p = c2 / (c1 + c2) + c1 / (c1 + c2) * Math.Exp(-(c1 + c2) * t);
            var column = samples.Column(samples.IndexOf(t), 0);
            SamplingChecks.MeanAgrees(column, n * p, n * p * (1 - p), $"{method}, t = {t}");
            SamplingChecks.FollowsDistribution(column, SamplingChecks.Binomial(p, n), $"{method}, t = {t}");
        }
    }
}
