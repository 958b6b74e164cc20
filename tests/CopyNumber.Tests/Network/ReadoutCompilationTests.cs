namespace CopyNumber.Tests.Network;

// A readout is a count when it is an integer combination of species (integers, +, −, unary minus, * by
// an integer constant): such a value is an integer for every integer state (common practice).
// The classification of each case and its value are worked out by hand.
public class ReadoutCompilationTests
{
    [Theory]
    [InlineData("A", true)]
    [InlineData("A + 2*B", true)]
    [InlineData("2*(A - B)", true)]
    [InlineData("-A + 1", true)]
    [InlineData("B*3 - A", true)]
    [InlineData("A*(6/2)", true)]
    [InlineData("(1 + 1)*A", true)]
    [InlineData("A*size", true)]  // Ω = 4 here
    [InlineData("twice", true)]   // another readout, 2*(A + B)
    [InlineData("A/2", false)]
    [InlineData("A*0.5", false)]
    [InlineData("A + 0.5", false)]
    [InlineData("A*B", false)]
    [InlineData("k*A", false)]    // a parameter may be changed by the schedule
    [InlineData("A/size", false)] // a concentration
    [InlineData("exp(A)", false)]
    public void Integer_combinations_of_species_are_counts(string expression, bool isCount)
    {
        var network = new SyntaxBuilder(size: 4)
            .Species("A", 7).Species("B", 3)
            .Parameter("k", "2")
            .Mass("d", "A -> 0", "1")
            .Readout("twice", "2*(A + B)")
            .Readout("probe", expression)
            .Compile();
        Assert.Equal(isCount, network.Readouts[1].IsCount);
        Assert.True(network.Readouts[0].IsCount);
    }

    [Fact]
    public void Readouts_evaluate_on_counts_and_on_real_states()
    {
        var network = new SyntaxBuilder(size: 4)
            .Species("A", 7).Species("B", 3)
            .Mass("d", "A -> 0", "1")
            .Readout("total", "A + 2*B")
            .Readout("concentration", "A/size")
            .Readout("scaled", "total*3")
            .Compile();
        Assert.Equal(7 + 2 * 3, network.Readouts[0].OnCounts([7, 3], []));
        Assert.Equal(1.5 + 2 * 0.25, network.Readouts[0].OnState([1.5, 0.25], []), 15);
        Assert.Equal(7 / 4.0, network.Readouts[1].OnCounts([7, 3], []), 15);
        Assert.Equal(3 * (7 + 2 * 3), network.Readouts[2].OnCounts([7, 3], []));
        Assert.Equal("total * 3", network.Readouts[2].Text);
        Assert.True(network.Readouts[2].IsCount);
        Assert.False(network.Readouts[1].IsCount);
        Assert.Equal("A + 2 * B", network.Readouts[0].Text);
        Assert.Equal(["total", "concentration", "scaled"], network.Readouts.Select(r => r.Name));
    }
}
