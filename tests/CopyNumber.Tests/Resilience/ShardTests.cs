using CopyNumber.Ensembles;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Shards of a run and their merge. The reference each time is one unsplit run of the same replicates
/// with the same seed: replicate r's stream depends on (seed, r) alone (docs/conventions.md), so three
/// shards run exactly its replicates, and the merge must reproduce its tables cell for cell.
/// </summary>
public class ShardTests
{
    [Fact]
    public void Shard_ranges_are_contiguous_disjoint_and_cover_every_block()
    {
        // Checked by enumeration against the definition ⌊(i − 1)B/n⌋ … ⌊iB/n⌋ − 1 for every n ≤ B.
        foreach (var blocks in new long[] { 1, 2, 7, 16, 1000 })
        {
            for (var n = 1; n <= Math.Min(blocks, 40); n++)
            {
                var next = 0L;
                for (var i = 1; i <= n; i++)
                {
                    var (first, end) = new Shard(i, n).Blocks(blocks);
                    Assert.Equal(next, first);
                    Assert.InRange(end - first, blocks / n, (blocks + n - 1) / n);
                    next = end;
                }
                Assert.Equal(blocks, next);
            }
        }
    }

    [Fact]
    public void Three_shards_merged_equal_one_run_of_all_replicates_cell_for_cell()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 1000, 5, "--paths", "150", "--out", whole)]).ExitCode);
        var shards = new List<string>();
        for (var i = 1; i <= 3; i++)
        {
            var folder = scratch.File($"shard-{i}");
            var run = CliRun.Of([.. Simulate(model, 1000, 5, "--paths", "150", "--shard", $"{i}/3", "--threads", i.ToString(), "--out", folder)]);
            Assert.Equal(0, run.ExitCode);
            Assert.False(Manifest(folder).Partial);
            shards.Add(folder);
        }
        // 1000 replicates are 16 blocks of 64: shards of 5, 5 and 6 blocks.
        Assert.Equal(["0-4", "5-9", "10-15"], shards.Select(s => Manifest(s).ExtraText(ManifestFields.FinishedBlocks)).ToArray());
        Assert.Equal([320L, 320, 360], shards.Select(s => Manifest(s).ReplicatesFinished).ToArray());

        var merged = scratch.File("merged");
        var merge = CliRun.Of(["merge", shards[2], shards[0], shards[1], "--out", merged]);
        Assert.Equal(0, merge.ExitCode);
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole, merged, file);
        var manifest = Manifest(merged);
        Assert.False(manifest.Partial);
        Assert.Equal(1000, manifest.ReplicatesFinished);
        Assert.Equal(Manifest(whole).EventsFired, manifest.EventsFired);
        Assert.Equal("1/1", manifest.Arguments["shard"]);
        Assert.Equal(Directory.GetFiles(whole).Select(Path.GetFileName).Order(), Directory.GetFiles(merged).Select(Path.GetFileName).Order());
    }

    [Fact]
    public void An_incomplete_merge_is_partial_and_merges_on_with_the_missing_shard()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 700, 9, "--out", whole)]).ExitCode);
        var shard = new string[4];
        for (var i = 1; i <= 4; i++)
        {
            shard[i - 1] = scratch.File($"s{i}");
            Assert.Equal(0, CliRun.Of([.. Simulate(model, 700, 9, "--shard", $"{i}/4", "--out", shard[i - 1])]).ExitCode);
        }
        // Shards 1 and 3 leave a gap: the moment tree keeps the two parts apart until shard 2 fills it.
        var partial = scratch.File("partial");
        var first = CliRun.Of(["merge", shard[0], shard[2], "--out", partial]);
        Assert.Equal(0, first.ExitCode);
        Assert.Contains("partial", first.Error);
        Assert.True(Manifest(partial).Partial);
        var all = scratch.File("all");
        Assert.Equal(0, CliRun.Of(["merge", partial, shard[3], shard[1], "--out", all]).ExitCode);
        foreach (var file in ResultFiles) AssertSameCells(whole, all, file);
        Assert.False(Manifest(all).Partial);
    }

    [Theory]
    [InlineData("--seed", "6", "--seed")]
    [InlineData("--every", "0.25", "--every")]
    [InlineData("--method", "next-reaction", "--method")]
    [InlineData("--replicates", "640", "--replicates")]
    public void Merge_refuses_shards_of_different_settings(string option, string value, string named)
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var a = scratch.File("a");
        var b = scratch.File("b");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 300, 5, "--shard", "1/2", "--out", a)]).ExitCode);
        var args = Simulate(model, 300, 5, "--shard", "2/2", "--out", b).ToList();
        var at = args.IndexOf(option);
        if (at >= 0) args[at + 1] = value;
        else args.AddRange([option, value]);
        Assert.Equal(0, CliRun.Of([.. args]).ExitCode);

        var merged = scratch.File("merged");
        var run = CliRun.Of(["merge", a, b, "--out", merged]);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("not part of the same run", run.Error);
        Assert.Contains(named, run.Error);
        AssertNoStackTrace(run);
        Assert.False(Directory.Exists(merged));
    }

    [Fact]
    public void Merge_refuses_shards_of_different_models_and_overlapping_shards()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var other = WriteModel(scratch, BurstyGene.Replace("ktx = 8", "ktx = 9"), "other.cnet");
        var a = scratch.File("a");
        var b = scratch.File("b");
        var c = scratch.File("c");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 300, 5, "--shard", "1/2", "--out", a)]).ExitCode);
        Assert.Equal(0, CliRun.Of([.. Simulate(other, 300, 5, "--shard", "2/2", "--out", b)]).ExitCode);
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 300, 5, "--out", c)]).ExitCode);

        var models = CliRun.Of(["merge", a, b, "--out", scratch.File("m1")]);
        Assert.Equal(2, models.ExitCode);
        Assert.Contains("SHA-256", models.Error);

        var overlap = CliRun.Of(["merge", a, c, "--out", scratch.File("m2")]);
        Assert.Equal(2, overlap.ExitCode);
        Assert.Contains("both hold block 0", overlap.Error);

        var twice = CliRun.Of(["merge", a, a, "--out", scratch.File("m3")]);
        Assert.Equal(2, twice.ExitCode);
        Assert.Contains("given twice", twice.Error);

        var notARun = CliRun.Of(["merge", a, scratch.Path, "--out", scratch.File("m4")]);
        Assert.Equal(2, notARun.ExitCode);
        Assert.Contains("manifest.json", notARun.Error);
        foreach (var run in new[] { models, overlap, twice, notARun }) AssertNoStackTrace(run);
    }
}
