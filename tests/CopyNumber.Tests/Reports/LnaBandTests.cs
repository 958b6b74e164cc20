using CopyNumber.Reports;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// Issue 16: the LNA ±2σ band went below zero copies. For immigration–death (0 → X at rate α, X → 0 at rate μ·X)
/// the stationary law is Poisson with mean α/μ (exact; e.g. Gardiner, Handbook of Stochastic Methods, birth–death
/// processes; quoted from memory) and the LNA variance equals that mean, so the band's lower edge is α/μ − 2·√(α/μ):
/// −0.83 for α/μ = 2 (clipped, with a note) and 400 − 40 = 360 for α/μ = 400 (untouched).
/// </summary>
public sealed class LnaBandTests
{
    [Fact]
    public void A_species_band_is_clipped_at_zero_and_a_readout_band_is_not()
    {
        double[] centre = [2, 400];
        double[] variance = [2, 400];
        var (lower, upper, clipped) = LnaBand.Of(centre, variance, isSpecies: true);
        Assert.True(clipped);
        Assert.Equal([0, 360], lower);
        Assert.Equal(2 + 2 * Math.Sqrt(2), upper[0], 12);
        var (readoutLower, _, readoutClipped) = LnaBand.Of(centre, variance, isSpecies: false);
        Assert.False(readoutClipped);
        Assert.Equal(2 - 2 * Math.Sqrt(2), readoutLower[0], 12);
    }

    [Theory]
    [InlineData(2, true)]
    [InlineData(400, false)]
    public void The_report_says_when_the_band_was_clipped(int alpha, bool clipped)
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("birth_death.cnet");
        File.WriteAllText(model, $"# illustrative\nspecies\n  X = {alpha}\nreactions\n  make: 0 -> X mass {alpha}\n  decay: X -> 0 mass 1\n");
        var run = CliRun.Of("simulate", model, "--until", "3", "--every", "1", "--replicates", "200", "--seed", "11", "--out", scratch.File("run"));
        Assert.Equal(0, run.ExitCode);
        var report = File.ReadAllText(Path.Combine(scratch.File("run"), "report.md"));
        Assert.Contains("LNA ±2σ band", report);
        Assert.Equal(clipped, report.Contains("clipped at 0 copies", StringComparison.Ordinal));
    }
}
