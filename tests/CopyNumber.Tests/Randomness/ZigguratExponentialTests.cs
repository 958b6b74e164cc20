using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Stochastic;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Randomness;

/// <summary>
/// The exponential sampler (Marsaglia &amp; Tsang 2000, J. Stat. Softw. 5(8)): its tables, its law, its tail,
/// its use of the bits of a draw, and its independence from the uniform draw that follows it.
/// </summary>
public class ZigguratExponentialTests
{
    private const double Unit = 1.0 / (1UL << 53);

    [Fact]
    public void The_tables_built_at_start_up_reproduce_the_published_constants_and_equal_layer_areas()
    {
        // Marsaglia & Tsang (2000), section on the exponential: 256 layers, r = 7.69711747013104972 and
        // v = 0.3949659822581572e-2 (quoted from memory). Ours are solved for by bisection, so they agree
        // to the double precision of the recurrence, not to the last digit.
        var r = ZigguratExponential.TailStart;
        var v = ZigguratExponential.LayerArea;
        Assert.Equal(7.69711747013104972, r, 1e-12);
        Assert.Equal(3.949659822581572e-3, v, 1e-15);
        // Every layer has area v: the base layer's rectangle plus the tail e^(−r) (∫_r^∞ e^(−x) dx), each
        // layer above it x_i·(e^(−x_(i+1)) − e^(−x_i)), the cap x_255·(1 − e^(−x_255)).
        Assert.Equal(r, ZigguratExponential.Edge(1));
        Assert.Equal(v, ZigguratExponential.Edge(0) * Math.Exp(-r), v * 1e-13);
        Assert.Equal(v, r * Math.Exp(-r) + Math.Exp(-r), v * 1e-13);
        for (var i = 1; i < ZigguratExponential.Layers; i++)
        {
            var upper = i + 1 < ZigguratExponential.Layers ? Math.Exp(-ZigguratExponential.Edge(i + 1)) : 1.0;
            var area = ZigguratExponential.Edge(i) * (upper - Math.Exp(-ZigguratExponential.Edge(i)));
            Assert.True(Math.Abs(area - v) <= v * 1e-9, $"layer {i}: area {area:R}, v {v:R}");
            Assert.True(ZigguratExponential.Edge(i + 1) < ZigguratExponential.Edge(i));
        }
        Assert.Equal(0.0, ZigguratExponential.Edge(ZigguratExponential.Layers));
    }

    [Fact]
    public void Ten_million_draws_pass_the_Kolmogorov_Smirnov_test_against_Exp_1()
    {
        // One-sample Kolmogorov–Smirnov test (Kolmogorov 1933, Giorn. Ist. Ital. Attuari 4:83; Smirnov 1948,
        // Ann. Math. Stat. 19:279): under H0, P(√n·D_n > λ) → 2 Σ_(k≥1) (−1)^(k−1) e^(−2k²λ²). At λ = 2.694 the
        // first term, 2e^(−2λ²) = 9.9e-7, is the level (the others are below 1e-24); n = 10⁷ is far into the
        // asymptotic regime. A ziggurat without its wedge test has D = 1.9·10⁻³ (√n·D ≈ 6.0; computed from
        // the layers' uniform laws); one that puts the tail's mass e^(−r) = 4.5·10⁻⁴ at r has √n·D ≈ 1.4, which
        // this test would miss and the tail test below catches.
        const int n = 10_000_000;
        const double critical = 2.694;
        var generator = new Xoshiro256StarStar(20001);
        var values = new double[n];
        for (var i = 0; i < n; i++) values[i] = generator.NextExponential();
        Array.Sort(values);
        var d = 0.0;
        for (var i = 0; i < n; i++)
        {
            var f = -double.ExpM1(-values[i]);
            d = Math.Max(d, Math.Max((i + 1.0) / n - f, f - (double)i / n));
        }
        Assert.True(Math.Sqrt(n) * d < critical, $"√n·D = {Math.Sqrt(n) * d:F3} ≥ {critical}");
        Assert.True(values[0] >= 0.0 && double.IsFinite(values[^1]));
    }

