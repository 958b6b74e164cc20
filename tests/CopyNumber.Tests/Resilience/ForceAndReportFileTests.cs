using System.Text.RegularExpressions;
using CopyNumber.Cli;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using Xunit.Abstractions;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Issue 10, fault 11: --force left the previous run's paths.parquet, readout-state.parquet and figures of
/// another model behind; a second contrast left the first one's figures; and a report file written
/// straight under its final name could be a truncated PNG after a full disk.
/// </summary>
public partial class ForceAndReportFileTests(ITestOutputHelper log)
{
    /// <summary>A birth-death process with no real readouts (so no readout-state.parquet): our own illustrative model.</summary>
    private const string BirthDeath = "species\n  x = 5\nparameters\n  k = 10\n  g = 1\nreactions\n  make: 0 -> x mass k\n  lose: x -> 0 mass g\n";

    [Fact]
    public void Force_removes_every_file_of_the_earlier_run_so_only_the_new_runs_files_remain()
    {
        using var scratch = new ScratchFolder();
        var gene = WriteModel(scratch);
        var folder = scratch.File("run");
        Assert.Equal(0, CliRun.Of(Simulate(gene, 300, 1, "--paths", "10", "--heatmap", "p", "--out", folder)).ExitCode);
        Assert.True(File.Exists(Path.Combine(folder, RunFiles.Paths)));
        Assert.True(File.Exists(Path.Combine(folder, RunFiles.ReadoutState)));

        var birthDeath = WriteModel(scratch, BirthDeath, "birth_death.cnet");
        // --paths 0: the new run writes no paths, so an old paths.parquet could only be the earlier run's.
        var forced = CliRun.Of(Simulate(birthDeath, 300, 2, "--paths", "0", "--out", folder, "--force"));
        Assert.Equal(0, forced.ExitCode);

        Assert.Equal(
            new[] { RunFiles.Contrast, RunFiles.Deterministic, RunFiles.Distributions, RunFiles.Figures, RunFiles.Manifest, RunFiles.Moments, RunFiles.ReportHtml, RunFiles.ReportMarkdown },
            Directory.EnumerateFileSystemEntries(folder).Select(Path.GetFileName).Order(StringComparer.Ordinal).ToArray());
        AssertFiguresAreTheReports(folder);
        // Figures are named after their quantity: only the birth-death model's x may have any now.
        foreach (var figure in Directory.GetFiles(Path.Combine(folder, RunFiles.Figures)))
            Assert.StartsWith("x-", Path.GetFileName(figure));
    }

    [Fact]
    public void Force_refuses_a_folder_holding_files_copynumber_did_not_write_and_removes_nothing()
    {
        using var scratch = new ScratchFolder();
        var gene = WriteModel(scratch);
        var folder = scratch.File("run");
        Assert.Equal(0, CliRun.Of(Simulate(gene, 300, 1, "--no-contrast", "--out", folder)).ExitCode);
        File.WriteAllText(Path.Combine(folder, "notes.txt"), "my notes");
        var before = Directory.GetFiles(folder).Order(StringComparer.Ordinal).ToArray();

        var refused = CliRun.Of(Simulate(gene, 300, 2, "--no-contrast", "--out", folder, "--force"));

        Assert.Equal(ExitCodes.BadInput, refused.ExitCode);
        Assert.Contains($"The output folder '{folder}' holds files copynumber did not write ('notes.txt'); --force only replaces a run folder's own files.", refused.Error);
        Assert.Equal(before, Directory.GetFiles(folder).Order(StringComparer.Ordinal).ToArray());
        Assert.Equal(1UL, Manifest(folder).Seed);
    }

    [Fact]
    public void A_second_contrast_leaves_none_of_the_first_ones_figures()
    {
        using var scratch = new ScratchFolder();
        var gene = WriteModel(scratch);
        var folder = scratch.File("run");
        Assert.Equal(0, CliRun.Of(Simulate(gene, 300, 1, "--heatmap", "p", "--at", "1,2.5", "--out", folder)).ExitCode);
        var heatmap = Path.Combine(folder, RunFiles.Figures, "p-heatmap.png");
        Assert.True(File.Exists(heatmap));

        // Without --heatmap the second contrast draws the heatmap of another quantity.
        var again = CliRun.Of("contrast", folder);
        Assert.Equal(0, again.ExitCode);

        AssertFiguresAreTheReports(folder);
        Assert.False(File.Exists(heatmap), "the first contrast's heatmap of p survived the second contrast");
    }

    [Fact]
    public void Report_figures_on_a_disk_that_fills_up_are_whole_pngs_or_absent_never_truncated()
    {
        if (ChildCli.TmpfsUnavailable() is { } reason)
        {
            log.WriteLine($"skipped: {reason}");
            return;
        }
        using var scratch = new ScratchFolder();
        var gene = WriteModel(scratch);
        var source = scratch.File("run");
        Assert.Equal(0, CliRun.Of(Simulate(gene, 300, 1, "--no-contrast", "--out", source)).ExitCode);
        var mount = scratch.File("small");
        Directory.CreateDirectory(mount);
        // The run folder copied into a 1 MiB tmpfs, then filled so that about 60 KiB stay free: the figures
        // (each tens of KiB) start to fit and then do not.
        var (code, output, error) = ChildCli.Shell(
            $"mount -t tmpfs -o size=1m tmpfs '{mount}' && cp -r '{source}' '{mount}/run' && " +
            $"used=$(du -sk '{mount}' | cut -f1) && dd if=/dev/zero of='{mount}/filler' bs=1k count=$((1024 - used - 60)) 2>/dev/null; " +
            $"{ChildCli.Cn} contrast '{mount}/run'; echo \"exit=$?\"; " +
            $"for f in '{mount}'/run/figures/* '{mount}'/run/*; do [ -f \"$f\" ] && echo \"file $(basename \"$f\") $(tail -c 12 \"$f\" | od -An -c | tr -d ' \\n')\"; done");
        log.WriteLine(output + error);
        Assert.Equal(0, code);
        Assert.Contains("exit=1", output);
        Assert.Contains("disk is full", error);
        Assert.DoesNotContain("   at ", error);
        foreach (Match file in FileLine().Matches(output))
        {
            var (name, tail) = (file.Groups[1].Value, file.Groups[2].Value);
            Assert.DoesNotContain(AtomicFile.PartialMarker, name);
            // A PNG ends with the IEND chunk: "IEND" and its CRC AE 42 60 82 (ISO/IEC 15948, PNG specification).
            if (name.EndsWith(".png", StringComparison.Ordinal)) Assert.Contains("IEND", tail);
        }
    }

    [GeneratedRegex(@"^file (\S+) (\S*)$", RegexOptions.Multiline)]
    private static partial Regex FileLine();

    /// <summary>Every PNG under figures/ is linked from report.md: nothing left from an earlier report.</summary>
    private static void AssertFiguresAreTheReports(string folder)
    {
        var markdown = File.ReadAllText(Path.Combine(folder, RunFiles.ReportMarkdown));
        foreach (var figure in Directory.GetFiles(Path.Combine(folder, RunFiles.Figures)))
            Assert.Contains($"{RunFiles.Figures}/{Path.GetFileName(figure)}", markdown);
    }
}
