using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Sbml;

/// <summary>
/// An expression read from SBML's MathML, in a small tree the importer can substitute into, evaluate and
/// print as network-language text. Operators are the language's own (docs/network-language.md):
/// <c>+ - * / ^ &lt; &lt;= &gt; &gt;= == != and or not</c> and the functions <c>exp log abs min max choose</c>.
/// </summary>
internal abstract record SbmlMath
{
    public static SbmlMath Number(double value) => new MathNumber(value);
    public static SbmlMath Apply(string op, params SbmlMath[] arguments) => new MathApply(op, arguments);

    /// <summary>Replaces names (and <c>time</c>) by what <paramref name="replace"/> gives; null keeps the node.</summary>
    public SbmlMath Substitute(Func<SbmlMath, SbmlMath?> replace)
    {
        var replaced = replace(this);
        if (replaced is not null) return replaced;
        return this is MathApply a ? new MathApply(a.Operator, a.Arguments.Select(x => x.Substitute(replace)).ToArray()) : this;
    }

    /// <summary>Every node of the tree, this one first.</summary>
    public IEnumerable<SbmlMath> Nodes()
    {
        yield return this;
        if (this is MathApply a)
            foreach (var argument in a.Arguments)
                foreach (var node in argument.Nodes()) yield return node;
    }

    /// <summary>The names the expression reads.</summary>
    public IEnumerable<string> Names() => Nodes().OfType<MathName>().Select(n => n.Name).Distinct();

    /// <summary>The value with names valued by <paramref name="value"/> (conditions are 1 or 0, as in the language).</summary>
    public double Evaluate(Func<string, double> value) => this switch
    {
        MathNumber n => n.Value,
        MathName n => value(n.Name),
        MathTime => 0,
        MathApply a => EvaluateApply(a, value),
        _ => throw new InvalidOperationException(GetType().Name),
    };

    private static double EvaluateApply(MathApply a, Func<string, double> value)
    {
        double Arg(int i) => a.Arguments[i].Evaluate(value);
        static double Truth(bool b) => b ? 1 : 0;
        return a.Operator switch
        {
            "+" => Arg(0) + Arg(1),
            "-" => a.Arguments.Count == 1 ? -Arg(0) : Arg(0) - Arg(1),
            "*" => Arg(0) * Arg(1),
            "/" => Arg(0) / Arg(1),
            "^" => Math.Pow(Arg(0), Arg(1)),
            "exp" => Math.Exp(Arg(0)),
            "sin" => Math.Sin(Arg(0)),
            "cos" => Math.Cos(Arg(0)),
            "log" => Math.Log(Arg(0)),
            "abs" => Math.Abs(Arg(0)),
            "min" => Math.Min(Arg(0), Arg(1)),
            "max" => Math.Max(Arg(0), Arg(1)),
            "choose" => Arg(0) != 0 ? Arg(1) : Arg(2),
            "<" => Truth(Arg(0) < Arg(1)),
            "<=" => Truth(Arg(0) <= Arg(1)),
            ">" => Truth(Arg(0) > Arg(1)),
            ">=" => Truth(Arg(0) >= Arg(1)),
            "==" => Truth(Arg(0) == Arg(1)),
            "!=" => Truth(Arg(0) != Arg(1)),
            "and" => Truth(Arg(0) != 0 && Arg(1) != 0),
            "or" => Truth(Arg(0) != 0 || Arg(1) != 0),
            "not" => Truth(Arg(0) == 0),
            _ => throw new InvalidOperationException($"operator {a.Operator}"),
        };
    }

    /// <summary>
    /// The expression in the network language's syntax, printed by the language's one printer
    /// (<see cref="ExpressionText"/>), so an imported model reads exactly like one written by hand.
    /// </summary>
    public string ToCnet() => ExpressionText.Format(ToExpr(this));

    private static readonly SourcePosition Nowhere = new(0, 0);

    private static Expr ToExpr(SbmlMath m) => m switch
    {
        MathNumber n => new NumberExpr(n.Value, Nowhere),
        MathName n => new NameExpr(n.Name, Nowhere),
        MathTime => new NameExpr("time", Nowhere),
        MathApply a => a.Operator switch
        {
            "+" or "*" or "/" or "^" => new BinaryExpr(a.Operator[0], ToExpr(a.Arguments[0]), ToExpr(a.Arguments[1]), Nowhere),
            "-" when a.Arguments.Count == 1 => new NegateExpr(ToExpr(a.Arguments[0]), Nowhere),
            "-" => new BinaryExpr('-', ToExpr(a.Arguments[0]), ToExpr(a.Arguments[1]), Nowhere),
            "<" => Compare(Comparison.Less, a),
            "<=" => Compare(Comparison.LessOrEqual, a),
            ">" => Compare(Comparison.Greater, a),
            ">=" => Compare(Comparison.GreaterOrEqual, a),
            "==" => Compare(Comparison.Equal, a),
            "!=" => Compare(Comparison.NotEqual, a),
            "and" or "or" => new LogicExpr(a.Operator == "and", ToExpr(a.Arguments[0]), ToExpr(a.Arguments[1]), Nowhere),
            "not" => new NotExpr(ToExpr(a.Arguments[0]), Nowhere),
            _ => new CallExpr(a.Operator, a.Arguments.Select(ToExpr).ToArray(), Nowhere),
        },
        _ => throw new InvalidOperationException(m.GetType().Name),
    };

    private static CompareExpr Compare(Comparison op, MathApply a) => new(op, ToExpr(a.Arguments[0]), ToExpr(a.Arguments[1]), Nowhere);
}

/// <summary>A number.</summary>
internal sealed record MathNumber(double Value) : SbmlMath;

/// <summary>An identifier: an SBML id while reading, a network-language name after translation.</summary>
internal sealed record MathName(string Name) : SbmlMath;

/// <summary>SBML's simulation time (the <c>time</c> csymbol); only a timed event's trigger may use it.</summary>
internal sealed record MathTime : SbmlMath;

/// <summary>An operator or function applied to its arguments (binary operators have exactly two).</summary>
internal sealed record MathApply(string Operator, IReadOnlyList<SbmlMath> Arguments) : SbmlMath
{
    public bool Equals(MathApply? other) => other is not null && Operator == other.Operator && Arguments.SequenceEqual(other.Arguments);
    public override int GetHashCode() => HashCode.Combine(Operator, Arguments.Count);
}
