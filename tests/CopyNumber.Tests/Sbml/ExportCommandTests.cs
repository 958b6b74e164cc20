using System.Text.RegularExpressions;
using CopyNumber.Network;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Sbml;

/// <summary><c>copynumber export</c> through the in-process command tree: output, refusals, overwriting.</summary>
public sealed class ExportCommandTests
{
    private const string Model = "size 2\ntime unit hour\nspecies\n  A = 10\nparameters\n  k = 0.5\nreactions\n  decay: A -> 0  mass k\nchanges\n  A += 5  at time 1\n";

    [Fact]
    public void Export_prints_SBML_that_import_reads_back_as_the_same_network()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("decay.cnet");
        File.WriteAllText(model, Model);
        var run = CliRun.Of("export", model);
        Assert.Equal(0, run.ExitCode);
        Assert.StartsWith("<?xml version=\"1.0\" encoding=\"UTF-8\"?>", run.Output);
        Assert.Contains("level=\"3\" version=\"2\"", run.Output);
        Assert.Contains("timeUnits=\"hour\"", run.Output);

        var xml = scratch.File("decay.xml");
        File.WriteAllText(xml, run.Output);
        var original = ModelLoader.Load(model).Model!;
        var back = ModelLoader.Load(xml).Model!;
        var export = CopyNumber.Sbml.SbmlExporter.Export(original);
        NetworkEquivalence.AssertSame(original.Network, back.Network, export, seed: 11);
    }

    [Fact]
    public void Out_writes_the_file_and_refuses_to_replace_it_without_force()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("decay.cnet");
        File.WriteAllText(model, Model);
        var xml = scratch.File("decay.xml");

        var first = CliRun.Of("export", model, "--out", xml);
        Assert.Equal(0, first.ExitCode);
        Assert.Contains("wrote", first.Output);
        var written = File.ReadAllText(xml);
        Assert.Contains("<listOfEvents>", written);

        File.WriteAllText(xml, "keep me");
        var again = CliRun.Of("export", model, "--out", xml);
        Assert.Equal(2, again.ExitCode);
        Assert.Contains("exists; give --force to replace it", again.Error);
        Assert.Equal("keep me", File.ReadAllText(xml));

        var forced = CliRun.Of("export", model, "--out", xml, "--force");
        Assert.Equal(0, forced.ExitCode);
        Assert.Equal(written, File.ReadAllText(xml));
    }

    [Theory]
    [InlineData("species\n  A = 1\nreactions\n  d: A -> 0  mass k\n", "decay.cnet:4:")]                                   // unknown parameter
    [InlineData("species\n  A = 1\nparameters\n  k = 1\nreactions\n  d: A -> 0  mass k\nchanges\n  A += 1  every 2\n", "decay.cnet:8:3: error: a repeating change without 'until'")]
    public void Bad_input_gets_a_located_message_and_exit_code_2_without_a_stack_trace(string text, string expected)
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("decay.cnet");
        File.WriteAllText(model, text);
        var xml = scratch.File("decay.xml");
        var run = CliRun.Of("export", model, "--out", xml);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains(expected, run.Error);
        Assert.Matches(new Regex(@"decay\.cnet:\d+:\d+: error: "), run.Error);
        Assert.DoesNotContain("   at ", run.Error);
        Assert.False(File.Exists(xml));
    }

    [Fact]
    public void A_missing_model_file_is_exit_code_2()
    {
        using var scratch = new ScratchFolder();
        var run = CliRun.Of("export", scratch.File("absent.cnet"));
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("not found", run.Error);
        Assert.DoesNotContain("   at ", run.Error);
    }
}
