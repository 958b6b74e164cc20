using System.Globalization;
using CopyNumber.Cli;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Runs;
using CopyNumber.Storage;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Storage;
using Xunit.Abstractions;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Issue 10, fault 3: with --paths on a disk that filled up the run ended with "Index was outside the
/// bounds of the array.", exit 1 and only deterministic.parquet, although the summaries would have fit
/// (the paths table kept a full row group after a failed flush). Now the paths are dropped with a clear
/// message and the summary tables and manifest are written, identical to a run without --paths.
/// </summary>
public class PathsFullDiskTests(ITestOutputHelper log)
{
    /// <summary>2000 replicates × 101 grid points = 202 000 path rows; with the 2 + 4 columns of the gene model, several MB.</summary>
    private const int Replicates = 2000;

    private static SimulationRequest Request(ScratchFolder scratch, string name, long pathReplicates, Func<string, Stream>? open)
    {
        var loaded = ModelLoader.LoadText(BurstyGene, "gene.cnet").Model!;
        var folder = scratch.File(name);
        Directory.CreateDirectory(folder);
        var specification = new RunSpecification
        {
            Model = loaded,
            Grid = new TimeGrid(50, 0.5),
            Replicates = Replicates,
            Seed = 11,
            MethodRequested = "direct",
            Threads = 2,
            PathReplicates = pathReplicates,
        };
        return new SimulationRequest(RunPlan.Make(specification), folder) { OpenPathsFile = open };
    }

    [Fact]
    public void A_disk_that_fills_up_while_paths_are_written_drops_the_paths_and_writes_the_same_summaries_as_a_run_without_them()
    {
        using var scratch = new ScratchFolder();
        var reference = SimulationRun.Execute(Request(scratch, "reference", 0, null));
        var whole = SimulationRun.Execute(Request(scratch, "whole", Replicates, null));
        Assert.Null(whole.PathsFailure);
        var pathsSize = new FileInfo(Path.Combine(scratch.File("whole"), RunFiles.Paths)).Length;
        log.WriteLine($"paths.parquet of the whole run: {pathsSize} bytes");

        // Chosen points: the file's header, inside the first full row group, and the last byte of the footer.
        foreach (var capacity in new[] { 0L, 100_000L, pathsSize - 1 })
        {
            var name = $"full-{capacity}";
            var outcome = SimulationRun.Execute(Request(scratch, name, Replicates, temporary => new FillingStream(temporary, capacity)));
            var folder = scratch.File(name);

            Assert.NotNull(outcome.PathsFailure);
            Assert.StartsWith("no space left on device while writing paths.parquet (after ", outcome.PathsFailure);
            Assert.EndsWith("the paths were dropped", outcome.PathsFailure);
            Assert.Equal(StopReason.Finished, outcome.StopReason);
            Assert.Equal(outcome.PathsFailure, Manifest(folder).ExtraText(ManifestFields.PathsFailure));
            Assert.False(File.Exists(Path.Combine(folder, RunFiles.Paths)));
            Assert.Empty(Directory.GetFiles(folder, "*" + AtomicFile.PartialMarker + "*"));
            // The paths are a by-product: the summaries are the reference run's, cell for cell.
            foreach (var file in ResultFiles) AssertSameCells(scratch.File("reference"), folder, file);
        }
        Assert.Null(reference.PathsFailure);
    }

    [Fact]
    public void On_a_real_full_tmpfs_simulate_with_paths_exits_1_with_a_clear_message_and_keeps_the_summaries()
    {
        if (ChildCli.TmpfsUnavailable() is { } reason)
        {
            log.WriteLine($"skipped: {reason}");
            return;
        }
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var mount = scratch.File("small");
        Directory.CreateDirectory(mount);
        // Measured: the summaries take about 0.6 MB and paths.parquet about 4.6 MB, so 2 MB holds the one and not the other.
        var (code, output, error) = ChildCli.Shell(
            $"mount -t tmpfs -o size=2m tmpfs '{mount}' && {ChildCli.Cn} simulate '{model}' --until 50 --every 0.1 --replicates {Replicates} --seed 1 --paths all --no-contrast --out '{mount}/run'; " +
            $"echo \"exit=$?\"; ls '{mount}/run' | sed 's/^/entry /'; cat '{mount}/run/{RunFiles.Manifest}'");
        log.WriteLine(output + error);
        Assert.Equal(0, code);
        Assert.Contains($"exit={ExitCodes.RunFailed}", output);
        Assert.Contains("error: no space left on device while writing paths.parquet (after ", error);
        Assert.Contains("the summary tables and manifest.json were written without them", error);
        Assert.DoesNotContain("Index was outside", error);
        Assert.DoesNotContain("   at ", error);
        foreach (var file in new[] { RunFiles.Moments, RunFiles.Distributions, RunFiles.ReadoutState, RunFiles.Deterministic, RunFiles.Manifest })
            Assert.Contains($"entry {file}\n", output);
        Assert.DoesNotContain($"entry {RunFiles.Paths}", output);
        Assert.DoesNotContain(AtomicFile.PartialMarker, output);
        Assert.Contains($"\"{ManifestFields.PathsFailure}\": \"no space left on device while writing paths.parquet", output);
    }
}
