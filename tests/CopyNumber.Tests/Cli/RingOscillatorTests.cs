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
            foreach (var name in new[] { "m1", "m2", "m3", "p1", "p2", "p3" })
                Assert.Matches($@"\| {name} \| cycles with the rate equations \| oscillating in \d+ of \d+ replicates: period [\d.]+ ± [\d.]+ .* amplitude [\d.]+ ± [\d.]+ copies .* coherence time [\d.]+ ± [\d.]+", report);
            Assert.Contains("extinction not judged: the rate equations themselves fall to", report);

            // The tables of the oscillation sample: 200 replicates per species, and a spectrum whose largest power of p1 lies at the cycle's period.
            using (var replicates = CopyNumber.Storage.ParquetTableReader.Open(Path.Combine(folder, "oscillation-replicates.parquet")))
                Assert.Equal(6 * 200, replicates.Longs("replicate").Length);
            using var spectrum = CopyNumber.Storage.ParquetTableReader.Open(Path.Combine(folder, "oscillation-spectrum.parquet"));
            var species = spectrum.Strings("species");
            var omega = spectrum.Doubles("omega");
            var power = spectrum.Doubles("power");
            var top = Enumerable.Range(0, species.Length).Where(k => species[k] == "p1").MaxBy(k => power[k]);
            Assert.InRange(2 * Math.PI / omega[top], 30, 45);

            // The report's oscillation figures: paths beside the rate equations, periods, spectra (PNG files).
            foreach (var figure in new[] { "p1-cycle.png", "p1-periods.png", "p1-spectrum.png" })
                Assert.Equal(0x89, File.ReadAllBytes(Path.Combine(folder, "figures", figure))[0]);
            Assert.Contains("## Oscillation", report);
        }
        finally
        {
            if (Directory.Exists(folder)) Directory.Delete(folder, recursive: true);
        }
    }
}
