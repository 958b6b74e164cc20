using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Tests.Analysis.Noise;

/// <summary>
/// The LNA's variance split into the part fed by the reactions and the part fed by partitioning at divisions, for a
/// protein P made at k per gene copy (the gene doubles at phase φ) and at q·V(t) (V = V₀·2^(a/T)), lost at rate d
/// (d = 0: the stable protein of Stochastic/CellCycleTests). The network is linear, so its moments are exact and
/// closed between divisions (common practice; derived here): a molecule present at birth survives to age a with
/// p = e^(−da), and the molecules made since are Poisson with mean m(a) = ∫₀ᵃ (k·g(s) + q·V(s))·e^(−d(a−s)) ds, so
/// with B molecules at birth, Var P(a) = p²·Var B + p(1 − p)·E B + m(a). Of this, p²·(part of Var B from
/// partitioning) is partitioning noise carried forward and the rest comes from the reactions. At a binomial
/// division D ~ Binomial(N, ½): E D = E N/2, Var D = Var N/4 + E N/4 (law of total variance; Huh &amp; Paulsson
/// 2011, Nat. Genet. 43:95), the E N/4 entering the partitioning part; for halves the LNA's rule adds ⅛
/// (docs/methods.md "Growth and division"). The maps are iterated here, apart from the engine.
/// </summary>
public sealed class LnaNoiseSourcesTests
{
    private const double K = 1.5, Q = 0.5, V0 = 2, T = 30, Phase = 0.25, Start = 40;

    private static ReactionNetwork Network(double d, string split) => ModelLoader.LoadText($"""
        size {V0}
        species
          gene = 1
          P = {Start}
        parameters
          k = {K}
          q = {Q}
          d = {d}
        reactions
          make:   gene -> gene + P  mass k
          import: 0 -> P            mass q
          {(d > 0 ? "loss:   P -> 0  mass d" : "")}
        cycle
          length {T}
          genes gene double at {Phase}
          split {split}
        """, "sources.cnet").Model!.Network;

    // m(a): the mean number made since birth and still present at age a.
    private static double Made(double a, double d)
    {
        double Grown(double x) => d == 0 ? x : (Math.Exp(d * x) - 1) / d; // ∫₀ˣ e^(ds) ds
        var r = Math.Log(2) / T;
        var gene = a < Phase * T ? K * Grown(a) : K * Grown(Phase * T) + 2 * K * (Grown(a) - Grown(Phase * T));
        var volume = Q * V0 * (Math.Exp((r + d) * a) - 1) / (r + d);
        return Math.Exp(-d * a) * (gene + volume);
    }

    [Theory]
    [InlineData(0.0, "binomial")]
    [InlineData(0.02, "binomial")]
    [InlineData(0.02, "halves")]
    public void ThePartsFollowTheirExactMapsAndAddUpToTheTotal(double d, string split)
    {
        var network = Network(d, split);
        var grid = new TimeGrid(until: 5 * T, every: T / 6);
        var lna = LinearNoiseApproximation.SolveBySource(network, grid, new SolverOptions());
        var sources = lna.Sources!;
        var column = lna.ColumnIndex("P");
        // At the current birth: mean, reactions' part, partitioning part.
        double mean = Start, reactions = 0, partitioning = 0;
        for (var point = 0; point < grid.Count; point++)
        {
            var cycle = (int)Math.Floor(grid[point] / T + 1e-9);
            var age = grid[point] - cycle * T;
            if (point > 0 && age < 1e-9)
            {
                var p = Math.Exp(-d * T);
                var before = p * mean + Made(T, d);
                (mean, reactions, partitioning) = (before / 2, (p * p * reactions + p * (1 - p) * mean + Made(T, d)) / 4,
                    p * p * partitioning / 4 + (split == "binomial" ? before / 4 : 0.125));
            }
            var survive = Math.Exp(-d * age);
            var expectedReactions = survive * survive * reactions + survive * (1 - survive) * mean + Made(age, d);
            var expectedPartitioning = survive * survive * partitioning;
            var total = lna.Variance(point, column);
            Assert.Equal(expectedReactions, sources.Reactions(point, column), 1e-5 * expectedReactions + 1e-9);
            Assert.Equal(expectedPartitioning, sources.Partitioning(point, column), 1e-5 * expectedPartitioning + 1e-9);
            // Linearity: the two parts add up to the full covariance to rounding, not to the integrator's tolerance.
            Assert.Equal(total, sources.Reactions(point, column) + sources.Partitioning(point, column), 1e-12 * total + 1e-12);
        }
        Assert.True(sources.Mismatch < 1e-12, $"misfit {sources.Mismatch}");
        // The parts are the same integration as the plain LNA's variance, within its tolerance.
        var plain = LinearNoiseApproximation.Solve(network, grid, new SolverOptions());
        Assert.Equal(plain.Variance(grid.Count - 1, column), lna.Variance(grid.Count - 1, column), 1e-6 * plain.Variance(grid.Count - 1, column));
    }

    [Fact]
    public void AStableProteinOwesTwoThirdsOfItsVarianceAtBirthToPartitioning()
    {
        // d = 0, binomial: the birth maps R' = (R + λ)/4 and P' = P/4 + (μ + λ)/4 with μ → λ have the fixed points λ/3 and 2λ/3
        // (derived from the maps above; the total λ is the Poisson fixed point of Stochastic/CellCycleTests).
        var network = Network(0, "binomial");
        var grid = new TimeGrid(until: 14 * T, every: T);
        var lna = LinearNoiseApproximation.SolveBySource(network, grid, new SolverOptions());
        var column = lna.ColumnIndex("P");
        var last = grid.Count - 1;
        var lambda = Made(T, 0);
        Assert.Equal(2.0 / 3, lna.Sources!.Partitioning(last, column) / lna.Variance(last, column), 3);
        Assert.Equal(lambda, lna.Variance(last, column), 1e-3 * lambda);
    }
}
