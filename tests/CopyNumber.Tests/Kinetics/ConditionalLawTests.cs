using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Tests.Analysis;

namespace CopyNumber.Tests.Kinetics;

// choose(condition, a, b), comparisons and and/or/not inside laws, through the expression compiler (on
// counts and on real states), the symbolic derivative and the shared expression graph. A comparison is
// 1 or 0 and piecewise constant, so its derivative is 0; the derivative of choose is the choose of the
// branches' derivatives (common practice for piecewise functions, away from the switching surface).
// Expected values are worked out by hand in each test.
public sealed class ConditionalLawTests
{
    private static readonly ExpressionScope Scope = new(["A", "B"], ["k"], 1.0);

    /// <summary>A law as the parser reads it, in a model with species A, B and parameter k.</summary>
    private static Expr Law(string text)
    {
        var outcome = ModelSource.Parse($"species\n  A = 1\n  B = 1\nparameters\n  k = 2\nreactions\n  r: A -> 0  rate {text}\n", "law.cnet");
        Assert.True(outcome.Succeeded, string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model!.Reactions[0].Forward;
    }

    public static TheoryData<string> Laws => new()
    {
        "choose(A > 3 and B <= 2, k * A * B, k * A^2)",
        "k * (A >= B) + (A == B) - (A != 2) * (not B < 1)",
        "choose(A < 2 or B > 4, 1, choose(not A == 5, A, B))",
    };

    // The same laws written out in C#, the reference.
    private static double Reference(string law, double a, double b, double k) => law switch
    {
        "choose(A > 3 and B <= 2, k * A * B, k * A^2)" => a > 3 && b <= 2 ? k * a * b : k * a * a,
        "k * (A >= B) + (A == B) - (A != 2) * (not B < 1)" => k * (a >= b ? 1 : 0) + (a == b ? 1 : 0) - (a != 2 ? 1 : 0) * (!(b < 1) ? 1 : 0),
        _ => a < 2 || b > 4 ? 1 : a != 5 ? a : b,
    };

    [Theory]
    [MemberData(nameof(Laws))]
    public void Compiled_conditional_laws_agree_with_the_law_written_out_on_counts_and_on_real_states(string law)
    {
        var expression = Law(law);
        var onCounts = ExpressionCompiler.CompileCountLaw(expression, Scope);
        var onState = ExpressionCompiler.CompileStateLaw(expression, Scope);
        for (var a = 0; a <= 6; a++)
        for (var b = 0; b <= 6; b++)
        {
            Assert.Equal(Reference(law, a, b, 2), onCounts([a, b], [2]));
            Assert.Equal(Reference(law, a + 0.5, b, 2), onState([a + 0.5, b], [2]));
        }
    }

    [Fact]
    public void The_derivative_of_choose_is_the_choose_of_the_derivatives_and_comparisons_have_none()
    {
        // d/dA choose(A > 3, A^3, k·A·B) = choose(A > 3, 3A², k·B); d/dA (A·(A > 1)) = (A > 1)
        var derivative = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(Law("choose(A > 3, A^3, k * A * B)"), "A"), Scope);
        Assert.Equal(3 * 5.0 * 5.0, derivative([5, 7], [2]), 12);
        Assert.Equal(2 * 7.0, derivative([2, 7], [2]), 12);
        var gated = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(Law("A * (A > 1)"), "A"), Scope);
        Assert.Equal((1.0, 0.0), (gated([1.5, 0], [2]), gated([0.5, 0], [2])));
        Assert.Equal(0, Assert.IsType<NumberExpr>(SymbolicDerivative.Differentiate(Law("(A > 1) + (not B < A) * (A == 2)"), "A")).Value);
        // both branches constant in B: the derivative by B is the number 0, not a choose of zeros
        Assert.Equal(0, Assert.IsType<NumberExpr>(SymbolicDerivative.Differentiate(Law("choose(B > 3, A, 2)"), "B")).Value);
    }

    [Fact]
    public void The_exact_Jacobian_of_a_conditional_rate_law_matches_central_differences_away_from_the_switch()
    {
        var network = AnalysisModels.Compile("""
            species
              A = 10
              B = 4
            parameters
              k = 0.3
            reactions
              gate: A -> B  rate choose(A > 8 or B < 2, k * A * A / (1 + B), k * B)
              back: B -> A  mass 0.1
            """);
        var constants = new double[2];
        double[] parameters = [0.3];
        network.Propensities.ComputeConstants(parameters, constants);
        foreach (var x in new[] { new[] { 10.0, 4.0 }, new[] { 5.0, 4.0 }, new[] { 5.0, 1.0 } })
        {
            var exact = new double[2, 2];
            network.RateEquations.RateJacobian(x, constants, parameters, exact);
            for (var i = 0; i < 2; i++)
            {
                var (up, down) = ((double[])x.Clone(), (double[])x.Clone());
                const double h = 1e-6;
                up[i] += h;
                down[i] -= h;
                var (vUp, vDown) = (new double[2], new double[2]);
                network.RateEquations.Rates(up, constants, parameters, vUp);
                network.RateEquations.Rates(down, constants, parameters, vDown);
                for (var j = 0; j < 2; j++)
                    Assert.Equal((vUp[j] - vDown[j]) / (2 * h), exact[j, i], 1e-6);
            }
        }
    }

    [Fact]
    public void Comparisons_and_logic_are_nodes_of_the_shared_graph_and_nested_choices_grow_linearly()
    {
        // choose(A > 1, f, f·A) nested: each level refers to the level below twice; as a graph the
        // derivative grows by a fixed number of nodes per level (a tree would double).
        string Nested(int depth)
        {
            var text = "A";
            for (var level = 0; level < depth; level++) text = $"choose(A > {level} and not B < 1, {text}, B)";
            return text;
        }
        var outer = Law(Nested(1));
        Assert.Equal(3, ExpressionGraph.Children(outer).Count);
        var and = Assert.IsType<LogicExpr>(ExpressionGraph.Children(outer)[0]);
        Assert.Equal(2, ExpressionGraph.Children(and).Count);
        Assert.Single(ExpressionGraph.Children(Assert.IsType<NotExpr>(and.Right)));
        Assert.Equal(["A", "B"], ExpressionGraph.NamesUsed(outer).Order());

        var sizes = Enumerable.Range(1, 12).Select(d => ExpressionGraph.NodeCount(SymbolicDerivative.Differentiate(Law(Nested(d)), "A"))).ToArray();
        var steps = sizes.Zip(sizes.Skip(1), (p, q) => q - p).Distinct().ToArray();
        Assert.Single(steps);
        // d/dA of the nested choice is 1 where every condition holds, else 0 (the B branch)
        var derivative = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(Law(Nested(12)), "A"), Scope);
        Assert.Equal((1.0, 0.0, 0.0), (derivative([20, 3], [2]), derivative([5, 3], [2]), derivative([20, 0.5], [2])));
    }

    [Fact]
    public void Compile_time_evaluation_gives_conditions_the_meaning_compiled_laws_give_them()
    {
        // A parameter defined by a condition: 1 or 0, and choose picks a branch.
        var network = AnalysisModels.Compile("""
            species
              A = 1
            parameters
              big = 5 > 3 and not 2 == 2
              pick = choose(1 <= 1, 7, 9)
              either = 0 or 2
            reactions
              r: A -> 0  mass pick
            """);
        Assert.Equal([0.0, 7.0, 1.0], network.InitialParameterValues);
    }
}
