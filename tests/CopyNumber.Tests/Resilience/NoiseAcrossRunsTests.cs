using CopyNumber.Network;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// The intrinsic/extrinsic split of a nested design (docs/methods.md, "Extrinsic variability and noise by source") carried
/// through shards, merges and resumed runs. The reference is one unsplit run with the same seed: the draws depend on
/// (seed, draw) alone and the pairs of groups never straddle a block, so the parts must agree bit for bit (the same
/// argument as for the readouts' moments; docs/conventions.md). Before, a merged or resumed run wrote no noise.parquet.
/// </summary>
public class NoiseAcrossRunsTests
{
    /// <summary>The bursty gene of <see cref="RunFolders.BurstyGene"/> with a transcription rate that differs from cell to cell (illustrative).</summary>
    private static readonly string VaryingGene = BurstyGene.Replace("ktx = 8\n", "ktx = 8 varies gamma cv 0.5\n", StringComparison.Ordinal);

    private static readonly string[] NoiseFiles = [RunFiles.Noise, RunFiles.ReadoutState, RunFiles.Moments, RunFiles.Distributions];

    [Fact]
    public void Three_shards_merged_give_the_noise_split_of_one_run_cell_for_cell()
    {
        Assert.Contains("varies gamma", VaryingGene, StringComparison.Ordinal);
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, VaryingGene);
        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 1000, 5, "--replicates-per-draw", "4", "--out", whole)]).ExitCode);
        Assert.True(File.Exists(Path.Combine(whole, RunFiles.Noise)));
        var shards = new List<string>();
        for (var i = 1; i <= 3; i++)
        {
            var folder = scratch.File($"shard-{i}");
            Assert.Equal(0, CliRun.Of([.. Simulate(model, 1000, 5, "--replicates-per-draw", "4", "--shard", $"{i}/3", "--out", folder)]).ExitCode);
            shards.Add(folder);
        }
        var merged = scratch.File("merged");
        var merge = CliRun.Of(["merge", shards[1], shards[2], shards[0], "--out", merged]);
        Assert.Equal(0, merge.ExitCode);
        foreach (var file in NoiseFiles) AssertSameCells(whole, merged, file);
        Assert.Equal("4", Manifest(merged).Arguments[ManifestFields.ReplicatesPerDrawArgument]);
    }

    [Fact]
    public void An_interrupted_run_resumed_gives_the_noise_split_of_the_uninterrupted_run()
    {
        using var scratch = new ScratchFolder();
        var model = ModelLoader.Load(WriteModel(scratch, VaryingGene)).Model!;
        var whole = scratch.File("whole");
        Directory.CreateDirectory(whole);
        ResumeTests.Run(model, whole, 2, resume: false, CancellationToken.None);
        var folder = scratch.File("resumed");
        Directory.CreateDirectory(folder);
        using (var cancel = new CancellationTokenSource())
            ResumeTests.Run(model, folder, 2, resume: false, cancel.Token, block => { if (block >= 3) cancel.Cancel(); });
        Assert.True(Manifest(folder).Partial);
        ResumeTests.Run(model, folder, 1, resume: true, CancellationToken.None);
        Assert.False(Manifest(folder).Partial);
        foreach (var file in NoiseFiles) AssertSameCells(whole, folder, file);
    }

    [Theory]
    [InlineData(VaryingMarker, "3", "--replicates-per-draw must be 2, 4, 8, 16 or 32")]
    [InlineData(VaryingMarker, "64", "--replicates-per-draw must be 2, 4, 8, 16 or 32")]
    [InlineData("", "4", "--replicates-per-draw applies only to a model whose parameters vary")]
    public void A_group_size_that_cannot_be_used_is_refused_with_a_reason(string varying, string size, string message)
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, varying == VaryingMarker ? VaryingGene : BurstyGene);
        var run = CliRun.Of([.. Simulate(model, 100, 1, "--replicates-per-draw", size, "--out", scratch.File("run"))]);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
        AssertNoStackTrace(run);
    }

    private const string VaryingMarker = "varying";
}
