using System.Globalization;
using System.Text;

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

    /// <summary>The expression in the network language's syntax, with the fewest parentheses its grammar needs.</summary>
    public string ToCnet()
    {
        var text = new StringBuilder();
        Print(this, 0, text);
        return text.ToString();
    }

    // Binding strength of the language's operators, loosest first (docs/network-language.md, Expressions).
    private const int Or = 1, And = 2, Not = 3, Compare = 4, Sum = 5, Product = 6, Negation = 7, Power = 8, Primary = 9;

    private static int Strength(SbmlMath m) => m switch
    {
        MathNumber n => n.Value < 0 || double.IsNegative(n.Value) && n.Value == 0 ? Negation : Primary,
        MathApply a => a.Operator switch
        {
            "or" => Or,
            "and" => And,
            "not" => Not,
            "<" or "<=" or ">" or ">=" or "==" or "!=" => Compare,
            "+" => Sum,
            "-" => a.Arguments.Count == 1 ? Negation : Sum,
            "*" or "/" => Product,
            "^" => Power,
            _ => Primary,
        },
        _ => Primary,
    };

    private static void Print(SbmlMath m, int needed, StringBuilder text)
    {
        var strength = Strength(m);
        var wrap = strength < needed;
        if (wrap) text.Append('(');
        switch (m)
        {
            case MathNumber n:
                text.Append(FormatNumber(n.Value));
                break;
            case MathName n:
                text.Append(n.Name);
                break;
            case MathTime:
                text.Append("time");
                break;
            case MathApply a when strength == Primary:
                text.Append(a.Operator).Append('(');
                for (var i = 0; i < a.Arguments.Count; i++)
                {
                    if (i > 0) text.Append(", ");
                    Print(a.Arguments[i], 0, text);
                }
                text.Append(')');
                break;
            case MathApply a when a.Operator == "not":
                text.Append("not ");
                Print(a.Arguments[0], Not, text);
                break;
            case MathApply a when a.Operator == "-" && a.Arguments.Count == 1:
                text.Append('-');
                Print(a.Arguments[0], Negation, text);
                break;
            case MathApply a when a.Operator == "^":
                Print(a.Arguments[0], Primary, text);
                text.Append('^');
                Print(a.Arguments[1], Negation, text);
                break;
            case MathApply a when strength == Compare:
                Print(a.Arguments[0], Sum, text);
                text.Append(' ').Append(a.Operator).Append(' ');
                Print(a.Arguments[1], Sum, text);
                break;
            case MathApply a:
                // Left-associative binary operators: the right operand binds one step tighter.
                Print(a.Arguments[0], strength, text);
                text.Append(' ').Append(a.Operator).Append(' ');
                Print(a.Arguments[1], strength + 1, text);
                break;
        }
        if (wrap) text.Append(')');
    }

    /// <summary>A number as the language reads it back exactly (shortest round-trip form); negative ones with a leading '-'.</summary>
    public static string FormatNumber(double value)
    {
        var text = value.ToString("R", CultureInfo.InvariantCulture);
        return text.Contains('E') && !text.Contains("E-") && !text.Contains("E+") ? text.Replace("E", "E+") : text;
    }
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
