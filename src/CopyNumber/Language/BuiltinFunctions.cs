namespace CopyNumber.Language;

/// <summary>
/// The functions a model expression may call, with their number of arguments and their meaning.
/// Hill functions follow the usual regulatory forms (Alon, An Introduction to Systems Biology, 2007,
/// ch. 2; quoted from memory): activation x^n/(K^n + x^n), repression K^n/(K^n + x^n); <c>mm</c> is the
/// Michaelis–Menten saturation x/(K + x). <c>sin</c> and <c>cos</c> take radians (for periodic
/// inputs in rate laws that read <c>time</c>).
/// </summary>
public static class BuiltinFunctions
{
    /// <summary>Function name → number of arguments.</summary>
    public static IReadOnlyDictionary<string, int> Arity { get; } = new Dictionary<string, int>(StringComparer.Ordinal)
    {
        ["exp"] = 1,
        ["log"] = 1,
        ["sqrt"] = 1,
        ["pow"] = 2,
        ["min"] = 2,
        ["max"] = 2,
        ["abs"] = 1,
        ["sin"] = 1,
        ["cos"] = 1,
        ["hill_act"] = 3,
        ["hill_rep"] = 3,
        ["mm"] = 2,
        [Choose] = 3,
    };

    /// <summary>
    /// The conditional of the language: <c>choose(condition, a, b)</c> is a when the condition is not 0
    /// (true), else b. Its derivative is the conditional of the derivatives (a comparison's derivative is 0).
    /// </summary>
    public const string Choose = "choose";

    /// <summary>Function name → how its arguments are written, for messages and documentation (e.g. <c>hill_rep(x, K, n)</c>).</summary>
    public static IReadOnlyDictionary<string, string> Signature { get; } = new Dictionary<string, string>(StringComparer.Ordinal)
    {
        ["exp"] = "exp(x)",
        ["log"] = "log(x)",
        ["sqrt"] = "sqrt(x)",
        ["pow"] = "pow(x, y)",
        ["min"] = "min(a, b)",
        ["max"] = "max(a, b)",
        ["abs"] = "abs(x)",
        ["sin"] = "sin(x)",
        ["cos"] = "cos(x)",
        ["hill_act"] = "hill_act(x, K, n)",
        ["hill_rep"] = "hill_rep(x, K, n)",
        ["mm"] = "mm(x, K)",
        [Choose] = "choose(condition, a, b)",
    };

    /// <summary>
    /// Evaluates a built-in function. <c>log</c> is the natural logarithm; <c>pow</c> and <c>^</c> both
    /// mean <see cref="Math.Pow"/>. Results follow IEEE arithmetic (log of a negative number is NaN).
    /// </summary>
    /// <param name="name">A key of <see cref="Arity"/>.</param>
    /// <param name="arguments">Exactly <see cref="Arity"/>[name] values.</param>
    /// <exception cref="ArgumentException">An unknown name or a wrong number of arguments (a programming error: the model checker rejects both).</exception>
    public static double Apply(string name, ReadOnlySpan<double> arguments)
    {
        if (!Arity.TryGetValue(name, out var arity) || arity != arguments.Length)
            throw new ArgumentException($"'{name}' with {arguments.Length} arguments is not a built-in function", nameof(name));
        return name switch
        {
            "exp" => Math.Exp(arguments[0]),
            "log" => Math.Log(arguments[0]),
            "sqrt" => Math.Sqrt(arguments[0]),
            "pow" => Math.Pow(arguments[0], arguments[1]),
            "min" => Math.Min(arguments[0], arguments[1]),
            "max" => Math.Max(arguments[0], arguments[1]),
            "abs" => Math.Abs(arguments[0]),
            "sin" => Math.Sin(arguments[0]),
            "cos" => Math.Cos(arguments[0]),
            "hill_act" => HillActivation(arguments[0], arguments[1], arguments[2]),
            "hill_rep" => HillRepression(arguments[0], arguments[1], arguments[2]),
            Choose => arguments[0] != 0 ? arguments[1] : arguments[2],
            _ => MichaelisMenten(arguments[0], arguments[1]),
        };
    }

    /// <summary>x^n / (K^n + x^n).</summary>
    public static double HillActivation(double x, double k, double n)
    {
        var xn = Math.Pow(x, n);
        return xn / (Math.Pow(k, n) + xn);
    }

    /// <summary>K^n / (K^n + x^n).</summary>
    public static double HillRepression(double x, double k, double n)
    {
        var kn = Math.Pow(k, n);
        return kn / (kn + Math.Pow(x, n));
    }

    /// <summary>x / (K + x).</summary>
    public static double MichaelisMenten(double x, double k) => x / (k + x);
}
