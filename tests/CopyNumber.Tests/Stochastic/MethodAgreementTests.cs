using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The exact methods sample the same process: distributions compared between them, and first moments
/// compared with the exact moment equations of a network with propensities at most linear in the counts.
/// </summary>
public sealed class MethodAgreementTests
{
    [Fact]
    public void DirectAndNextReactionMethodsGiveTheSameGeneExpressionDistributions()
    {
        // Both are exact samplers of the same Markov jump process (Gibson & Bruck 2000, J. Phys. Chem. A
        // 104:1876), so their samples pass a two-sample chi-square test of homogeneity.
        const int replicates = 10_000;
        var grid = new TimeGrid(until: 10, every: 1);
        var network = TestNetworks.Gene();
        var direct = GridSamples.Run(network, SimulationMethod.Direct, grid, replicates, seed: 1976);
        var next = GridSamples.Run(network, SimulationMethod.NextReaction, grid, replicates, seed: 2000);
        foreach (var t in new[] { 2.0, 10.0 })
        {
            var k = direct.IndexOf(t);
            SamplingChecks.SameDistribution(direct.Column(k, 2), next.Column(k, 2), $"mRNA at t = {t}");
            SamplingChecks.SameDistribution(direct.Column(k, 3), next.Column(k, 3), $"protein at t = {t}");
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void GeneExpressionMeansObeyTheMomentEquations(SimulationMethod method)
    {
        // When every propensity is at most linear in the counts, the means obey the rate equations
        // exactly: d⟨x⟩/dt = N·a(⟨x⟩) (e.g. van Kampen 2007, Stochastic Processes in Physics and
        // Chemistry, 3rd ed., Elsevier; quoted from memory). Solved here by classical Runge–Kutta
        // (Kutta 1901) with step 10⁻³, whose error (~10⁻¹²) is far below the sampling error.
        const double kOn = 0.5, kOff = 0.5, kM = 5, kP = 2, dM = 1, dP = 0.5;
        const int replicates = 4_000;
        var grid = new TimeGrid(until: 6, every: 1);
        var samples = GridSamples.Run(TestNetworks.Gene(kOn, kOff, kM, kP, dM, dP), method, grid, replicates, seed: 1901);

        double[] Rate(double[] m) =>
        [
            -kOn * m[0] + kOff * m[1],
            kOn * m[0] - kOff * m[1],
            kM * m[1] - dM * m[2],
            kP * m[2] - dP * m[3],
        ];
        var mean = new double[] { 1, 0, 0, 0 };
        const double h = 1e-3;
        var time = 0.0;
        for (var k = 1; k < grid.Count; k++)
        {
            while (time < grid[k] - h / 2)
            {
                var k1 = Rate(mean);
                var k2 = Rate(mean.Select((m, i) => m + h / 2 * k1[i]).ToArray());
                var k3 = Rate(mean.Select((m, i) => m + h / 2 * k2[i]).ToArray());
                var k4 = Rate(mean.Select((m, i) => m + h * k3[i]).ToArray());
                mean = mean.Select((m, i) => m + h / 6 * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i])).ToArray();
                time += h;
            }
            for (var species = 0; species < 4; species++)
            {
                var column = samples.Column(k, species);
                SamplingChecks.MeanAgrees(column, mean[species], Math.Max(SamplingChecks.Variance(column), 1e-300),
                    $"{method}, species {species} at t = {grid[k]}");
            }
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void LargeNetworksSelectFromTheSumTreeCorrectly(SimulationMethod method)
    {
        // 33 independent immigration–death pairs: 66 reactions, above the linear-selection limit, so the
        // direct method and tau-leaping's exact steps use the sum tree. One pair is fast (α = 50) and
        // keeps tau-leaping's τ' below 10/a0, so tau-leaping takes exact steps here too. Each X_i(t) is
        // Poisson with mean (α_i/μ)(1 − e^(−μt)), and their sum is Poisson with the summed mean (Bailey
        // 1964, The Elements of Stochastic Processes; quoted from memory).
        const int pairs = 33;
        const double mu = 1.0, t = 2.0;
        Assert.True(2 * pairs > SimulatorFactory.LinearSelectionLimit);
        var builder = new TestNetwork();
        var alphas = Enumerable.Range(0, pairs).Select(i => i == 0 ? 50 : 0.1 + 0.02 * i).ToArray();
        for (var i = 0; i < pairs; i++)
            builder.Species($"X{i}", 0).Parameter($"alpha{i}", alphas[i])
                .Mass($"in{i}", "", $"X{i}", $"alpha{i}").Mass($"out{i}", $"X{i}", "", "1");
        const int replicates = 4_000;
        var grid = new TimeGrid(until: t, every: t);
        var samples = GridSamples.Run(builder.Build(), method, grid, replicates, seed: 66);

        var last = grid.Count - 1;
        var totalMean = 0.0;
        var total = new long[replicates];
        for (var i = 0; i < pairs; i++)
        {
            var lambda = alphas[i] / mu * (1 - Math.Exp(-mu * t));
            totalMean += lambda;
            var column = samples.Column(last, i);
            for (var r = 0; r < replicates; r++) total[r] += column[r];
            SamplingChecks.MeanAgrees(column, lambda, lambda, $"{method}, X{i}");
        }
        SamplingChecks.FollowsDistribution(total, SamplingChecks.Poisson(totalMean), $"{method}, sum of all X");
    }
}
