using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using MathNet.Numerics.LinearAlgebra;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Ensembles;

/// <summary>Covariances between species per grid time (covariances.parquet), against exact laws and across splits of a run.</summary>
public sealed class CovarianceTests(ITestOutputHelper output)
{
    private static ReactionNetwork Load(string text) => ModelLoader.LoadText(text, "covariance.cnet").Model!.Network;

    private static EnsembleResult Run(ReactionNetwork network, TimeGrid grid, long replicates, ulong seed, int threads = 1, Shard? shard = null) =>
        EnsembleRunner.Run(network, new EnsembleOptions
        {
            Grid = grid, Replicates = replicates, Seed = seed, Threads = threads, Method = SimulationMethod.Direct, Shard = shard ?? Shard.Whole,
        });

    [Fact]
    public void Isomerisation_with_a_conserved_total_has_cov_A_B_equal_to_minus_the_binomial_variance()
    {
        // A ⇌ B (kf, kb) from A = N, B = 0: each molecule flips independently, so A(t) ~ Binomial(N, p(t)) with
        // p(t) = kb/(kf + kb) + kf/(kf + kb)·e^{−(kf + kb)t} (a two-state Markov chain per molecule; common practice), and
        // B = N − A gives Cov(A, B) = −Var A = −N·p(1 − p) exactly.
        const int n = 40;
        const double kf = 1, kb = 0.5;
        var network = Load($"species\n  A = {n}\n  B = 0\nparameters\n  kf = {kf}\n  kb = {kb}\nreactions\n  flip: A -> B mass kf back mass kb\n");
        var grid = new TimeGrid(3, 0.5);
        var result = Run(network, grid, 4000, 11);
        Assert.Equal([new SpeciesPair(0, 1)], result.Pairs);
        for (var k = 1; k < grid.Count; k++)
        {
            var p = kb / (kf + kb) + kf / (kf + kb) * Math.Exp(-(kf + kb) * grid[k]);
            var exact = -n * p * (1 - p);
            var estimate = result.Covariance(k, 0);
            var sampleVariance = DistributionSummary.From(result.Histogram(k, 0)).Variance;
            output.WriteLine($"t = {grid[k]}: Cov(A, B) {estimate.Covariance:G6} ± {estimate.StandardError:G3}, exact {exact:G6}, correlation {estimate.Correlation:G6}");
            // Per replicate A + B = N, so the sample covariance is minus the sample variance up to round-off.
            Assert.Equal(-sampleVariance, estimate.Covariance, 1e-9 * sampleVariance);
            Assert.Equal(-1, estimate.Correlation, 1e-12);
            // Against the binomial law: 4 standard errors at each of 6 times (two-sided normal tail 6.3·10⁻⁵ each).
            Assert.InRange(estimate.Covariance, exact - 4 * estimate.StandardError, exact + 4 * estimate.StandardError);
        }
        // At t = 0 every replicate holds (N, 0): no spread, covariance 0, correlation undefined.
        Assert.Equal(0, result.Covariance(0, 0).Covariance);
        Assert.True(double.IsNaN(result.Covariance(0, 0).Correlation));
    }

    [Fact]
    public void A_translation_chain_has_the_stationary_covariance_of_its_moment_equations()
    {
        // 0 → A (k), A → 0 (d₁·A), A → A + B (c·A), B → 0 (d₂·B): every propensity is linear, so the moment equations close and the
        // stationary covariance matrix C solves the Lyapunov equation J·C + C·Jᵀ + N·diag(v)·Nᵀ = 0 exactly (van Kampen 2007,
        // Stochastic Processes in Physics and Chemistry, ch. X; Elf & Ehrenberg 2003, Genome Res. 13:2475). Solved here for its
        // three unknowns; in closed form Cov(A, B) = c·⟨A⟩/(d₁ + d₂) (quoted from memory, and checked against the solve).
        const double kIn = 10, c = 2, d1 = 1, d2 = 0.25;
        var network = Load($"species\n  A = 0\n  B = 0\nparameters\n  k = {kIn}\n  c = {c}\n  d1 = {d1}\n  d2 = {d2}\n" +
            "reactions\n  make: 0 -> A mass k\n  loss_a: A -> 0 mass d1\n  translate: A -> A + B mass c\n  loss_b: B -> 0 mass d2\n");
        var a = kIn / d1;
        var b = c * a / d2;
        double[,] j = { { -d1, 0 }, { c, -d2 } };
        double[,] noise = { { kIn + d1 * a, 0 }, { 0, c * a + d2 * b } };
        // Unknowns (C₁₁, C₁₂, C₂₂); rows: the (1,1), (1,2) and (2,2) entries of J·C + C·Jᵀ = −D.
        var m = Matrix<double>.Build.DenseOfArray(new[,]
        {
            { 2 * j[0, 0], 2 * j[0, 1], 0 },
            { j[1, 0], j[0, 0] + j[1, 1], j[0, 1] },
            { 0, 2 * j[1, 0], 2 * j[1, 1] },
        });
        var covariance = m.Solve(Vector<double>.Build.Dense([-noise[0, 0], -noise[0, 1], -noise[1, 1]]));
        var exact = covariance[1];
        Assert.Equal(c * a / (d1 + d2), exact, 1e-9);

        // From 0, the slowest relaxation is e^{−d₂t}: at t = 60 it is e^{−15}·⟨B⟩ ≈ 2·10⁻⁵ copies, far below the sampling error.
        var grid = new TimeGrid(60, 20);
        var result = Run(network, grid, 4000, 21, threads: 2);
        var estimate = result.Covariance(grid.Count - 1, 0);
        output.WriteLine($"Cov(A, B) at t = 60: {estimate.Covariance:G6} ± {estimate.StandardError:G3}; exact stationary {exact:G6}");
        Assert.InRange(estimate.Covariance, exact - 4 * estimate.StandardError, exact + 4 * estimate.StandardError);
    }

