using System.Reflection;
using CopyNumber.Language;
using System.Linq.Expressions;

namespace CopyNumber.Kinetics;

/// <summary>
/// Compiles a model expression to a delegate with System.Linq.Expressions: species and parameters
/// become array reads (parameters are read at every call, so a schedule can change them), <c>size</c>
/// and numbers become constants, and functions become direct calls. Nothing is interpreted at run
/// time and the delegate captures no per-call state, so calling it allocates nothing.
/// </summary>
/// <remarks>
/// An expression may be a shared graph (<see cref="ExpressionGraph"/>; symbolic derivatives are): a node
/// used by two or more others is computed once into a local and read from there, so the compiled code
/// grows with the graph, not with its (possibly exponentially larger) tree form.
/// </remarks>
public static class ExpressionCompiler
{
    private static readonly MethodInfo PowerMethod =
        typeof(LawFunctions).GetMethod(nameof(LawFunctions.Power), BindingFlags.Public | BindingFlags.Static)!;

    /// <summary>The expression on integer copy numbers, for the stochastic simulators.</summary>
    /// <param name="expression">The expression; readout names are expanded.</param>
    /// <param name="scope">What its names mean.</param>
    /// <exception cref="ModelException">A name, function or operator the compiler does not know.</exception>
    public static CountLaw CompileCountLaw(Expr expression, ExpressionScope scope)
    {
        var counts = Expression.Parameter(typeof(long[]), "counts");
        var parameters = Expression.Parameter(typeof(double[]), "parameters");
        var body = new TreeBuilder(scope, parameters,
                i => Expression.Convert(Expression.ArrayIndex(counts, Expression.Constant(i)), typeof(double)))
            .Body(scope.Expand(expression));
        return Expression.Lambda<CountLaw>(body, counts, parameters).Compile();
    }

    /// <summary>The expression on a real-valued state in copy-number units, for the rate equations.</summary>
    /// <param name="expression">The expression; readout names are expanded.</param>
    /// <param name="scope">What its names mean.</param>
    /// <exception cref="ModelException">A name, function or operator the compiler does not know.</exception>
    public static StateLaw CompileStateLaw(Expr expression, ExpressionScope scope) => StateLawTree(expression, scope).Compile();

    /// <summary>The expression tree <see cref="CompileStateLaw"/> compiles (for tests that measure its size).</summary>
    internal static Expression<StateLaw> StateLawTree(Expr expression, ExpressionScope scope)
    {
        var state = Expression.Parameter(typeof(double[]), "state");
        var parameters = Expression.Parameter(typeof(double[]), "parameters");
        var body = new TreeBuilder(scope, parameters,
                i => Expression.ArrayIndex(state, Expression.Constant(i)))
            .Body(scope.Expand(expression));
        return Expression.Lambda<StateLaw>(body, state, parameters);
    }

    /// <summary>The method of a call's function, or a user-facing error at the call.</summary>
    internal static MethodInfo FunctionMethod(CallExpr call)
    {
        try
        {
            return LawFunctions.Method(call.Function, call.Arguments.Count);
        }
        catch (ArgumentException e)
        {
            throw new ModelException(call.Position, e.Message);
        }
    }

    private sealed class TreeBuilder(ExpressionScope scope, ParameterExpression parameters, Func<int, Expression> readSpecies)
    {
        private Dictionary<Expr, int> _uses = new(ReferenceEqualityComparer.Instance);
        private readonly Dictionary<Expr, ParameterExpression> _computed = new(ReferenceEqualityComparer.Instance);
        private readonly List<ParameterExpression> _locals = [];
        private readonly List<Expression> _assignments = [];

        /// <summary>
        /// The compiled body: the shared nodes assigned to locals in the order they are first needed
        /// (each after the shared nodes it uses), then the value.
        /// </summary>
        public Expression Body(Expr expression)
        {
            _uses = ExpressionGraph.UseCounts(expression);
            var value = Build(expression);
            return _locals.Count == 0 ? value : Expression.Block(typeof(double), _locals, [.. _assignments, value]);
        }

        private Expression Build(Expr expression)
        {
            if (expression is NumberExpr or NameExpr || _uses.GetValueOrDefault(expression) < 2) return BuildNode(expression);
            if (_computed.TryGetValue(expression, out var local)) return local;
            var value = BuildNode(expression);
            local = Expression.Variable(typeof(double), "shared");
            _locals.Add(local);
            _assignments.Add(Expression.Assign(local, value));
            _computed[expression] = local;
            return local;
        }

