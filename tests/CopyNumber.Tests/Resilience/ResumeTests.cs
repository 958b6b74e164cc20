using CopyNumber.Runs;
using System.Globalization;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// An interrupted run resumed with --resume must give, cell for cell, the tables of the same run left
/// uninterrupted: replicate streams depend on (seed, replicate) alone, histograms add exactly, and real
/// moments are combined in one fixed tree over the blocks whichever run finished them.
/// </summary>
public class ResumeTests
{
    private const long Replicates = 1000;
    private const int Seed = 21;

    [Theory]
    [InlineData(1, 5)]
    [InlineData(2, 3)]
    public void A_run_cancelled_through_the_library_and_resumed_equals_the_uninterrupted_run(int threads, int cancelAfterBlocks)
    {
        using var scratch = new ScratchFolder();
        var model = ModelLoader.Load(WriteModel(scratch)).Model!;
        var whole = Folder(scratch, "whole");
        Assert.Equal(StopReason.Finished, Run(model, whole, threads, resume: false, CancellationToken.None).StopReason);

        var resumed = Folder(scratch, "resumed");
        using var cancel = new CancellationTokenSource();
        var partial = Run(model, resumed, threads, resume: false, cancel.Token, block => { if (block + 1 >= cancelAfterBlocks) cancel.Cancel(); });
        Assert.Equal(StopReason.Interrupted, partial.StopReason);
        var manifest = Manifest(resumed);
        Assert.True(manifest.Partial);
        Assert.Equal("interrupted", manifest.ExtraText(ManifestFields.StopReason));
        Assert.InRange(manifest.ReplicatesFinished, 64L * (threads == 1 ? cancelAfterBlocks : 1), Replicates - 1);
        Assert.Equal(0, manifest.ReplicatesFinished % 64);
        Assert.Equal("true", ParquetReadBack.Of(Path.Combine(resumed, RunFiles.Moments)).KeyValues["copynumber.partial"]);
        if (threads == 1) Assert.Equal("0-4", manifest.ExtraText(ManifestFields.FinishedBlocks));

        var outcome = Run(model, resumed, threads, resume: true, CancellationToken.None);
        Assert.Equal(StopReason.Finished, outcome.StopReason);
        Assert.Equal(manifest.ReplicatesFinished, outcome.ReplicatesResumed);
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole, resumed, file);
        Assert.Equal(Manifest(whole).EventsFired, Manifest(resumed).EventsFired);
        Assert.False(Manifest(resumed).Partial);
        Assert.Empty(Directory.GetFiles(resumed, "*" + AtomicFile.PartialMarker + "*"));
        Assert.False(File.Exists(Path.Combine(resumed, "paths-resumed.parquet")));
    }

    [Fact]
    public void A_resumption_that_is_itself_interrupted_resumes_again_to_the_same_result()
    {
        using var scratch = new ScratchFolder();
        var model = ModelLoader.Load(WriteModel(scratch)).Model!;
        var whole = Folder(scratch, "whole");
        Run(model, whole, 1, resume: false, CancellationToken.None);
        var folder = Folder(scratch, "twice");
        using (var first = new CancellationTokenSource())
            Run(model, folder, 1, resume: false, first.Token, block => { if (block == 2) first.Cancel(); });
        using (var second = new CancellationTokenSource())
            Run(model, folder, 1, resume: true, second.Token, block => { if (block == 9) second.Cancel(); });
        Assert.Equal("0-9", Manifest(folder).ExtraText(ManifestFields.FinishedBlocks));
        Run(model, folder, 2, resume: true, CancellationToken.None);
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole, folder, file);
    }

    [Fact]
    public void Resume_through_the_command_takes_left_out_options_from_the_manifest_and_refuses_different_ones()
    {
        using var scratch = new ScratchFolder();
        var modelPath = WriteModel(scratch);
        var model = ModelLoader.Load(modelPath).Model!;
        var folder = Folder(scratch, "run");
        using (var cancel = new CancellationTokenSource())
            Run(model, folder, 1, resume: false, cancel.Token, block => { if (block == 1) cancel.Cancel(); });

        var seed = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--seed", "22", "--resume", folder]);
        Assert.Equal(2, seed.ExitCode);
        Assert.Contains("--seed: 21 in the stored run, 22 in this command", seed.Error);

        var method = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--method", "tau-leap", "--resume", folder]);
        Assert.Equal(2, method.ExitCode);
        Assert.Contains("--method", method.Error);

        var otherModel = WriteModel(scratch, BurstyGene.Replace("dp = 0.5", "dp = 0.4"), "edited.cnet");
        var edited = CliRun.Of(["simulate", otherModel, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", folder]);
        Assert.Equal(2, edited.ExitCode);
        Assert.Contains("model", edited.Error);

        var withOut = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", folder, "--out", scratch.File("x")]);
        Assert.Equal(2, withOut.ExitCode);
        var missing = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", scratch.File("nowhere")]);
        Assert.Equal(2, missing.ExitCode);
        Assert.Contains("does not exist", missing.Error);
        foreach (var run in new[] { seed, method, edited, withOut, missing }) AssertNoStackTrace(run);
        Assert.True(Manifest(folder).Partial);

        // The seed, the method and the paths come from the manifest when left out.
        var resumed = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", folder]);
        Assert.Equal(0, resumed.ExitCode);
        Assert.Contains("128 replicates kept, 872 to run", resumed.Error);
        Assert.False(Manifest(folder).Partial);
        var again = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", folder]);
        Assert.Equal(0, again.ExitCode);
        Assert.Contains("nothing to resume", again.Error);
        var finishedOther = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--seed", "22", "--resume", folder]);
        Assert.Equal(2, finishedOther.ExitCode);
        Assert.Contains("--seed", finishedOther.Error);
    }

    /// <summary>
    /// Issue 10, fault 12: the README promises that options left out take the stored values, yet --until,
    /// --every, --replicates and MODEL were required, and the resume line printed the method argument
    /// ("auto") instead of the method the stored blocks were made with.
    /// </summary>
    [Fact]
    public void Resume_with_only_the_folder_takes_model_and_options_from_the_run_and_prints_its_method()
    {
        using var scratch = new ScratchFolder();
        var model = ModelLoader.Load(WriteModel(scratch)).Model!;
        var whole = Folder(scratch, "whole");
        Run(model, whole, 1, resume: false, CancellationToken.None);
        var folder = Folder(scratch, "run");
        using (var cancel = new CancellationTokenSource())
            Run(model, folder, 1, resume: false, cancel.Token, block => { if (block == 1) cancel.Cancel(); }, methodArgument: "auto");
        File.Delete(model.Path); // the stored model text is what a resumption reads

        var resumed = CliRun.Of(["simulate", "--resume", folder]);
        Assert.Equal(0, resumed.ExitCode);
        AssertNoStackTrace(resumed);
        Assert.Contains("128 replicates kept, 872 to run", resumed.Error);
        Assert.Contains("method direct", resumed.Error);
        Assert.DoesNotContain("method auto", resumed.Error);
        Assert.False(Manifest(folder).Partial);
        foreach (var file in ResultFiles.Append(RunFiles.Paths)) AssertSameCells(whole, folder, file);

        // Without --resume the options are still required, with a message rather than a stack trace.
        var bare = CliRun.Of(["simulate", WriteModel(scratch), "--until", "5", "--every", "0.5"]);
        Assert.Equal(2, bare.ExitCode);
        Assert.Contains("--replicates is required", bare.Error);
        AssertNoStackTrace(bare);
    }

    [Fact]
    public void A_folder_whose_tables_and_manifest_disagree_is_refused()
    {
        using var scratch = new ScratchFolder();
        var modelPath = WriteModel(scratch);
        var model = ModelLoader.Load(modelPath).Model!;
        var a = Folder(scratch, "a");
        var b = Folder(scratch, "b");
        using (var cancel = new CancellationTokenSource())
            Run(model, a, 1, resume: false, cancel.Token, block => { if (block == 1) cancel.Cancel(); });
        using (var cancel = new CancellationTokenSource())
            Run(model, b, 1, resume: false, cancel.Token, block => { if (block == 3) cancel.Cancel(); });
        // As if a resumption had replaced the distributions and then died before its manifest.
        File.Copy(Path.Combine(b, RunFiles.Distributions), Path.Combine(a, RunFiles.Distributions), overwrite: true);
        var run = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", a]);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("distributions.parquet' was changed or damaged after it was written", run.Error);
        AssertNoStackTrace(run);

        // A folder written before checksums existed (no "files" in its manifest) is still checked for blocks.
        var manifest = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(Path.Combine(a, RunFiles.Manifest)))!.AsObject();
        Assert.True(manifest.Remove(ManifestFields.Files));
        File.WriteAllText(Path.Combine(a, RunFiles.Manifest), manifest.ToJsonString());
        var old = CliRun.Of(["simulate", modelPath, "--until", "5", "--every", "0.5", "--replicates", "1000", "--resume", a]);
        Assert.Equal(2, old.ExitCode);
        Assert.Contains("holds blocks 0-3 but the manifest", old.Error);
        AssertNoStackTrace(old);
    }

    private static string Folder(ScratchFolder scratch, string name)
    {
        var folder = scratch.File(name);
        Directory.CreateDirectory(folder);
        return folder;
    }

    /// <summary>The run every test here uses: 1000 replicates of the bursty gene, seed 21, paths of the first 100.</summary>
    internal static SimulationOutcome Run(LoadedModel model, string folder, int threads, bool resume, CancellationToken cancel, Action<long>? blockFinished = null, string methodArgument = "direct")
    {
        var specification = new RunSpecification
        {
            Model = model,
            Grid = new TimeGrid(5, 0.5),
            Replicates = Replicates,
            Seed = Seed,
            MethodRequested = methodArgument,
            PathReplicates = 100,
            Threads = threads,
        };
        // The direct method whatever was asked for, so that the stored settings, not the method, differ between tests.
        var plan = RunPlan.Make(specification with { MethodRequested = "direct" }) with { Specification = specification };
        var request = new SimulationRequest(plan, folder) { Resume = resume };
        return SimulationRun.Execute(request, new EnsembleMonitor { BlockFinished = blockFinished }, cancel);
    }
}
