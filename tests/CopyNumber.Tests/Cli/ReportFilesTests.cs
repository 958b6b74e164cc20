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
}
