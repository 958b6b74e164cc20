using System.Diagnostics;
using CopyNumber.Cli;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// The real binary, started as a child process and sent SIGTERM with /bin/kill while it simulates: it
/// must exit with 130 (README's exit codes) after writing readable partial summaries, and resuming
/// them must reproduce the uninterrupted run. The generous waits below are liveness limits so a broken
/// build cannot hang the suite, not measurements.
/// </summary>
public class InterruptionTests
{
    private static readonly TimeSpan Patience = TimeSpan.FromSeconds(60);

    [Fact]
    public void Sigterm_during_simulate_writes_partial_summaries_exits_130_and_the_run_resumes_to_the_uninterrupted_result()
    {
        if (!OperatingSystem.IsLinux() && !OperatingSystem.IsMacOS()) return; // SIGTERM is POSIX
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        // About 2 500 events per replicate, 125 million in all over 781 blocks: seconds even for the fastest
        // simulator on an idle machine, so the signal sent 400 ms after the start arrives mid-run.
        string[] arguments = ["simulate", model, "--until", "100", "--every", "5", "--replicates", "50000", "--seed", "3", "--threads", "2", "--no-contrast"];

        var interrupted = scratch.File("interrupted");
        using var child = Start([.. arguments, "--out", interrupted]);
        var error = new StringWriter();
        var started = new ManualResetEventSlim();
        child.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is null) return;
            lock (error) error.WriteLine(e.Data);
            if (e.Data.StartsWith("simulating", StringComparison.Ordinal)) started.Set();
        };
        child.BeginErrorReadLine();
        var output = child.StandardOutput.ReadToEndAsync();
        Assert.True(started.Wait(Patience), "the child never started simulating");
        Thread.Sleep(400); // usually lets some blocks finish; the assertions hold for any number of them, none included
        Signal(child.Id);
        Assert.True(child.WaitForExit(Patience), "the child did not stop after SIGTERM");
        child.WaitForExit();
        string errorText;
        lock (error) errorText = error.ToString();
        Assert.Equal(ExitCodes.Interrupted, child.ExitCode);
        Assert.Contains("interrupted", errorText);
        Assert.DoesNotContain("   at ", errorText + output.Result);

        var manifest = Manifest(interrupted);
        Assert.True(manifest.Partial);
        Assert.Equal("interrupted", manifest.ExtraText(ManifestFields.StopReason));
        Assert.InRange(manifest.ReplicatesFinished, 0, 50000 - 64);
        Assert.Equal(0, manifest.ReplicatesFinished % 64);
        var moments = ParquetReadBack.Of(Path.Combine(interrupted, RunFiles.Moments));
        Assert.Equal("true", moments.KeyValues["copynumber.partial"]);
        Assert.Equal(manifest.ReplicatesFinished.ToString(), moments.KeyValues["copynumber.replicates_finished"]);
        // Every finished replicate is recorded at time 0, so the frequencies there add up to the replicates finished.
        var distributions = ParquetReadBack.Of(Path.Combine(interrupted, RunFiles.Distributions));
        Assert.Equal("frequency", distributions.Names[4]);
        var atZero = 0L;
        if (distributions.TotalRows > 0)
        {
            var time = (double[])distributions.Values[0];
            var species = (string[])distributions.Values[1];
            var frequency = (long[])distributions.Values[4];
            atZero = Enumerable.Range(0, time.Length).Where(r => time[r] == 0 && species[r] == "p").Sum(r => frequency[r]);
        }
        Assert.Equal(manifest.ReplicatesFinished, atZero);
        Assert.Empty(Directory.GetFiles(interrupted, "*" + AtomicFile.PartialMarker + "*"));

        var resumed = CliRun.Of([.. arguments, "--resume", interrupted]);
        Assert.Equal(0, resumed.ExitCode);
        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of([.. arguments, "--out", whole]).ExitCode);
        foreach (var file in ResultFiles) AssertSameCells(whole, interrupted, file);
    }

    private static Process Start(string[] arguments) => ChildProcess.Start(arguments);

    private static void Signal(int pid) => ChildProcess.Signal(pid, "TERM");
}
