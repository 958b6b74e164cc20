using CopyNumber.Kinetics;
using CopyNumber.Tests.Network;

namespace CopyNumber.Tests.Kinetics;

// Symbolic derivatives: the printed results of simple cases are the textbook derivatives (sum, product,
// chain and power rules; common practice) after the simplifications 0·x → 0, 1·x → x, x + 0 → x and
// folding of numbers. Harder cases are checked by value against central finite differences
// (common practice) and against closed forms differentiated by hand.
public class SymbolicDerivativeTests
{
    private static string D(string text, string variable = "x") =>
        ExpressionText.Format(SymbolicDerivative.Differentiate(SyntaxBuilder.Expression(text), variable));

    [Theory]
    [InlineData("3*x", "3")]
    [InlineData("x + 5", "1")]
    [InlineData("x - y", "1")]
    [InlineData("y", "0")]
    [InlineData("k*x", "k")]
    [InlineData("x*k", "k")]
    [InlineData("2*3*x", "6")]
    [InlineData("x*(1 + 1)", "2")]
    [InlineData("x^2", "2 * x")]
    [InlineData("x^3", "3 * x^2")]
    [InlineData("x^1", "1")]
    [InlineData("x^0", "0")]
    [InlineData("-x", "-1")]
    [InlineData("-(2*x)", "-2")]
    [InlineData("exp(x)", "exp(x)")]
    [InlineData("exp(2*x)", "exp(2 * x) * 2")]
    [InlineData("log(x)", "1 / x")]
    [InlineData("x/k", "1 / k")]
    [InlineData("k/x", "-k / x^2")]
    [InlineData("x*y", "y")]
    [InlineData("x^n", "n * x^(n - 1)")]
    [InlineData("k^x", "k^x * log(k)")]
    [InlineData("abs(x)", "sign(x)")]
    [InlineData("sin(x)", "cos(x)")]
    [InlineData("cos(x)", "-sin(x)")]
    public void Simple_derivatives_print_in_simplified_form(string expression, string derivative) =>
        Assert.Equal(derivative, D(expression));

    public static TheoryData<string> Laws => new()
    {
        "hill_act(x, K, 2)", "hill_act(x, K, n)", "hill_rep(x, K, 3)", "hill_rep(x, K, n)", "mm(x, K)",
        "pow(x, 2.5) + pow(2, x)", "x^x", "exp(-k*x)*log(x + y)", "sqrt(x*y)/(1 + x)",
        "min(x, y) + max(2*x, K)", "min(x, 2*y, K*x)", "abs(y - x^2)", "k*x*y/(K + x)^2", "x^-1.5",
        "sin(k*x)*cos(y) + cos(x/2)",
    };

    [Theory]
    [MemberData(nameof(Laws))]
    public void Derivatives_match_central_differences(string text)
    {
        string[] variables = ["x", "y"];
        var scope = new ExpressionScope(variables, ["k", "K", "n"], 1.0);
        var expression = SyntaxBuilder.Expression(text);
        var law = ExpressionCompiler.CompileStateLaw(expression, scope);
        double[] parameters = [0.4, 3.5, 2.3];
        foreach (var point in new[] { new[] { 1.7, 2.3 }, [4.2, 0.6], [6.5, 5.1] })
            for (var i = 0; i < 2; i++)
            {
                var derivative = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(expression, variables[i]), scope);
                FiniteDifference.AssertMatches(derivative(point, parameters), s => law(s, parameters), point, i);
            }
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(2.0)]
    [InlineData(3.0)]
    public void Hill_derivative_is_exact_at_zero(double n)
    {
        // d/dx x^n/(K^n + x^n) = n·x^(n−1)·K^n/(K^n + x^n)², differentiated by hand: 1/K at x = 0 when n = 1,
        // else 0. A one-sided limit where a central difference cannot be taken (the state stays ≥ 0).
        const double k = 2.5;
        var scope = new ExpressionScope(["x"], ["n"], 1.0);
        var derivative = ExpressionCompiler.CompileStateLaw(
            SymbolicDerivative.Differentiate(SyntaxBuilder.Expression("hill_act(x, 2.5, n)"), "x"), scope);
        Assert.Equal(n == 1 ? 1 / k : 0.0, derivative([0.0], [n]), 15);
        var closedForm = (double x) => n * Math.Pow(x, n - 1) * Math.Pow(k, n) / Math.Pow(Math.Pow(k, n) + Math.Pow(x, n), 2);
        Assert.Equal(closedForm(1.3), derivative([1.3], [n]), 14);
    }

    [Fact]
    public void Michaelis_Menten_derivative_matches_its_closed_form()
    {
        // d/dx x/(K + x) = K/(K + x)², differentiated by hand
        var scope = new ExpressionScope(["x"], ["K"], 1.0);
        var derivative = ExpressionCompiler.CompileStateLaw(SymbolicDerivative.Differentiate(SyntaxBuilder.Expression("mm(x, K)"), "x"), scope);
        foreach (var x in new[] { 0.0, 0.5, 7.0 })
            Assert.Equal(4.0 / Math.Pow(4.0 + x, 2), derivative([x], [4.0]), 15);
    }
}
