using System.Xml.Linq;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

public class ContrastTests
{
    private static string Model(double alpha) =>
        $"# illustrative: constant synthesis and first-order decay\nspecies\n  X = 0\nparameters\n  alpha = {alpha}\n  mu = 1\nreactions\n  make: 0 -> X mass alpha\n  decay: X -> 0 mass mu\n";

    private static CliRun Simulate(ScratchFolder scratch, double alpha, string folder)
    {
        var model = scratch.File($"immigration_{alpha}.cnet");
        File.WriteAllText(model, Model(alpha));
        return CliRun.Of("simulate", model, "--until", "10", "--every", "0.5", "--replicates", "1000", "--seed", "5", "--method", "direct", "--out", folder);
    }

    [Fact]
    public void Thousands_of_copies_are_judged_adequate_without_a_false_alarm()
    {
        // Immigration–death is linear: its mean obeys the rate equation exactly and its distribution is
        // Poisson (Bailey 1964), so with a mean of 2000 nothing may be flagged.
        using var scratch = new ScratchFolder();
        var run = Simulate(scratch, 2000, scratch.File("run"));
        Assert.Equal(0, run.ExitCode);
        var lines = run.Output.Split('\n').Where(l => l.StartsWith("X ", StringComparison.Ordinal)).ToArray();
        Assert.Contains(lines, l => l.Contains("adequate"));
        Assert.DoesNotContain(lines, l => l.Contains("mean shifted") || l.Contains("noise-dominated") || l.Contains("multimodal") || l.Contains("extinction-prone"));
    }

    [Fact]
    public void A_mean_of_two_copies_is_flagged_as_noisy_and_extinction_prone()
    {
        // Poisson with mean 2: CV = 1/√2 ≈ 0.71 > 0.5 and P(0) = e^(−2) ≈ 0.135 > 0.05 (Bailey 1964).
        using var scratch = new ScratchFolder();
        var run = Simulate(scratch, 2, scratch.File("run"));
        Assert.Equal(0, run.ExitCode);
        var lines = run.Output.Split('\n').Where(l => l.StartsWith("X ", StringComparison.Ordinal)).ToArray();
        Assert.Contains(lines, l => l.Contains("noise-dominated"));
        Assert.Contains(lines, l => l.Contains("extinction-prone"));
        Assert.DoesNotContain(lines, l => l.Contains("adequate"));
    }

    [Fact]
    public void Contrast_rewrites_the_report_with_other_thresholds_and_the_HTML_embeds_every_figure()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("run");
        Assert.Equal(0, Simulate(scratch, 2, folder).ExitCode);
        var run = CliRun.Of("contrast", folder, "--cv-threshold", "0.9", "--extinction-threshold", "0.5", "--at", "1,5");
        Assert.Equal(0, run.ExitCode);
        var lines = run.Output.Split('\n').Where(l => l.StartsWith("X ", StringComparison.Ordinal)).ToArray();
        Assert.DoesNotContain(lines, l => l.Contains("noise-dominated") || l.Contains("extinction-prone"));
        Assert.True(File.Exists(Path.Combine(folder, "contrast.parquet")));
        // The HTML is well-formed XHTML (common practice for a browser-free check); every <img> is embedded.
        var html = XDocument.Parse(File.ReadAllText(Path.Combine(folder, "report.html")));
        var images = html.Descendants().Where(e => e.Name.LocalName == "img").ToArray();
        Assert.NotEmpty(images);
        Assert.All(images, img => Assert.StartsWith("data:image/png;base64,", (string?)img.Attribute("src")));
        var markdown = File.ReadAllText(Path.Combine(folder, "report.md"));
        // One image link per figure (each figure's SVG is linked too, as a plain link).
        Assert.Equal(images.Length, System.Text.RegularExpressions.Regex.Matches(markdown, @"\]\(figures/[^)]*\.png\)").Count);
    }

    [Fact]
    public void The_false_alarm_rate_is_chosen_on_the_command_line_and_stated_in_the_verdict()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("run");
        Assert.Equal(0, Simulate(scratch, 2, folder).ExitCode);
        var run = CliRun.Of("contrast", folder, "--false-alarm-rate", "0.05");
        Assert.Equal(0, run.ExitCode);
        Assert.Contains(run.Output.Split('\n'), l => l.StartsWith("X ", StringComparison.Ordinal) && l.Contains("false-alarm rate 5%"));
        Assert.Contains("false-alarm rate 5% per quantity and run", File.ReadAllText(Path.Combine(folder, "report.md")));
        var bad = CliRun.Of("contrast", folder, "--false-alarm-rate", "0.7");
        Assert.Equal(2, bad.ExitCode);
        Assert.Contains("false-alarm rate", bad.Error);
    }

    [Fact]
    public void Contrast_of_a_folder_that_is_not_a_run_is_bad_input()
    {
        using var scratch = new ScratchFolder();
        var run = CliRun.Of("contrast", scratch.Path);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("not a folder written by simulate", run.Error);
    }
}
