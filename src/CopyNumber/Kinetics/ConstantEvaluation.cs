using CopyNumber.Language;

namespace CopyNumber.Kinetics;

/// <summary>
/// Evaluates an expression once, at compile time: parameter values, schedule times, constant folding.
/// Laws evaluated during a run are compiled instead (<see cref="ExpressionCompiler"/>); both use the
/// methods of <see cref="LawFunctions"/>, so they agree.
/// </summary>
internal static class ConstantEvaluation
{
    /// <summary>
    /// The value of <paramref name="expression"/>, or false when a name has no value
    /// (<paramref name="valueOf"/> returns null for it).
    /// </summary>
    /// <exception cref="ModelException">An unknown function or a wrong number of arguments.</exception>
    public static bool TryEvaluate(Expr expression, Func<string, double?> valueOf, out double value)
    {
        value = double.NaN;
        switch (expression)
        {
            case NumberExpr number:
                value = number.Value;
                return true;
            case NameExpr name:
                var known = valueOf(name.Name);
                if (known is null) return false;
                value = known.Value;
                return true;
            case NegateExpr negate:
                if (!TryEvaluate(negate.Operand, valueOf, out var operand)) return false;
                value = -operand;
                return true;
            case BinaryExpr binary:
                if (!TryEvaluate(binary.Left, valueOf, out var left) || !TryEvaluate(binary.Right, valueOf, out var right))
                    return false;
                value = Apply(binary.Operator, left, right, binary.Position);
                return true;
            case CallExpr call:
                var arguments = new double[call.Arguments.Count];
                for (var a = 0; a < arguments.Length; a++)
                    if (!TryEvaluate(call.Arguments[a], valueOf, out arguments[a])) return false;
                var method = ExpressionCompiler.FunctionMethod(call);
                if (method.GetParameters().Length == arguments.Length)
                {
                    value = (double)method.Invoke(null, arguments.Cast<object>().ToArray())!;
                    return true;
                }
                value = arguments[0]; // min and max of more than two arguments fold pairwise, as compiled
                for (var a = 1; a < arguments.Length; a++) value = (double)method.Invoke(null, [value, arguments[a]])!;
                return true;
            case CompareExpr compare:
                if (!TryEvaluate(compare.Left, valueOf, out var compareLeft) || !TryEvaluate(compare.Right, valueOf, out var compareRight)) return false;
                value = ConstantEvaluator.Truth(ConstantEvaluator.Compare(compare.Operator, compareLeft, compareRight));
                return true;
            case LogicExpr logic:
                if (!TryEvaluate(logic.Left, valueOf, out var p) || !TryEvaluate(logic.Right, valueOf, out var q)) return false;
                value = ConstantEvaluator.Truth(logic.Conjunction ? p != 0 && q != 0 : p != 0 || q != 0);
                return true;
            case NotExpr not:
                if (!TryEvaluate(not.Operand, valueOf, out var v)) return false;
                value = ConstantEvaluator.Truth(v == 0);
                return true;
            default:
                throw new ModelException(expression.Position, "unsupported expression");
        }
    }

    /// <summary>The value of a number-only expression (no names), or false.</summary>
    public static bool TryNumber(Expr expression, out double value) => TryEvaluate(expression, _ => null, out value);

    /// <summary>A binary operator on two numbers, with the same meaning as in compiled laws.</summary>
    public static double Apply(char op, double left, double right, SourcePosition position) => op switch
    {
        '+' => left + right,
        '-' => left - right,
        '*' => left * right,
        '/' => left / right,
        '^' => LawFunctions.Power(left, right),
        _ => throw new ModelException(position, $"unknown operator '{op}'"),
    };
}
