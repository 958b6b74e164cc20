using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// A sweep over Ω must change the model's dynamics. toggle_pair.cnet writes every law in counts (rate laws
/// through hill_rep that never read <c>size</c>, first-order decay whose constant is the same at every Ω), so
/// only its initial counts would scale: at Ω = 10 U starts at 250 while the dynamics stay those of Ω = 1.
/// Measured before: exit 0, "not adequate at any size tried", no warning.
/// </summary>
public class HonestSweepTests
{
    [Fact]
    public void A_sweep_of_a_model_whose_laws_never_read_size_is_refused_with_the_reason()
    {
        using var scratch = new ScratchFolder();
        var root = scratch.File("sweep");
        var run = CliRun.Of("sweep", CliRun.Scenario("toggle_pair.cnet"), "--sizes", "1,10", "--until", "2", "--every", "1",
            "--replicates", "100", "--seed", "3", "--out", root);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("size", run.Error);
        Assert.Contains("would not change", run.Error);
        Assert.False(Directory.Exists(Path.Combine(root, "point-0001")), "nothing is run for a refused sweep");
        Assert.Contains("U would start at 250", run.Error);
    }
}
