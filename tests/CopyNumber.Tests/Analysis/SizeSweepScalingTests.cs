using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Analysis;

public class SizeSweepScalingTests
{
    private const string PairLoss = "# illustrative\nspecies\n  A = 0\nparameters\n  j = 1\n  k = 1\nreactions\n  make: 0 -> A mass j\n  loss: 2 A -> 0 mass k\n";

    [Fact]
    public void The_relative_shift_of_the_mean_from_the_rate_equations_shrinks_like_one_over_the_system_size()
    {
        // System-size expansion: in counts the mean differs from the rate equations by a term of order Ω⁰,
        // so the relative deviation falls like 1/Ω (van Kampen, Stochastic Processes in Physics and
        // Chemistry; Grima 2010, J. Chem. Phys. 133:035101). On log-log axes the slope is −1; we accept ±0.2.
        double[] sizes = [2, 4, 8, 16];
        var deviations = new List<double>();
        foreach (var size in sizes)
        {
            var network = ModelLoader.LoadText(PairLoss, "pair_loss.cnet", new CompileOptions(SizeOverride: size)).Model!.Network;
            var grid = new TimeGrid(40, 0.5);
            var ensemble = EnsembleRunner.Run(network, new EnsembleOptions { Grid = grid, Replicates = 4000, Seed = 2024, Threads = 2, Method = SimulationMethod.Direct });
            var rateEquations = RateEquationSolver.Solve(network, grid, new SolverOptions());
            // Average over the stationary part (t ≥ 10, many relaxation times 1/(4kφ/Ω) ≈ 0.35) to cut the sampling noise.
            var late = Enumerable.Range(0, grid.Count).Where(k => grid[k] >= 10).ToArray();
            var mean = late.Average(k => DistributionSummary.From(ensemble.Histogram(k, 0)).Mean);
            var phi = late.Average(k => rateEquations.Values[k, 0]);
            deviations.Add((mean - phi) / phi);
        }
        // The stationary mean lies above the rate equations: at the same count the stochastic loss
        // k·A(A−1) is slower than the deterministic k·A² (the sign Grima 2010 derives for this system).
        Assert.All(deviations, d => Assert.True(d > 0, $"deviation {d} should be positive"));
        var x = sizes.Select(s => Math.Log(s)).ToArray();
        var y = deviations.Select(d => Math.Log(Math.Abs(d))).ToArray();
        var slope = Slope(x, y);
        Assert.True(slope is > -1.2 and < -0.8, $"slope {slope} from relative deviations {string.Join(", ", deviations)}");
    }

    private static double Slope(double[] x, double[] y)
    {
        var mx = x.Average();
        var my = y.Average();
        return x.Zip(y).Sum(p => (p.First - mx) * (p.Second - my)) / x.Sum(v => (v - mx) * (v - mx));
    }
}
