using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Dimerisation 2P ⇄ D from P(0) = P0, D(0) = 0: the state is D alone (P = P0 − 2D), a finite chain on
/// which the chemical master equation (Gillespie 1977, J. Phys. Chem. 81:2340; McQuarrie 1967,
/// J. Appl. Prob. 4:413) is solved exactly in the test with the propensities of our convention,
/// a_dimerise = c1·P(P−1) and a_dissociate = c2·D at Ω = 1.
/// </summary>
public sealed class DimerisationTests
{
    private const long P0 = 30;
    private const double C1 = 0.01, C2 = 0.5;

    private static BirthDeathChain MasterEquation() => new(
        (int)(P0 / 2),
        d => C1 * (P0 - 2 * d) * (P0 - 2 * d - 1),
        d => C2 * d);

    [Fact]
    public void TheTwoMasterEquationSolutionsAgree()
    {
        // Checks the reference itself: uniformisation against the spectral solution.
        var chain = MasterEquation();
        foreach (var t in new[] { 0.25, 1.0, 5.0 })
        {
            var a = chain.ByUniformisation(0, t);
            var b = chain.BySpectralDecomposition(0, t);
            Assert.Equal(1.0, a.Sum(), 12);
            for (var s = 0; s < a.Length; s++) Assert.Equal(a[s], b[s], 9);
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void DimerDistributionMatchesTheMasterEquationAndPPlus2DIsConserved(SimulationMethod method)
    {
        const int replicates = 10_000;
        var grid = new TimeGrid(until: 5, every: 0.25);
        var samples = GridSamples.Run(TestNetworks.Dimerisation(P0, C1, C2), method, grid, replicates, seed: 1977);

        for (var r = 0; r < replicates; r++)
            for (var k = 0; k < grid.Count; k++)
                Assert.Equal(P0, samples.At(r, k, 0) + 2 * samples.At(r, k, 1));

        var chain = MasterEquation();
        foreach (var t in new[] { 0.25, 1.0, 5.0 })
        {
            var p = chain.ByUniformisation(0, t);
            SamplingChecks.FollowsDistribution(samples.Column(samples.IndexOf(t), 1), d => d < p.Length ? p[d] : 0.0, $"{method}, dimers at t = {t}");
        }
    }
}
