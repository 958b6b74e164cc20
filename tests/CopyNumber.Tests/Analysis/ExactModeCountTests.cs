using CopyNumber.Analysis;
using CopyNumber.Network;
using CopyNumber.Randomness;
using MathNet.Numerics;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// The mode count against exact laws of the chemical master equation on small state spaces, solved here:
/// one-step (birth–death) chains, whose stationary law follows from detailed balance,
/// π(x + 1)/π(x) = λ(x)/μ(x + 1) (Gardiner, Handbook of Stochastic Methods, 3rd ed. 2004, §7.1;
/// quoted from memory), and whose law at a time t comes from uniformisation,
/// p(t) = Σ_k e^(−Λt)(Λt)^k/k! · (I + Q/Λ)^k p(0) with Λ ≥ every total exit rate (Jensen 1953;
/// common practice). Propensities follow docs/conventions.md (falling factorials, size 1).
/// </summary>
public sealed class ExactModeCountTests(ITestOutputHelper output)
{
    // 3 A <-> T with A + 3T = 60: a chain in T = 0..20 with λ(T) = kf·ff(A, 3), μ(T) = kr·T, A = 60 − 3T.
    private const string Trimer =
        "# illustrative trimerisation\nspecies\n  A = 60\n  T = 0\nreactions\n  pair: 3 A -> T mass 0.001  back mass 1\n";

    private static double TrimerForward(int t)
    {
        var a = 60.0 - 3 * t;
        return a >= 3 ? 0.001 * a * (a - 1) * (a - 2) : 0.0;
    }

    // Schlögl-type chain (as in Cli/BistableContrastTests): λ(x) = k3 + k1·x(x − 1), μ(x) = k4·x + k2·x(x − 1)(x − 2);
    // its rate equation −k2(x − 100)(x − 250)(x − 400) has stable points 100 and 400.
    private static double SchloeglBirth(int x) => 100 + 0.0075 * x * (x - 1.0);
    // With inflow k3 = 106 instead of 100 the two wells hold about equal mass at stationarity (53% below
    // x = 250; at k3 = 100 the upper well holds 2.6% and its peak is 0.8% as high as the lower one's,
    // below the 5% relative prominence a mode needs).
    private static double BalancedSchloeglBirth(int x) => 106 + 0.0075 * x * (x - 1.0);
    private static double SchloeglDeath(int x) => 1.65 * x + 1e-5 * x * (x - 1.0) * (x - 2.0);
    private const int SchloeglStates = 801; // 0..800: the law above 800 is below 1e-12 (checked: the mass at 800)

    private static double[] Stationary(Func<int, double> birth, Func<int, double> death, int states)
    {
        var log = new double[states];
        for (var x = 0; x + 1 < states; x++) log[x + 1] = log[x] + Math.Log(birth(x) / death(x + 1));
        var top = log.Max();
        var p = log.Select(l => Math.Exp(l - top)).ToArray();
        var sum = p.Sum();
        return p.Select(q => q / sum).ToArray();
    }

    // Uniformisation on states 0..states − 1, birth switched off at the top state.
    private static double[] Transient(Func<int, double> birth, Func<int, double> death, int states, int start, double time)
    {
        var up = Enumerable.Range(0, states).Select(x => x + 1 < states ? birth(x) : 0.0).ToArray();
        var down = Enumerable.Range(0, states).Select(x => x > 0 ? death(x) : 0.0).ToArray();
        var rate = Enumerable.Range(0, states).Max(x => up[x] + down[x]) * 1.01;
        var v = new double[states];
        v[start] = 1;
        var next = new double[states];
        var result = new double[states];
        var lt = rate * time;
        var last = (int)Math.Ceiling(lt + 12 * Math.Sqrt(lt) + 20);
        for (var k = 0; k <= last; k++)
        {
            var weight = Math.Exp(-lt + k * Math.Log(lt) - SpecialFunctions.GammaLn(k + 1));
            if (weight > 1e-300) for (var x = 0; x < states; x++) result[x] += weight * v[x];
            for (var x = 0; x < states; x++)
            {
                var stay = v[x] * (1 - (up[x] + down[x]) / rate);
                var fromBelow = x > 0 ? v[x - 1] * up[x - 1] / rate : 0.0;
                var fromAbove = x + 1 < states ? v[x + 1] * down[x + 1] / rate : 0.0;
                next[x] = stay + fromBelow + fromAbove;
            }
            (v, next) = (next, v);
        }
        return result;
    }

    // Strict local maxima of a law along its chain (plateaus of equal values count once).
    private static int LocalMaxima(double[] p)
    {
        var count = 0;
        for (var x = 0; x < p.Length; x++)
        {
            var end = x;
            while (end + 1 < p.Length && p[end + 1] == p[x]) end++;
            if ((x == 0 || p[x - 1] < p[x]) && (end + 1 == p.Length || p[end + 1] < p[x]) && p[x] > 1e-12) count++;
            x = end;
        }
        return count;
    }

