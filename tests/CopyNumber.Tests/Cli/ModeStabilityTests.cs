using CopyNumber.Runs;
using CopyNumber.Analysis;
using CopyNumber.Storage;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// Mode counts of whole runs through the command and the library: a quantity that lives on every third
/// count, and the toggle scenario's bimodal U over the last grid times.
/// </summary>
public class ModeStabilityTests
{
    // A + 3T = 60 is conserved and A moves in steps of 3. The stationary law is that of a birth–death
    // chain in T whose ratio π(T+1)/π(T) = a_fwd(T)/a_rev(T+1) decreases in T, so it is log-concave and
    // unimodal on its lattice (Keilson & Gerber 1971, J. Am. Stat. Assoc. 66:386; quoted from memory).
    private const string Trimer =
        "# illustrative trimerisation\nspecies\n  A = 60\n  T = 0\nreactions\n  pair: 3 A -> T mass 0.001  back mass 1\n";

    [Fact]
    public void A_species_that_moves_in_steps_of_three_has_one_mode_on_its_lattice()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("trimer.cnet");
        File.WriteAllText(model, Trimer);
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", model, "--until", "10", "--every", "1", "--replicates", "1000", "--seed", "3", "--method", "direct", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        var lines = run.Output.Split('\n').Where(l => l.StartsWith("A ", StringComparison.Ordinal)).ToArray();
        Assert.DoesNotContain(lines, l => l.Contains("multimodal"));

        var contrast = RunContrast.Compute(RunFolder.Read(folder));
        var a = contrast.Quantities.Single(q => q.Name == "A");
        Assert.All(a.Modes, m => Assert.Equal(1, m!.Count));
        Assert.All(a.Modes.Skip(1), m => Assert.Equal(0, (m!.Modes[0].Value - 60) % 3));
    }

    [Fact]
    public void The_toggle_pair_has_two_modes_of_U_at_every_time_from_89_to_100()
    {
        // The scenario's README settings (2000 replicates, seed 7, --until 100 --every 1). Its U histogram
        // at these times has a sharp peak near 4 copies, a dip near 15 (about 34 replicates per count) and
        // a broad hump near 25 (about 55 per count): plainly bimodal, as the rate equations' two stable
        // states (3.8 and 26.2 copies; worked out in the scenario's comment) lead one to expect.
        using var scratch = new ScratchFolder();
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "100", "--every", "1", "--replicates", "2000", "--seed", "7", "--out", folder);
        Assert.Equal(0, run.ExitCode);
        var contrast = RunContrast.Compute(RunFolder.Read(folder));
        var u = contrast.Quantities.Single(q => q.Name == "U");
        var counts = Enumerable.Range(89, 12).Select(k => u.Modes[k]!.Count).ToArray();
        Assert.True(counts.All(c => c == 2), $"mode counts of U over t = 89..100: {string.Join(",", counts)}");
        var final = u.Modes[100]!;
        Assert.InRange(final.Modes[0].Value, 1, 8);
        Assert.InRange(final.Modes[1].Value, 18, 32);
    }
}
