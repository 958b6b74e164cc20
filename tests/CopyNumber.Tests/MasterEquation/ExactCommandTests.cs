using CopyNumber.Runs;
using CopyNumber.Analysis;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// <c>copynumber exact</c> end to end: the run folder, its contrast, and the refusals. Exact values here
/// are those of the immigration–death process (Poisson with mean (k/μ)(1 − e^{−μt}); Bailey 1964, quoted
/// from memory), whose rate equation dx/dt = k − μx has the same mean exactly (common practice: a linear
/// network's mean obeys its rate equations).
/// </summary>
public sealed class ExactCommandTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "copynumber-exact-" + Guid.NewGuid().ToString("N"));
    private readonly string _model;

    public ExactCommandTests()
    {
        Directory.CreateDirectory(_folder);
        _model = Path.Combine(_folder, "immigration.cnet");
        File.WriteAllText(_model, "species\n  X = 0\nreactions\n  birth: 0 -> X mass 20\n  death: X -> 0 mass 0.5\n");
    }

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public void WritesAFolderWhoseContrastUsesTheProjectionErrorBars()
    {
        var run = Path.Combine(_folder, "run");
        var exact = CliRun.Of("exact", _model, "--until", "10", "--every", "1", "--tolerance", "1e-8", "--out", run);
        Assert.True(exact.ExitCode == 0, exact.Error);
        foreach (var file in new[] { RunFiles.Moments, RunFiles.Distributions, RunFiles.Deterministic, RunFiles.Manifest })
            Assert.True(File.Exists(Path.Combine(run, file)), file);

        var folder = RunFolder.Read(run);
        Assert.Equal(ExactRun.ExactErrorKind, folder.Manifest.ExtraText(ExactRun.ErrorKindField));
        var x = folder.Quantities.Single(q => q.Name == "X");
        for (var k = 0; k < folder.Times.Length; k++)
        {
            var mean = 20 / 0.5 * (1 - Math.Exp(-0.5 * folder.Times[k]));
            Assert.Equal(mean, x.Mean[k], 1e-6);
            Assert.Equal(mean, x.Variance[k], 1e-5); // Poisson: variance = mean
            Assert.Equal(0, x.Replicates[k]);
        }

        var contrast = RunContrast.Compute(folder);
        Assert.Equal(ExactRun.ExactErrorKind, contrast.ErrorSource);
        var quantity = contrast.Quantities.Single(q => q.Name == "X");
        // The band is the stored error bar itself (z·SE with SE = bar / z), not a sampling error.
        for (var k = 0; k < folder.Times.Length; k++)
            Assert.Equal(x.StandardError[k], quantity.Deviations[k].AbsoluteHalfWidth, 1e-15);
        Assert.Equal(VerdictKind.Adequate, Assert.Single(quantity.Verdicts).Kind);

        var printed = CliRun.Of("contrast", run);
        Assert.True(printed.ExitCode == 0, printed.Error);
        Assert.Contains("error bars: " + ExactRun.ExactErrorKind, printed.Output);
    }

    [Fact]
    public void AProjectionBeyondMaxStatesStopsWithTheCountAndASuggestion()
    {
        var result = CliRun.Of("exact", _model, "--until", "10", "--every", "1", "--max-states", "20", "--out", Path.Combine(_folder, "small"));
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("more than 20 states", result.Error);
        Assert.Contains("'simulate'", result.Error);
        Assert.DoesNotContain("   at ", result.Error);
    }

    [Fact]
    public void ACountDependentParameterChangeIsRefused()
    {
        var model = Path.Combine(_folder, "random-parameter.cnet");
        File.WriteAllText(model, "species\n  X = 0\nparameters\n  k = 5\nreactions\n  birth: 0 -> X mass k\n  death: X -> 0 mass 1\nchanges\n  k = X  at time 2\n");
        var result = CliRun.Of("exact", model, "--until", "4", "--every", "1", "--out", Path.Combine(_folder, "refused"));
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("depends on the counts", result.Error);
    }

    [Fact]
    public void TheStationaryLawIsWrittenWithItsResidual()
    {
        var run = Path.Combine(_folder, "stationary");
        var result = CliRun.Of("exact", _model, "--until", "30", "--every", "10", "--stationary", "--out", run);
        Assert.True(result.ExitCode == 0, result.Error);
        Assert.True(File.Exists(Path.Combine(run, ExactRun.StationaryFile)));
        // Stationary law Poisson(k/μ = 40): mean 40.
        Assert.Contains("X mean 40", result.Output);
        Assert.Contains("relative residual", result.Output);
    }
}
