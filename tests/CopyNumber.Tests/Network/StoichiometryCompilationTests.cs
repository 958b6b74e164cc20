using CopyNumber.Language;

namespace CopyNumber.Tests.Network;

// N = products − reactants, one column per reaction, reversible lines as two columns: the definition of
// the stoichiometric matrix (common practice).
// Every expected matrix below is written out by hand from the reaction lines.
public class StoichiometryCompilationTests
{
    private static SyntaxBuilder Enzyme() => new SyntaxBuilder()
        .Species("E", 10).Species("S", 100).Species("C", 0).Species("P", 0)
        .Parameter("kon", "0.01").Parameter("koff", "0.5").Parameter("kcat", "2")
        .Reversible("bind", "E + S <-> C", "kon", "koff")
        .Mass("convert", "C -> E + P", "kcat")
        .Mass("decay", "P -> 0", "0.1")
        .Mass("feed", "0 -> S", "3");

    [Fact]
    public void Dense_matrix_is_products_minus_reactants()
    {
        var network = Enzyme().Compile();
        long[,] expected =
        {
            //  bind_fwd bind_rev convert decay feed
            { -1, +1, +1, 0, 0 }, // E
            { -1, +1, 0, 0, +1 }, // S
            { +1, -1, -1, 0, 0 }, // C
            { 0, 0, +1, -1, 0 },  // P
        };
        Assert.Equal(expected, network.Stoichiometry.ToDense());
        Assert.Equal(["E", "S", "C", "P"], network.Species);
        Assert.Equal(["bind_fwd", "bind_rev", "convert", "decay", "feed"], network.Reactions.Select(r => r.Name));
    }

    [Fact]
    public void Sparse_form_lists_the_nonzero_entries_of_each_column()
    {
        var n = Enzyme().Compile().Stoichiometry;
        Assert.Equal([0, 1, 2], n.ChangedSpecies(0).ToArray());
        Assert.Equal([-1L, -1, 1], n.Changes(0).ToArray());
        Assert.Equal([0, 2, 3], n.ChangedSpecies(2).ToArray());
        Assert.Equal([1L, -1, 1], n.Changes(2).ToArray());
        Assert.Equal([1], n.ChangedSpecies(4).ToArray());
        Assert.Equal([1L], n.Changes(4).ToArray());
    }

    [Fact]
    public void Reversible_line_becomes_forward_and_reverse_columns_with_their_own_constants()
    {
        var network = Enzyme().Compile();
        var forward = network.Reactions[0];
        var reverse = network.Reactions[1];
        Assert.Equal([(0, 1L), (1, 1L)], forward.Reactants);
        Assert.Equal([(2, 1L)], forward.Products);
        Assert.Equal([(2, 1L)], reverse.Reactants);
        Assert.Equal([(0, 1L), (1, 1L)], reverse.Products);
        Assert.Equal("kon", forward.LawText);
        Assert.Equal("koff", reverse.LawText);
        Assert.Equal(LawKind.Mass, reverse.Law);

        // at E = 10, S = 100, C = 0: a_fwd = kon·E·S (Ω = 1) and a_rev = koff·C
        var (parameters, constants) = network.InitialKinetics();
        long[] counts = [10, 100, 4, 0];
        Assert.Equal(0.01 * 10 * 100, network.Propensities.Evaluate(0, counts, constants, parameters), 12);
        Assert.Equal(0.5 * 4, network.Propensities.Evaluate(1, counts, constants, parameters), 12);
    }

    [Fact]
    public void Repeated_species_on_a_side_are_merged_and_catalysts_cancel_in_N()
    {
        var network = new SyntaxBuilder()
            .Species("A", 5).Species("B", 0).Species("G", 1)
            .Mass("pair", "A + A -> B", "1")
            .Mass("make", "G -> G + A", "2")
            .Compile();
        Assert.Equal([(0, 2L)], network.Reactions[0].Reactants);
        long[,] expected = { { -2, 1 }, { 1, 0 }, { 0, 0 } };
        Assert.Equal(expected, network.Stoichiometry.ToDense());
        Assert.True(network.Stoichiometry.ChangedSpecies(1).SequenceEqual([0]));
    }

    [Fact]
    public void Rate_law_text_is_printed_from_the_tree()
    {
        var network = new SyntaxBuilder()
            .Species("P", 0).Parameter("v", "5").Parameter("K", "20")
            .Rate("make", "0 -> P", "v*hill_rep(P, K, 2)")
            .Compile();
        Assert.Equal("v * hill_rep(P, K, 2)", network.Reactions[0].LawText);
        Assert.Equal(LawKind.Rate, network.Reactions[0].Law);
    }

    [Fact]
    public void Model_name_comes_from_the_file_name()
    {
        var network = new SyntaxBuilder(file: "models/toggle.cnet").Species("A", 1).Mass("d", "A -> 0", "1").Compile();
        Assert.Equal("toggle", network.Name);
        Assert.Equal("models/toggle.cnet", network.SourceFile);
    }
}
