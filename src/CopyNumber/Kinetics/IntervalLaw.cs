using CopyNumber.Language;

namespace CopyNumber.Kinetics;

/// <summary>A closed interval [Lo, Hi] of reals; an unbounded or undefined one has infinite or NaN ends.</summary>
internal readonly record struct Interval(double Lo, double Hi)
{
    public static Interval Point(double value) => new(value, value);
    public static readonly Interval Everything = new(double.NegativeInfinity, double.PositiveInfinity);
    public static readonly Interval Truth = new(0, 1);
    public bool IsPoint => Lo == Hi;
    public bool Contains(double value) => Lo <= value && value <= Hi;
    public bool IsValid => !double.IsNaN(Lo) && !double.IsNaN(Hi) && Lo <= Hi;
    public static Interval Hull(Interval a, Interval b) => new(Math.Min(a.Lo, b.Lo), Math.Max(a.Hi, b.Hi));
    public static Interval Of(double a, double b) => double.IsNaN(a) || double.IsNaN(b) ? Everything : new(Math.Min(a, b), Math.Max(a, b));
}

/// <summary>
/// A rate law evaluated by interval arithmetic over a window of time [t0, t1], with the counts and the
/// parameters fixed: the result encloses every value the law takes on the window (Moore, Kearfott &amp;
/// Cloud 2009, <i>Introduction to Interval Analysis</i>, SIAM; quoted from memory). The exact simulation of
/// laws that read <c>time</c> uses its upper end as the bounding propensity of thinning (Voliotis, Thomas,
/// Grima &amp; Bowsher 2016, PLoS Comput. Biol. 12:e1004923). The enclosure is in floating point without
/// directed rounding; the caller widens it by a relative margin far above the round-off.
/// </summary>
/// <remarks>
/// Built once per reaction as a tree of small nodes with names resolved to indices; evaluating it calls
/// one virtual method per node and allocates nothing. Functions are enclosed by their monotonicity (exp,
/// log, sqrt, mm, the Hill functions in x), by their extrema (sin, cos, abs, even powers), or, where no
/// rule applies, by the whole line, which makes the bound infinite and the caller shortens the window.
/// </remarks>
internal sealed class IntervalLaw
{
    private readonly Node _root;

    private IntervalLaw(Node root) => _root = root;

    /// <summary>Compiles an expression (readouts already expanded) whose names are species, parameters, <c>size</c> or <c>time</c>.</summary>
    public static IntervalLaw Compile(Expr expression, ExpressionScope scope) => new(Build(expression, scope));

    /// <summary>An interval holding every value of the law for t in [<paramref name="t0"/>, <paramref name="t1"/>].</summary>
    public Interval Evaluate(long[] counts, double[] parameters, double t0, double t1) =>
        _root.Evaluate(new Window(counts, parameters, t0, t1));

    private readonly record struct Window(long[] Counts, double[] Parameters, double T0, double T1);

    private abstract class Node
    {
        public abstract Interval Evaluate(in Window w);
    }

