using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Tests.Network;

namespace CopyNumber.Tests.Kinetics;

// Compiled expressions against the definitions of the functions written out in the test with Math.*
// (hill_act(x,K,n) = x^n/(K^n + x^n), hill_rep(x,K,n) = K^n/(K^n + x^n), mm(x,K) = x/(K + x): the Hill
// and Michaelis–Menten saturation functions; common practice).
public class ExpressionCompilerTests
{
    private static readonly ExpressionScope Scope = new(["A", "B"], ["k", "K", "n"], size: 3.0);

    private static CountLaw Counts(string text) => ExpressionCompiler.CompileCountLaw(SyntaxBuilder.Expression(text), Scope);

    private static StateLaw State(string text) => ExpressionCompiler.CompileStateLaw(SyntaxBuilder.Expression(text), Scope);

    public static TheoryData<string, Func<double, double, double, double, double, double>> Cases => new()
    {
        { "k*A + B/K - n", (a, b, k, K, n) => k * a + b / K - n },
        { "-A^2", (a, b, k, K, n) => -(a * a) },
        { "2^3^2", (a, b, k, K, n) => Math.Pow(2, 9) },
        { "A^3 * B^0 + B^1", (a, b, k, K, n) => a * a * a + b },
        { "A^n", (a, b, k, K, n) => Math.Pow(a, n) },
        { "A^2.5", (a, b, k, K, n) => Math.Pow(a, 2.5) },
        { "pow(B, 3)", (a, b, k, K, n) => b * b * b },
        { "exp(-k*A) + log(B) + sqrt(A)", (a, b, k, K, n) => Math.Exp(-k * a) + Math.Log(b) + Math.Sqrt(a) },
        { "min(A, B) + 10*max(A, B, K)", (a, b, k, K, n) => Math.Min(a, b) + 10 * Math.Max(Math.Max(a, b), K) },
        { "abs(B - A)", (a, b, k, K, n) => Math.Abs(b - a) },
        { "hill_act(A, K, n)", (a, b, k, K, n) => Math.Pow(a, n) / (Math.Pow(K, n) + Math.Pow(a, n)) },
        { "hill_rep(B, K, 2)", (a, b, k, K, n) => K * K / (K * K + b * b) },
        { "mm(A, K)", (a, b, k, K, n) => a / (K + a) },
        { "A*size", (a, b, k, K, n) => a * 3.0 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Both_forms_match_the_written_formula(string text, Func<double, double, double, double, double, double> formula)
    {
        double[] parameters = [0.3, 4.0, 2.6];
        foreach (var (a, b) in new (long, long)[] { (1, 2), (7, 3), (25, 40) })
        {
            var expected = formula(a, b, parameters[0], parameters[1], parameters[2]);
            Assert.Equal(expected, Counts(text)([a, b], parameters), 1e-13 * Math.Max(1, Math.Abs(expected)));
            Assert.Equal(expected, State(text)([a, b], parameters), 1e-13 * Math.Max(1, Math.Abs(expected)));
        }
        var real = formula(2.75, 0.5, parameters[0], parameters[1], parameters[2]);
        Assert.Equal(real, State(text)([2.75, 0.5], parameters), 1e-13 * Math.Max(1, Math.Abs(real)));
    }

    [Fact]
    public void Integer_powers_are_exact_where_repeated_multiplication_is()
    {
        // 3^7 = 2187 and (−2)^5 = −32 exactly (repeated multiplication of small integers is exact)
        Assert.Equal(2187.0, Counts("A^7")([3, 0], []));
        Assert.Equal(-32.0, State("A^5")([-2, 0], []));
        Assert.Equal(1.0, State("A^0")([double.NaN, 0], [])); // pow(x, 0) = 1 for every x, NaN included (IEEE 754-2008 §9.2.1; quoted from memory)
    }

    [Fact]
    public void Parameters_are_read_at_each_call()
    {
        var law = Counts("k*A");
        Assert.Equal(2.0, law([4, 0], [0.5, 0, 0]));
        Assert.Equal(12.0, law([4, 0], [3.0, 0, 0]));
    }

    [Fact]
    public void An_unknown_name_is_a_model_exception_at_its_position()
    {
        var e = Assert.Throws<ModelException>(() => Counts("k + zz"));
        Assert.Equal(5, e.Position.Column);
        Assert.Contains("'zz'", e.Message);
    }

    [Fact]
    public void Evaluation_allocates_nothing()
    {
        // The compiled delegates close over nothing that changes per call; measured by the runtime's
        // own allocation counter (deterministic, not a timing).
        var counts = Counts("k*hill_rep(B, K, n)*A^2/(1 + exp(-A)) + min(A, B)");
        var state = State("k*hill_act(A, K, 2)*mm(B, K) + sqrt(abs(A - B))");
        long[] x = [5, 9];
        double[] y = [5.5, 9.25];
        double[] parameters = [0.3, 4.0, 2.6];
        var sum = counts(x, parameters) + state(y, parameters); // warm up
        var before = GC.GetAllocatedBytesForCurrentThread();
        for (var i = 0; i < 10_000; i++) sum += counts(x, parameters) + state(y, parameters);
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Equal(0, allocated);
        Assert.True(double.IsFinite(sum));
    }

    [Fact]
    public void A_compiled_network_evaluates_without_allocating()
    {
        var network = new SyntaxBuilder(size: 2)
            .Species("A", 10).Species("B", 5).Parameter("K", "3")
            .Mass("bind", "A + B -> 0", "0.1").Mass("trimer", "3 A -> B", "0.01")
            .Rate("make", "0 -> A", "5*hill_rep(B, K, 2)")
            .Compile();
        var parameters = network.InitialParameterValues.ToArray();
        var constants = new double[3];
        var a = new double[3];
        long[] counts = [10, 5];
        double[] x = [10, 5];
        var dxdt = new double[2];
        var jacobian = new double[2, 2];
        var dvdx = new double[3, 2];
        network.Propensities.ComputeConstants(parameters, constants);
        network.Propensities.EvaluateAll(counts, constants, parameters, a);
        network.RateEquations.Derivative(x, constants, parameters, new double[3], dxdt);
        network.RateEquations.Jacobian(x, constants, parameters, dvdx, jacobian);
        var v = new double[3];
        var before = GC.GetAllocatedBytesForCurrentThread();
        for (var i = 0; i < 1000; i++)
        {
            network.Propensities.EvaluateAll(counts, constants, parameters, a);
            network.RateEquations.Derivative(x, constants, parameters, v, dxdt);
            network.RateEquations.Jacobian(x, constants, parameters, dvdx, jacobian);
        }
        Assert.Equal(0, GC.GetAllocatedBytesForCurrentThread() - before);
    }
}
