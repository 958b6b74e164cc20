using System.Text.RegularExpressions;
using CopyNumber.Ensembles;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>Limits (--max-wall, --max-events), refused and unwritable output folders, and a replicate that fails.</summary>
public partial class LimitTests
{
    /// <summary>
    /// A switch that flips from A to B with rate k = 0.0004; once B = 1 the law of 'tick' is 1 − 2B = −1,
    /// an invalid propensity, so the replicate fails. The flip is a first-order event, so a replicate
    /// fails before t = 5 with probability 1 − e^(−5k) ≈ 0.002 (the exponential waiting time of
    /// Gillespie 1977, J. Phys. Chem. 81:2340): among 5000 replicates at least one fails except with
    /// probability e^(−10) ≈ 5e−5, and a block of 64 has no failure with probability about 0.88.
    /// </summary>
    private const string RareFailure =
        "# illustrative: a rare switch that makes a rate law negative\nspecies\n  A = 1\n  B = 0\n  C = 0\n" +
        "reactions\n  flip: A -> B mass 0.0004\n  tick: 0 -> C rate 1 - 2 * B\n";

    [Fact]
    public void Max_wall_stops_like_an_interruption_but_exits_0_with_a_warning_and_a_resumable_partial_folder()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("run");
        // A million replicates cannot finish in 0.3 s; the run stops at the limit.
        var run = CliRun.Of("simulate", model, "--until", "20", "--every", "5", "--replicates", "1000000", "--seed", "1", "--max-wall", "0.3", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("warning: stopped at --max-wall", run.Error);
        Assert.Contains("--resume", run.Error);
        var manifest = Manifest(folder);
        Assert.True(manifest.Partial);
        Assert.Equal("wall_limit", manifest.ExtraText(ManifestFields.StopReason));
        Assert.InRange(manifest.ReplicatesFinished, 0, 1000000 - 64);
        Assert.Equal("true", ParquetReadBack.Of(Path.Combine(folder, RunFiles.Distributions)).KeyValues["copynumber.partial"]);
    }

    [Fact]
    public void Replicates_that_reach_max_events_are_counted_reported_and_missing_from_the_later_times()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", model, "--until", "5", "--every", "0.5", "--replicates", "500", "--seed", "4", "--max-events", "40", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        var stopped = Manifest(folder).ExtraText(ManifestFields.StoppedEarly);
        Assert.NotNull(stopped);
        var early = long.Parse(stopped);
        Assert.InRange(early, 1, 500);
        Assert.Contains($"warning: {early} replicates reached --max-events", run.Error);
        // A replicate stopped at the limit records the grid times before its last event and none after,
        // so it is missing at the final time: there the replicates counted are 500 minus those stopped.
        var moments = ParquetReadBack.Of(Path.Combine(folder, RunFiles.Moments));
        var time = (double[])moments.Values[0];
        var species = (string[])moments.Values[1];
        var replicates = (long[])moments.Values[2];
        var final = Enumerable.Range(0, time.Length).Single(r => time[r] == 5 && species[r] == "p");
        var start = Enumerable.Range(0, time.Length).Single(r => time[r] == 0 && species[r] == "p");
        Assert.Equal(500, replicates[start]);
        Assert.Equal(500 - early, replicates[final]);
    }

    [Fact]
    public void A_non_empty_output_folder_is_refused_with_exit_2_and_force_does_not_take_a_folder_of_foreign_files()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("taken");
        Directory.CreateDirectory(folder);
        File.WriteAllText(Path.Combine(folder, "notes.txt"), "mine");
        var refused = CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", "10", "--seed", "1", "--out", folder);
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("already exists and is not empty", refused.Error);
        AssertNoStackTrace(refused);
        Assert.Equal(["notes.txt"], Directory.GetFiles(folder).Select(Path.GetFileName));
        // --force replaces a run, never the user's files (issue 10, fault 11): a folder of foreign files stays refused.
        var forced = CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", "10", "--seed", "1", "--out", folder, "--force");
        Assert.Equal(2, forced.ExitCode);
        Assert.Contains("holds files copynumber did not write ('notes.txt')", forced.Error);
        Assert.Equal(["notes.txt"], Directory.GetFiles(folder).Select(Path.GetFileName));
        Assert.Equal("mine", File.ReadAllText(Path.Combine(folder, "notes.txt")));
    }

    [Fact]
    public void An_output_folder_under_a_file_is_bad_input_exit_2_and_leaves_nothing()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        // A regular file where a parent folder should be: the user named an impossible folder (README, exit codes).
        var blocker = scratch.File("plain-file");
        File.WriteAllText(blocker, "");
        var run = CliRun.Of("simulate", model, "--until", "1", "--every", "0.5", "--replicates", "10", "--seed", "1", "--out", Path.Combine(blocker, "run"));
        Assert.Equal(2, run.ExitCode);
        Assert.Contains($"'{blocker}' is a file, not a folder", run.Error);
        AssertNoStackTrace(run);
        Assert.Equal(["gene.cnet", "plain-file"], scratch.Entries());
    }

    [Fact]
    public void A_failing_replicate_gives_exit_1_names_the_replicate_and_keeps_the_blocks_finished_before_it()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, RareFailure, "rare.cnet");
        var folder = scratch.File("run");
        string[] arguments = ["simulate", model, "--until", "5", "--every", "1", "--replicates", "5000", "--seed", "8", "--threads", "1"];
        var run = CliRun.Of([.. arguments, "--out", folder]);
        Assert.Equal(1, run.ExitCode);
        AssertNoStackTrace(run);
        var match = FailedReplicate().Match(run.Error);
        Assert.True(match.Success, run.Error);
        Assert.Contains("reaction 'tick' has propensity -1", run.Error);
        var replicate = long.Parse(match.Groups[1].Value);

        // One thread runs the blocks in order, so the blocks finished are exactly those before the failing one.
        var manifest = Manifest(folder);
        var failingBlock = replicate / 64;
        Assert.True(manifest.Partial);
        Assert.Equal("failed", manifest.ExtraText(ManifestFields.StopReason));
        Assert.Contains($"replicate {replicate} failed", manifest.ExtraText(ManifestFields.Failure));
        Assert.Equal(failingBlock == 0 ? "" : failingBlock == 1 ? "0" : $"0-{failingBlock - 1}", manifest.ExtraText(ManifestFields.FinishedBlocks));
        Assert.Equal(64 * failingBlock, manifest.ReplicatesFinished);
        var moments = ParquetReadBack.Of(Path.Combine(folder, RunFiles.Moments));
        Assert.All((long[])moments.Values[2], n => Assert.Equal(64 * failingBlock, n));

        // The streams are fixed by the seed: resuming meets the same replicate again.
        var again = CliRun.Of([.. arguments, "--resume", folder]);
        Assert.Equal(1, again.ExitCode);
        Assert.Contains($"replicate {replicate} failed", again.Error);
    }

    [GeneratedRegex(@"error: replicate (\d+) failed")]
    private static partial Regex FailedReplicate();
}
