using System.Reflection;

namespace CopyNumber.Kinetics;

/// <summary>
/// The built-in functions of the model language as plain static methods. Compiled laws call these
/// very methods, and compile-time evaluation (parameter values, schedule times) invokes them too,
/// so a function means the same thing everywhere.
/// </summary>
internal static class LawFunctions
{
    /// <summary>Integer exponents up to this are computed by repeated multiplication (exact for small integers, no pow call).</summary>
    public const int LargestUnrolledExponent = 16;

    /// <summary>Sign of x (0 for 0 and NaN); not in the language, produced by differentiating abs, min and max.</summary>
    public const string SignFunction = "sign";

    private static readonly Dictionary<string, (int MinArity, int MaxArity, MethodInfo Method)> Table = new()
    {
        ["exp"] = (1, 1, Of<Func<double, double>>(Math.Exp)),
        ["log"] = (1, 1, Of<Func<double, double>>(Math.Log)),
        ["sqrt"] = (1, 1, Of<Func<double, double>>(Math.Sqrt)),
        ["abs"] = (1, 1, Of<Func<double, double>>(Math.Abs)),
        ["sin"] = (1, 1, Of<Func<double, double>>(Math.Sin)),
        ["cos"] = (1, 1, Of<Func<double, double>>(Math.Cos)),
        ["pow"] = (2, 2, Of<Func<double, double, double>>(Power)),
        ["min"] = (2, int.MaxValue, Of<Func<double, double, double>>(Math.Min)),
        ["max"] = (2, int.MaxValue, Of<Func<double, double, double>>(Math.Max)),
        ["hill_act"] = (3, 3, Of<Func<double, double, double, double>>(HillActivation)),
        ["hill_rep"] = (3, 3, Of<Func<double, double, double, double>>(HillRepression)),
        ["mm"] = (2, 2, Of<Func<double, double, double>>(MichaelisMenten)),
        [SignFunction] = (1, 1, Of<Func<double, double>>(Sign)),
        [Language.BuiltinFunctions.Choose] = (3, 3, Of<Func<double, double, double, double>>(Choose)),
    };

    /// <summary>
    /// The method implementing <paramref name="function"/> called with <paramref name="arguments"/> arguments.
    /// min and max take two or more arguments and are applied pairwise from the left.
    /// </summary>
    /// <exception cref="ArgumentException">The function is unknown or the argument count is wrong; the message is user-facing.</exception>
    public static MethodInfo Method(string function, int arguments)
    {
        if (!Table.TryGetValue(function, out var entry))
            throw new ArgumentException($"unknown function '{function}'");
        if (arguments < entry.MinArity || arguments > entry.MaxArity)
        {
            var expected = entry.MaxArity == int.MaxValue ? $"at least {entry.MinArity}"
                : entry.MinArity.ToString(System.Globalization.CultureInfo.InvariantCulture);
            throw new ArgumentException($"'{function}' takes {expected} argument{(entry.MinArity == 1 ? "" : "s")}, not {arguments}");
        }
        return entry.Method;
    }

    /// <summary>Whether <paramref name="n"/> is an exponent computed by repeated multiplication.</summary>
    public static bool IsUnrolledExponent(double n) => n >= 0 && n <= LargestUnrolledExponent && n == Math.Floor(n);

    /// <summary>x^n: repeated multiplication for a small non-negative integer n, otherwise <see cref="Math.Pow"/>.</summary>
    public static double Power(double x, double n)
    {
        if (!IsUnrolledExponent(n)) return Math.Pow(x, n);
        var result = 1.0;
        for (var q = 0; q < (int)n; q++) result *= x;
        return result;
    }

    /// <summary>Activating Hill function x^n/(K^n + x^n).</summary>
    public static double HillActivation(double x, double k, double n)
    {
        var xn = Power(x, n);
        return xn / (Power(k, n) + xn);
    }

    /// <summary>Repressing Hill function K^n/(K^n + x^n).</summary>
    public static double HillRepression(double x, double k, double n)
    {
        var kn = Power(k, n);
        return kn / (kn + Power(x, n));
    }

    /// <summary>Michaelis–Menten saturation x/(K + x).</summary>
    public static double MichaelisMenten(double x, double k) => x / (k + x);

    /// <summary>
    /// choose(c, a, b): a when c is not 0, else b. Compile-time evaluation calls this; compiled laws use a
    /// conditional expression with the same meaning (see <see cref="ExpressionCompiler"/>).
    /// </summary>
    public static double Choose(double condition, double then, double otherwise) => condition != 0 ? then : otherwise;

    /// <summary>+1, −1 or 0 (also for NaN, where <see cref="Math.Sign(double)"/> would throw).</summary>
    public static double Sign(double x) => x > 0 ? 1.0 : x < 0 ? -1.0 : 0.0;

    private static MethodInfo Of<TDelegate>(TDelegate method) where TDelegate : Delegate => method.Method;
}
