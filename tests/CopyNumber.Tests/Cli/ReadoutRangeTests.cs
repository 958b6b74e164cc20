using CopyNumber.Storage;
using CopyNumber.Tests.Storage;
using CopyNumber.Tests.Resilience;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// Integer readouts are stored as exact counts (issue 10, fault 7: <c>q = A * 10^18</c> with A = 10 was
/// stored as 2^63 − 1 = 9223372036854775807, exit 0). A double holds every integer only up to 2^53
/// (IEEE 754-2008, 53-bit significand), so a count readout beyond ±2^53 fails the run with a message.
/// </summary>
public sealed class ReadoutRangeTests
{
    private static string Model(string readout) =>
        "# illustrative: a species that never changes (rate 0), read through a scaled readout\n" +
        "species\n  A = 10\nreactions\n  still: A -> 0 mass 0\nreadouts\n  " + readout + "\n";

    private static CliRun Run(ScratchFolder scratch, string readout)
    {
        var model = scratch.File("scaled.cnet");
        File.WriteAllText(model, Model(readout));
        return CliRun.Of("simulate", model, "--until", "1", "--every", "1", "--replicates", "4", "--seed", "3",
            "--threads", "1", "--no-contrast", "--out", scratch.File("run"));
    }

    [Fact]
    public void A_count_readout_past_two_to_the_53_fails_the_run_with_a_message()
    {
        using var scratch = new ScratchFolder();
        var run = Run(scratch, "q = A * 1000000000000000000"); // 10 × 10^18 = 10^19 > 2^63 − 1 ≈ 9.22·10^18
        Assert.Equal(1, run.ExitCode);
        RunFolders.AssertNoStackTrace(run);
        Assert.Contains("readout 'q'", run.Error);
        Assert.Contains("2^53", run.Error);
    }

    [Fact]
    public void A_count_readout_just_under_two_to_the_53_is_kept()
    {
        using var scratch = new ScratchFolder();
        // 10 × 900719925474099 = 9007199254740990 < 2^53 = 9007199254740992.
        var run = Run(scratch, "q = A * 900719925474099");
        Assert.Equal(0, run.ExitCode);
        var moments = ParquetReadBack.Of(Path.Combine(scratch.File("run"), RunFiles.Moments));
        var species = (string[])moments.Values[1];
        var rows = Enumerable.Range(0, species.Length).Where(r => species[r] == "q").ToArray();
        Assert.NotEmpty(rows);
        foreach (var column in new[] { "min", "max" })
        {
            var values = (double[])moments.Values[Array.IndexOf(moments.Names, column)];
            Assert.All(rows, r => Assert.Equal(9007199254740990.0, values[r]));
        }
    }
}