    private static Node Build(Expr e, ExpressionScope scope)
    {
        Node B(Expr x) => Build(x, scope);
        switch (e)
        {
            case NumberExpr n: return new Constant(n.Value);
            case NameExpr { Name: ExpressionScope.TimeName }: return new TimeNode();
            case NameExpr { Name: ExpressionScope.SizeName }: return new Constant(scope.Size);
            case NameExpr name when scope.SpeciesIndex(name.Name) is var s and >= 0: return new SpeciesNode(s);
            case NameExpr name when scope.ParameterIndex(name.Name) is var p and >= 0: return new ParameterNode(p);
            case NegateExpr negate: return new Unary(B(negate.Operand), UnaryOp.Negate);
            case BinaryExpr binary: return new Binary(binary.Operator, B(binary.Left), B(binary.Right));
            case CallExpr { Function: "pow" } pow: return new Binary('^', B(pow.Arguments[0]), B(pow.Arguments[1]));
            case CallExpr { Function: "min" or "max" } call:
            {
                var folded = B(call.Arguments[0]);
                for (var a = 1; a < call.Arguments.Count; a++) folded = new Extremum(call.Function == "max", folded, B(call.Arguments[a]));
                return folded;
            }
            case CallExpr { Function: BuiltinFunctions.Choose } choose:
                return new ChooseNode(B(choose.Arguments[0]), B(choose.Arguments[1]), B(choose.Arguments[2]));
            case CallExpr { Function: "hill_act" or "hill_rep" or "mm" } saturating:
                return new Saturating(saturating.Function, saturating.Arguments.Select(B).ToArray());
            case CallExpr call when call.Arguments.Count == 1 && UnaryOf(call.Function) is { } op:
                return new Unary(B(call.Arguments[0]), op);
            case CompareExpr compare: return new CompareNode(compare.Operator, B(compare.Left), B(compare.Right));
            case LogicExpr logic: return new LogicNode(logic.Conjunction, B(logic.Left), B(logic.Right));
            case NotExpr not: return new NotNode(B(not.Operand));
            default: throw new ModelException(e.Position, "this expression cannot be bounded over a window of time");
        }
    }

    private static UnaryOp? UnaryOf(string function) => function switch
    {
        "exp" => UnaryOp.Exp,
        "log" => UnaryOp.Log,
        "sqrt" => UnaryOp.Sqrt,
        "abs" => UnaryOp.Abs,
        "sin" => UnaryOp.Sin,
        "cos" => UnaryOp.Cos,
        LawFunctions.SignFunction => UnaryOp.Sign,
        _ => null,
    };

    private enum UnaryOp { Negate, Exp, Log, Sqrt, Abs, Sin, Cos, Sign }

    private sealed class Constant(double value) : Node
    {
        public override Interval Evaluate(in Window w) => Interval.Point(value);
    }

    private sealed class TimeNode : Node
    {
        public override Interval Evaluate(in Window w) => new(w.T0, w.T1);
    }

    private sealed class SpeciesNode(int index) : Node
    {
        public override Interval Evaluate(in Window w) => Interval.Point(w.Counts[index]);
    }

    private sealed class ParameterNode(int index) : Node
    {
        public override Interval Evaluate(in Window w) => Interval.Point(w.Parameters[index]);
    }

