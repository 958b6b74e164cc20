using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// A network whose propensity grows exponentially (linear autocatalysis) is stopped as explosive within
/// seconds instead of showing "0 replicates" for hours. The projection rule is ours (docs/methods.md,
/// "Runaway guard"); the facts it is checked against are the Yule process's.
/// </summary>
public sealed class RunawayTests
{
    private const string Yule = "# illustrative: self-replication without decay\nspecies\n  X = 10\nreactions\n  copy: X -> 2 X mass 1\n";

    [Fact]
    public void Linear_autocatalysis_to_t_20_stops_as_explosive_with_exit_code_1_instead_of_running_for_hours()
    {
        // X -> 2X at rate 1 from X = 10 is a Yule process: E[X(t)] = 10·e^t (Yule 1925, Phil. Trans. R. Soc. B
        // 213:21), so one replicate to t = 20 fires about 10·e^20 ≈ 4.9·10^9 events and 100 replicates about
        // 4.9·10^11: hours of CPU at the rates of docs/performance.md. The linear projection a0·(T − t) stays
        // below 10^10 per replicate all the way, so before the growth rule the run never stopped. --max-wall
        // keeps the test bounded should the guard not fire: the run would then end "partial" with exit code 0.
        using var scratch = new ScratchFolder();
        var model = scratch.File("yule.cnet");
        File.WriteAllText(model, Yule);
        var run = CliRun.Of("simulate", model, "--until", "20", "--every", "1", "--replicates", "100", "--seed", "3",
            "--threads", "2", "--max-wall", "60", "--out", scratch.File("run"));
        Assert.Equal(1, run.ExitCode);
        Assert.Contains("method direct", run.Error);
        Assert.Contains("explosive", run.Error);
        Assert.Contains("'copy'", run.Error);
        Assert.Contains("grows", run.Error);
        Assert.Contains("--max-events", run.Error);
        Assert.DoesNotContain("   at ", run.Error); // no stack trace
        // The folder is still written, with the (empty) summaries marked partial.
        Assert.True(File.Exists(Path.Combine(scratch.File("run"), "manifest.json")));
    }
}
