using System.Text.Json;
using CopyNumber.Cli;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Issue 10, fault 5: two runs given the same --out both exited 0, and the folder held one run's manifest
/// beside the other's tables. A folder is now claimed (advisory lock plus claim file) before it is checked
/// and held until the last file is written; these tests use real child processes, since the lock is
/// per process. That an exclusive flock excludes a second process and is released when its holder dies
/// is the documented behaviour of flock(2) (Linux man-pages, common practice); the tests check it here.
/// </summary>
public class ExclusiveFolderTests
{
    /// <summary>About 7·10^6 events: seconds on two threads, so the loser starts while the winner runs.</summary>
    private static string[] LongRun(string model, int seed, string folder) =>
        ["simulate", model, "--until", "20", "--every", "0.5", "--replicates", "20000", "--seed", seed.ToString(), "--threads", "1", "--no-contrast", "--out", folder];

    [Fact]
    public void Two_runs_started_together_into_one_folder_one_exits_0_the_other_2_naming_the_holder_and_the_folder_is_one_runs()
    {
        if (!OperatingSystem.IsLinux() && !OperatingSystem.IsMacOS()) return; // flock is the POSIX mechanism tested here
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("same");
        using var first = ChildCli.Start(LongRun(model, 1, folder));
        using var second = ChildCli.Start(LongRun(model, 2, folder));
        var a = ChildCli.Finish(first);
        var b = ChildCli.Finish(second);

        Assert.Equal(new[] { ExitCodes.Done, ExitCodes.BadInput }, new[] { a.ExitCode, b.ExitCode }.Order());
        var (winner, loser, winnerSeed) = a.ExitCode == 0 ? (first, b, 1) : (second, a, 2);
        // The holder is named once its claim is in place; a loser arriving in the microseconds between the
        // winner's lock and its claim is told only that the folder is in use.
        var named = $"'{folder}' is in use by another run (simulate, process {winner.Id} on host {Environment.MachineName}, since ";
        var unnamed = $"'{folder}' is in use by another run (another run (its claim is being written or removed))";
        Assert.True(loser.Error.Contains(named) || loser.Error.Contains(unnamed), $"the refusal does not say the folder is in use by the winner: {loser.Error}");
        Assert.DoesNotContain("   at ", loser.Error);

        // Consistent: the manifest and every table come from the winner's seed, and the claim is gone.
        Assert.Equal((ulong)winnerSeed, Manifest(folder).Seed);
        foreach (var table in new[] { RunFiles.Moments, RunFiles.Distributions, RunFiles.ReadoutState, RunFiles.Deterministic })
        {
            var arguments = ParquetReadBack.Of(Path.Combine(folder, table)).KeyValues[Provenance.ArgumentsKey];
            Assert.Equal(winnerSeed.ToString(), JsonDocument.Parse(arguments).RootElement.GetProperty("seed").GetString());
        }
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Claim)));
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Lock)));
    }

    [Fact]
    public void The_kernel_lock_alone_keeps_a_second_process_out_and_is_released_when_the_holder_is_killed()
    {
        if (!OperatingSystem.IsLinux()) return; // flock semantics of .NET's FileShare.None are checked on Linux
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("held");
        using var child = ChildCli.Start(LongRun(model, 1, folder));
        var started = new ManualResetEventSlim();
        child.ErrorDataReceived += (_, e) =>
        {
            if (e.Data?.StartsWith("simulating", StringComparison.Ordinal) == true) started.Set();
        };
        child.BeginErrorReadLine();
        child.BeginOutputReadLine();
        Assert.True(started.Wait(ChildCli.Patience), "the child never started simulating");

        // Without the claim file only the lock is left to say the folder is in use; --take-over cannot pass a live lock.
        File.Delete(Path.Combine(folder, RunFiles.Claim));
        var refused = Assert.Throws<OutputException>(() => FolderClaim.Take(folder, "test", takeOverStale: true, takeOver: true));
        Assert.True(refused.IsRefusal);
        Assert.Contains("is in use by another run", refused.Message);

        child.Kill();
        Assert.True(child.WaitForExit(ChildCli.Patience));
        using var claim = FolderClaim.Take(folder, "test", takeOverStale: false, takeOver: false);
        Assert.Equal(Environment.ProcessId, FolderClaim.HolderOf(folder)!.ProcessId);
    }

    [Fact]
    public void A_claim_left_by_a_process_gone_from_this_host_is_taken_over_by_resume_and_force_only()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("stale");
        string[] partial = ["simulate", model, "--until", "20", "--every", "0.5", "--replicates", "20000", "--seed", "4", "--threads", "1", "--no-contrast", "--max-wall", "0.2", "--out", folder];
        Assert.Equal(0, CliRun.Of(partial).ExitCode);
        Assert.True(Manifest(folder).Partial);
        var dead = DeadProcess();
        PlantClaim(folder, new ClaimHolder(Environment.MachineName, dead, DateTimeOffset.UtcNow.AddMinutes(-5), DateTimeOffset.UtcNow.AddMinutes(-5), "simulate"));

        var fresh = CliRun.Of(Simulate(model, 200, 5, "--no-contrast", "--out", folder));
        Assert.Equal(ExitCodes.BadInput, fresh.ExitCode);
        Assert.Contains($"was claimed by a run that ended without releasing it (simulate, process {dead} on host {Environment.MachineName}, since ", fresh.Error);
        Assert.Contains("--resume", fresh.Error);

        var resumed = CliRun.Of("simulate", "--resume", folder, "--no-contrast", "--threads", "1");
        Assert.Equal(ExitCodes.Done, resumed.ExitCode);
        Assert.Contains($"took over the claim on", resumed.Error);
        Assert.False(Manifest(folder).Partial);
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Claim)));

        PlantClaim(folder, new ClaimHolder(Environment.MachineName, dead, DateTimeOffset.UtcNow.AddMinutes(-5), DateTimeOffset.UtcNow.AddMinutes(-5), "simulate"));
        var forced = CliRun.Of(Simulate(model, 200, 5, "--no-contrast", "--out", folder, "--force"));
        Assert.Equal(ExitCodes.Done, forced.ExitCode);
        Assert.Equal(200, Manifest(folder).ReplicatesRequested);
    }

    [Fact]
    public void A_claim_from_another_host_is_refused_naming_the_holder_and_the_override_even_with_force()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("shared");
        Assert.Equal(0, CliRun.Of(Simulate(model, 200, 1, "--no-contrast", "--out", folder)).ExitCode);
        var since = new DateTimeOffset(2025, 3, 1, 12, 0, 0, TimeSpan.Zero);
        PlantClaim(folder, new ClaimHolder("node-elsewhere-17", 4242, since, since, "simulate"));

        foreach (var args in new[] { Simulate(model, 200, 2, "--no-contrast", "--out", folder, "--force"), ["contrast", folder], ["simulate", "--resume", folder] })
        {
            var refused = CliRun.Of(args);
            Assert.Equal(ExitCodes.BadInput, refused.ExitCode);
            Assert.Contains("is claimed by a run on another host (simulate, process 4242 on host node-elsewhere-17, since 2025-03-01 12:00:00 UTC)", refused.Error);
            Assert.Contains("--take-over", refused.Error);
            AssertNoStackTrace(refused);
        }
        Assert.Equal(1UL, Manifest(folder).Seed);

        var taken = CliRun.Of(Simulate(model, 200, 2, "--no-contrast", "--out", folder, "--force", "--take-over"));
        Assert.Equal(ExitCodes.Done, taken.ExitCode);
        Assert.Contains("took over the claim", taken.Error);
        Assert.Equal(2UL, Manifest(folder).Seed);
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Claim)));
    }

    /// <summary>The id of a process that has exited (and so is gone from this host, unless the id is reused, which the start time in the claim catches).</summary>
    private static int DeadProcess()
    {
        using var process = System.Diagnostics.Process.Start(new System.Diagnostics.ProcessStartInfo(OperatingSystem.IsWindows() ? "cmd" : "true") { UseShellExecute = false })!;
        process.WaitForExit();
        return process.Id;
    }

    private static void PlantClaim(string folder, ClaimHolder holder)
    {
        File.WriteAllText(Path.Combine(folder, RunFiles.Claim), holder.ToJson());
        File.WriteAllText(Path.Combine(folder, RunFiles.Lock), "");
    }
}