        private Expression BuildNode(Expr expression) => expression switch
        {
            NumberExpr number => Expression.Constant(number.Value),
            NameExpr name => Name(name),
            NegateExpr negate => Expression.Negate(Build(negate.Operand)),
            BinaryExpr { Operator: '^' } power => Power(power.Left, power.Right),
            BinaryExpr binary => Binary(binary),
            CallExpr { Function: "pow", Arguments.Count: 2 } pow => Power(pow.Arguments[0], pow.Arguments[1]),
            CallExpr { Function: BuiltinFunctions.Choose, Arguments.Count: 3 } choose =>
                Expression.Condition(IsTrue(Build(choose.Arguments[0])), Build(choose.Arguments[1]), Build(choose.Arguments[2])),
            CallExpr call => Call(call),
            CompareExpr compare => Truth(Compare(compare.Operator, Build(compare.Left), Build(compare.Right))),
            LogicExpr { Conjunction: true } and => Truth(Expression.AndAlso(IsTrue(Build(and.Left)), IsTrue(Build(and.Right)))),
            LogicExpr or => Truth(Expression.OrElse(IsTrue(Build(or.Left)), IsTrue(Build(or.Right)))),
            NotExpr not => Truth(Expression.Equal(Build(not.Operand), Expression.Constant(0.0))),
            _ => throw new ModelException(expression.Position, "unsupported expression"),
        };

        // A condition is a number: true is anything but 0, and a comparison or a logical operator gives 1 or 0,
        // as ConstantEvaluator.Compare and Truth do at compile time.
        private static Expression IsTrue(Expression value) => Expression.NotEqual(value, Expression.Constant(0.0));

        private static Expression Truth(Expression holds) => Expression.Condition(holds, Expression.Constant(1.0), Expression.Constant(0.0));

        private static Expression Compare(Comparison op, Expression left, Expression right) => op switch
        {
            Comparison.Less => Expression.LessThan(left, right),
            Comparison.LessOrEqual => Expression.LessThanOrEqual(left, right),
            Comparison.Greater => Expression.GreaterThan(left, right),
            Comparison.GreaterOrEqual => Expression.GreaterThanOrEqual(left, right),
            Comparison.Equal => Expression.Equal(left, right),
            _ => Expression.NotEqual(left, right),
        };

        private Expression Name(NameExpr name)
        {
            var species = scope.SpeciesIndex(name.Name);
            if (species >= 0) return readSpecies(species);
            var parameter = scope.ParameterIndex(name.Name);
            if (parameter >= 0) return Expression.ArrayIndex(parameters, Expression.Constant(parameter));
            if (name.Name == ExpressionScope.SizeName) return Expression.Constant(scope.Size);
            if (name.Name == ExpressionScope.TimeName) return Expression.ArrayIndex(parameters, Expression.Constant(scope.TimeSlot));
            throw new ModelException(name.Position, $"'{name.Name}' is not a species, a parameter or size");
        }

        private Expression Binary(BinaryExpr binary)
        {
            var left = Build(binary.Left);
            var right = Build(binary.Right);
            return binary.Operator switch
            {
                '+' => Expression.Add(left, right),
                '-' => Expression.Subtract(left, right),
                '*' => Expression.Multiply(left, right),
                '/' => Expression.Divide(left, right),
                _ => throw new ModelException(binary.Position, $"unknown operator '{binary.Operator}'"),
            };
        }

        // A small non-negative integer exponent becomes repeated multiplication of the base, held in a
        // local so it is evaluated once; any other exponent calls LawFunctions.Power, which is Math.Pow
        // except for integer values known only at run time (then it also multiplies).
        private Expression Power(Expr baseExpr, Expr exponentExpr)
        {
            var baseValue = Build(baseExpr);
            if (!ConstantEvaluation.TryNumber(exponentExpr, out var n) || !LawFunctions.IsUnrolledExponent(n))
                return Expression.Call(PowerMethod, baseValue, Build(exponentExpr));
            if (n == 0) return Expression.Constant(1.0);
            if (n == 1) return baseValue;
            var local = Expression.Variable(typeof(double), "power_base");
            Expression product = local;
            for (var q = 1; q < (int)n; q++) product = Expression.Multiply(product, local);
            return Expression.Block(typeof(double), [local], Expression.Assign(local, baseValue), product);
        }

        private Expression Call(CallExpr call)
        {
            var method = FunctionMethod(call);
            var arguments = call.Arguments.Select(Build).ToArray();
            if (method.GetParameters().Length == arguments.Length) return Expression.Call(method, arguments);
            // min and max of more than two arguments: pairwise from the left
            var folded = arguments[0];
            for (var a = 1; a < arguments.Length; a++) folded = Expression.Call(method, folded, arguments[a]);
            return folded;
        }
    }
}