    private static long[] TrimerA => Enumerable.Range(0, 21).Select(t => 60L - 3 * t).ToArray();

    [Fact]
    public void The_trimer_law_is_unimodal_on_its_lattice_and_so_is_the_count()
    {
        var network = ModelLoader.LoadText(Trimer, "trimer.cnet").Model!.Network;
        var lattice = QuantityLattice.For(network, new TimeGrid(1, 1), "A")!.At(0);
        Assert.Equal(new CountLattice(3, 60), lattice);
        foreach (var time in new[] { 0.02, 0.2, 2.0, double.PositiveInfinity })
        {
            var law = double.IsPositiveInfinity(time) ? Stationary(TrimerForward, t => t, 21) : Transient(TrimerForward, t => t, 21, 0, time);
            Assert.Equal(1, LocalMaxima(law)); // the exact law, along T (hence along A's lattice)
            var exact = CountDistribution.FromProbabilities(TrimerA, law);
            var counted = ModeCount.Count(exact, lattice: lattice);
            Assert.Equal(1, counted.Count);
            Assert.Equal(60 - 3 * Array.IndexOf(law, law.Max()), counted.Modes[0].Value);
            // Read on the plain integers the same law is a comb with teeth every 3 copies: that is what
            // the lattice is for.
            if (time >= 0.2) Assert.True(ModeCount.Count(exact).Count > 1);

            var ripples = 0;
            foreach (var n in new[] { 100, 1000, 10000 })
                for (var seed = 0; seed < 50; seed++)
                {
                    var rng = new Xoshiro256StarStar((ulong)(seed * 7919 + n));
                    var sample = LawSampling.Sample(ref rng, TrimerA, law, n);
                    Assert.Equal(1, ModeCount.Count(sample, lattice: lattice).Count);
                    if (ModeCount.Count(sample).Count > 1) ripples++;
                }
            output.WriteLine($"t = {time}: on the integers, ≥ 2 modes in {ripples} of 150 samples; on the lattice in none");
        }
    }

    [Fact]
    public void The_stationary_Schloegl_law_has_two_modes_near_the_stable_points()
    {
        var law = Stationary(BalancedSchloeglBirth, SchloeglDeath, SchloeglStates);
        Assert.True(law[^1] < 1e-12, $"mass at the truncation {law[^1]}");
        Assert.Equal(2, LocalMaxima(law));
        var exact = CountDistribution.FromProbabilities(LawSampling.Consecutive(0, SchloeglStates), law);
        var counted = ModeCount.Count(exact);
        Assert.Equal(2, counted.Count);
        Assert.InRange(counted.Modes[0].Value, 100, 118); // the law's peaks: 109 and 403
        Assert.InRange(counted.Modes[1].Value, 394, 412);
        foreach (var n in new[] { 100, 400, 1000, 10000 })
        {
            var detected = 0;
            for (var seed = 0; seed < 50; seed++)
            {
                var rng = new Xoshiro256StarStar((ulong)(104729 * seed + n));
                var sample = LawSampling.Sample(ref rng, LawSampling.Consecutive(0, SchloeglStates), law, n);
                if (ModeCount.Count(sample).Count == 2) detected++;
            }
            output.WriteLine($"n = {n}: two modes in {detected} of 50 samples");
            // From 400 replicates on the two wells are always found; 100 replicates (about 0.5 per count
            // in the upper well) leave the 3-standard-error dip test short of power now and then
            // (measured: 42 of 50), which is the price of its false-alarm rate.
            Assert.True(n == 100 ? detected >= 35 : detected == 50, $"n = {n}: two modes in {detected} of 50 samples");
        }
    }

    [Fact]
    public void Started_at_its_unstable_point_the_Schloegl_chain_is_counted_bimodal_at_t_20_from_400_replicates()
    {
        // The setting of Cli/BistableContrastTests: x(0) = 250, t = 20, 400 replicates.
        var law = Transient(SchloeglBirth, SchloeglDeath, SchloeglStates, 250, 20);
        Assert.Equal(1.0, law.Sum(), 1e-9);
        Assert.Equal(2, LocalMaxima(law));
        var values = LawSampling.Consecutive(0, SchloeglStates);
        var exact = ModeCount.Count(CountDistribution.FromProbabilities(values, law));
        Assert.Equal(2, exact.Count);
        Assert.InRange(exact.Modes[0].Value, 80, 130);
        Assert.InRange(exact.Modes[1].Value, 360, 430);
        var detected = 0;
        for (var seed = 0; seed < 200; seed++)
        {
            var rng = new Xoshiro256StarStar((ulong)(31 * seed + 5));
            if (ModeCount.Count(LawSampling.Sample(ref rng, values, law, 400)).Count == 2) detected++;
        }
        output.WriteLine($"two modes in {detected} of 200 samples of 400");
        Assert.Equal(200, detected);
    }
}
