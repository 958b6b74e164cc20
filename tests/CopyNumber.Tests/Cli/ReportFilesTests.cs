using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// A run's report figures come as PNG and SVG pairs (issue 16), and they stay the run's own files: a second contrast
/// replaces them, and --force may clear a folder that holds them (common practice: a tool cleans what it wrote).
/// </summary>
public sealed class ReportFilesTests
{
    [Fact]
    public void Figures_come_in_png_and_svg_pairs_that_a_new_contrast_and_force_replace()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("pulse");
        string[] simulate = ["simulate", CliRun.Scenario("inducer_pulse.cnet"), "--until", "150", "--every", "5", "--replicates", "100", "--seed", "3", "--out", folder];
        var first = CliRun.Of(simulate);
        Assert.True(first.ExitCode == 0, first.Error);
        var figures = Path.Combine(folder, "figures");
        var png = Directory.GetFiles(figures, "*.png").Select(Path.GetFileNameWithoutExtension).Order().ToArray();
        var svg = Directory.GetFiles(figures, "*.svg").Select(Path.GetFileNameWithoutExtension).Order().ToArray();
        Assert.NotEmpty(png);
        Assert.Equal(png, svg);
        Assert.Contains("protein-deviation", png); // the deviation over time, per quantity with a relative deviation

        var again = CliRun.Of("contrast", folder);
        Assert.True(again.ExitCode == 0, again.Error);
        Assert.Equal(svg, Directory.GetFiles(figures, "*.svg").Select(Path.GetFileNameWithoutExtension).Order().ToArray());

        var forced = CliRun.Of([.. simulate, "--force"]);
        Assert.True(forced.ExitCode == 0, forced.Error);
    }

    /// <summary>
    /// Without --paths a run keeps the paths of its first five replicates, for the report to draw beside the mean; they
    /// are keyed to the replicate index, so one thread and two give the same paths (each replicate's stream is derived
    /// from the seed and its index).
    /// </summary>
    [Fact]
    public void A_run_keeps_five_example_paths_by_default_the_same_on_one_thread_and_two()
    {
        using var scratch = new ScratchFolder();
        ParquetReadBack Paths(string threads)
        {
            var folder = scratch.File("t" + threads);
            var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "5", "--every", "1", "--replicates", "300", "--seed", "4",
                "--threads", threads, "--no-contrast", "--check-exact", "false", "--out", folder);
            Assert.True(run.ExitCode == 0, run.Error);
            return ParquetReadBack.Of(Path.Combine(folder, RunFiles.Paths));
        }
        var one = Paths("1");
        var two = Paths("2");
        Assert.Equal([0L, 1, 2, 3, 4], ((long[])one.Values[0]).Distinct().Order().ToArray());
        for (var c = 0; c < one.Values.Length; c++) Assert.Equal(one.Values[c], two.Values[c]);

        var none = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "5", "--every", "1", "--replicates", "20", "--paths", "0",
            "--no-contrast", "--check-exact", "false", "--out", scratch.File("none"));
        Assert.True(none.ExitCode == 0, none.Error);
        Assert.False(File.Exists(Path.Combine(scratch.File("none"), RunFiles.Paths)));
    }
}
