using CopyNumber.Language;

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
/// <remarks>
/// The result is a shared graph (<see cref="ExpressionGraph"/>), not a tree: the derivative of each
/// node is computed once and referred to wherever the rules need it, and the operands u and w of the
/// product and quotient rules are the input's own nodes. Nested functions therefore give a result whose
/// size grows linearly with the nesting depth (the tree form of d/dx of 33 nested Hill functions would
/// have about 10^15 nodes; the graph has a few hundred). Copying subtrees instead made the size, and the
/// compile time, double with each level.
/// </remarks>
public static class SymbolicDerivative
{
    /// <summary>∂<paramref name="expression"/>/∂<paramref name="variable"/>, every other name held constant.</summary>
    /// <param name="expression">The expression, readouts already expanded (<see cref="ExpressionScope.Expand"/>).</param>
    /// <param name="variable">The name to differentiate by, usually a species.</param>
    /// <exception cref="ModelException">An unknown function, operator or wrong number of arguments.</exception>
    public static Expr Differentiate(Expr expression, string variable) => new Rules(variable).D(expression);

    /// <summary>Whether <paramref name="variable"/> occurs in <paramref name="expression"/>.</summary>
    public static bool DependsOn(Expr expression, string variable) =>
        ExpressionGraph.NamesUsed(expression).Contains(variable);

    /// <summary>One differentiation: the rules, and what it has already worked out about each node (by reference).</summary>
    private sealed class Rules(string variable)
    {
        private readonly Dictionary<Expr, Expr> _derivative = new(ReferenceEqualityComparer.Instance);
        private readonly Dictionary<Expr, bool> _depends = new(ReferenceEqualityComparer.Instance);
        private readonly Dictionary<Expr, double?> _number = new(ReferenceEqualityComparer.Instance);

        public Expr D(Expr e)
        {
            if (_derivative.TryGetValue(e, out var known)) return known;
            var derivative = !Depends(e) ? Number(0, e) : e switch
            {
                NameExpr => Number(1, e),
                // a comparison or logical value is piecewise constant: derivative 0 wherever it is defined
                CompareExpr or LogicExpr or NotExpr => Number(0, e),
                NegateExpr negate => Neg(D(negate.Operand)),
                BinaryExpr binary => Binary(binary),
                CallExpr call => Call(call),
                _ => throw new ModelException(e.Position, "unsupported expression"),
            };
            _derivative[e] = derivative;
            return derivative;
        }

        /// <summary>Whether the variable occurs in <paramref name="e"/>; worked out once per node.</summary>
        private bool Depends(Expr e)
        {
            if (_depends.TryGetValue(e, out var known)) return known;
            var depends = e switch
            {
                NameExpr name => name.Name == variable,
                NumberExpr => false,
                // every operand visited (no short cut), so an unknown function anywhere is reported
                _ => ExpressionGraph.Children(e).Aggregate(false, (any, operand) => Depends(operand) | any),
            };
            if (e is CallExpr call) ExpressionCompiler.FunctionMethod(call); // reports an unknown function or a wrong argument count
            _depends[e] = depends;
            return depends;
        }

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
            if (!Depends(w)) // d(u^w) = w·u^(w−1)·u'
                return Mul(Mul(w, Pow(u, Sub(w, Number(1, at)))), D(u));
            var power = at is BinaryExpr { Operator: '^' } ? at : new BinaryExpr('^', u, w, at.Position);
            var logU = new CallExpr("log", [u], at.Position);
            if (!Depends(u)) // d(u^w) = u^w·ln(u)·w'
                return Mul(Mul(power, logU), D(w));
            // d(u^w) = u^w·(w'·ln u + w·u'/u)
            return Mul(power, Add(Mul(D(w), logU), Div(Mul(w, D(u)), u)));
        }

