using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

public class SweepTests
{
    [Fact]
    public void A_sweep_writes_one_run_folder_per_size_and_a_table_whose_noise_falls_like_one_over_root_size()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("immigration.cnet");
        File.WriteAllText(model, "# illustrative\nsize 1\nspecies\n  X = 0\nparameters\n  alpha = 4\n  mu = 1\nreactions\n  make: 0 -> X mass alpha\n  decay: X -> 0 mass mu\n");
        var root = scratch.File("sweep");
        var run = CliRun.Of("sweep", model, "--sizes", "1,4,16", "--until", "8", "--every", "1", "--replicates", "2000", "--seed", "9", "--out", root);
        Assert.Equal(0, run.ExitCode);
        // A sweep is a scan over size: one run folder per size, point-0000 the smallest.
        foreach (var point in new[] { "point-0000", "point-0001", "point-0002" })
            Assert.True(File.Exists(Path.Combine(root, point, "moments.parquet")), point);
        Assert.True(File.Exists(Path.Combine(root, "scan.parquet")));
        var table = ParquetReadBack.Of(Path.Combine(root, "sweep.parquet"));
        Assert.Equal(["size", "species", "relative_deviation", "relative_half_width", "cv", "variance_ratio", "verdicts", "adequate_from"], table.Names);
        var sizes = (double[])table.Values[0];
        var cv = (double[])table.Values[4];
        Assert.Equal([1.0, 4, 16], sizes);
        // Stationary immigration–death at size Ω is Poisson with mean 4Ω (Bailey 1964), so CV = 1/√(4Ω):
        // 0.5, 0.25, 0.125 (near-stationary at t = 8, e^(−8) ≈ 3e-4); the CV of 2000 Poisson samples has a
        // relative standard error of about 1/√(2·2000) ≈ 1.6%, so 10% is over 5 standard errors.
        for (var i = 0; i < 3; i++)
        {
            var exact = 1 / Math.Sqrt(4 * sizes[i]);
            Assert.True(Math.Abs(cv[i] - exact) < 0.1 * exact, $"size {sizes[i]}: cv {cv[i]} vs {exact}");
        }
        Assert.True(File.Exists(Path.Combine(root, "report.html")));
        Assert.Contains("adequate", run.Output);
    }
}
