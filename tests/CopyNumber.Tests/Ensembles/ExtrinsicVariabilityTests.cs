using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Ensembles;

/// <summary>
/// Extrinsic variability: immigration–death with a gamma-distributed immigration rate k (mean m, CV c) from
/// X(0) = 0. Given k, X(t) is Poisson with mean k·u, u = (1 − e^(−dt))/d (Bailey 1964, quoted from memory),
/// so the marginal is a gamma mixture of Poisson laws: negative binomial with r = 1/c² and success
/// probability 1/(1 + m·c²·u) (common practice: the gamma–Poisson mixture). The law of total variance
/// splits its variance into the intrinsic part E[Var(X | k)] = m·u = ⟨x⟩ and the extrinsic part
/// Var(E[X | k]) = (m·u·c)², i.e. squared CVs 1/⟨x⟩ and c² (common practice; Swain, Elowitz &amp; Siggia 2002,
/// PNAS 99:12795). Everything exact is computed in the test.
/// </summary>
public sealed class ExtrinsicVariabilityTests
{
    internal const double Mean = 20, Cv = 0.5, Death = 1, Until = 4;
    private static readonly double Exposure = (1 - Math.Exp(-Death * Until)) / Death;

    /// <summary>The model as text, shared with the report's check of the same split (Reports/NoiseSectionTests).</summary>
    internal static readonly string ModelText = $"""
        # immigration with a cell-to-cell varying rate, illustrative
        species
          X = 0
        parameters
          k = {Mean}  varies gamma cv {Cv}
          d = {Death}
        reactions
          arrive: 0 -> X  mass k
          leave:  X -> 0  mass d
        """;

    private static ReactionNetwork Network() => ModelLoader.LoadText(ModelText, "extrinsic.cnet").Model!.Network;

    [Fact]
    public void MarginalLawIsNegativeBinomial()
    {
        // One replicate per draw, so the sample is independent and Pearson's test applies.
        var network = Network();
        Assert.True(network.Variability.Any);
        var simulator = SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions());
        var grid = new TimeGrid(until: Until, every: Until);
        var parameters = new double[network.Parameters.Count];
        var observer = new LastCount();
        var values = new long[6_000];
        for (var r = 0; r < values.Length; r++)
        {
            for (var p = 0; p < parameters.Length; p++) parameters[p] = network.InitialParameterValues[p];
            network.Variability.Draw(13, r, parameters);
            simulator.StartFrom(parameters);
            var rng = ReplicateStreams.For(13, r);
            simulator.Run(ref rng, grid, observer);
            values[r] = observer.Last;
        }
        var mean = Mean * Exposure;
        var variance = mean + mean * mean * Cv * Cv;
        SamplingChecks.MeanAgrees(values, mean, variance, "marginal");
        SamplingChecks.VarianceAgrees(values, variance, "marginal");
        SamplingChecks.FollowsDistribution(values,
            n => MathNet.Numerics.Distributions.NegativeBinomial.PMF(1 / (Cv * Cv), 1 / (1 + Mean * Cv * Cv * Exposure), (int)n), "marginal");
    }

    [Fact]
    public void NestedDesignSplitsTheVarianceIntoItsIntrinsicAndExtrinsicParts()
    {
        var result = EnsembleRunner.Run(Network(), new EnsembleOptions
        {
            Grid = new TimeGrid(until: Until, every: Until / 2), Replicates = 32_000, Seed = 2002, Threads = 2, ReplicatesPerDraw = 8,
        });
        var noise = result.Noise!;
        var x = Mean * Exposure;
        var intrinsic = noise.Intrinsic(2, 0);
        var extrinsic = noise.Extrinsic(2, 0);
        Assert.Equal(2_000, noise.Pairs(2, 0));
        Assert.True(Math.Abs(intrinsic.Mean - x) <= 5 * intrinsic.StandardError,
            $"intrinsic {intrinsic.Mean} ± {intrinsic.StandardError} vs exact {x}");
        Assert.True(Math.Abs(extrinsic.Mean - x * x * Cv * Cv) <= 5 * extrinsic.StandardError,
            $"extrinsic {extrinsic.Mean} ± {extrinsic.StandardError} vs exact {x * x * Cv * Cv}");
        // the parts are resolved: each standard error is well below the part itself
        Assert.True(intrinsic.StandardError < 0.05 * x && extrinsic.StandardError < 0.1 * x * x * Cv * Cv);
    }

    [Fact]
    public void OneAndTwoThreadsGiveTheSameBits()
    {
        EnsembleResult Run(int threads) => EnsembleRunner.Run(Network(), new EnsembleOptions
        {
            Grid = new TimeGrid(until: Until, every: 1), Replicates = 1_000, Seed = 5, Threads = threads, ReplicatesPerDraw = 4,
        });
        var (one, two) = (Run(1), Run(2));
        for (var k = 0; k < one.Grid.Count; k++)
        {
            Assert.Equal(one.Histogram(k, 0).Select(f => (f.Value, f.Frequency)), two.Histogram(k, 0).Select(f => (f.Value, f.Frequency)));
            Assert.Equal(one.Noise!.Intrinsic(k, 0).State, two.Noise!.Intrinsic(k, 0).State);
            Assert.Equal(one.Noise!.Extrinsic(k, 0).State, two.Noise!.Extrinsic(k, 0).State);
        }
    }

    [Theory]
    [InlineData("k = 20  varies gama cv 0.5", "expected a law after 'varies'")]
    [InlineData("k = 20  varies gamma 0.5", "expected 'cv'")]
    [InlineData("k = 20  varies uniform cv 0.7", "reaches below 0")]
    [InlineData("k = 20  varies gamma cv -1", "must be a finite number, zero or more")]
    public void BadVariationIsReported(string line, string message)
    {
        var outcome = ModelLoader.LoadText($"species\n  X = 0\nparameters\n  {line}\nreactions\n  r: 0 -> X  mass k\n", "bad.cnet");
        Assert.Null(outcome.Model);
        Assert.Contains(outcome.Diagnostics, d => d.Format().Contains(message));
    }

    [Fact]
    public void AParameterDerivedFromAVaryingOneIsReported()
    {
        var outcome = ModelLoader.LoadText("species\n  X = 0\nparameters\n  k = 20  varies gamma cv 0.5\n  k2 = 2 * k\nreactions\n  r: 0 -> X  mass k2\n", "bad.cnet");
        Assert.Contains(outcome.Diagnostics, d => d.Format().Contains("uses 'k', which varies per replicate"));
    }

    private sealed class LastCount : ITrajectoryObserver
    {
        public long Last { get; private set; }
        public void Record(int gridIndex, double time, long[] counts, double[] parameters) => Last = counts[0];
    }
}
