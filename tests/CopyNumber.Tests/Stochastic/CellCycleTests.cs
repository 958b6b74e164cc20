using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// A stable protein P in a cell that grows and divides, followed along one lineage: made at rate k per gene
/// copy (the gene doubles at phase φ of the cycle) and at rate q·V(t) (zeroth order, so it grows with the
/// volume V(t) = V₀·2^(a/T), or V₀·(1 + a/T)), never degraded, diluted only by division, with each molecule
/// going to the followed daughter with probability ½ (Huh &amp; Paulsson 2011, Nat. Genet. 43:95; Beentjes,
/// Perez-Carrasco &amp; Grima 2020, Phys. Rev. E 101:032403; both quoted from memory). Everything exact is
/// derived here and computed in the test:
/// <para>Within a cycle that starts with B molecules, P(a) = B + Π(Λ(a)) with Π a Poisson count independent of
/// B (production at a rate that does not depend on P; common practice) and
/// Λ(a) = k·a (a &lt; φT), k·φT + 2k·(a − φT) (a ≥ φT), plus q·V₀·T·(2^(a/T) − 1)/ln 2 (exponential) or
/// q·V₀·(a + a²/(2T)) (linear). At division N = B + Π(λ), λ = Λ(T), and the daughter keeps
/// D ~ Binomial(N, ½), so E[D] = E[N]/2 and Var D = Var N/4 + E[N]/4 (law of total variance). The birth-to-birth
/// map is μ' = (μ + λ)/2, σ²' = (σ² + λ)/4 + (μ + λ)/4, whose fixed point is μ = σ² = λ (Poisson, as thinning
/// keeps a Poisson law Poisson). For exact halving D = N/2, or ⌊N/2⌋ and ⌈N/2⌉ with probability ½ each, the
/// law is carried exactly as a probability vector.</para>
/// </summary>
public sealed class CellCycleTests
{
    internal const double K = 1.0, Q = 0.5, V0 = 1.0, T = 40, Phase = 0.5;
    internal const long Start = 50;

    internal static ReactionNetwork Network(string growth = "exponential", string split = "binomial", string length = "40", string variation = "") =>
        ModelLoader.LoadText(ModelText(growth, split, length, variation), "cells.cnet").Model!.Network;

    /// <summary>The model as text (shared with Reports/PartitionSectionTests, which runs it through the command line).</summary>
    internal static string ModelText(string growth = "exponential", string split = "binomial", string length = "40", string variation = "") => $"""
        # a stable protein in a growing, dividing cell; illustrative
        size {V0}
        species
          gene = 1
          P = {Start}
        parameters
          k = {K}{variation}
          q = {Q}
        reactions
          make:   gene -> gene + P  mass k
          import: 0 -> P            mass q
        cycle
          growth {growth}
          length {length}
          genes gene double at {Phase}
          split {split}
        """;

    // Λ(a): the mean production from birth to age a.
    internal static double Produced(double a, string growth, double length = T)
    {
        var gene = a < Phase * length ? K * a : K * Phase * length + 2 * K * (a - Phase * length);
        var volume = growth == "exponential" ? Q * V0 * length * (Math.Pow(2, a / length) - 1) / Math.Log(2) : Q * V0 * (a + a * a / (2 * length));
        return gene + volume;
    }

    // The birth-to-birth map of mean and variance under binomial partitioning, from a fixed start.
    internal static (double Mean, double Variance) BirthMoments(int divisions, double lambda, double lambdaVariance = 0)
    {
        double mu = Start, s2 = 0;
        for (var c = 0; c < divisions; c++) (mu, s2) = ((mu + lambda) / 2, (s2 + lambda + lambdaVariance) / 4 + (mu + lambda) / 4);
        return (mu, s2);
    }

    // The law at birth after each of `divisions` divisions, as a probability vector (Poisson production, then the split).
    internal static double[] BirthLaw(int divisions, double lambda, bool binomial)
    {
        var law = new double[Start + 1];
        law[Start] = 1;
        for (var c = 0; c < divisions; c++)
        {
            var produced = Enumerable.Range(0, (int)(lambda + 20 * Math.Sqrt(lambda) + 50))
                .Select(n => MathNet.Numerics.Distributions.Poisson.PMF(lambda, n)).ToArray();
            var before = new double[law.Length + produced.Length];
            for (var b = 0; b < law.Length; b++)
                for (var n = 0; n < produced.Length; n++) before[b + n] += law[b] * produced[n];
            var after = new double[before.Length];
            for (var n = 0; n < before.Length; n++)
            {
                if (before[n] < 1e-300) continue;
                if (binomial)
                    for (var d = 0; d <= n; d++) after[d] += before[n] * MathNet.Numerics.Distributions.Binomial.PMF(0.5, n, d);
                else if (n % 2 == 0) after[n / 2] += before[n];
                else
                {
                    after[n / 2] += before[n] / 2;
                    after[n / 2 + 1] += before[n] / 2;
                }
            }
            law = after;
        }
        return law;
    }

