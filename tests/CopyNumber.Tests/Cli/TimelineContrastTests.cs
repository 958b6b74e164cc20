using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// Deterministic models with a schedule: the ensemble must equal its rate equations exactly, so the
/// contrast may say nothing but "adequate" (common practice: nothing in these models is random), over the whole run
/// and in each phase between the schedule's changes.
/// </summary>
public sealed class TimelineContrastTests
{
    private static void OnlyAdequate(string model, string[] quantities, params string[] arguments)
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, model);
        var run = CliRun.Of(["simulate", path, "--replicates", "100", "--seed", "2", "--out", scratch.File("run"), .. arguments]);
        Assert.True(run.ExitCode == 0, run.Error);
        foreach (var quantity in quantities)
        {
            var verdict = run.Output.Split('\n').Where(l => l.StartsWith(quantity + " ", StringComparison.Ordinal) && l.Contains("adequate", StringComparison.Ordinal)).ToArray();
            Assert.Single(verdict);
        }
        foreach (var word in new[] { "mean shifted", "noise-dominated", "multimodal", "extinction-prone" })
            Assert.DoesNotContain(word, run.Output, StringComparison.Ordinal);
        // The change cuts the run into two phases, each judged on its own (and the grid time at the change opens the second).
        Assert.Contains("verdicts per phase of the schedule", run.Output, StringComparison.Ordinal);
        Assert.Contains("Verdicts per phase", File.ReadAllText(Path.Combine(scratch.File("run"), "report.md")), StringComparison.Ordinal);
        using var phases = CopyNumber.Storage.ParquetTableReader.Open(Path.Combine(scratch.File("run"), "phases.parquet"));
        Assert.Equal(quantities.Length * 2, phases.Longs("phase").Length);
        Assert.All(phases.Strings("verdicts"), v => Assert.Equal("adequate", v));
        Assert.Equal(0.005, phases.Doubles("false_alarm_rate").Distinct().Single(), 12);
        using var contrast = CopyNumber.Storage.ParquetTableReader.Open(Path.Combine(scratch.File("run"), "contrast.parquet"));
        var times = contrast.Doubles("time");
        var phase = contrast.Longs("phase");
        var start = phases.Doubles("start").Max();
        for (var row = 0; row < times.Length; row++)
            Assert.Equal(times[row] >= start - 1e-9 * start ? 1 : 0, phase[row]);
    }

    [Theory]
    [InlineData("direct")]
    [InlineData("next-reaction")]
    [InlineData("tau-leap")]
    public void A_change_on_a_grid_time_computed_differently_raises_no_alarm(string method) =>
        // 3 × 0.3 = 0.8999999999999999 on the grid against the change at 0.9.
        OnlyAdequate("species\n  X = 0\nparameters\n  k = 0\nreactions\n  decay: X -> 0 mass k\nchanges\n  X = 100  at time 0.9\n",
            ["X"], "--until", "1.5", "--every", "0.3", "--method", method);

    [Fact]
    public void A_readout_of_a_scheduled_parameter_raises_no_alarm() =>
        OnlyAdequate("species\n  A = 100\nparameters\n  K = 1\n  k = 0\nreactions\n  decay: A -> 0 mass k\nchanges\n  K = 10  at time 2\nreadouts\n  scaled = A / K\n",
            ["A", "scaled"], "--until", "4", "--every", "0.5");
}
