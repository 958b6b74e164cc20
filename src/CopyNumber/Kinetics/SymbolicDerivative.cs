using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Kinetics;

/// <summary>
/// Symbolic partial derivatives of model expressions, for the exact Jacobian of the rate equations.
/// The usual rules of differentiation (sum, product, quotient, chain and power rules; common
/// practice), with light simplification as the result is built: 0·x → 0, 1·x → x, x + 0 → x, x^1 → x,
/// x^0 → 1 and folding of operations on two numbers when the result is finite. The derivative of
/// abs, min and max uses <c>sign</c> (taking the mean of the two sides at a tie), a function only the
/// compiler knows. The result is an ordinary expression: it prints with <see cref="ExpressionText"/>
/// and compiles with <see cref="ExpressionCompiler"/>.
/// </summary>
public static class SymbolicDerivative
{
    /// <summary>∂<paramref name="expression"/>/∂<paramref name="variable"/>, every other name held constant.</summary>
    /// <param name="expression">The expression, readouts already expanded (<see cref="ExpressionScope.Expand"/>).</param>
    /// <param name="variable">The name to differentiate by, usually a species.</param>
    /// <exception cref="ModelException">An unknown function, operator or wrong number of arguments.</exception>
    public static Expr Differentiate(Expr expression, string variable) => new Rules(variable).D(expression);

    /// <summary>Whether <paramref name="variable"/> occurs in <paramref name="expression"/>.</summary>
    public static bool DependsOn(Expr expression, string variable) =>
        ExpressionScope.Names(expression).Any(n => n.Name == variable);

    private sealed class Rules(string variable)
    {
        public Expr D(Expr e) => e switch
        {
            NumberExpr => Number(0, e),
            NameExpr name => Number(name.Name == variable ? 1 : 0, e),
            NegateExpr negate => Neg(D(negate.Operand)),
            BinaryExpr binary => Binary(binary),
            CallExpr call => Call(call),
            _ => throw new ModelException(e.Position, "unsupported expression"),
        };

        private Expr Binary(BinaryExpr b)
        {
            var (u, w) = (b.Left, b.Right);
            switch (b.Operator)
            {
                case '+': return Add(D(u), D(w));
                case '-': return Sub(D(u), D(w));
                case '*': return Add(Mul(D(u), w), Mul(u, D(w)));
                case '/':
                    var dw = D(w);
                    return IsNumber(dw, 0) ? Div(D(u), w) : Div(Sub(Mul(D(u), w), Mul(u, dw)), Pow(w, Number(2, b)));
                case '^': return PowerRule(u, w, b);
                default: throw new ModelException(b.Position, $"unknown operator '{b.Operator}'");
            }
        }

        private Expr PowerRule(Expr u, Expr w, Expr at)
        {
            if (!DependsOn(w, variable)) // d(u^w) = w·u^(w−1)·u'
                return Mul(Mul(w, Pow(u, Sub(w, Number(1, at)))), D(u));
            var power = new BinaryExpr('^', u, w, at.Position);
            var logU = new CallExpr("log", [u], at.Position);
            if (!DependsOn(u, variable)) // d(u^w) = u^w·ln(u)·w'
                return Mul(Mul(power, logU), D(w));
            // d(u^w) = u^w·(w'·ln u + w·u'/u)
            return Mul(power, Add(Mul(D(w), logU), Div(Mul(w, D(u)), u)));
        }

        private Expr Call(CallExpr c)
        {
            var args = c.Arguments;
            ExpressionCompiler.FunctionMethod(c); // reports an unknown function or a wrong argument count
            switch (c.Function)
            {
                case "exp": return Mul(c, D(args[0]));
                case "log": return Div(D(args[0]), args[0]);
                case "sqrt": return Div(D(args[0]), Mul(Number(2, c), c));
                case "abs": return Mul(Sign(args[0], c), D(args[0]));
                case LawFunctions.SignFunction: return Number(0, c);
                case "pow": return PowerRule(args[0], args[1], c);
                case "min" or "max" when args.Count > 2:
                    return D(c with { Arguments = [c with { Arguments = args.Take(args.Count - 1).ToArray() }, args[^1]] });
                case "min" or "max":
                {
                    // min(a,b) = (a + b − |a − b|)/2 and max(a,b) = (a + b + |a − b|)/2, differentiated
                    var (da, db) = (D(args[0]), D(args[1]));
                    var sum = Add(da, db);
                    var jump = Mul(Sign(Sub(args[0], args[1]), c), Sub(da, db));
                    return Div(c.Function == "min" ? Sub(sum, jump) : Add(sum, jump), Number(2, c));
                }
                default: return D(Definition(c));
            }
        }

