using System.Diagnostics;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>One uninterrupted run of the command line the checkpoint tests interrupt, made once for the class.</summary>
public sealed class UninterruptedRun : IDisposable
{
    private readonly ScratchFolder _scratch = new();

    public UninterruptedRun()
    {
        Model = WriteModel(_scratch);
        Folder = _scratch.File("whole");
        var run = CliRun.Of([.. Arguments(Model), "--out", Folder]);
        if (run.ExitCode != 0) throw new InvalidOperationException(run.Error);
    }

    public string Model { get; }

    public string Folder { get; }

    /// <summary>
    /// About 430 events per replicate and 100 000 replicates (1563 blocks): several seconds on two threads,
    /// long enough for checkpoints (at most every second) to be written while it runs.
    /// </summary>
    public static string[] Arguments(string model) =>
        ["simulate", model, "--until", "20", "--every", "1", "--replicates", "100000", "--seed", "3", "--threads", "2", "--paths", "300", "--no-contrast"];

    public void Dispose() => _scratch.Dispose();
}

/// <summary>
/// Issue 10, faults 1 and 2: finished blocks reach the disk as checkpoints while the run goes, so a real
/// SIGKILL (no handler runs) at any point — in the ensemble, in a checkpoint, in the final write — loses
/// only the blocks since the last checkpoint, and <c>--resume DIR</c> then gives, cell for cell (read with
/// ParquetSharp, an independent reader), the tables of the run left alone. Replicate streams depend on
/// (seed, replicate) only, histograms add exactly and real moments combine in one fixed tree (common
/// practice for reproducible parallel Monte Carlo), which is what makes "identical" the right check.
/// The waits are liveness limits, not measurements.
/// </summary>
public class CheckpointTests(UninterruptedRun whole) : IClassFixture<UninterruptedRun>
{
    private static readonly TimeSpan Patience = TimeSpan.FromSeconds(90);

    [Fact]
    public void A_first_run_killed_after_its_first_checkpoint_keeps_its_blocks_and_resumes_to_the_uninterrupted_tables()
    {
        if (!OperatingSystem.IsLinux() && !OperatingSystem.IsMacOS()) return;
        using var scratch = new ScratchFolder();
        var folder = scratch.File("killed");
        KillAfterFirstCheckpoint(folder);

        var resumed = CliRun.Of(["simulate", "--resume", folder]);
        Assert.True(resumed.ExitCode == 0, resumed.Error);
        AssertNoStackTrace(resumed);
        Assert.Matches(@"resuming .*: [1-9]\d* replicates kept", resumed.Error);
        AssertSameAsWhole(folder);
    }

    /// <summary>
    /// Fault 1 as measured: a resumption killed between renaming distributions.parquet and writing
    /// manifest.json left a folder that --resume refused ("holds blocks … but the manifest says …").
    /// The kill is injected at exactly that instant by the test-only COPYNUMBER_TEST_KILL_AFTER.
    /// </summary>
    [Fact]
    public void A_resumption_killed_right_after_renaming_distributions_parquet_resumes_to_the_uninterrupted_tables()
    {
        if (!OperatingSystem.IsLinux() && !OperatingSystem.IsMacOS()) return;
        using var scratch = new ScratchFolder();
        var folder = scratch.File("fault1");
        var first = CliRun.Of([.. UninterruptedRun.Arguments(whole.Model), "--max-wall", "1", "--out", folder]);
        Assert.True(Manifest(folder).Partial, first.Error);

        var distributions = Path.Combine(AtomicFile.FullPath(folder), RunFiles.Distributions);
        using (var child = ChildProcess.Start(["simulate", "--resume", folder], new Dictionary<string, string> { ["COPYNUMBER_TEST_KILL_AFTER"] = distributions }))
        {
            var drain = Drain(child);
            Assert.True(child.WaitForExit(Patience));
            Assert.True(child.ExitCode == ChildProcess.KilledBySigkill, $"the resumption was not killed at the rename (exit {child.ExitCode}): {drain.Result}");
        }
        var resumed = CliRun.Of(["simulate", "--resume", folder]);
        Assert.Equal(0, resumed.ExitCode);
        AssertNoStackTrace(resumed);
        AssertSameAsWhole(folder);
    }