    /// <summary>Runs replicates and keeps each one's count of P at every grid point.</summary>
    private static long[][] Simulate(ReactionNetwork network, TimeGrid grid, int replicates, ulong seed)
    {
        var simulator = SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions());
        var p = network.SpeciesIndex("P");
        var paths = new long[replicates][];
        for (var r = 0; r < replicates; r++)
        {
            var observer = new Path(grid.Count, p);
            var rng = ReplicateStreams.For(seed, r);
            simulator.Run(ref rng, grid, observer);
            paths[r] = observer.Counts;
        }
        return paths;
    }

    [Theory]
    [InlineData("exponential")]
    [InlineData("linear")]
    public void BinomialPartitioningAtBirthFollowsTheBirthToBirthMap(string growth)
    {
        const int divisions = 6;
        var lambda = Produced(T, growth);
        var births = Simulate(Network(growth), new TimeGrid(until: divisions * T, every: T), 6_000, 2011).Select(path => path[^1]).ToArray();
        var (mean, variance) = BirthMoments(divisions, lambda);
        SamplingChecks.MeanAgrees(births, mean, variance, $"P at birth after {divisions} divisions ({growth})");
        SamplingChecks.VarianceAgrees(births, variance, $"P at birth ({growth})");
        var law = BirthLaw(divisions, lambda, binomial: true);
        SamplingChecks.FollowsDistribution(births, n => n < law.Length ? law[n] : 0, $"P at birth ({growth})");
        // The map's fixed point, μ = σ² = λ, is approached as 2^−c and 4^−c: after 6 divisions within 1 and 0.1%.
        Assert.InRange(mean, lambda - 1, lambda + 1);
    }

    [Fact]
    public void ExactHalvingAtBirthFollowsItsLaw()
    {
        const int divisions = 6;
        var lambda = Produced(T, "exponential");
        var births = Simulate(Network(split: "halves"), new TimeGrid(until: divisions * T, every: T), 6_000, 7).Select(path => path[^1]).ToArray();
        var law = BirthLaw(divisions, lambda, binomial: false);
        var mean = law.Select((pr, n) => pr * n).Sum();
        var variance = law.Select((pr, n) => pr * (n - mean) * (n - mean)).Sum();
        SamplingChecks.MeanAgrees(births, mean, variance, "P at birth, halves");
        SamplingChecks.VarianceAgrees(births, variance, "P at birth, halves");
        SamplingChecks.FollowsDistribution(births, n => n < law.Length ? law[n] : 0, "P at birth, halves");
        // Halving adds at most ¼ per division where the binomial split adds E[N]/4: its fixed point σ² = (σ² + λ)/4 + ⅛
        // (P(N odd) ≈ ½ for a broad law) is λ/3 + 1/6, against λ for the binomial split.
        Assert.InRange(variance, lambda / 3 - 1, lambda / 3 + 1);
    }

    [Fact]
    public void AveragedOverTheCycleTheLawIsTheMixtureOverAges()
    {
        // One age per replicate (replicate r at age (r mod 8)·T/8 of the cycle after 5 divisions), so the samples are independent.
        const int divisions = 5, ages = 8;
        var grid = new TimeGrid(until: (divisions + 1) * T, every: T / ages);
        var paths = Simulate(Network(), grid, 8_000, 95);
        var samples = paths.Select((path, r) => path[divisions * ages + r % ages]).ToArray();
        var (mu, s2) = BirthMoments(divisions, Produced(T, "exponential"));
        var means = Enumerable.Range(0, ages).Select(i => mu + Produced(i * T / ages, "exponential")).ToArray();
        var variances = Enumerable.Range(0, ages).Select(i => s2 + Produced(i * T / ages, "exponential")).ToArray();
        var mean = means.Average();
        var variance = variances.Average() + means.Average(m => m * m) - mean * mean; // law of total variance over ages
        SamplingChecks.MeanAgrees(samples, mean, variance, "P averaged over the cycle");
        SamplingChecks.VarianceAgrees(samples, variance, "P averaged over the cycle");
    }

    [Fact]
    public void GammaCycleLengthsAddTheVarianceOfTheProduction()
    {
        // Without the volume term the production of a cycle of length T_i is Poisson with mean k·T_i·(2 − φ), T_i gamma with
        // mean T and CV c: E λ = k·T·(2 − φ), Var λ = (k·(2 − φ)·c·T)² (common practice: law of total variance).
        const double cv = 0.3;
        const int divisions = 5;
        var network = ModelLoader.LoadText($"""
            species
              gene = 1
              P = {Start}
            reactions
              make: gene -> gene + P  mass {K}
            cycle
              length {T} gamma cv {cv}
              genes gene double at {Phase}
            """, "gamma.cnet").Model!.Network;
        // Each replicate's divisions fall at its own times: read P just after the 5th by an observer of the division count.
        var simulator = SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions());
        var lambda = K * T * (2 - Phase);
        var (mean, variance) = BirthMoments(divisions, lambda, Math.Pow(K * (2 - Phase) * cv * T, 2));
        var births = new long[6_000];
        for (var r = 0; r < births.Length; r++)
        {
            var rng = ReplicateStreams.For(44, r);
            var observer = new AtDivision(network, divisions);
            // A fine grid: the count is constant between events and drops at the division, which the observer sees
            // as the first grid point after the cycle parameter 'birth' moved on for the 5th time.
            simulator.Run(ref rng, new TimeGrid(until: 12 * T, every: T / 400), observer);
            Assert.True(observer.Seen, "the fifth division happened before the end of the run");
            births[r] = observer.Count;
        }
        // The grid point lies up to T/400 after the division: about λ/400·... ≤ 0.15 molecules on average; allowed for below.
        var late = K * 1 * T / 400;
        SamplingChecks.MeanAgrees(births.Select(b => b).ToArray(), mean + late / 2, variance, "P at the 5th birth, gamma lengths");
        SamplingChecks.VarianceAgrees(births, variance + late / 2, "P at the 5th birth, gamma lengths");
    }

    [Fact]
    public void OneAndTwoThreadsAndTwoShardsGiveTheSameBits()
    {
        var network = ModelLoader.LoadText("""
            species
              gene = 1
              P = 0
            parameters
              k = 2  varies gamma cv 0.3
            reactions
              make: gene -> gene + burst(3) P  mass k
              import: 0 -> P  mass 0.2
              decay: P -> 0  mass 0.01
            cycle
              growth linear
              length 30 gamma cv 0.2
              genes gene double at 0.3
            """, "bits.cnet").Model!.Network;
        EnsembleResult Run(int threads, Shard shard) => EnsembleRunner.Run(network, new EnsembleOptions
        {
            Grid = new TimeGrid(until: 150, every: 10), Replicates = 512, Seed = 8, Threads = threads, ReplicatesPerDraw = 4, Shard = shard,
        });
        var (one, two) = (Run(1, Shard.Whole), Run(2, Shard.Whole));
        var (first, second) = (Run(2, new Shard(1, 2)), Run(1, new Shard(2, 2)));
        for (var k = 0; k < one.Grid.Count; k++)
        {
            for (var q = 0; q < 2; q++)
            {
                Assert.Equal(one.Histogram(k, q).Select(f => (f.Value, f.Frequency)), two.Histogram(k, q).Select(f => (f.Value, f.Frequency)));
                var merged = first.Histogram(k, q);
                merged.Merge(second.Histogram(k, q));
                Assert.Equal(one.Histogram(k, q).Select(f => (f.Value, f.Frequency)), merged.Select(f => (f.Value, f.Frequency)));
            }
        }
        // The cycle made a difference: the gene count is 1 or 2 along the runs.
        Assert.Contains(one.Histogram(one.Grid.Count - 1, 0), f => f.Value == 2);
    }

    private sealed class Path(int points, int species) : ITrajectoryObserver
    {
        public long[] Counts { get; } = new long[points];
        public void Record(int gridIndex, double time, long[] counts, double[] parameters) => Counts[gridIndex] = counts[species];
    }

    // The count of P at the first grid point after the given division (read from the birth-time parameter).
    private sealed class AtDivision(ReactionNetwork network, int division) : ITrajectoryObserver
    {
        private readonly int _birth = network.Cycle!.BirthSlot;
        private readonly int _p = network.SpeciesIndex("P");
        private double _lastBirth;
        private int _seenDivisions;
        public bool Seen { get; private set; }
        public long Count { get; private set; }

        public void Record(int gridIndex, double time, long[] counts, double[] parameters)
        {
            if (gridIndex == 0) (_lastBirth, _seenDivisions, Seen) = (0, 0, false);
            if (parameters[_birth] == _lastBirth) return;
            _lastBirth = parameters[_birth];
            if (++_seenDivisions == division && !Seen) (Seen, Count) = (true, counts[_p]);
        }
    }
}
