using CopyNumber.Runs.Scans;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Scans;

public class ScanChecksTests(Xunit.Abstractions.ITestOutputHelper output)
{
    // 0 -> A (k), 2 A -> 0 (c), at Ω = 1. Rate equation dA/dt = k − 2c·A² (v = c·A², two copies per event),
    // so φ = √(k/(2c)). The stationary law of the master equation solves the cut balance between {≤ n} and
    // {> n} (births cross it upwards from n; pairings cross it downwards from n + 1 and from n + 2):
    //     k·p(n) = c·(n + 1)·n·p(n + 1) + c·(n + 2)·(n + 1)·p(n + 2),
    // solved here by the backward recursion from a truncation N = 400 (p(N) = 1, p(N + 1) = p(N + 2) = 0;
    // the mass beyond ~30 copies is below 10⁻³⁰ for the k used) and normalised (common practice for one-step
    // chains, e.g. Gardiner 2009, Stochastic Methods, §11.2; this two-step form is worked out here).
    private const string Pairs = "# illustrative immigration with pairing\nspecies\n  A = 0\nparameters\n  k = 1\n  c = 0.1\nreactions\n  make: 0 -> A mass k\n  pair: 2 A -> 0 mass c\n";
    private const double C = 0.1;

    private static double ExactMean(double k)
    {
        const int n = 400;
        var p = new double[n + 3];
        p[n] = 1;
        for (var i = n - 1; i >= 0; i--)
        {
            p[i] = (C * (i + 1) * i * p[i + 1] + C * (i + 2) * (i + 1) * p[i + 2]) / k;
            if (p[i] > 1e250) for (var j = i; j <= n; j++) p[j] /= 1e250;
        }
        var total = p.Sum();
        return p.Select((v, i) => i * v).Sum() / total;
    }

    private static double ExactRelativeDeviation(double k) => (ExactMean(k) - Math.Sqrt(k / (2 * C))) / Math.Sqrt(k / (2 * C));

