using System.Text.Json;
using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// What a new user hit (issue 16): counts in scientific notation, solve overwriting its output, solve and
/// simulate disagreeing on a negative rate law, a --resume hint that cannot help, and a shard contrasted as if
/// it were the whole run. Expected values are written out by hand from the documented rules (README, exit codes).
/// </summary>
public sealed class FirstUseTests
{
    private const string ImmigrationDeath = "# illustrative\nspecies\n  X = 0\nreactions\n  make: 0 -> X mass 5\n  decay: X -> 0 mass 1\n";

    // make: rate 5 − X from X = 10 is −5 at t = 0 by hand: a rate law below zero, refused by both descriptions.
    private const string NegativeLaw = "# illustrative: a law that goes negative\nspecies\n  X = 10\nreactions\n  make: 0 -> X rate 5 - X\n  decay: X -> 0 mass 0.1\n";

    private static string Model(ScratchFolder scratch, string text)
    {
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, text);
        return path;
    }

    [Fact]
    public void Replicates_in_scientific_notation_are_accepted_like_until_when_whole()
    {
        using var scratch = new ScratchFolder();
        var model = Model(scratch, ImmigrationDeath);
        var run = CliRun.Of("simulate", model, "--until", "1e0", "--every", "0.5", "--replicates", "1.5e2", "--seed", "3", "--out", scratch.File("run"));
        Assert.Equal(0, run.ExitCode);
        using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(scratch.File("run"), RunFiles.Manifest)));
        Assert.Equal(150, manifest.RootElement.GetProperty("replicates_requested").GetInt64());

        foreach (var bad in new[] { "2.5", "1e-1", "abc", "1e300" })
        {
            var refused = CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", bad, "--out", scratch.File("bad"));
            Assert.Equal(2, refused.ExitCode);
            Assert.Contains($"--replicates takes a whole number, e.g. 2000 or 2e3 (got '{bad}')", refused.Error);
            Assert.DoesNotContain("   at ", refused.Error);
        }
    }

    [Fact]
    public void Solve_out_refuses_an_existing_file_without_force_and_a_directory_always()
    {
        using var scratch = new ScratchFolder();
        var model = Model(scratch, ImmigrationDeath);
        var output = scratch.File("solution.parquet");
        File.WriteAllText(output, "an earlier result");

        var refused = CliRun.Of("solve", model, "--until", "1", "--every", "0.5", "--out", output);
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("exists; give --force to replace it", refused.Error);
        Assert.Equal("an earlier result", File.ReadAllText(output));

        Assert.Equal(0, CliRun.Of("solve", model, "--until", "1", "--every", "0.5", "--out", output, "--force").ExitCode);
        Assert.Equal(["time", "X"], ParquetReadBack.Of(output).Names);

        var folder = scratch.File("a-folder");
        Directory.CreateDirectory(folder);
        foreach (var force in new[] { false, true })
        {
            var directory = CliRun.Of([.. new[] { "solve", model, "--until", "1", "--every", "0.5", "--out", folder }, .. force ? new[] { "--force" } : []]);
            Assert.Equal(2, directory.ExitCode);
            Assert.Contains("is a directory", directory.Error);
        }
    }

    [Fact]
    public void Solve_and_simulate_stop_on_a_negative_rate_law_with_one_message_and_no_resume_hint()
    {
        using var scratch = new ScratchFolder();
        var model = Model(scratch, NegativeLaw);

        var solve = CliRun.Of("solve", model, "--until", "10", "--every", "1");
        Assert.Equal(1, solve.ExitCode);
        Assert.Contains("reaction 'make' has rate -5 at time 0; a rate must be a finite number of at least 0 (state: X=10)", solve.Error);

        // A net law that changes sign is meaningful for the rate equations (docs/sbml.md): asked for, it is solved.
        // dX/dt = (5 − X) − 0.1·X from X = 10 tends to 5 / 1.1 = 4.5455 (by hand).
        var signed = CliRun.Of("solve", model, "--until", "50", "--every", "10", "--signed-rates");
        Assert.Equal(0, signed.ExitCode);
        Assert.Contains("4.5455", signed.Output);

        var simulate = CliRun.Of("simulate", model, "--until", "10", "--every", "1", "--replicates", "4", "--seed", "1", "--method", "direct", "--out", scratch.File("run"));
        Assert.Equal(1, simulate.ExitCode);
        Assert.Contains("reaction 'make' has propensity -5 at time 0; a propensity must be a finite number of at least 0 (state: X=10)", simulate.Error);
        // The replicate's stream is fixed by the seed, so --resume would fail at the same replicate.
        Assert.DoesNotContain("--resume", simulate.Error + simulate.Output);
        Assert.Contains("correct the model", simulate.Error);
    }

    [Fact]
    public void Contrast_on_a_shard_says_it_covers_part_of_a_run()
    {
        using var scratch = new ScratchFolder();
        var model = Model(scratch, ImmigrationDeath);
        var shard = scratch.File("shard1");
        Assert.Equal(0, CliRun.Of("simulate", model, "--until", "2", "--every", "1", "--replicates", "256", "--seed", "5", "--shard", "1/2", "--out", shard).ExitCode);
        var contrast = CliRun.Of("contrast", shard);
        Assert.Equal(0, contrast.ExitCode);
        // 256 replicates are 4 blocks of 64 (DEVELOPERS.md); shard 1/2 holds the first 2 blocks, 128 replicates.
        Assert.Contains("holds shard 1/2 of a run: 128 of the run's 256 replicates", contrast.Error);
        // The report says it too, first among its cautions, for a reader who never saw the console.
        Assert.Contains("holds shard 1/2 of a run: 128 of the run's 256 replicates", File.ReadAllText(Path.Combine(shard, "report.md")));

        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of("simulate", model, "--until", "2", "--every", "1", "--replicates", "256", "--seed", "5", "--out", whole).ExitCode);
        Assert.DoesNotContain("shard", CliRun.Of("contrast", whole).Error);
    }
}