    /// <summary>
    /// SIGKILL at several points chosen by a fixed seed: alternately at the N-th file renamed into place
    /// (inside checkpoints, path parts and the final write) and after a delay into the run; each time
    /// --resume goes on from what was kept, and the end result is the uninterrupted run's.
    /// </summary>
    [Fact]
    public void Kills_at_random_points_then_resume_give_the_uninterrupted_tables()
    {
        if (!OperatingSystem.IsLinux() && !OperatingSystem.IsMacOS()) return;
        using var scratch = new ScratchFolder();
        var folder = scratch.File("random");
        var points = new Random(20251202);
        KillAfterFirstCheckpoint(folder);
        var kills = 1;
        for (var attempt = 1; attempt <= 5; attempt++)
        {
            string[] arguments = ["simulate", "--resume", folder];
            var byCommit = attempt % 2 == 1;
            var environment = byCommit ? new Dictionary<string, string> { ["COPYNUMBER_TEST_KILL_AFTER"] = $"commit:{points.Next(1, 12)}" } : null;
            var delay = TimeSpan.FromMilliseconds(points.Next(300, 2500));
            using var child = ChildProcess.Start(arguments, environment);
            var drain = Drain(child);
            if (!byCommit && !child.WaitForExit(delay)) ChildProcess.Signal(child.Id, "KILL");
            Assert.True(child.WaitForExit(Patience));
            if (child.ExitCode == ChildProcess.KilledBySigkill) kills++;
            else Assert.True(child.ExitCode == 0, drain.Result);
            if (child.ExitCode == 0) break;
        }
        Assert.True(kills >= 3, $"only {kills} of the planned kills happened");
        var resumed = CliRun.Of(["simulate", "--resume", folder]);
        Assert.Equal(0, resumed.ExitCode);
        AssertSameAsWhole(folder);
    }

    private void AssertSameAsWhole(string folder)
    {
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole.Folder, folder, file);
        Assert.Equal(Manifest(whole.Folder).EventsFired, Manifest(folder).EventsFired);
        Assert.False(Manifest(folder).Partial);
        // Nothing of the checkpoint store or of a killed writer is left once the final tables are written.
        Assert.Empty(Directory.GetFileSystemEntries(folder, ".*"));
        Assert.Empty(Directory.GetFiles(folder, "*" + AtomicFile.PartialMarker + "*"));
    }

    /// <summary>Starts the run into <paramref name="folder"/> and sends SIGKILL as soon as its first checkpoint is complete.</summary>
    private void KillAfterFirstCheckpoint(string folder)
    {
        using var child = ChildProcess.Start([.. UninterruptedRun.Arguments(whole.Model), "--out", folder]);
        var drain = Drain(child);
        var clock = Stopwatch.StartNew();
        while (!child.HasExited && !HasCheckpoint(folder) && clock.Elapsed < Patience) Thread.Sleep(10);
        if (!HasCheckpoint(folder)) Assert.Fail("no checkpoint was written before the run ended: " + drain.Result);
        ChildProcess.Signal(child.Id, "KILL");
        Assert.True(child.WaitForExit(Patience));
        Assert.True(child.ExitCode == ChildProcess.KilledBySigkill, $"exit {child.ExitCode}: {drain.Result}");
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Manifest)), "the run ended before the kill; the test needs a longer run");
    }

    private static bool HasCheckpoint(string folder) =>
        Directory.Exists(folder) && Directory.GetDirectories(folder, ".checkpoint-*").Any(d => !d.EndsWith(".tmp", StringComparison.Ordinal));

    /// <summary>Reads the child's output to the end (so its pipes never fill), returning both streams' text.</summary>
    private static Task<string> Drain(Process child)
    {
        var error = child.StandardError.ReadToEndAsync();
        var output = child.StandardOutput.ReadToEndAsync();
        return Task.WhenAll(error, output).ContinueWith(_ => error.Result + output.Result);
    }
}
