using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary><c>--covariance-pairs</c> and covariances.parquet through the command line.</summary>
public sealed class CovarianceOptionTests
{
    // A ⇌ B with a conserved total and an independent C: Cov(A, B) = −Var A exactly per run (B = N − A in every replicate).
    private const string Model =
        "species\n  A = 30\n  B = 0\n  C = 5\nparameters\n  kf = 1\n  kb = 1\n  kc = 1\nreactions\n" +
        "  flip: A -> B mass kf back mass kb\n  make_c: 0 -> C mass kc\n  lose_c: C -> 0 mass kc\n";

    [Fact]
    public void Named_pairs_are_the_only_rows_and_are_recorded_in_the_manifest()
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, Model);
        var folder = scratch.File("run");
        var run = CliRun.Of(["simulate", path, "--until", "2", "--every", "1", "--replicates", "300", "--seed", "4", "--covariance-pairs", "B:A", "--out", folder]);
        Assert.True(run.ExitCode == 0, run.Error);
        using var table = ParquetTableReader.Open(Path.Combine(folder, RunFiles.Covariances));
        Assert.Equal(CovariancesTable.ColumnNames, table.ColumnNames);
        Assert.All(table.Strings("species_a"), a => Assert.Equal("A", a));
        Assert.All(table.Strings("species_b"), b => Assert.Equal("B", b));
        Assert.Equal([0.0, 1, 2], table.Doubles("time"));
        Assert.All(table.Doubles("correlation").Skip(1), r => Assert.Equal(-1, r, 1e-12));
        Assert.Contains("\"covariance_pairs\": \"B:A\"", File.ReadAllText(Path.Combine(folder, RunFiles.Manifest)), StringComparison.Ordinal);
    }

    [Fact]
    public void Every_pair_by_default_and_none_on_request()
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, Model);
        Assert.Equal(0, CliRun.Of(["simulate", path, "--until", "1", "--every", "1", "--replicates", "100", "--seed", "4", "--out", scratch.File("all")]).ExitCode);
        using (var table = ParquetTableReader.Open(Path.Combine(scratch.File("all"), RunFiles.Covariances)))
            Assert.Equal(["A:B", "A:C", "B:C"], table.Strings("species_a").Zip(table.Strings("species_b"), (a, b) => $"{a}:{b}").Distinct());
        Assert.Equal(0, CliRun.Of(["simulate", path, "--until", "1", "--every", "1", "--replicates", "100", "--seed", "4", "--covariance-pairs", "none", "--out", scratch.File("none")]).ExitCode);
        Assert.False(File.Exists(Path.Combine(scratch.File("none"), RunFiles.Covariances)));
    }

    [Theory]
    [InlineData("A:Z", "'Z' is not a species of the model")]
    [InlineData("A:A", "names A twice")]
    [InlineData("A-B", "is not a pair of species")]
    public void A_bad_pair_is_refused_with_exit_code_2(string pairs, string message)
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("model.cnet");
        File.WriteAllText(path, Model);
        var run = CliRun.Of(["simulate", path, "--until", "1", "--every", "1", "--replicates", "100", "--covariance-pairs", pairs, "--out", scratch.File("run")]);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("--covariance-pairs: ", run.Error, StringComparison.Ordinal);
        Assert.Contains(message, run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", run.Error, StringComparison.Ordinal);
    }
}
