using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// <c>simulate --view population</c> from the command line: the tables, their checksums, the report's section, the
/// same bits for 1 and 2 threads, and the refusals (exit code 2, a message, no folder) of models and settings the
/// snapshot cannot take. The numbers themselves are checked against independent results in PopulationSnapshotTests.
/// </summary>
public sealed class PopulationViewTests
{
    private const string Protein = """
        # a protein made in proportion to the volume of a growing, dividing cell; illustrative
        species
          P = 30
        parameters
          q = 1
        reactions
          make: 0 -> P  mass q
          decay: P -> 0  mass 0.01
        cycle
          length 20{0}
        {1}
        """;

    private static string Model(ScratchFolder scratch, string name, string length = "", string extra = "", string law = "mass q")
    {
        var path = scratch.File(name + ".cnet");
        File.WriteAllText(path, Protein.Replace("{0}", length).Replace("{1}", extra).Replace("mass q", law));
        return path;
    }

    [Fact]
    public void TheSnapshotIsWrittenCheckedReportedAndTheSameForAnyThreads()
    {
        using var scratch = new ScratchFolder();
        var model = Model(scratch, "protein", " gamma cv 0.2");
        byte[] Run(string threads)
        {
            var folder = scratch.File("t" + threads);
            var run = CliRun.Of("simulate", model, "--until", "200", "--every", "10", "--replicates", "100", "--seed", "5", "--threads", threads,
                "--view", "population", "--burn-in", "3", "--check-exact", "false", "--out", folder);
            Assert.True(run.ExitCode == 0, run.Error);
            Assert.Contains("population snapshot (100 lineages, 7 cycles each after 3 divisions", run.Output);
            // P starts near its level (made at about 1.4 per unit time, lost at 0.01 + ln 2/20): no drift to warn of.
            Assert.DoesNotContain("still drifting", run.Error);
            // The tables carry checksums in the manifest, so the folder reads back (RunFolder verifies every table it lists).
            Assert.NotNull(RunFolder.Read(folder));
            var snapshot = SnapshotTable.Read(folder)!;
            Assert.Equal(["lineage", "population"], snapshot.Moments.Select(m => m.View).ToArray());
            Assert.Equal(7, snapshot.Cycles);
            // The law sums to 1 in each view (a ratio of the same weights).
            foreach (var (_, law) in snapshot.Laws) Assert.Equal(1.0, law.Probabilities.Sum(), 1e-9);
            var report = File.ReadAllText(Path.Combine(folder, RunFiles.ReportMarkdown));
            Assert.Contains("## Population snapshot", report);
            Assert.Contains("No species' population mean differs between the earlier and the later half", report);
            Assert.True(File.Exists(Path.Combine(folder, RunFiles.Figures, "population-snapshot.png")));
            return File.ReadAllBytes(Path.Combine(folder, RunFiles.Snapshot));
        }
        var one = ParquetReadBack.Of(WriteBytes(scratch, "one.parquet", Run("1")));
        var two = ParquetReadBack.Of(WriteBytes(scratch, "two.parquet", Run("2")));
        for (var c = 0; c < one.Values.Length; c++) Assert.Equal(one.Values[c], two.Values[c]);
    }

    [Fact]
    public void A_snapshot_cut_off_before_the_manifest_recorded_it_is_ignored_with_a_warning_and_the_run_still_reads()
    {
        // The snapshot's tables are written after the ensemble, then recorded in the manifest; a kill between the two
        // (made here by taking the records out again) left a folder every reader refused, although its own tables were whole.
        using var scratch = new ScratchFolder();
        var model = Model(scratch, "protein");
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", model, "--until", "200", "--every", "10", "--replicates", "64", "--seed", "5",
            "--view", "population", "--burn-in", "3", "--check-exact", "false", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        var manifestPath = Path.Combine(folder, RunFiles.Manifest);
        var manifest = RunManifest.Read(manifestPath);
        var sums = new SortedDictionary<string, string>(FileChecksums.Recorded(manifest, ManifestFields.Files, folder)!.ToDictionary(), StringComparer.Ordinal);
        Assert.True(sums.Remove(RunFiles.Snapshot) && sums.Remove(RunFiles.SnapshotMoments));
        manifest.Extra[ManifestFields.Files] = sums;
        manifest.WriteAtomic(manifestPath);

        var contrast = CliRun.Of("contrast", folder);
        Assert.True(contrast.ExitCode == 0, contrast.Error);
        Assert.Contains("it was being added when the process stopped, so it is ignored", contrast.Error);
        Assert.Null(SnapshotTable.Read(folder));
        Assert.DoesNotContain("## Population snapshot", File.ReadAllText(Path.Combine(folder, RunFiles.ReportMarkdown)));
    }

    private static string WriteBytes(ScratchFolder scratch, string name, byte[] bytes)
    {
        var path = scratch.File(name);
        File.WriteAllBytes(path, bytes);
        return path;
    }

    [Fact]
    public void ALineageThatHasNotSettledIsWarnedOf()
    {
        // From P = 300 the mean relaxes towards some 32 copies at rate 0.01 + ln 2/20 ≈ 0.045 per unit time (e-fold in 22):
        // with no burn-in the earlier half of the sampled cycles lies far above the later one.
        using var scratch = new ScratchFolder();
        var model = Model(scratch, "far");
        File.WriteAllText(model, File.ReadAllText(model).Replace("P = 30", "P = 300"));
        var folder = scratch.File("out");
        var run = CliRun.Of("simulate", model, "--until", "140", "--every", "10", "--replicates", "64", "--seed", "2", "--view", "population", "--burn-in", "0",
            "--check-exact", "false", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Contains("warning: the population snapshot of P is still drifting", run.Error);
        Assert.Contains("Caution: the population mean still drifts", File.ReadAllText(Path.Combine(folder, RunFiles.ReportMarkdown)));
    }

    [Theory]
    [InlineData("none", "needs a model with a 'cycle' section")]
    [InlineData("schedule", "timed changes")]
    [InlineData("time", "reads 'time' beyond the cell's volume")]
    [InlineData("cv", "CV below 1")]
    [InlineData("short", "raise --until above 100")]
    [InlineData("burn-in", "--burn-in applies to --view population only")]
    [InlineData("shard", "leave out --shard")]
    public void WhatTheSnapshotCannotTakeIsRefusedBeforeAnythingRuns(string problem, string message)
    {
        using var scratch = new ScratchFolder();
        var model = problem switch
        {
            "none" => CliRun.Scenario("toggle_pair.cnet"),
            "schedule" => Model(scratch, problem, extra: "changes\n  q = 2  at time 50"),
            "time" => Model(scratch, problem, law: "rate q * size * (1 + 0.5 * sin(time))"),
            "cv" => Model(scratch, problem, " gamma cv 1.2"),
            _ => Model(scratch, problem),
        };
        var folder = scratch.File("out");
        var args = new List<string> { "simulate", model, "--until", problem == "short" ? "90" : "200", "--every", "10", "--seed", "1", "--out", folder };
        args.AddRange(problem == "burn-in" ? ["--burn-in", "2"] : ["--view", "population"]);
        args.AddRange(problem == "shard" ? ["--shard", "1/2", "--replicates", "128"] : ["--replicates", "64"]);
        var run = CliRun.Of([.. args]);
        Assert.True(run.ExitCode == 2, $"exit {run.ExitCode}: {run.Error}");
        Assert.Contains(message, run.Error);
        Assert.False(File.Exists(Path.Combine(folder, RunFiles.Manifest)), "nothing was written");
    }
}