    [Fact]
    public void A_scan_over_the_inflow_locates_where_the_stationary_mean_comes_within_five_percent_of_the_rate_equations()
    {
        // The exact crossing k* of the relative deviation with 5%, by bisection (it falls monotonically in k, ~0.13/φ).
        double lo = 0.5, hi = 4;
        Assert.True(ExactRelativeDeviation(lo) > 0.05 && ExactRelativeDeviation(hi) < 0.05);
        for (var i = 0; i < 60; i++)
        {
            var mid = Math.Sqrt(lo * hi);
            if (ExactRelativeDeviation(mid) > 0.05) lo = mid; else hi = mid;
        }
        var exactCrossing = lo; // ≈ 1.45

        using var scratch = new ScratchFolder();
        var model = scratch.File("pairs.cnet");
        File.WriteAllText(model, Pairs);
        var folder = scratch.File("scan");
        var run = CliRun.Of("scan", model, "--vary", "k=0.5:4:log:7", "--until", "20", "--every", "1", "--replicates", "40000",
            "--seed", "5", "--method", "direct", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        var table = ParquetReadBack.Of(Path.Combine(folder, ScanRunner.TableFile));
        double[] Column(string name) => (double[])table.Values[Array.IndexOf(table.Names, name)];
        var k = Column("vary_k");
        var deviation = Column("final_relative_deviation");
        var halfWidth = Column("final_relative_deviation_error"); // z·SE/φ with z = 3

        // Every point agrees with the exact deviation within 4 standard errors (Bonferroni over 7 points: a false
        // failure has chance ≤ 7·6.3e-5; the stationary law is reached to e^(−12) by t = 20).
        for (var i = 0; i < k.Length; i++)
        {
            var exact = ExactRelativeDeviation(k[i]);
            Assert.True(Math.Abs(deviation[i] - exact) <= 4.0 / 3 * halfWidth[i], $"k = {k[i]}: measured {deviation[i]} ± {halfWidth[i]}, exact {exact}");
        }

        // The boundary the scan locates, with its sampling error: the measured curve minus and plus its half-width
        // crosses 5% at the ends of an interval (linear interpolation in log k; the exact curve's curvature makes an
        // interpolation error of ~2e-4 between these points, far below the half-widths of ~1e-2). It must hold k*.
        var low = Crossing(k, deviation.Select((d, i) => d - halfWidth[i]).ToArray(), 0.05);
        var high = Crossing(k, deviation.Select((d, i) => d + halfWidth[i]).ToArray(), 0.05);
        output.WriteLine($"exact k* = {exactCrossing}; located in [{low}, {high}]; measured: {string.Join("; ", k.Select((x, i) => $"{x}: {deviation[i]} ± {halfWidth[i]} (exact {ExactRelativeDeviation(x)})"))}");
        Assert.True(low <= exactCrossing && exactCrossing <= high, $"boundary located in [{low}, {high}], exact {exactCrossing}");
        Assert.True(high / low < 3, $"the interval [{low}, {high}] is too wide to say the boundary was located");
    }

    /// <summary>Where a falling sequence crosses <paramref name="level"/>, interpolated linearly in log x; the ends when it does not cross.</summary>
    private static double Crossing(double[] x, double[] y, double level)
    {
        for (var i = 0; i + 1 < x.Length; i++)
            if (y[i] >= level && y[i + 1] < level)
            {
                var u = (y[i] - level) / (y[i] - y[i + 1]);
                return Math.Exp(Math.Log(x[i]) + u * (Math.Log(x[i + 1]) - Math.Log(x[i])));
            }
        return y[0] < level ? x[0] : x[^1];
    }

    // The Schlögl-type chain of Cli/BistableContrastTests (Schlögl 1972, Z. Physik 253:147) with the inflow k3 varied:
    // the rate equation dx/dt = k3 + k1·x² − k2·x³ − k4·x, k1 = 0.0075, k2 = 1e-5, k4 = 1.65. Its steady states are
    // the roots of g(x) = k2·x³ − k1·x² + k4·x = k3, found here by sign changes on a fine grid; a root is stable when
    // the right-hand side falls through it. g has a local maximum of ≈ 113.0 at x ≈ 163 and a local minimum of ≈ 87.0
    // at x ≈ 337, so k3 ∈ (87.0, 113.0) has two stable states. Every point starts at X = 250 (the unstable middle state
    // at k3 = 100), horizon t = 20, 400 replicates. (At t = 10 the two populations had not yet separated: the mode
    // count at k3 = 100 was 2 for only 13 of 20 seeds with the old exponential sampler and 15 of 20 with the ziggurat;
    // at t = 20 it was 2 for 24 of 24 runs, seeds 1–12 with each sampler.)
    private const string Schloegl =
        "# illustrative Schlögl-type bistable chain\nspecies\n  X = 250\nparameters\n  k1 = 0.0075\n  k2 = 1e-5\n  k3 = 100\n  k4 = 1.65\n" +
        "reactions\n  inflow: 0 -> X mass k3\n  outflow: X -> 0 mass k4\n  autocatalysis: 2 X -> 3 X mass k1\n  crowding: 3 X -> 2 X mass k2\n";

    private static int StableRoots(double k3)
    {
        double F(double x) => k3 + 0.0075 * x * x - 1e-5 * x * x * x - 1.65 * x;
        var stable = 0;
        for (var x = 0.0; x < 2000; x += 0.01)
            if (F(x) > 0 && F(x + 0.01) <= 0) stable++;
        return stable;
    }

    [Fact]
    public void A_scan_over_the_inflow_of_the_Schloegl_chain_marks_the_bistable_range_of_the_rate_equations_and_the_multimodal_ensemble()
    {
        Assert.Equal(1, StableRoots(70));
        Assert.Equal(2, StableRoots(100));
        Assert.Equal(1, StableRoots(130));
        using var scratch = new ScratchFolder();
        var model = scratch.File("schloegl.cnet");
        File.WriteAllText(model, Schloegl);
        var folder = scratch.File("scan");
        var run = CliRun.Of("scan", model, "--vary", "k3=70,85,90,100,110,115,130", "--until", "20", "--every", "1", "--replicates", "400",
            "--seed", "17", "--method", "direct", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        var table = ParquetReadBack.Of(Path.Combine(folder, ScanRunner.TableFile));
        var k3 = (double[])table.Values[Array.IndexOf(table.Names, "vary_k3")];
        var states = (long[])table.Values[Array.IndexOf(table.Names, "stable_steady_states")];
        var modes = (long[])table.Values[Array.IndexOf(table.Names, "modes")];
        var multimodal = (long[])table.Values[Array.IndexOf(table.Names, "multimodal")];
        output.WriteLine(string.Join("; ", k3.Select((x, i) => $"k3 {x}: {states[i]} stable, {modes[i]} modes, multimodal {multimodal[i]}")));
        for (var i = 0; i < k3.Length; i++)
            Assert.True(StableRoots(k3[i]) == states[i], $"k3 = {k3[i]}: {states[i]} stable steady states found, {StableRoots(k3[i])} by the cubic");
        // At k3 = 100 the ensemble leaves the unstable middle state both ways: two modes at the horizon, and the map
        // says multimodal there; far outside the bistable range (70, 130) one attractor pulls every replicate: one mode.
        var middle = Array.IndexOf(k3, 100.0);
        Assert.Equal(2, modes[middle]);
        Assert.Equal(1, multimodal[middle]);
        Assert.Equal(1, modes[Array.IndexOf(k3, 70.0)]);
        Assert.Equal(1, modes[Array.IndexOf(k3, 130.0)]);
        Assert.True(File.Exists(Path.Combine(folder, "figures", "scan-modes.png")) || Directory.EnumerateFiles(folder, "scan-modes.png", SearchOption.AllDirectories).Any());
    }
}
