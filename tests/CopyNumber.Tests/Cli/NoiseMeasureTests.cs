using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// A coefficient of variation and a Fano factor measure noise only for a positive quantity: a signed one
/// can have mean 0 whatever its spread, and for a quantity that is 0 or 1 they are fixed by the occupancy p
/// (CV = √((1 − p)/p), Fano factor 1 − p; common practice, the Bernoulli law).
/// </summary>
public class NoiseMeasureTests
{
    private static string[] Lines(CliRun run, string quantity) =>
        run.Output.Split('\n').Where(l => l.StartsWith(quantity + " ", StringComparison.Ordinal)).ToArray();

    private static CliRun Simulate(ScratchFolder scratch, string scenario)
    {
        var run = CliRun.Of("simulate", CliRun.Scenario(scenario), "--until", "100", "--every", "1", "--replicates", "400",
            "--seed", "3", "--method", "direct", "--out", scratch.File("run"));
        Assert.Equal(0, run.ExitCode);
        return run;
    }

    [Fact]
    public void A_signed_difference_gets_no_coefficient_of_variation_verdict_and_is_told_why()
    {
        using var scratch = new ScratchFolder();
        var run = Simulate(scratch, "toggle_pair.cnet");
        var difference = Lines(run, "difference");
        Assert.NotEmpty(difference);
        Assert.DoesNotContain(difference, l => l.Contains("noise-dominated"));
        Assert.Contains(difference, l => l.Contains("takes negative values") && l.Contains("no coefficient of variation or Fano factor verdict"));
        var table = ParquetReadBack.Of(Path.Combine(scratch.File("run"), "contrast.parquet"));
        var names = (string[])table.Values[Array.IndexOf(table.Names, "species")];
        var cv = (double[])table.Values[Array.IndexOf(table.Names, "cv")];
        var fano = (double[])table.Values[Array.IndexOf(table.Names, "fano")];
        for (var row = 0; row < names.Length; row++)
            if (names[row] == "difference") Assert.True(double.IsNaN(cv[row]) && double.IsNaN(fano[row]), $"CV {cv[row]}, Fano {fano[row]} for the difference");
    }

    [Fact]
    public void A_single_gene_state_and_its_complement_get_the_same_kind_of_statement_with_the_occupancy()
    {
        // g_off + g_on = 1 bounds both to {0, 1}; with k_on = k_off the stationary occupancy is ½ (two-state
        // Markov chain; common practice) and neither state is 'noise-dominated'.
        using var scratch = new ScratchFolder();
        var run = Simulate(scratch, "promoter_switch.cnet");
        foreach (var gene in new[] { "g_on", "g_off" })
        {
            var lines = Lines(run, gene);
            Assert.NotEmpty(lines);
            Assert.DoesNotContain(lines, l => l.Contains("noise-dominated"));
            Assert.Contains(lines, l => l.Contains("a 0/1 quantity (bounded to 0 or 1 by the conservation law") && l.Contains("occupancy (fraction of replicates at 1)"));
            // With k_on = k_off = k the gene leaves whichever state it is in at rate k, so its switches form a
            // Poisson process: S over [0, 100] is Poisson(k·100 = 5) exactly (common practice, two-state chain).
            // 400 replicates: standard error √(5/400) = 0.11; the sentence prints three digits.
            var match = System.Text.RegularExpressions.Regex.Match(string.Join(" ", lines), @"([0-9.]+) switches per replicate from t = 0");
            Assert.True(match.Success, string.Join("\n", lines));
            var switches = double.Parse(match.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);
            Assert.InRange(switches, 5 - 4 * 0.112, 5 + 4 * 0.112);
        }
    }
}
