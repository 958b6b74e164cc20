using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Tests.Network;

namespace CopyNumber.Tests.Kinetics;

// Printing: conventional operator precedence (sums below products below unary minus below powers;
// common practice), with brackets wherever the tree departs from it. Each expected text is written
// by hand from the tree it prints.
public class ExpressionTextTests
{
    private static readonly SourcePosition At = new(1, 1);

    [Theory]
    [InlineData("k*A/(K + A)", "k * A / (K + A)")]
    [InlineData("(a + b)*c", "(a + b) * c")]
    [InlineData("a - (b - c)", "a - (b - c)")]
    [InlineData("a - b - c", "a - b - c")]
    [InlineData("a/(b*c)", "a / (b * c)")]
    [InlineData("-x^2", "-(x^2)")]
    [InlineData("(-x)^2", "(-x)^2")]
    [InlineData("2^3^2", "2^(3^2)")]
    [InlineData("(2^3)^2", "(2^3)^2")]
    [InlineData("a*-b", "a * (-b)")]
    [InlineData("-a*b", "-a * b")]
    [InlineData("-(a + b)", "-(a + b)")]
    [InlineData("x^-1.5", "x^(-1.5)")]
    [InlineData("hill_rep(P, K, 2) + min(x, y, 3)", "hill_rep(P, K, 2) + min(x, y, 3)")]
    [InlineData("3e-4*A", "0.0003 * A")]
    [InlineData("1e-7*A", "1e-7 * A")]
    [InlineData("2.5e20", "2.5e20")]
    public void Prints_with_the_brackets_the_tree_needs(string text, string printed) =>
        Assert.Equal(printed, ExpressionText.Format(SyntaxBuilder.Expression(text)));

    [Fact]
    public void Negative_numbers_made_by_folding_are_bracketed_after_an_operator()
    {
        var tree = new BinaryExpr('*', new NameExpr("a", At), new NumberExpr(-2, At), At);
        Assert.Equal("a * (-2)", ExpressionText.Format(tree));
        Assert.Equal("-2 * a", ExpressionText.Format(tree with { Left = new NumberExpr(-2, At), Right = new NameExpr("a", At) }));
    }

    [Theory]
    [InlineData("-(x^2) + (-x)^2 * 2^(3^2) - a / (b * c)")]
    [InlineData("k * A / (K + A) - (-3) * hill_act(A, K, n)^2")]
    public void Printed_text_reads_back_to_an_equal_value(string text)
    {
        // Reading the printed text again gives the same text and the same value (common practice: a printer
        // and reader agree)
        var tree = SyntaxBuilder.Expression(text);
        var printed = ExpressionText.Format(tree);
        Assert.Equal(printed, ExpressionText.Format(SyntaxBuilder.Expression(printed)));
        var scope = new ExpressionScope(["A", "x"], ["a", "b", "c", "k", "K", "n"], 1.0);
        double[] parameters = [1.5, 2.0, 0.75, 0.3, 4.0, 2.0];
        Assert.Equal(
            ExpressionCompiler.CompileStateLaw(tree, scope)([3.0, 1.25], parameters),
            ExpressionCompiler.CompileStateLaw(SyntaxBuilder.Expression(printed), scope)([3.0, 1.25], parameters));
    }
}
