using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Run folders that were edited or mixed with another run's files (issue 10, fault 13): each is refused
/// with exit 2 and a message that says what does not fit, never read against the wrong grid, never an
/// internal error, never a hang. The expected behaviour is the project's own rule (README's exit codes).
/// </summary>
public class DamagedFolderTests
{
    private static string Run(ScratchFolder scratch, string name, string every, params string[] extra)
    {
        var folder = scratch.File(name);
        var run = CliRun.Of(["simulate", WriteModel(scratch), "--until", "2", "--every", every, "--replicates", "128", "--seed", "1", "--no-contrast", "--out", folder, .. extra]);
        Assert.Equal(0, run.ExitCode);
        return folder;
    }

    /// <summary>Removes the manifest's checksums, as a folder of an earlier version has none.</summary>
    private static void WithoutChecksums(string folder)
    {
        var path = Path.Combine(folder, RunFiles.Manifest);
        var manifest = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(path))!.AsObject();
        Assert.True(manifest.Remove(ManifestFields.Files), "the manifest records no checksums to remove");
        File.WriteAllText(path, manifest.ToJsonString());
    }

    [Fact]
    public void A_distributions_table_copied_from_a_run_on_another_grid_is_refused_by_contrast()
    {
        using var scratch = new ScratchFolder();
        var fine = Run(scratch, "fine", "0.5");
        var coarse = Run(scratch, "coarse", "1");
        // Its times 0, 1, 2 all lie on the fine grid, so only the provenance can tell (before: exit 0 and
        // verdicts drawn from the coarse run's distributions at the fine run's times).
        File.Copy(Path.Combine(coarse, RunFiles.Distributions), Path.Combine(fine, RunFiles.Distributions), overwrite: true);
        var contrast = CliRun.Of("contrast", fine);
        // The table's checksum no longer matches the manifest's record of it.
        Assert.Equal(2, contrast.ExitCode);
        Assert.Contains(RunFiles.Distributions, contrast.Error);
        Assert.Contains("changed or damaged after it was written", contrast.Error);
        AssertNoStackTrace(contrast);

        // A folder without checksums (as earlier versions wrote them) is refused by the tables' own provenance.
        WithoutChecksums(fine);
        contrast = CliRun.Of("contrast", fine);
        Assert.Equal(2, contrast.ExitCode);
        Assert.Contains("do not belong together", contrast.Error);
        Assert.Contains("every 1", contrast.Error);
        AssertNoStackTrace(contrast);
    }

    [Fact]
    public void A_distributions_table_with_times_the_moments_lack_is_refused_by_name()
    {
        using var scratch = new ScratchFolder();
        var coarse = Run(scratch, "coarse", "1");
        var fine = Run(scratch, "fine", "0.5");
        // Before: "The given key '0.5' was not present in the dictionary.", exit 1.
        File.Copy(Path.Combine(fine, RunFiles.Distributions), Path.Combine(coarse, RunFiles.Distributions), overwrite: true);
        WithoutChecksums(coarse);
        var contrast = CliRun.Of("contrast", coarse);
        Assert.Equal(2, contrast.ExitCode);
        Assert.Contains("do not belong together", contrast.Error);
        Assert.DoesNotContain("given key", contrast.Error);
        AssertNoStackTrace(contrast);
    }

    [Fact]
    public void A_shard_whose_manifest_names_blocks_far_outside_the_run_is_refused_at_once()
    {
        using var scratch = new ScratchFolder();
        var first = Run(scratch, "first", "0.5", "--shard", "1/2");
        var second = Run(scratch, "second", "0.5", "--shard", "2/2");
        var manifest = Path.Combine(first, RunFiles.Manifest);
        // Before: the range was expanded block by block (a hang), or the block arithmetic overflowed.
        File.WriteAllText(manifest, File.ReadAllText(manifest).Replace("\"finished_blocks\": \"0\"", "\"finished_blocks\": \"0-9223372036854775806\""));
        Assert.Contains("9223372036854775806", File.ReadAllText(manifest));
        var merge = CliRun.Of("merge", first, second, "--out", scratch.File("merged"));
        Assert.Equal(2, merge.ExitCode);
        Assert.Contains("names a block outside the run's 2 blocks", merge.Error);
        AssertNoStackTrace(merge);
    }

    [Fact]
    public void A_manifest_field_of_the_wrong_kind_is_named_in_our_words()
    {
        using var scratch = new ScratchFolder();
        var first = Run(scratch, "first", "0.5", "--shard", "1/2");
        var second = Run(scratch, "second", "0.5", "--shard", "2/2");
        var manifest = Path.Combine(first, RunFiles.Manifest);
        File.WriteAllText(manifest, "{\"replicates_finished\": \"many\"}");
        var merge = CliRun.Of("merge", first, second, "--out", scratch.File("merged"));
        Assert.Equal(2, merge.ExitCode);
        Assert.Contains("the field 'replicates_finished'", merge.Error);
        // Before: "The JSON value could not be converted to System.Int64. Path: $.replicates_finished | …".
        Assert.DoesNotContain("System.", merge.Error);
        AssertNoStackTrace(merge);
    }
}
