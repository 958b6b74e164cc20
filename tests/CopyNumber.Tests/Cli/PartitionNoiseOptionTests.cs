using CopyNumber.Cli;
using CopyNumber.Storage;
using CopyNumber.Tests.Stochastic;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// <c>simulate --partition-noise</c> (docs/methods.md, "Partitioning noise") through the command line: what it refuses,
/// and that a resumed run's control and partition.parquet are those of the same run done at once (the documented rule:
/// a replicate's stream depends on the seed and its index alone, and the control's seed on the run's).
/// </summary>
public sealed class PartitionNoiseOptionTests
{
    [Fact]
    public void A_resumed_run_writes_the_same_partition_table_as_the_run_done_at_once()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("stable_protein.cnet");
        File.WriteAllText(model, CellCycleTests.ModelText());
        string[] run = ["simulate", model, "--until", "240", "--every", "40", "--replicates", "8000", "--seed", "31", "--no-contrast", "--partition-noise"];
        var whole = scratch.File("whole");
        Assert.Equal(ExitCodes.Done, CliRun.Of([.. run, "--threads", "2", "--out", whole]).ExitCode);

        var parts = scratch.File("parts");
        var first = CliRun.Of([.. run, "--threads", "1", "--max-wall", "0.1", "--out", parts]);
        Assert.Equal(ExitCodes.Done, first.ExitCode);
        Assert.True(RunManifest.Read(Path.Combine(parts, RunFiles.Manifest)).Partial, "the wall limit stopped the first part");
        Assert.False(File.Exists(Path.Combine(parts, RunFiles.Partition)), "no control for an unfinished run");
        // The option is taken from the stored run.
        var resumed = CliRun.Of("simulate", "--resume", parts, "--no-contrast", "--threads", "2");
        Assert.True(resumed.ExitCode == ExitCodes.Done, resumed.Error);

        using var expected = ParquetTableReader.Open(Path.Combine(whole, RunFiles.Partition));
        using var actual = ParquetTableReader.Open(Path.Combine(parts, RunFiles.Partition));
        foreach (var column in PartitionTable.ColumnNames.Where(c => c != "quantity"))
            Assert.Equal(column.EndsWith("replicates", StringComparison.Ordinal) ? expected.Longs(column).Select(v => (double)v) : expected.Doubles(column),
                column.EndsWith("replicates", StringComparison.Ordinal) ? actual.Longs(column).Select(v => (double)v) : actual.Doubles(column));
        Assert.Equal(expected.Strings("quantity"), actual.Strings("quantity"));
    }

    [Theory]
    [InlineData("halves", "", "--partition-noise: the model's cells already split in halves")]
    [InlineData("binomial", "--shard 1/2", "--partition-noise runs its control over the whole run; it cannot be combined with --shard")]
    public void The_control_is_refused_where_it_cannot_be_run(string split, string extra, string message)
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("cells.cnet");
        File.WriteAllText(model, CellCycleTests.ModelText(split: split));
        string[] arguments = ["simulate", model, "--until", "40", "--every", "40", "--replicates", "128", "--partition-noise", "--out", scratch.File("run"),
            .. extra.Split(' ', StringSplitOptions.RemoveEmptyEntries)];
        var run = CliRun.Of(arguments);
        Assert.Equal(ExitCodes.BadInput, run.ExitCode);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
        Assert.False(Directory.Exists(scratch.File("run")) && Directory.EnumerateFiles(scratch.File("run"), "*.parquet").Any());
    }
}