    [Fact]
    public void Covariances_are_the_same_bits_for_one_or_two_threads_and_for_shards_combined()
    {
        // The pairs' sums are combined by the fixed tree of MomentTree (Chan, Golub & LeVeque 1983), so the split of the
        // blocks over threads or shards must not change one bit (common practice: a reproducibility requirement).
        var network = Load("species\n  off = 1\n  on = 0\n  m = 0\nparameters\n  kon = 0.5\n  koff = 0.5\n  ktx = 8\n  dm = 1\n" +
            "reactions\n  flip: off -> on mass kon back mass koff\n  transcribe: on -> on + m mass ktx\n  decay: m -> 0 mass dm\n");
        var grid = new TimeGrid(5, 0.5);
        var one = Run(network, grid, 700, 5, threads: 1);
        var two = Run(network, grid, 700, 5, threads: 2);
        var shards = EnsembleResult.Combine(Run(network, grid, 700, 5, shard: new Shard(2, 3)),
            EnsembleResult.Combine(Run(network, grid, 700, 5, shard: new Shard(3, 3)), Run(network, grid, 700, 5, shard: new Shard(1, 3))));
        Assert.Equal(3, one.Pairs.Count);
        for (var k = 0; k < grid.Count; k++)
            for (var p = 0; p < one.Pairs.Count; p++)
            {
                var expected = BitConverter.DoubleToInt64Bits(one.Covariance(k, p).Covariance);
                Assert.Equal(expected, BitConverter.DoubleToInt64Bits(two.Covariance(k, p).Covariance));
                Assert.Equal(expected, BitConverter.DoubleToInt64Bits(shards.Covariance(k, p).Covariance));
            }
        // The gene's two states are complementary: Cov(off, on) = −Var(on) at every time after 0.
        Assert.Equal(-DistributionSummary.From(one.Histogram(grid.Count - 1, 1)).Variance, one.Covariance(grid.Count - 1, 0).Covariance, 1e-12);
    }

    [Fact]
    public void Large_networks_get_only_the_pairs_named()
    {
        var species = string.Join("\n", Enumerable.Range(0, SpeciesPair.AllPairsUpTo + 1).Select(i => $"  S{i} = 1"));
        var network = Load($"species\n{species}\nparameters\n  k = 1\nreactions\n  decay: S0 -> 0 mass k\n");
        Assert.Empty(SpeciesPair.Default(network));
        Assert.Equal([new SpeciesPair(1, 3), new SpeciesPair(0, 10)], SpeciesPair.Parse("S3:S1, S0:S10", network));
        Assert.Equal(55, SpeciesPair.Parse("all", network).Count);
        Assert.Contains("'S99' is not a species", Assert.Throws<ArgumentException>(() => SpeciesPair.Parse("S1:S99", network)).Message);
        Assert.Contains("twice", Assert.Throws<ArgumentException>(() => SpeciesPair.Parse("S1:S1", network)).Message);
        Assert.Contains("NAME:NAME", Assert.Throws<ArgumentException>(() => SpeciesPair.Parse("S1", network)).Message);
        // The memory estimate counts the pairs' accumulators: all 55 pairs cost more than none.
        var options = new EnsembleOptions { Grid = new TimeGrid(100, 0.1), Replicates = 1000, Seed = 1, Threads = 1 };
        var none = EnsembleMemory.For(network, options);
        var all = EnsembleMemory.For(network, options with { CovariancePairs = SpeciesPair.Parse("all", network) });
        // 1001 grid points × 55 pairs × 72 bytes per accumulator, in the worker's leaf and in the tree's nodes.
        Assert.True(all.TotalBytes - none.TotalBytes >= 1001L * 55 * 72 * 2, $"{all.TotalBytes} against {none.TotalBytes}");
    }
}
