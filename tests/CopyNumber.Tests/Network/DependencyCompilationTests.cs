namespace CopyNumber.Tests.Network;

// The dependency graph of Gibson & Bruck (2000, J. Phys. Chem. A 104:1876): after reaction j fires, the
// propensities to recompute are those of the reactions reading a species that j changes. The
// expected lists below are worked out by hand from the reaction lines.
public class DependencyCompilationTests
{
    [Fact]
    public void Small_network_dependencies_match_the_hand_worked_graph()
    {
        var network = new SyntaxBuilder()
            .Species("A", 0).Species("B", 0).Species("C", 0).Species("D", 0)
            .Parameter("K", "10")
            .Mass("r0", "0 -> A", "1")            // reads -, changes A
            .Mass("r1", "A -> B", "1")            // reads A, changes A B
            .Mass("r2", "B + C -> D", "1")        // reads B C, changes B C D
            .Rate("r3", "0 -> C", "hill_rep(D, K, 2)") // reads D, changes C
            .Mass("r4", "D -> D + A", "1")        // reads D, changes A only (D is a catalyst)
            .Compile();
        var g = network.Dependencies;

        Assert.Equal([1], g.Readers(0).ToArray());    // A
        Assert.Equal([2], g.Readers(1).ToArray());    // B
        Assert.Equal([2], g.Readers(2).ToArray());    // C
        Assert.Equal([3, 4], g.Readers(3).ToArray()); // D

        Assert.Equal([1], g.Affected(0).ToArray());
        Assert.Equal([1, 2], g.Affected(1).ToArray());
        Assert.Equal([2, 3, 4], g.Affected(2).ToArray());
        Assert.Equal([2], g.Affected(3).ToArray());
        Assert.Equal([1], g.Affected(4).ToArray());
    }

    [Fact]
    public void Rate_law_reading_a_readout_depends_on_the_readout_species()
    {
        var network = new SyntaxBuilder()
            .Species("M", 0).Species("P", 0).Species("Q", 0)
            .Readout("total", "P + Q")
            .Rate("make", "0 -> M", "10/(1 + total)")
            .Mass("convert", "M -> P", "1")
            .Compile();
        Assert.Equal([0], network.Dependencies.Readers(1).ToArray());
        Assert.Equal([0], network.Dependencies.Readers(2).ToArray());
        Assert.Equal([0, 1], network.Dependencies.Affected(1).ToArray()); // convert changes M and P
        Assert.Equal(10.0 / (1 + 3 + 4), network.Propensities.Evaluate(0, [0, 3, 4], new double[2], []), 12);
    }
}