        private Expr Call(CallExpr c)
        {
            var args = c.Arguments;
            switch (c.Function)
            {
                case "exp": return Mul(c, D(args[0]));
                case "log": return Div(D(args[0]), args[0]);
                case "sqrt": return Div(D(args[0]), Mul(Number(2, c), c));
                case "abs": return Mul(Sign(args[0], c), D(args[0]));
                case "sin": return Mul(new CallExpr("cos", [args[0]], c.Position), D(args[0]));
                case "cos": return Neg(Mul(new CallExpr("sin", [args[0]], c.Position), D(args[0])));
                case LawFunctions.SignFunction: return Number(0, c);
                case BuiltinFunctions.Choose:
                {
                    // d choose(c, a, b) = choose(c, da, db): the condition picks the branch, the branch is differentiated
                    var (da, db) = (D(args[1]), D(args[2]));
                    if (IsNumber(da, 0) && IsNumber(db, 0)) return Number(0, c);
                    return new CallExpr(BuiltinFunctions.Choose, [args[0], Folded(da), Folded(db)], c.Position);
                }
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

        // The saturating functions by their definitions x^n/(K^n + x^n), K^n/(K^n + x^n), x/(K + x); each
        // power is one node, used twice.
        private static Expr Definition(CallExpr c)
        {
            var p = c.Position;
            var a = c.Arguments;
            Expr Raise(Expr b) => new BinaryExpr('^', b, a[2], p);
            switch (c.Function)
            {
                case "hill_act":
                {
                    var (xn, kn) = (Raise(a[0]), Raise(a[1]));
                    return new BinaryExpr('/', xn, new BinaryExpr('+', kn, xn, p), p);
                }
                case "hill_rep":
                {
                    var (xn, kn) = (Raise(a[0]), Raise(a[1]));
                    return new BinaryExpr('/', kn, new BinaryExpr('+', kn, xn, p), p);
                }
                case "mm": return new BinaryExpr('/', a[0], new BinaryExpr('+', a[1], a[0], p), p);
                default: throw new ModelException(p, $"cannot differentiate '{c.Function}'");
            }
        }

        /// <summary>The value of a subexpression made of numbers only (possibly not finite); null when it has a name.</summary>
        private double? Value(Expr e)
        {
            if (e is NumberExpr n) return n.Value;
            if (e is NameExpr) return null;
            if (_number.TryGetValue(e, out var known)) return known;
            double? value = null;
            var operands = ExpressionGraph.Children(e).Select(Value).ToArray();
            if (operands.All(v => v is not null))
            {
                // The node on its operands' values, evaluated as the compiled law would evaluate it.
                var numbers = operands.Select(v => (Expr)new NumberExpr(v!.Value, e.Position)).ToArray();
                Expr folded = e switch
                {
                    NegateExpr negate => negate with { Operand = numbers[0] },
                    BinaryExpr binary => binary with { Left = numbers[0], Right = numbers[1] },
                    CallExpr call => call with { Arguments = numbers },
                    CompareExpr compare => compare with { Left = numbers[0], Right = numbers[1] },
                    LogicExpr logic => logic with { Left = numbers[0], Right = numbers[1] },
                    NotExpr not => not with { Operand = numbers[0] },
                    _ => e,
                };
                if (ConstantEvaluation.TryNumber(folded, out var result)) value = result;
            }
            _number[e] = value;
            return value;
        }

        /// <summary>The value of a subexpression made of numbers only, when finite; null for anything else.</summary>
        private double? Literal(Expr e) => Value(e) is { } value && double.IsFinite(value) ? value : null;

        /// <summary>A new operator node, its number-only operands folded to single numbers.</summary>
        private Expr Node(char op, Expr a, Expr b) => new BinaryExpr(op, Folded(a), Folded(b), a.Position);

        private Expr Folded(Expr e) => e is not NumberExpr && Literal(e) is { } value ? new NumberExpr(value, e.Position) : e;

        private bool IsNumber(Expr e, double value) => Literal(e) == value;

        private Expr? Fold(char op, Expr a, Expr b)
        {
            if (Literal(a) is not { } x || Literal(b) is not { } y) return null;
            var value = ConstantEvaluation.Apply(op, x, y, a.Position);
            return double.IsFinite(value) ? new NumberExpr(value, a.Position) : null;
        }

        // Each constructor folds two numbers first, then applies the identities.
        private Expr Add(Expr a, Expr b) =>
            Fold('+', a, b) ?? (IsNumber(a, 0) ? b : IsNumber(b, 0) ? a : Node('+', a, b));

        private Expr Sub(Expr a, Expr b) =>
            Fold('-', a, b) ?? (IsNumber(b, 0) ? a : IsNumber(a, 0) ? Neg(b) : Node('-', a, b));

        private Expr Mul(Expr a, Expr b)
        {
            if (Fold('*', a, b) is { } folded) return folded;
            if (IsNumber(a, 0) || IsNumber(b, 0)) return new NumberExpr(0, a.Position);
            if (IsNumber(a, 1)) return b;
            if (IsNumber(b, 1)) return a;
            if (IsNumber(a, -1)) return Neg(b);
            if (IsNumber(b, -1)) return Neg(a);
            return Node('*', a, b);
        }

        private Expr Div(Expr a, Expr b) =>
            Fold('/', a, b) ?? (IsNumber(a, 0) ? new NumberExpr(0, a.Position) : IsNumber(b, 1) ? a : Node('/', a, b));

        private Expr Pow(Expr a, Expr b) =>
            Fold('^', a, b) ?? (IsNumber(b, 0) ? new NumberExpr(1, a.Position) : IsNumber(b, 1) ? a : Node('^', a, b));

        private Expr Neg(Expr a) => a switch
        {
            _ when Literal(a) is { } value => new NumberExpr(-value, a.Position),
            NegateExpr inner => inner.Operand,
            _ => new NegateExpr(a, a.Position),
        };
    }

    private static Expr Number(double value, Expr at) => new NumberExpr(value, at.Position);

    private static Expr Sign(Expr argument, Expr at) => new CallExpr(LawFunctions.SignFunction, [argument], at.Position);
}
