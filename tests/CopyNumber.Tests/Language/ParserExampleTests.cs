using CopyNumber.Language;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Language;

// Expected trees are written out by hand from the language definition in docs/network-language.md
// (precedence and associativity as in ordinary algebra: common practice).
public sealed class ParserExampleTests
{
    private const string EveryFeature = """
        # every feature of the language in one file
        readouts                  # sections in any order
          total = A + 2*D
          ratio = D / (A + 1)
        size 2.5                  # the system size, anywhere at top level
        species
          A = 10
            D = 0                 # indentation is free
          mass = 3                # 'mass' is a keyword only after a reaction's products

        parameters
          k1 = 1e-3
          k2 = .5 * size
          k3 = -k1^2 + pow(2, 3) / (min(1, 2) + max(3, 4)) - abs(-1)
          kr = exp(0) + log(1) + sqrt(4)
        reactions
          dimerise: 2 A -> D mass k1  back mass k2
          make:     0 -> A           rate k3 * hill_act(D, 5, 2) + hill_rep(A, 5, 2) + mm(A, 3)
          merged:   A + A -> D       mass k1
          lose:     mass -> 0        mass kr
          mixed:    A + 2 D -> 3 mass  rate k1 * A * D
        changes
          A = A / 2  at time 10
          A += 5  at time 10
          D -= 1  at time 2*k1
          k1 = 2 * k1  at time 0
        """;