        // The saturating functions by their definitions x^n/(K^n + x^n), K^n/(K^n + x^n), x/(K + x).
        private static Expr Definition(CallExpr c)
        {
            var p = c.Position;
            var a = c.Arguments;
            Expr Raise(Expr b) => new BinaryExpr('^', b, a[2], p);
            return c.Function switch
            {
                "hill_act" => new BinaryExpr('/', Raise(a[0]), new BinaryExpr('+', Raise(a[1]), Raise(a[0]), p), p),
                "hill_rep" => new BinaryExpr('/', Raise(a[1]), new BinaryExpr('+', Raise(a[1]), Raise(a[0]), p), p),
                "mm" => new BinaryExpr('/', a[0], new BinaryExpr('+', a[1], a[0], p), p),
                _ => throw new ModelException(p, $"cannot differentiate '{c.Function}'"),
            };
        }
    }

    private static Expr Number(double value, Expr at) => new NumberExpr(value, at.Position);

    private static Expr Sign(Expr argument, Expr at) => new CallExpr(LawFunctions.SignFunction, [argument], at.Position);

    /// <summary>The value of a subexpression made of numbers only, when finite; null for anything else.</summary>
    private static double? Literal(Expr e) => e switch
    {
        NumberExpr n => n.Value,
        NameExpr => null,
        _ => ConstantEvaluation.TryNumber(e, out var value) && double.IsFinite(value) ? value : null,
    };

    /// <summary>A new operator node, its number-only operands folded to single numbers.</summary>
    private static Expr Node(char op, Expr a, Expr b) => new BinaryExpr(op, Folded(a), Folded(b), a.Position);

    private static Expr Folded(Expr e) => e is not NumberExpr && Literal(e) is { } value ? new NumberExpr(value, e.Position) : e;

    private static bool IsNumber(Expr e, double value) => Literal(e) == value;

    private static Expr? Fold(char op, Expr a, Expr b)
    {
        if (Literal(a) is not { } x || Literal(b) is not { } y) return null;
        var value = ConstantEvaluation.Apply(op, x, y, a.Position);
        return double.IsFinite(value) ? new NumberExpr(value, a.Position) : null;
    }

    // Each constructor folds two numbers first, then applies the identities.
    private static Expr Add(Expr a, Expr b) =>
        Fold('+', a, b) ?? (IsNumber(a, 0) ? b : IsNumber(b, 0) ? a : Node('+', a, b));

    private static Expr Sub(Expr a, Expr b) =>
        Fold('-', a, b) ?? (IsNumber(b, 0) ? a : IsNumber(a, 0) ? Neg(b) : Node('-', a, b));

    private static Expr Mul(Expr a, Expr b)
    {
        if (Fold('*', a, b) is { } folded) return folded;
        if (IsNumber(a, 0) || IsNumber(b, 0)) return new NumberExpr(0, a.Position);
        if (IsNumber(a, 1)) return b;
        if (IsNumber(b, 1)) return a;
        if (IsNumber(a, -1)) return Neg(b);
        if (IsNumber(b, -1)) return Neg(a);
        return Node('*', a, b);
    }

    private static Expr Div(Expr a, Expr b) =>
        Fold('/', a, b) ?? (IsNumber(a, 0) ? new NumberExpr(0, a.Position) : IsNumber(b, 1) ? a : Node('/', a, b));

    private static Expr Pow(Expr a, Expr b) =>
        Fold('^', a, b) ?? (IsNumber(b, 0) ? new NumberExpr(1, a.Position) : IsNumber(b, 1) ? a : Node('^', a, b));

    private static Expr Neg(Expr a) => a switch
    {
        _ when Literal(a) is { } value => new NumberExpr(-value, a.Position),
        NegateExpr inner => inner.Operand,
        _ => new NegateExpr(a, a.Position),
    };
}