    [Fact]
    public void The_tail_beyond_the_last_layer_has_probability_e_to_the_minus_r_and_is_again_exponential()
    {
        // P(X > r) = e^(−r) for Exp(1), and X − r given X > r is Exp(1) (memorylessness; textbook). The
        // count is binomial(n, e^(−r)); its mean excess has standard error 1/√k. Tolerance 5 standard errors.
        const int n = 10_000_000;
        var r = ZigguratExponential.TailStart;
        var generator = new Xoshiro256StarStar(777);
        var beyond = 0L;
        var excess = 0.0;
        var farBeyond = 0L;
        for (var i = 0; i < n; i++)
        {
            var x = generator.NextExponential();
            if (x <= r) continue;
            beyond++;
            excess += x - r;
            if (x > r + 1) farBeyond++;
        }
        var p = Math.Exp(-r);
        var sd = Math.Sqrt(n * p * (1 - p));
        Assert.InRange(beyond, n * p - 5 * sd, n * p + 5 * sd);
        Assert.InRange(excess / beyond, 1 - 5 / Math.Sqrt(beyond), 1 + 5 / Math.Sqrt(beyond));
        // Beyond r + 1 among those beyond r: binomial(k, e^(−1)), so the tail's own tail is right too.
        var q = Math.Exp(-1);
        var sdFar = Math.Sqrt(beyond * q * (1 - q));
        Assert.InRange(farBeyond, beyond * q - 5 * sdFar, beyond * q + 5 * sdFar);
    }

    [Fact]
    public void The_first_three_moments_are_those_of_Exp_1()
    {
        // Exp(1): E X = 1, Var X = 1, E X³ = 3! = 6, E X⁴ = 24, E X⁶ = 720 (textbook). Standard errors: of
        // the mean 1/√n, of the variance √((μ4 − σ⁴)/n) = √(8/n), of the third raw moment √((720 − 36)/n).
        // Tolerance 5 standard errors.
        const int n = 10_000_000;
        var generator = new Xoshiro256StarStar(31337);
        double sum = 0, sumSquares = 0, sumCubes = 0;
        for (var i = 0; i < n; i++)
        {
            var x = generator.NextExponential();
            sum += x;
            sumSquares += x * x;
            sumCubes += x * x * x;
        }
        var mean = sum / n;
        var variance = (sumSquares - n * mean * mean) / (n - 1);
        Assert.InRange(mean, 1 - 5 / Math.Sqrt(n), 1 + 5 / Math.Sqrt(n));
        Assert.InRange(variance, 1 - 5 * Math.Sqrt(8.0 / n), 1 + 5 * Math.Sqrt(8.0 / n));
        Assert.InRange(sumCubes / n, 6 - 5 * Math.Sqrt(684.0 / n), 6 + 5 * Math.Sqrt(684.0 / n));
    }

