using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// The numbers behind the mean figure in contrast.parquet: the linear noise approximation's variance and the first-order
/// corrected mean as columns of their own.
/// </summary>
public sealed class ContrastColumnsTests
{
    [Fact]
    public void Immigration_death_has_lna_variance_equal_to_the_mean_and_no_mean_correction()
    {
        // 0 → A at k, A → 0 at d·A from A = 0: the law is Poisson with mean m(t) = k/d·(1 − e^{−dt}) at every t, and the linear
        // noise approximation is exact for it (van Kampen 2007, Stochastic Processes in Physics and Chemistry, ch. X): its
        // variance is m(t). The network is linear, so the first-order correction of the mean is 0 (Grima 2010, J. Chem. Phys.
        // 133:035101): the corrected mean is m(t) too.
        const double k = 8, d = 0.5;
        using var scratch = new ScratchFolder();
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, $"species\n  A = 0\nparameters\n  k = {k}\n  d = {d}\nreactions\n  make: 0 -> A mass k\n  loss: A -> 0 mass d\n");
        var run = CliRun.Of(["simulate", path, "--until", "10", "--every", "0.5", "--replicates", "200", "--seed", "3", "--out", scratch.File("run")]);
        Assert.True(run.ExitCode == 0, run.Error);
        using var table = ParquetTableReader.Open(Path.Combine(scratch.File("run"), "contrast.parquet"));
        var times = table.Doubles("time");
        var variance = table.Doubles("lna_variance");
        var corrected = table.Doubles("corrected_mean");
        Assert.Equal(21, times.Length);
        for (var row = 0; row < times.Length; row++)
        {
            var mean = k / d * (1 - Math.Exp(-d * times[row]));
            // The solver's relative tolerance is 10⁻⁶ (SolverOptions); 10⁻⁵ of the mean (plus 10⁻⁸ at t = 0) allows for it.
            Assert.InRange(variance[row], mean - 1e-5 * mean - 1e-8, mean + 1e-5 * mean + 1e-8);
            Assert.InRange(corrected[row], mean - 1e-5 * mean - 1e-8, mean + 1e-5 * mean + 1e-8);
        }
        Assert.All(table.Longs("phase"), p => Assert.Equal(0, p));
        Assert.False(File.Exists(Path.Combine(scratch.File("run"), "phases.parquet")));
    }
}
