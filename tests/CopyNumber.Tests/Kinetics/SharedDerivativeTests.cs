using System.Linq.Expressions;
using CopyNumber.Kinetics;
using CopyNumber.Network;
using CopyNumber.Tests.Network;

namespace CopyNumber.Tests.Kinetics;

// Derivatives of deeply nested laws are shared graphs (ExpressionGraph): one more level of nesting adds a
// fixed number of nodes to the derivative and to its compiled code (the chain rule applied once more;
// common practice), where copying subtrees doubled them with each level. Values are checked against the
// chain rule worked out in the test, d/dx f(f(…f(x))) = Π f'(x_k) with the Hill function's derivative
// f'(x) = n·x^(n−1)·K^n/(K^n + x^n)² differentiated by hand (common practice), and against central
// finite differences (common practice).
public class SharedDerivativeTests
{
    private const double K = 0.5;
    private const int Deepest = 33;

    /// <summary>hill_act(hill_act(…hill_act(x, K, 2)…, K, 2), K, 2), <paramref name="depth"/> calls.</summary>
    private static string Nested(int depth)
    {
        var text = "x";
        for (var level = 0; level < depth; level++) text = $"hill_act({text}, K, 2)";
        return text;
    }

    private static readonly ExpressionScope Scope = new(["x"], ["K"], 1.0);

    [Fact]
    public void Each_level_of_nesting_adds_the_same_number_of_derivative_nodes() =>
        AssertLinearGrowth(d => ExpressionGraph.NodeCount(SymbolicDerivative.Differentiate(SyntaxBuilder.Expression(Nested(d)), "x")),
            "derivative nodes", largestStep: 40);

    [Fact]
    public void Each_level_of_nesting_adds_the_same_amount_of_compiled_code() =>
        AssertLinearGrowth(d => TreeSize(ExpressionCompiler.StateLawTree(
                SymbolicDerivative.Differentiate(SyntaxBuilder.Expression(Nested(d)), "x"), Scope)),
            "compiled expression nodes", largestStep: 200);

    /// <summary>
    /// size(d) − size(d − 1) is the same for every depth d from 3 to 33, and at most <paramref name="largestStep"/>
    /// (the innermost level, x itself, is simpler than the rest). Checked depth by depth, so an exponential
    /// size fails at a small depth instead of running out of memory.
    /// </summary>
    private static void AssertLinearGrowth(Func<int, int> size, string what, int largestStep)
    {
        var (previous, current) = (size(2), size(3));
        var step = current - previous;
        Assert.InRange(step, 1, largestStep);
        for (var d = 4; d <= Deepest; d++)
        {
            (previous, current) = (current, size(d));
            Assert.True(current - previous == step,
                $"depth {d}: {current} {what}, {current - previous} more than at depth {d - 1} (the step from depth 2 to 3 was {step})");
        }
    }

    [Theory]
    [InlineData(0.55)]
    [InlineData(0.7)]
    [InlineData(1.3)]
    public void Depth_33_derivative_matches_the_chain_rule_and_central_differences(double x)
    {
        var expression = SyntaxBuilder.Expression(Nested(Deepest));
        var law = ExpressionCompiler.CompileStateLaw(expression, Scope);
        var derivative = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(expression, "x"), Scope);
        double[] parameters = [K];

        // The chain rule by hand: the product of the Hill slopes along the iterates x_0 = x, x_{k+1} = f(x_k).
        var (iterate, product) = (x, 1.0);
        for (var level = 0; level < Deepest; level++)
        {
            product *= 2 * iterate * K * K / Math.Pow(K * K + iterate * iterate, 2);
            iterate = iterate * iterate / (K * K + iterate * iterate);
        }
        Assert.Equal(iterate, law([x], parameters), 12);
        var exact = derivative([x], parameters);
        Assert.True(Math.Abs(exact - product) <= 1e-12 * Math.Abs(product), $"symbolic {exact:R}, chain rule {product:R}");
        // The slope at these points is far above the difference's tolerance (about 1e-6), so the check can fail.
        Assert.True(Math.Abs(product) > 1e-4, $"slope {product:R} too small to test");
        FiniteDifference.AssertMatches(exact, s => law(s, parameters), [x], 0);
    }

    [Fact]
    public void A_model_with_depth_33_nesting_compiles_with_its_exact_jacobian()
    {
        var text = $"species\n  x = 10\nparameters\n  K = {K}\nreactions\n  make: 0 -> x rate 5 * {Nested(Deepest)}\n  decay: x -> 0 mass 1\n";
        var loaded = ModelLoader.LoadText(text, "nested.cnet");
        Assert.Empty(loaded.Diagnostics);
        var network = loaded.Model!.Network;
        var (parameters, constants) = network.InitialKinetics();
        var dvdx = new double[2, 1];
        double[] state = [0.7];
        network.RateEquations.RateJacobian(state, constants, parameters, dvdx);
        var law = ExpressionCompiler.CompileStateLaw(SyntaxBuilder.Expression($"5 * {Nested(Deepest)}"), Scope);
        FiniteDifference.AssertMatches(dvdx[0, 0], s => law(s, parameters), state, 0);
        Assert.Equal(1.0, dvdx[1, 0]); // mass action x -> 0 at k = 1, size 1: v = x
    }

    /// <summary>Nodes of an expression tree as the compiler walks it (a node reached twice counts twice).</summary>
    private static int TreeSize(Expression tree)
    {
        var counter = new NodeCounter();
        counter.Visit(tree);
        return counter.Count;
    }

    private sealed class NodeCounter : ExpressionVisitor
    {
        public int Count { get; private set; }

        public override Expression? Visit(Expression? node)
        {
            if (node is not null) Count++;
            return base.Visit(node);
        }
    }
}
