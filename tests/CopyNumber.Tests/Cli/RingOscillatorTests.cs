namespace CopyNumber.Tests.Cli;

/// <summary>
/// The measured failure of issue 17: the bundled three-gene ring (1 000 replicates to t = 200) was read as "mean shifted"
/// (up to 630%), "noise-dominated" and, for every mRNA, "extinction-prone", with first-order corrections of +1131% and LNA
/// coefficients of variation of 4 quoted along the cycle. Now each species cycles with the rate equations, with period,
/// amplitude and coherence time and their errors, and no expansion is quoted or drawn along the cycle.
/// </summary>
public sealed class RingOscillatorTests
{
    [Fact]
    public void RingReportSaysItOscillatesAndQuotesNoExpansionAlongTheCycle()
    {
        var folder = Path.Combine(Path.GetTempPath(), $"cn-ring-{Guid.NewGuid():N}");
        try
        {
            var run = CliRun.Of("simulate", CliRun.Scenario("ring_oscillator.cnet"), "--until", "200", "--every", "1", "--replicates", "1000",
                "--seed", "1", "--threads", "2", "--out", folder);
            Assert.True(run.ExitCode == 0, run.Error);
            var report = File.ReadAllText(Path.Combine(folder, "report.md"));
            foreach (var text in new[] { run.Output, report })
            {
                Assert.DoesNotContain("mean shifted", text);
                Assert.DoesNotContain("noise-dominated", text);
                Assert.DoesNotContain("extinction-prone", text);
                Assert.DoesNotContain("first-order correction predicts", text);
                Assert.DoesNotContain("linear noise approximation gives", text);
            }
            Assert.DoesNotContain("LNA ±2σ", report);
            foreach (var species in new[] { "m1", "m2", "m3", "p1", "p2", "p3" })
                Assert.Matches($@"\| {species} \| cycles with the rate equations \| \d+ of \d+ replicates oscillate: period [\d.]+ ± [\d.]+ .* amplitude [\d.]+ ± [\d.]+ copies .* coherence time [\d.]+ ± [\d.]+", report);
            Assert.Contains("extinction not judged: the rate equations themselves fall to", report);
        }
        finally
        {
            if (Directory.Exists(folder)) Directory.Delete(folder, recursive: true);
        }
    }
}
