using System.Globalization;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Ensembles;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// The contrast report's noise section (issue 13: "the report says how much of each quantity's variance is
/// intrinsic, extrinsic ..., with errors"), run through the real command line. Immigration–death with a
/// gamma-distributed immigration rate k (mean m, CV c) from X(0) = 0: given k, X(t) is Poisson with mean
/// k·u, u = (1 − e^(−dt))/d (Bailey 1964, quoted from memory), so by the law of total variance the squared
/// CV splits into the intrinsic part 1/⟨x⟩ and the extrinsic part c² (Swain, Elowitz &amp; Siggia 2002,
/// PNAS 99:12795; common practice). The exact values are computed here.
/// </summary>
public sealed class NoiseSectionTests
{
    private const double Mean = ExtrinsicVariabilityTests.Mean, Cv = ExtrinsicVariabilityTests.Cv, Death = ExtrinsicVariabilityTests.Death, Until = ExtrinsicVariabilityTests.Until;

    [Fact]
    public void The_report_splits_the_noise_into_its_exact_intrinsic_and_extrinsic_parts_within_the_errors_it_prints()
    {
        var folder = Path.Combine(Path.GetTempPath(), $"copynumber-noise-{Guid.NewGuid():N}");
        Directory.CreateDirectory(folder);
        var model = Path.Combine(folder, "varying_immigration.cnet");
        File.WriteAllText(model, ExtrinsicVariabilityTests.ModelText);
        try
        {
            var run = CliRun.Of("simulate", model, "--until", "4", "--every", "2", "--replicates", "16000", "--seed", "2002", "--out", Path.Combine(folder, "run"));
            Assert.True(run.ExitCode == 0, run.Error);
            var report = File.ReadAllText(Path.Combine(folder, "run", "report.md"));
            Assert.Contains("## Noise: intrinsic and extrinsic", report);
            var row = report.Split('\n').Single(l => l.StartsWith("| X | 4 |", StringComparison.Ordinal));
            var cells = row.Split('|', StringSplitOptions.TrimEntries)[1..^1];
            var (intrinsic, intrinsicSe) = ValueAndError(cells[4]);
            var (extrinsic, extrinsicSe) = ValueAndError(cells[5]);
            var x = Mean * (1 - Math.Exp(-Death * Until)) / Death;
            // Five printed standard errors: a false failure has probability below 10⁻⁶ per part (normal tail).
            Assert.True(Math.Abs(intrinsic - 1 / x) <= 5 * intrinsicSe, $"intrinsic CV² {intrinsic} ± {intrinsicSe}, exact {1 / x}");
            Assert.True(Math.Abs(extrinsic - Cv * Cv) <= 5 * extrinsicSe, $"extrinsic CV² {extrinsic} ± {extrinsicSe}, exact {Cv * Cv}");
            // The errors are small enough for the check to mean something: each part resolved to 20%.
            Assert.True(intrinsicSe < 0.2 / x && extrinsicSe < 0.2 * Cv * Cv, row);
            var share = double.Parse(cells[6].Replace("\\", "", StringComparison.Ordinal).TrimEnd('%'), CultureInfo.InvariantCulture) / 100;
            Assert.InRange(share, 0.6, 0.95); // exact c²/(1/x + c²) = 0.83
            Assert.Contains("noise-split.png", report);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    // "0.2513 ± 0.0112", with the Markdown escapes of the report removed.
    private static (double Value, double Error) ValueAndError(string cell)
    {
        var parts = cell.Replace("\\", "", StringComparison.Ordinal).Split('±', StringSplitOptions.TrimEntries);
        return (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture));
    }
}
