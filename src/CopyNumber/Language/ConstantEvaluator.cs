namespace CopyNumber.Language;

/// <summary>
/// Evaluates an expression whose names all have known values (numbers, parameters, <c>size</c>), so the
/// checker can catch a negative schedule time or a parameter that is not a finite number before any
/// run. Recursion is bounded by the parser's limits on nesting and expression length.
/// </summary>
internal static class ConstantEvaluator
{
    /// <summary>The value of <paramref name="expr"/>, or null when some name has no known value.</summary>
    public static double? Evaluate(Expr expr, Func<string, double?> valueOf) => expr switch
    {
        NumberExpr number => number.Value,
        NameExpr name => valueOf(name.Name),
        NegateExpr negate => -Evaluate(negate.Operand, valueOf),
        BinaryExpr binary => Evaluate(binary.Left, valueOf) is { } left && Evaluate(binary.Right, valueOf) is { } right
            ? binary.Operator switch
            {
                '+' => left + right,
                '-' => left - right,
                '*' => left * right,
                '/' => left / right,
                _ => Math.Pow(left, right),
            }
            : null,
        CallExpr call => EvaluateCall(call, valueOf),
        CompareExpr compare => Evaluate(compare.Left, valueOf) is { } a && Evaluate(compare.Right, valueOf) is { } b
            ? Truth(Compare(compare.Operator, a, b)) : null,
        LogicExpr logic => Evaluate(logic.Left, valueOf) is { } p && Evaluate(logic.Right, valueOf) is { } q
            ? Truth(logic.Conjunction ? p != 0 && q != 0 : p != 0 || q != 0) : null,
        NotExpr not => Evaluate(not.Operand, valueOf) is { } v ? Truth(v == 0) : null,
        _ => null,
    };

    /// <summary>The value of a condition as a number: 1 for true, 0 for false.</summary>
    public static double Truth(bool holds) => holds ? 1.0 : 0.0;

    /// <summary>
    /// A comparison on two numbers, IEEE semantics (every comparison with NaN is false except <c>!=</c>),
    /// the one meaning compiled laws also use.
    /// </summary>
    public static bool Compare(Comparison op, double a, double b) => op switch
    {
        Comparison.Less => a < b,
        Comparison.LessOrEqual => a <= b,
        Comparison.Greater => a > b,
        Comparison.GreaterOrEqual => a >= b,
        Comparison.Equal => a == b,
        _ => a != b,
    };

    private static double? EvaluateCall(CallExpr call, Func<string, double?> valueOf)
    {
        if (!BuiltinFunctions.Arity.TryGetValue(call.Function, out var arity) || arity != call.Arguments.Count) return null;
        Span<double> arguments = stackalloc double[arity];
        for (var i = 0; i < arity; i++)
        {
            if (Evaluate(call.Arguments[i], valueOf) is not { } value) return null;
            arguments[i] = value;
        }
        return BuiltinFunctions.Apply(call.Function, arguments);
    }

    /// <summary>"NaN", "infinity" or "-infinity", for messages.</summary>
    public static string DescribeNonFinite(double value) =>
        double.IsNaN(value) ? "not a number (NaN)" : value > 0 ? "infinite" : "minus infinity";
}