    [Fact]
    public void The_layer_and_the_abscissa_come_from_disjoint_bits_and_the_abscissa_has_53_bits()
    {
        // The documented use of a draw: layer = bits 0–7, abscissa = bits 11–63 scaled by x_layer·2^−53
        // (exact: scaling by a power of two). Bits 8–10 are unused; the lowest abscissa bit (bit 11) counts.
        var spare = new Xoshiro256StarStar(1);
        var random = new Xoshiro256StarStar(5);
        for (var trial = 0; trial < 100_000; trial++)
        {
            var layer = (int)(random.NextUInt64() % 200) + 1;
            var inner = ZigguratExponential.Edge(layer + 1);
            // A mantissa inside the layer's rectangle (x < x_(layer+1)), so the draw is accepted as it is.
            var limit = (ulong)(inner / (ZigguratExponential.Edge(layer) * Unit)) - 1;
            var m = random.NextUInt64() % limit;
            var bits = (m << 11) | (ulong)layer;
            var untouched = spare;
            var x = ZigguratExponential.Sample(bits, ref spare);
            Assert.Equal(m * (ZigguratExponential.Edge(layer) * Unit), x);
            Assert.Equal(x, ZigguratExponential.Sample(bits | (0b111UL << 8), ref spare));
            // Monotone in the mantissa; strictly so where the product is exact (small m): the lowest
            // abscissa bit is used. (For m near 2^53 neighbouring mantissas may round to one double.)
            var nextUp = ZigguratExponential.Sample(((m + 1) << 11) | (ulong)layer, ref spare);
            Assert.True(nextUp >= x);
            var small = m >> 20;
            Assert.True(ZigguratExponential.Sample((((small << 1) | 1) << 11) | (ulong)layer, ref spare)
                        > ZigguratExponential.Sample(((small << 1) << 11) | (ulong)layer, ref spare));
            Assert.Equal(untouched.NextUInt64(), spare.NextUInt64()); // the fast path drew nothing more
        }
    }

    [Fact]
    public void Waiting_time_and_selected_reaction_are_independent_in_the_direct_method()
    {
        // G → A (k1 = 0.3) and G → B (k2 = 0.7), one G: the single event comes after τ ~ Exp(1) and is A with
        // probability 0.3, independently of τ (Gillespie 1976, J. Comput. Phys. 22:403). The grid (step
        // 0.05 to t = 4) bins τ; the cells are (bin, reaction) for 80 bins plus "no event by t = 4", so
        // Pearson's χ² (Pearson 1900) has 2·80 + 1 − 1 = 160 degrees of freedom against the fully specified
        // law. Level 1e-4 (ChiSquareTest.Level); seed fixed. The waiting time is the ziggurat draw, the
        // reaction the next uniform of the same stream: a dependence between them shows here.
        const int replicates = 400_000;
        const double step = 0.05, until = 4.0, k1 = 0.3, k2 = 0.7;
        var network = new TestNetwork().Species("G", 1).Species("A", 0).Species("B", 0)
            .Mass("to_a", "G", "A", "0.3").Mass("to_b", "G", "B", "0.7").Build();
        var simulator = SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions());
        var grid = new TimeGrid(until, step);
        var bins = (int)Math.Round(until / step);
        var observed = new long[bins, 2];
        var none = 0L;
        var observer = new FirstEvent();
        var rng = new Xoshiro256StarStar(4242);
        for (var r = 0; r < replicates; r++)
        {
            observer.Reset();
            simulator.Run(ref rng, grid, observer);
            if (observer.Bin < 0) none++;
            else observed[observer.Bin - 1, observer.Reaction]++;
        }
        var statistic = 0.0;
        for (var b = 0; b < bins; b++)
        {
            var mass = Math.Exp(-b * step) - Math.Exp(-(b + 1) * step);
            for (var j = 0; j < 2; j++)
            {
                var expected = replicates * mass * (j == 0 ? k1 : k2);
                var difference = observed[b, j] - expected;
                statistic += difference * difference / expected;
            }
        }
        var expectedNone = replicates * Math.Exp(-until);
        statistic += (none - expectedNone) * (none - expectedNone) / expectedNone;
        var pValue = 1 - ChiSquared.CDF(2 * bins, statistic);
        Assert.True(pValue > ChiSquareTest.Level, $"χ² = {statistic:F1} on {2 * bins} df, p = {pValue:G3}");
    }

    /// <summary>The first grid index at which G is gone, and which product it became.</summary>
    private sealed class FirstEvent : ITrajectoryObserver
    {
        public int Bin { get; private set; } = -1;
        public int Reaction { get; private set; }

        public void Reset() => Bin = -1;

        public void Record(int gridIndex, double time, long[] counts, double[] parameters)
        {
            if (Bin >= 0 || counts[0] != 0) return;
            Bin = gridIndex;
            Reaction = counts[1] == 1 ? 0 : 1;
        }
    }
}