    private sealed class Unary(Node operand, UnaryOp op) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var x = operand.Evaluate(w);
            if (!x.IsValid) return Interval.Everything;
            return op switch
            {
                UnaryOp.Negate => new(-x.Hi, -x.Lo),
                UnaryOp.Exp => new(Math.Exp(x.Lo), Math.Exp(x.Hi)),
                UnaryOp.Log => x.Lo < 0 ? Interval.Everything : new(Math.Log(x.Lo), Math.Log(x.Hi)),
                UnaryOp.Sqrt => x.Lo < 0 ? Interval.Everything : new(Math.Sqrt(x.Lo), Math.Sqrt(x.Hi)),
                UnaryOp.Abs => x.Lo >= 0 ? x : x.Hi <= 0 ? new(-x.Hi, -x.Lo) : new(0, Math.Max(-x.Lo, x.Hi)),
                UnaryOp.Sign => new(LawFunctions.Sign(x.Lo), LawFunctions.Sign(x.Hi)),
                UnaryOp.Sin => Sine(x.Lo, x.Hi),
                _ => Sine(x.Lo + Math.PI / 2, x.Hi + Math.PI / 2),
            };
        }

        // sin on [a, b]: the values at the ends, widened to 1 where a maximum π/2 + 2kπ lies inside and to −1
        // where a minimum −π/2 + 2kπ does. cos(x) = sin(x + π/2).
        private static Interval Sine(double a, double b)
        {
            if (!double.IsFinite(a) || !double.IsFinite(b) || b - a >= 2 * Math.PI) return new(-1, 1);
            var lo = Math.Min(Math.Sin(a), Math.Sin(b));
            var hi = Math.Max(Math.Sin(a), Math.Sin(b));
            if (HoldsPeak(a, b, Math.PI / 2)) hi = 1;
            if (HoldsPeak(a, b, -Math.PI / 2)) lo = -1;
            return new(lo, hi);
        }

        // Whether some peak + 2kπ lies in [a, b], a little wider than the interval so round-off in the
        // reduction cannot miss a peak at an end.
        private static bool HoldsPeak(double a, double b, double peak)
        {
            var k = Math.Ceiling((a - peak) / (2 * Math.PI) - 1e-9);
            return peak + 2 * Math.PI * k <= b + 1e-9 * (1 + Math.Abs(b));
        }
    }

    private sealed class Binary(char op, Node left, Node right) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var a = left.Evaluate(w);
            var b = right.Evaluate(w);
            if (!a.IsValid || !b.IsValid) return Interval.Everything;
            switch (op)
            {
                case '+': return new(a.Lo + b.Lo, a.Hi + b.Hi);
                case '-': return new(a.Lo - b.Hi, a.Hi - b.Lo);
                case '*': return Product(a, b);
                case '/':
                    if (b.Contains(0)) return a.IsPoint && a.Lo == 0 ? Interval.Point(0) : Interval.Everything;
                    return Product(a, new Interval(1 / b.Hi, 1 / b.Lo));
                default: return Power(a, b);
            }
        }

        private static Interval Product(Interval a, Interval b)
        {
            var p1 = a.Lo * b.Lo;
            var p2 = a.Lo * b.Hi;
            var p3 = a.Hi * b.Lo;
            var p4 = a.Hi * b.Hi;
            if (double.IsNaN(p1) || double.IsNaN(p2) || double.IsNaN(p3) || double.IsNaN(p4)) return Interval.Everything;
            return new(Math.Min(Math.Min(p1, p2), Math.Min(p3, p4)), Math.Max(Math.Max(p1, p2), Math.Max(p3, p4)));
        }

        private static Interval Power(Interval x, Interval n)
        {
            if (x.IsPoint && n.IsPoint) return Interval.Point(LawFunctions.Power(x.Lo, n.Lo));
            if (n.IsPoint && n.Lo == Math.Floor(n.Lo) && Math.Abs(n.Lo) <= 1e6)
            {
                var k = n.Lo;
                var (pa, pb) = (LawFunctions.Power(x.Lo, k), LawFunctions.Power(x.Hi, k));
                if (k < 0 && x.Contains(0)) return Interval.Everything;
                if (k % 2 != 0 || x.Lo >= 0 || x.Hi <= 0) return Interval.Of(pa, pb);
                return k > 0 ? new(0, Math.Max(pa, pb)) : Interval.Of(pa, pb);
            }
            // x^n = exp(n·log x) for x > 0, monotone in each argument at fixed sign
            if (x.Lo <= 0) return Interval.Everything;
            var logs = new Interval(Math.Log(x.Lo), Math.Log(x.Hi));
            var e = Product(n, logs);
            return e.IsValid ? new(Math.Exp(e.Lo), Math.Exp(e.Hi)) : Interval.Everything;
        }
    }

    private sealed class Extremum(bool max, Node left, Node right) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var a = left.Evaluate(w);
            var b = right.Evaluate(w);
            if (!a.IsValid || !b.IsValid) return Interval.Everything;
            return max ? new(Math.Max(a.Lo, b.Lo), Math.Max(a.Hi, b.Hi)) : new(Math.Min(a.Lo, b.Lo), Math.Min(a.Hi, b.Hi));
        }
    }

    // hill_act(x, K, n) rises and hill_rep(x, K, n) falls in x ≥ 0 and mm(x, K) rises in x ≥ 0, at fixed
    // K > 0 (and n > 0); mm falls in K. With K or n varying, only the range [0, 1] (mm: [0, x.Hi/K.Lo]) is used.
    private sealed class Saturating(string function, Node[] arguments) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var x = arguments[0].Evaluate(w);
            var k = arguments[1].Evaluate(w);
            var n = arguments.Length > 2 ? arguments[2].Evaluate(w) : Interval.Point(1);
            if (!x.IsValid || !k.IsValid || !n.IsValid || x.Lo < 0 || !(k.Lo > 0) || !(n.Lo > 0)) return Interval.Everything;
            if (function == "mm") return new(LawFunctions.MichaelisMenten(x.Lo, k.Hi), LawFunctions.MichaelisMenten(x.Hi, k.Lo));
            if (!k.IsPoint || !n.IsPoint) return Interval.Truth;
            var (lo, hi) = function == "hill_act"
                ? (LawFunctions.HillActivation(x.Lo, k.Lo, n.Lo), LawFunctions.HillActivation(x.Hi, k.Lo, n.Lo))
                : (LawFunctions.HillRepression(x.Hi, k.Lo, n.Lo), LawFunctions.HillRepression(x.Lo, k.Lo, n.Lo));
            return Interval.Of(lo, hi);
        }
    }

    private sealed class ChooseNode(Node condition, Node then, Node otherwise) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var c = condition.Evaluate(w);
            if (!c.IsValid) return Interval.Hull(then.Evaluate(w), otherwise.Evaluate(w));
            if (!c.Contains(0)) return then.Evaluate(w);
            if (c.IsPoint) return otherwise.Evaluate(w);
            return Interval.Hull(then.Evaluate(w), otherwise.Evaluate(w));
        }
    }

    private sealed class CompareNode(Comparison op, Node left, Node right) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var a = left.Evaluate(w);
            var b = right.Evaluate(w);
            if (!a.IsValid || !b.IsValid) return Interval.Truth;
            bool always, never;
            switch (op)
            {
                case Comparison.Less: always = a.Hi < b.Lo; never = a.Lo >= b.Hi; break;
                case Comparison.LessOrEqual: always = a.Hi <= b.Lo; never = a.Lo > b.Hi; break;
                case Comparison.Greater: always = a.Lo > b.Hi; never = a.Hi <= b.Lo; break;
                case Comparison.GreaterOrEqual: always = a.Lo >= b.Hi; never = a.Hi < b.Lo; break;
                case Comparison.Equal: always = a.IsPoint && b.IsPoint && a.Lo == b.Lo; never = a.Hi < b.Lo || b.Hi < a.Lo; break;
                default: always = a.Hi < b.Lo || b.Hi < a.Lo; never = a.IsPoint && b.IsPoint && a.Lo == b.Lo; break;
            }
            return always ? Interval.Point(1) : never ? Interval.Point(0) : Interval.Truth;
        }
    }

    private sealed class LogicNode(bool conjunction, Node left, Node right) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var a = Truth(left.Evaluate(w));
            var b = Truth(right.Evaluate(w));
            if (conjunction) return a.Lo == 1 && b.Lo == 1 ? Interval.Point(1) : a.Hi == 0 || b.Hi == 0 ? Interval.Point(0) : Interval.Truth;
            return a.Lo == 1 || b.Lo == 1 ? Interval.Point(1) : a.Hi == 0 && b.Hi == 0 ? Interval.Point(0) : Interval.Truth;
        }
    }

    private sealed class NotNode(Node operand) : Node
    {
        public override Interval Evaluate(in Window w)
        {
            var a = Truth(operand.Evaluate(w));
            return new(1 - a.Hi, 1 - a.Lo);
        }
    }

    // A value's truth as an interval in {0, 1}: [1, 1] when it is never 0, [0, 0] when it is always 0.
    private static Interval Truth(Interval value) =>
        !value.IsValid ? Interval.Truth : !value.Contains(0) ? Interval.Point(1) : value.IsPoint ? Interval.Point(0) : Interval.Truth;
}
