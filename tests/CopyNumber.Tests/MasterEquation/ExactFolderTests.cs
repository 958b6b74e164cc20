using CopyNumber.Analysis;
using CopyNumber.Runs;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// What the other commands make of an exact folder: its verdicts speak of probabilities (there are no
/// replicates), and resuming or merging it is refused with the reason. The law used is immigration–death
/// from 0 (Poisson with mean (k/μ)(1 − e^{−μt}); Bailey 1964, quoted from memory): with k = 2, μ = 1 at
/// t = 10, P(0) = e^{−2(1 − e^{−10})} ≈ 0.135, above the default extinction threshold 0.05, while the rate
/// equation holds ≈ 2 copies (≥ the floor of 1).
/// </summary>
public sealed class ExactFolderTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "copynumber-exactfolder-" + Guid.NewGuid().ToString("N"));
    private readonly string _run;

    public ExactFolderTests()
    {
        Directory.CreateDirectory(_folder);
        var model = Path.Combine(_folder, "rare.cnet");
        File.WriteAllText(model, "species\n  X = 0\nreactions\n  birth: 0 -> X mass 2\n  death: X -> 0 mass 1\n");
        _run = Path.Combine(_folder, "run");
        var exact = CliRun.Of("exact", model, "--until", "10", "--every", "1", "--out", _run);
        Assert.True(exact.ExitCode == 0, exact.Error);
    }

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public void TheExtinctionVerdictOfAnExactFolderStatesAProbabilityNotReplicates()
    {
        var contrast = RunContrast.Compute(RunFolder.Read(_run));
        var verdict = contrast.Quantities.Single(q => q.Name == "X").Verdicts.Single(v => v.Kind == VerdictKind.ExtinctionProne);
        Assert.Contains("exact law", verdict.Sentence);
        Assert.DoesNotContain("replicates", verdict.Sentence);
        Assert.Contains("0.135", verdict.Sentence);
    }

    [Fact]
    public void ResumingAnExactFolderSaysItIsAnExactSolution()
    {
        var result = CliRun.Of("simulate", "--resume", _run);
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("exact solution of the master equation", result.Error);
        Assert.DoesNotContain("block_size", result.Error);
    }

    [Fact]
    public void MergingAnExactFolderSaysItIsAnExactSolution()
    {
        var result = CliRun.Of("merge", _run, "--out", Path.Combine(_folder, "merged"));
        Assert.Equal(2, result.ExitCode);
        Assert.Contains("exact solution of the master equation", result.Error);
    }

    /// <summary>
    /// simulate --check-exact on the same immigration–death model: the direct method's ensemble is a sample of
    /// the Poisson law, so at the family-wise level 0.01 it agrees (fixed seed), and the manifest holds the check.
    /// </summary>
    [Fact]
    public void CheckExactReportsTheKolmogorovDistanceInTheConsoleAndTheManifest()
    {
        var model = Path.Combine(_folder, "rare.cnet");
        var sampled = Path.Combine(_folder, "sampled");
        var result = CliRun.Of("simulate", model, "--until", "10", "--every", "2", "--replicates", "1000", "--seed", "7", "--method", "direct", "--check-exact", "--no-contrast", "--out", sampled);
        Assert.True(result.ExitCode == 0, result.Error);
        Assert.Contains("the ensemble agrees with the exact law", result.Output);
        Assert.Contains("X: largest Kolmogorov distance", result.Output);
        var manifest = File.ReadAllText(Path.Combine(sampled, RunFiles.Manifest));
        Assert.Contains("\"exact_check\"", manifest);
        Assert.Contains("\"largest_kolmogorov_distance\"", manifest);

        var contrast = CliRun.Of("contrast", sampled);
        Assert.True(contrast.ExitCode == 0, contrast.Error);
        Assert.Contains("Ensemble against the exact law", File.ReadAllText(Path.Combine(sampled, RunFiles.ReportMarkdown)));
    }

    [Fact]
    public void JointWritesItsTableAndRefusesAnUnknownSpecies()
    {
        var model = Path.Combine(_folder, "pair.cnet");
        File.WriteAllText(model, "species\n  X = 0\n  Y = 0\nreactions\n  bx: 0 -> X mass 2\n  dx: X -> 0 mass 1\n  convert: X -> Y mass 0.5\n  dy: Y -> 0 mass 1\n");
        var run = Path.Combine(_folder, "joint");
        var result = CliRun.Of("exact", model, "--until", "2", "--every", "1", "--joint", "X,Y", "--out", run);
        Assert.True(result.ExitCode == 0, result.Error);
        Assert.True(File.Exists(Path.Combine(run, RunFiles.Joint)));
        var refused = CliRun.Of("exact", model, "--until", "2", "--every", "1", "--joint", "X,Z", "--out", Path.Combine(_folder, "refused"));
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("'Z' is not a species", refused.Error);
    }
}
