using System.Security.Cryptography;
using CopyNumber.Storage;
using CopyNumber.Reports;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Messages that need more than one command line: exact numbers in them, refusals that must leave files
/// untouched, and the one rule for printed paths (issue 10, fault 13).
/// </summary>
public class MessageTests
{
    /// <summary>
    /// 2^53 = 9 007 199 254 740 992 is the largest integer below which every integer is a double (IEEE 754
    /// binary64, 53-bit significand; common practice). 2^53 + 1 rounds to 2^53 when read as a double, so it
    /// must be refused from its digits, and the limit must be printed with all sixteen of them.
    /// </summary>
    [Fact]
    public void Initial_counts_above_two_to_the_53_are_refused_with_the_exact_limit()
    {
        using var scratch = new ScratchFolder();
        var largest = WriteModel(scratch, "species\n  X = 9007199254740992\nreactions\n  lose: X -> 0 mass 1\n", "largest.cnet");
        var above = WriteModel(scratch, "species\n  X = 9007199254740993\nreactions\n  lose: X -> 0 mass 1\n", "above.cnet");

        Assert.Equal(0, CliRun.Of("inspect", largest).ExitCode);
        var run = CliRun.Of("inspect", above);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("too large (at most 2^53 = 9007199254740992)", run.Error);
        AssertNoStackTrace(run);
    }

