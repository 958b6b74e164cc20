using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

// Mistakes the checker cannot see because they need values: each must come back as a diagnostic on the
// right line, with no network (common practice: errors are values with a position).
public class CompileDiagnosticsTests
{
    [Fact]
    public void Parameters_that_are_not_finite_numbers_are_reported_once_each()
    {
        var builder = new SyntaxBuilder()
            .Species("A", 1)                       // line 1
            .Parameter("ok", "2")                  // line 2
            .Parameter("nothing", "0/0")           // line 3
            .Parameter("huge", "exp(1000)")        // line 4
            .Parameter("below", "log(0)")          // line 5
            .Parameter("derived", "2*nothing + ok") // line 6: follows from line 3, not reported again
            .Mass("d", "A -> 0", "ok")
            .Mass("e", "A -> 0", "derived")          // line 8: NaN because of line 3, not reported again
            .At("huge", "A", ScheduleOperation.Add, "1"); // line 9: likewise
        var diagnostics = builder.Failures();
        Assert.Equal([3, 4, 5], diagnostics.Select(d => d.Position.Line));
        Assert.Contains("NaN", diagnostics[0].Message);
        Assert.Contains("infinite", diagnostics[1].Message);
        Assert.Contains("minus infinity", diagnostics[2].Message);
        Assert.All(diagnostics, d => Assert.Equal("test.cnet", d.File));
    }

    [Theory]
    [InlineData("-1", "-1")]
    [InlineData("k - 3", "-1")]
    [InlineData("sqrt(k - 3)", "NaN")]
    [InlineData("1/(k - 2)", "infinite")]
    public void A_mass_constant_must_be_finite_and_not_negative(string constant, string described)
    {
        var diagnostics = new SyntaxBuilder()
            .Species("A", 1).Parameter("k", "2")
            .Mass("decay", "A -> 0", constant)
            .Failures();
        var d = Assert.Single(diagnostics);
        Assert.Equal(3, d.Position.Line);
        Assert.Contains("'decay'", d.Message);
        Assert.Contains(described, d.Message);
    }

    [Fact]
    public void A_mass_constant_cannot_read_a_species()
    {
        var d = Assert.Single(new SyntaxBuilder().Species("A", 1).Mass("decay", "A -> 0", "2*A").Failures());
        Assert.Contains("rate law", d.Message);
    }

    [Fact]
    public void A_negative_change_time_is_reported()
    {
        var diagnostics = new SyntaxBuilder()
            .Species("A", 1).Parameter("t0", "5")
            .Mass("d", "A -> 0", "1")
            .At("-1", "A", ScheduleOperation.Add, "10")
            .At("t0 - 6", "A", ScheduleOperation.Add, "10")
            .At("t0", "A", ScheduleOperation.Add, "10")
            .Failures();
        Assert.Equal([4, 5], diagnostics.Select(d => d.Position.Line));
        Assert.All(diagnostics, d => Assert.Contains("change time", d.Message));
    }

    [Fact]
    public void Diagnostics_carry_the_source_line_when_the_text_is_given()
    {
        string[] lines = ["species A = 1", "param nothing = 0/0", "A -> 0 mass 1"];
        var diagnostics = new SyntaxBuilder()
            .Species("A", 1).Parameter("nothing", "0/0").Mass("d", "A -> 0", "1")
            .Failures(new CompileOptions(SourceLines: lines));
        var d = Assert.Single(diagnostics);
        Assert.Equal("param nothing = 0/0", d.SourceLine);
        Assert.StartsWith("test.cnet:2:1: error: parameter 'nothing' evaluates to NaN", d.Format());
    }

    [Fact]
    public void A_parameter_cannot_use_a_later_parameter_or_a_species()
    {
        var diagnostics = new SyntaxBuilder()
            .Species("A", 1)
            .Parameter("early", "late*2")
            .Parameter("late", "3")
            .Parameter("counted", "A + 1")
            .Mass("d", "A -> 0", "1")
            .Failures();
        Assert.Equal([2, 4], diagnostics.Select(d => d.Position.Line));
        Assert.Contains("'late'", diagnostics[0].Message);
        Assert.Contains("species 'A'", diagnostics[1].Message);
    }

    [Fact]
    public void Expanded_reversible_names_must_not_clash()
    {
        var d = Assert.Single(new SyntaxBuilder()
            .Species("A", 1).Species("B", 0)
            .Reversible("flip", "A <-> B", "1", "2")
            .Mass("flip_fwd", "A -> 0", "1")
            .Failures());
        Assert.Contains("'flip_fwd'", d.Message);
    }

    [Fact]
    public void An_unknown_function_is_a_diagnostic_not_an_exception()
    {
        var d = Assert.Single(new SyntaxBuilder().Species("A", 1).Rate("r", "A -> 0", "frobnicate(A)").Failures());
        Assert.Contains("unknown function 'frobnicate'", d.Message);
        var arity = Assert.Single(new SyntaxBuilder().Species("A", 1).Rate("r", "A -> 0", "mm(A)").Failures());
        Assert.Contains("'mm' takes 2 arguments, not 1", arity.Message);
    }

    [Fact]
    public void A_readout_defined_through_itself_is_reported()
    {
        var diagnostics = new SyntaxBuilder()
            .Species("A", 1).Mass("d", "A -> 0", "1")
            .Readout("x", "A + y").Readout("y", "2*x")
            .Failures();
        Assert.All(diagnostics, d => Assert.Contains("in terms of itself", d.Message));
    }
}