    [Fact]
    public void EveryFeatureParsesIntoTheExpectedTree()
    {
        var model = ParseValid(EveryFeature);
        Assert.Equal("test.cnet", model.File);
        Assert.Equal(2.5, model.Size);

        Assert.Equal(["A", "D", "mass"], model.Species.Select(s => s.Name));
        Assert.Equal([10L, 0L, 3L], model.Species.Select(s => s.InitialCount));
        Assert.Equal(new SourcePosition(7, 3, 1), model.Species[0].Position);
        Assert.Equal(new SourcePosition(8, 5, 1), model.Species[1].Position);

        Assert.Equal(["k1", "k2", "k3", "kr"], model.Parameters.Select(p => p.Name));
        Assert.Equal("0.001", Show(model.Parameters[0].Value));
        Assert.Equal("(0.5 * size)", Show(model.Parameters[1].Value));
        Assert.Equal("(((-(k1 ^ 2)) + (pow(2, 3) / (min(1, 2) + max(3, 4)))) - abs((-1)))", Show(model.Parameters[2].Value));
        Assert.Equal("((exp(0) + log(1)) + sqrt(4))", Show(model.Parameters[3].Value));

        var reactions = model.Reactions;
        Assert.Equal(["dimerise", "make", "merged", "lose", "mixed"], reactions.Select(r => r.Name));

        var dimerise = reactions[0];
        Assert.True(dimerise.Reversible);
        Assert.Equal(LawKind.Mass, dimerise.Law);
        Assert.Equal([(2L, "A")], dimerise.Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal([(1L, "D")], dimerise.Products.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal("k1", Show(dimerise.Forward));
        Assert.Equal("k2", Show(dimerise.Reverse!));

        var make = reactions[1];
        Assert.False(make.Reversible);
        Assert.Equal(LawKind.Rate, make.Law);
        Assert.Empty(make.Reactants.Terms);
        Assert.Null(make.Reverse);
        Assert.Equal("(((k3 * hill_act(D, 5, 2)) + hill_rep(A, 5, 2)) + mm(A, 3))", Show(make.Forward));

        // The same species twice on one side is merged into one term.
        Assert.Equal([(2L, "A")], reactions[2].Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal([(1L, "mass")], reactions[3].Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal([(1L, "A"), (2L, "D")], reactions[4].Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal([(3L, "mass")], reactions[4].Products.Terms.Select(t => (t.Coefficient, t.Species)));

        Assert.Equal(
            ["10: A Set (A / 2)", "10: A Add 5", "(2 * k1): D Subtract 1", "0: k1 Set (2 * k1)"],
            model.Schedule.Select(s => $"{Show(s.Time)}: {s.Target} {s.Operation} {Show(s.Value)}"));

        Assert.Equal(["total", "ratio"], model.Readouts.Select(r => r.Name));
        Assert.Equal("(A + (2 * D))", Show(model.Readouts[0].Value));
    }

    [Theory]
    [InlineData("2^3^2", "(2 ^ (3 ^ 2))")]        // ^ is right-associative
    [InlineData("-x^2", "(-(x ^ 2))")]            // ^ binds tighter than unary minus
    [InlineData("2^-x", "(2 ^ (-x))")]            // a signed exponent needs no parentheses
    [InlineData("a - b - c", "((a - b) - c)")]    // + - * / are left-associative
    [InlineData("a / b * c", "((a / b) * c)")]
    [InlineData("a + b * c ^ 2", "(a + (b * (c ^ 2)))")]
    [InlineData("--x", "(-(-x))")]
    [InlineData("(a + b) * -c", "((a + b) * (-c))")]
    [InlineData("hill_rep(x, 2*a, 3)^2", "(hill_rep(x, (2 * a), 3) ^ 2)")]
    public void OperatorsGroupAsInAlgebra(string expression, string grouped)
    {
        var model = ParseValid($"""
            species
              x = 1
            parameters
              a = 1
              b = 2
              c = 3
            reactions
              r: x -> 0 rate {expression}
            """);
        Assert.Equal(grouped, Show(model.Reactions[0].Forward));
    }

    [Theory]
    [InlineData("1", 1.0)]
    [InlineData("2.5", 2.5)]
    [InlineData("3e-4", 3e-4)]
    [InlineData("1E+3", 1000.0)]
    [InlineData(".5", 0.5)]
    [InlineData("7.", 7.0)]
    [InlineData("0.125e1", 1.25)]
    public void NumbersAreReadInEveryWrittenForm(string written, double value)
    {
        var model = ParseValid($"species\n A = 1\nparameters\n k = {written}\nreactions\n r: A -> 0 mass k\n");
        Assert.Equal(value, ((NumberExpr)model.Parameters[0].Value).Value);
    }

    [Fact]
    public void SizeDefaultsToOneAndLineEndingsMayBeMixed()
    {
        var model = ParseValid("species\r\n  A = 3\rreactions\n  r: A -> 0 mass 1\r\n");
        Assert.Equal(1.0, model.Size);
        Assert.Equal(3L, model.Species[0].InitialCount);
        Assert.Equal(4, model.Reactions[0].Position.Line);
    }

    [Fact]
    public void KeywordsAreKeywordsOnlyWhereTheyStand()
    {
        // A reaction called 'species', parameters called 'rate', 'at' and 'exp', and a schedule
        // line whose time is the parameter 'at': each word is read by its position.
        var model = ParseValid("""
            species
              A = 1
            parameters
              rate = 2
              at = 5
              exp = 3
            reactions
              species: A -> 0 rate rate * exp(1) * exp
              at: A -> 0 mass at
            changes
              rate = 1  at time at
            """);
        Assert.Equal(["species", "at"], model.Reactions.Select(r => r.Name));
        Assert.Equal("((rate * exp(1)) * exp)", Show(model.Reactions[0].Forward));
        Assert.Equal("at", Show(model.Schedule[0].Time));
        Assert.Equal("rate", model.Schedule[0].Target);
    }

    [Fact]
    public void LargeCountsAndScientificCountsAreExact()
    {
        var model = ParseValid("species\n A = 9007199254740992\n B = 1e3\n C = 4.0\nreactions\n r: A -> B mass 1\n");
        Assert.Equal([9007199254740992L, 1000L, 4L], model.Species.Select(s => s.InitialCount));
    }
}