    /// <summary>
    /// Pure decay X → 0 from 10 copies: x(t) = 10·e^(−t) (exact solution), about 4e-43 at t = 100, so the
    /// fewest copies round to 0. The numerical solution there is a rounding error either side of zero
    /// (−2.5e-13 at t = 90); rounding that gives IEEE 754 negative zero, which must not print as "-0".
    /// </summary>
    [Fact]
    public void The_auto_method_reason_never_says_minus_zero_copies()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch, "species\n  X = 10\nreactions\n  lose: X -> 0 mass 1\n", "decay.cnet");
        var run = CliRun.Of("simulate", model, "--until", "100", "--every", "1", "--replicates", "10", "--seed", "1", "--out", scratch.File("out"));
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("as few as 0 copies", run.Error + run.Output);
        Assert.DoesNotContain("-0 copies", run.Error + run.Output);
    }

    /// <summary>The file errors docs/network-language.md promises, one line each: no empty quote, no caret.</summary>
    [Fact]
    public void A_directory_or_an_empty_path_as_the_model_is_named_as_such_in_one_line()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("models");
        Directory.CreateDirectory(folder);
        var run = CliRun.Of("inspect", folder);
        Assert.Equal(2, run.ExitCode);
        Assert.Equal($"{folder}:1:1: error: '{folder}' is a directory, not a model file\n1 error\n", run.Error.ReplaceLineEndings("\n"));
        var empty = CliRun.Of("inspect", "");
        Assert.Equal(2, empty.ExitCode);
        Assert.Equal(":1:1: error: no model file given\n1 error\n", empty.Error.ReplaceLineEndings("\n"));
    }

    [Fact]
    public void Merging_into_one_of_the_inputs_is_refused_even_with_force_and_the_shard_is_untouched()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var shards = new[] { scratch.File("shard-1"), scratch.File("shard-2") };
        for (var i = 0; i < 2; i++)
            Assert.Equal(0, CliRun.Of([.. Simulate(model, 200, 3, "--shard", $"{i + 1}/2", "--out", shards[i])]).ExitCode);
        var before = Fingerprint(shards[0]);

        // Named as given and with a trailing separator: both are the same folder.
        foreach (var target in new[] { shards[0], shards[0] + Path.DirectorySeparatorChar })
        {
            var run = CliRun.Of("merge", shards[0], shards[1], "--out", target, "--force");
            Assert.Equal(2, run.ExitCode);
            Assert.Contains("is one of the folders being merged", run.Error);
            AssertNoStackTrace(run);
        }
        Assert.Equal(before, Fingerprint(shards[0]));
    }

    [Fact]
    public void Contrast_refuses_an_unknown_heatmap_quantity_and_a_time_after_the_run_before_writing_anything()
    {
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("run");
        Assert.Equal(0, CliRun.Of([.. Simulate(model, 100, 4, "--out", folder, "--no-contrast")]).ExitCode);

        var unknown = CliRun.Of("contrast", folder, "--heatmap", "protein");
        Assert.Equal(2, unknown.ExitCode);
        Assert.Contains("--heatmap 'protein' is not a species or readout", unknown.Error);
        Assert.Contains("'p'", unknown.Error);
        var late = CliRun.Of("contrast", folder, "--at", "1,50");
        Assert.Equal(2, late.ExitCode);
        Assert.Contains("--at 50 is after the final time 5", late.Error);
        Assert.False(File.Exists(Path.Combine(folder, ContrastOutputs.TableFile)));

        // The final time itself and a readout are fine.
        Assert.Equal(0, CliRun.Of("contrast", folder, "--heatmap", "total", "--at", "5").ExitCode);
    }

    /// <summary>One rule for printed paths (issue 16): relative to the folder the command started in when beneath it,
    /// full otherwise, whichever way the user spelled the folder.</summary>
    [Fact]
    public void Printed_paths_are_relative_to_the_start_folder_beneath_it_and_full_elsewhere()
    {
        var start = Directory.GetCurrentDirectory();
        using (var beneath = new ScratchFolder(start))
        {
            var model = WriteModel(beneath);
            var relative = Path.GetRelativePath(start, beneath.File("run"));
            // Spelled in full, shown relative: the rule is about where the folder is, not how it was typed.
            var (simulate, contrast) = SimulateAndContrast(model, beneath.File("run"));
            AssertEveryPrintedPathStartsWith(relative, simulate.Output, simulate.Error, contrast.Output);
            Assert.Contains($"wrote {Path.Combine(relative, ContrastOutputs.TableFile)}", contrast.Output);
        }
        using (var elsewhere = new ScratchFolder())
        {
            Assert.StartsWith("..", Path.GetRelativePath(start, elsewhere.Path), StringComparison.Ordinal);
            var model = WriteModel(elsewhere);
            var (simulate, contrast) = SimulateAndContrast(model, Path.GetRelativePath(start, elsewhere.File("run")));
            var full = elsewhere.File("run");
            AssertEveryPrintedPathStartsWith(full, simulate.Output, simulate.Error, contrast.Output);
            Assert.Contains($"wrote {Path.Combine(full, ContrastOutputs.TableFile)}", contrast.Output);
        }
    }

    private static (CliRun Simulate, CliRun Contrast) SimulateAndContrast(string model, string folder)
    {
        var simulate = CliRun.Of([.. Simulate(model, 100, 4, "--out", folder)]);
        Assert.Equal(0, simulate.ExitCode);
        var contrast = CliRun.Of("contrast", folder);
        Assert.Equal(0, contrast.ExitCode);
        return (simulate, contrast);
    }

    private static void AssertEveryPrintedPathStartsWith(string prefix, params string[] printed)
    {
        var seen = 0;
        foreach (var text in printed)
            foreach (var line in text.Split('\n').Where(l => l.Contains("wrote ") || l.Contains(" -> ")))
            {
                var paths = line[(line.Contains("wrote ") ? line.IndexOf("wrote ") + 6 : line.IndexOf(" -> ") + 4)..].Trim().Split(", ");
                foreach (var path in paths)
                {
                    Assert.True(path.StartsWith(prefix, StringComparison.Ordinal), $"'{path}' in '{line}' does not start with {prefix}");
                    seen++;
                }
            }
        Assert.True(seen >= 3, $"only {seen} printed paths found");
    }

    private static string Fingerprint(string folder) =>
        string.Join("\n", Directory.EnumerateFiles(folder).Order(StringComparer.Ordinal)
            .Select(f => $"{Path.GetFileName(f)} {Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(f)))}"));
}
