using CopyNumber.Analysis;
using CopyNumber.Network;
using CopyNumber.Runs.Scans;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Scans;

public class ScanResumeTests
{
    // Immigration with dimerisation (illustrative): small enough to run in a second, nonlinear so that the cells differ between points.
    private const string Model = "# illustrative\nspecies\n  A = 0\nparameters\n  k = 4\n  c = 0.05\nreactions\n  make: 0 -> A mass k\n  pair: 2 A -> 0 mass c\n";

    private static string[] Scan(string model, string folder, params string[] extra) =>
        ["scan", model, "--vary", "k=2,4,8", "--vary", "c=0.02,0.1", "--until", "6", "--every", "1", "--replicates", "200", "--seed", "21", "--method", "direct", "--threads", "2", "--out", folder, .. extra];

    [Fact]
    public void Resume_after_an_interruption_and_shards_merged_give_the_table_of_one_uninterrupted_scan_cell_for_cell()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("pairs.cnet");
        File.WriteAllText(model, Model);

        var whole = scratch.File("whole");
        var run = CliRun.Of(Scan(model, whole));
        Assert.True(run.ExitCode == 0, run.Error);
        var expected = ParquetReadBack.Of(Path.Combine(whole, ScanRunner.TableFile));
        Assert.Equal(6 * 1, expected.TotalRows);

        // Interrupted while the third point runs (a signal, in-process), then resumed by the command.
        var interrupted = scratch.File("interrupted");
        var loaded = ModelLoader.LoadText(File.ReadAllText(model), model).Model!;
        var request = ScanHelpers.Request(loaded, interrupted, 21, 200, new TimeGrid(6, 1), null, "k=2,4,8", "c=0.02,0.1") with { };
        using var cancel = new CancellationTokenSource();
        var started = 0;
        var observer = new ScanObserver { Line = _ => { if (++started == 3) cancel.Cancel(); } };
        var stopped = ScanRunner.Execute(request, ScanHelpers.ContrastOnly, observer, cancel.Token);
        Assert.Equal(StopReason.Interrupted, stopped.StopReason);
        Assert.Equal(2, stopped.Cells.Count);
        var resumed = CliRun.Of(Scan(model, interrupted, "--resume"));
        Assert.True(resumed.ExitCode == 0, resumed.Error);
        Assert.Contains("2 points kept from the earlier run, 4 run", resumed.Output);
        AssertSameCells(expected, ParquetReadBack.Of(Path.Combine(interrupted, ScanRunner.TableFile)));

        // Two shards over points, merged.
        var first = scratch.File("shard1");
        var second = scratch.File("shard2");
        Assert.Equal(0, CliRun.Of(Scan(model, first, "--shard", "1/2")).ExitCode);
        Assert.Equal(0, CliRun.Of(Scan(model, second, "--shard", "2/2")).ExitCode);
        Assert.Equal(3, ParquetReadBack.Of(Path.Combine(first, ScanRunner.TableFile)).TotalRows);
        var merged = scratch.File("merged");
        var merge = CliRun.Of("merge", first, second, "--out", merged);
        Assert.True(merge.ExitCode == 0, merge.Error);
        AssertSameCells(expected, ParquetReadBack.Of(Path.Combine(merged, ScanRunner.TableFile)));
        Assert.True(File.Exists(Path.Combine(merged, "report.html")));

        // A shard of another scan is refused by merge.
        var other = scratch.File("other");
        Assert.Equal(0, CliRun.Of([.. Scan(model, other, "--shard", "2/2").Select(a => a == "21" ? "22" : a)]).ExitCode);
        var refused = CliRun.Of("merge", first, other, "--out", scratch.File("refused"));
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("another scan: its seed", refused.Error);
    }

    private static void AssertSameCells(ParquetReadBack expected, ParquetReadBack actual)
    {
        Assert.Equal(expected.Names, actual.Names);
        Assert.Equal(expected.TotalRows, actual.TotalRows);
        for (var c = 0; c < expected.Names.Length; c++)
            Assert.True(Same(expected.Values[c], actual.Values[c]), $"column {expected.Names[c]} differs");
    }

    private static bool Same(Array a, Array b) => a switch
    {
        double[] x => x.Zip((double[])b).All(p => p.First.Equals(p.Second)), // bit for bit, NaN equal to NaN
        long[] x => x.SequenceEqual((long[])b),
        string[] x => x.SequenceEqual((string[])b),
        _ => false,
    };
}
