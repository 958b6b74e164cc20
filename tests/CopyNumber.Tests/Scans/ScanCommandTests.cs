using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Scans;

public class ScanCommandTests
{
    [Theory]
    [InlineData("--vary", "nope=1,2", "no parameter or species 'nope'")]
    [InlineData("--vary", "a=1:2:cubic:3", "lo:hi:lin:count")]
    [InlineData("--design", "latin:4", "draws within ranges")]
    [InlineData("--shard", "7/9", "at most 2 shards")]
    [InlineData("--resume", null, "--resume continues the scan in --out DIR")]
    public void Bad_scan_input_is_refused_with_exit_code_2_and_a_sentence(string option, string? value, string expected)
    {
        using var scratch = new ScratchFolder();
        string[] args = ["scan", CliRun.Scenario("toggle_pair.cnet"), "--until", "1", "--every", "1", "--replicates", "100"];
        if (option != "--vary") args = [.. args, "--vary", "a=10,20"];
        args = value is null ? [.. args, option] : [.. args, option, value];
        if (option != "--resume") args = [.. args, "--out", scratch.File("scan")];
        var run = CliRun.Of(args);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains(expected, run.Error);
        Assert.DoesNotContain("   at ", run.Error); // no stack trace
    }

    [Fact]
    public void A_one_name_scan_writes_its_curves_and_every_point_folder_is_an_ordinary_run()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("scan");
        var run = CliRun.Of("scan", CliRun.Scenario("toggle_pair.cnet"), "--vary", "V=0,30", "--until", "5", "--every", "1", "--replicates", "100",
            "--seed", "2", "--method", "direct", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        foreach (var figure in new[] { "scan-deviation.png", "scan-cv.png", "scan-lna.png", "scan-zero.png", "scan-modes.png" })
            Assert.True(File.Exists(Path.Combine(folder, "figures", figure)), figure);
        // report.html embeds its figures: the five curves are in it.
        Assert.Equal(5, System.Text.RegularExpressions.Regex.Count(File.ReadAllText(Path.Combine(folder, "report.html")), "data:image/png"));
        // The point folder stores the model it ran (V = 30) and contrast works on it alone.
        Assert.Contains("  V = 30", CopyNumber.Storage.RunFolder.Read(Path.Combine(folder, "point-0001")).ModelText, StringComparison.Ordinal);
        var again = CliRun.Of("contrast", Path.Combine(folder, "point-0001"));
        Assert.True(again.ExitCode == 0, again.Error);
    }

    [Fact]
    public void Force_replaces_a_scan_in_its_folder_and_refuses_a_folder_with_foreign_files()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("scan");
        string[] args = ["scan", CliRun.Scenario("toggle_pair.cnet"), "--vary", "a=10,20", "--until", "2", "--every", "1", "--replicates", "100", "--seed", "4", "--method", "direct", "--out", folder];
        Assert.Equal(0, CliRun.Of(args).ExitCode);
        Assert.Equal(2, CliRun.Of(args).ExitCode); // not empty
        var again = CliRun.Of([.. args, "--force"]);
        Assert.True(again.ExitCode == 0, again.Error);
        File.WriteAllText(Path.Combine(folder, "notes.txt"), "mine");
        var refused = CliRun.Of([.. args, "--force"]);
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("notes.txt", refused.Error);
    }
}
