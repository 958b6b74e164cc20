using System.Globalization;
using System.Text;
using CopyNumber.Language;

namespace CopyNumber.Kinetics;

/// <summary>
/// Prints an expression as readable text: <c>+ - * /</c> with spaces, <c>^</c> without, calls as
/// <c>f(a, b)</c>, numbers in the shortest form that reads back to the same double. Parentheses follow
/// the usual reading (operators group to the left, unary minus binds tighter than <c>*</c> and
/// <c>/</c>); beyond that, brackets are added wherever grammars differ: around a right operand of equal
/// precedence, around any negative operand after an operator, around both operands of <c>^</c> unless
/// they are atoms, and around whatever a unary minus applies to unless it is an atom (<c>-(x^2)</c>).
/// </summary>
public static class ExpressionText
{
    private const int Disjunction = -3, Conjunction = -2, Not = -1, Comparing = 0, Sum = 1, Product = 2, Negation = 3, Power = 4, Atom = 5;

    /// <summary>The expression as text.</summary>
    public static string Format(Expr expression)
    {
        var text = new StringBuilder();
        Write(expression, text);
        return text.ToString();
    }

    /// <summary>A number as the model language writes it: invariant culture, shortest round trip, <c>1e-05</c> as <c>1e-5</c>.</summary>
    public static string Format(double value)
    {
        var text = value.ToString("R", CultureInfo.InvariantCulture);
        var e = text.IndexOf('E');
        if (e < 0) return text;
        var exponent = int.Parse(text.AsSpan(e + 1), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture);
        return $"{text[..e]}e{exponent.ToString(CultureInfo.InvariantCulture)}";
    }

    private static int Precedence(Expr e) => e switch
    {
        BinaryExpr { Operator: '+' or '-' } => Sum,
        BinaryExpr { Operator: '*' or '/' } => Product,
        BinaryExpr { Operator: '^' } => Power,
        NegateExpr => Negation,
        LogicExpr { Conjunction: false } => Disjunction,
        LogicExpr => Conjunction,
        NotExpr => Not,
        CompareExpr => Comparing,
        NumberExpr n when n.Value < 0 || double.IsNegative(n.Value) => Negation,
        _ => Atom,
    };

    private static void Write(Expr e, StringBuilder text)
    {
        switch (e)
        {
            case NumberExpr number:
                text.Append(Format(number.Value));
                break;
            case NameExpr name:
                text.Append(name.Name);
                break;
            case NegateExpr negate:
                text.Append('-');
                WriteOperand(negate.Operand, text, Precedence(negate.Operand) < Atom);
                break;
            case BinaryExpr binary:
                var p = Precedence(binary);
                var left = Precedence(binary.Left);
                var right = Precedence(binary.Right);
                // ^ groups to the right in some grammars and to the left in others: bracket both sides
                WriteOperand(binary.Left, text, p == Power ? left <= Power : left < p);
                text.Append(binary.Operator == '^' ? "^" : $" {binary.Operator} ");
                WriteOperand(binary.Right, text, right <= p || right == Negation);
                break;
            case CompareExpr compare:
                // comparisons do not chain: bracket any operand that is itself a comparison or looser
                WriteOperand(compare.Left, text, Precedence(compare.Left) <= Comparing);
                text.Append(' ').Append(Symbol(compare.Operator)).Append(' ');
                WriteOperand(compare.Right, text, Precedence(compare.Right) <= Comparing);
                break;
            case LogicExpr logic:
                var own = Precedence(logic);
                WriteOperand(logic.Left, text, Precedence(logic.Left) < own);
                text.Append(logic.Conjunction ? " and " : " or ");
                WriteOperand(logic.Right, text, Precedence(logic.Right) <= own);
                break;
            case NotExpr not:
                text.Append("not ");
                WriteOperand(not.Operand, text, Precedence(not.Operand) < Not);
                break;
            case CallExpr call:
                text.Append(call.Function).Append('(');
                for (var a = 0; a < call.Arguments.Count; a++)
                {
                    if (a > 0) text.Append(", ");
                    Write(call.Arguments[a], text);
                }
                text.Append(')');
                break;
            default:
                text.Append('?');
                break;
        }
    }

    /// <summary>How a comparison is written in the language.</summary>
    public static string Symbol(Comparison op) => op switch
    {
        Comparison.Less => "<",
        Comparison.LessOrEqual => "<=",
        Comparison.Greater => ">",
        Comparison.GreaterOrEqual => ">=",
        Comparison.Equal => "==",
        _ => "!=",
    };

    private static void WriteOperand(Expr operand, StringBuilder text, bool bracket)
    {
        if (bracket) text.Append('(');
        Write(operand, text);
        if (bracket) text.Append(')');
    }
}
