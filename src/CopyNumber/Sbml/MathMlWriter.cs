using CopyNumber.Kinetics;
using System.Xml.Linq;

namespace CopyNumber.Sbml;

/// <summary>
/// <see cref="SbmlMath"/> into MathML content markup as SBML L3V2 core uses it (section 3.4, Hucka et al.
/// 2019). Every node is written with exactly its arguments (products and sums stay binary), so
/// <see cref="MathMlReader"/> reads back the very same tree. SBML types its math: a comparison or logical
/// operator is Boolean, everything else a number. The language lets either stand for the other (true is 1,
/// a number holds when it is not 0), so a Boolean used as a number is written <c>piecewise(1, c, 0)</c>
/// and a number used as a condition <c>x ≠ 0</c>.
/// </summary>
internal static class MathMlWriter
{
    private static readonly XNamespace M = MathMlReader.MathMl;

    /// <summary>The URL of SBML's time symbol (L3V2 core section 3.4.6).</summary>
    public const string TimeSymbol = "http://www.sbml.org/sbml/symbols/time";

    /// <summary>A <c>&lt;math&gt;</c> element holding <paramref name="expression"/>, a number or (when <paramref name="condition"/>) a Boolean.</summary>
    public static XElement Math(SbmlMath expression, bool condition = false) => new(M + "math", Write(expression, condition));

    /// <summary>A number as SBML and the importer read it back exactly (shortest round-trip form).</summary>
    public static XElement Number(double value)
    {
        var text = ExpressionText.Format(value);
        var e = text.IndexOfAny(['E', 'e']);
        if (e < 0) return new XElement(M + "cn", text);
        // MathML's e-notation: mantissa <sep/> exponent (an exponent inside <cn> text is not MathML 2).
        return new XElement(M + "cn", new XAttribute("type", "e-notation"),
            text[..e], new XElement(M + "sep"), text[(e + 1)..].TrimStart('+'));
    }

    private static bool IsBoolean(SbmlMath m) => m is MathApply { Operator: "<" or "<=" or ">" or ">=" or "==" or "!=" or "and" or "or" or "not" };

    private static XElement Write(SbmlMath m, bool wantBoolean)
    {
        if (wantBoolean && !IsBoolean(m)) return Apply("neq", Write(m, false), Number(0));
        if (!wantBoolean && IsBoolean(m))
            return new XElement(M + "piecewise",
                new XElement(M + "piece", Number(1), Write(m, true)),
                new XElement(M + "otherwise", Number(0)));
        return m switch
        {
            MathNumber n => Number(n.Value),
            MathName n => new XElement(M + "ci", n.Name),
            MathTime => new XElement(M + "csymbol", new XAttribute("encoding", "text"), new XAttribute("definitionURL", TimeSymbol), "time"),
            MathApply a => WriteApply(a),
            _ => throw new InvalidOperationException(m.GetType().Name),
        };
    }

    private static XElement WriteApply(MathApply a)
    {
        XElement[] Numbers() => a.Arguments.Select(x => Write(x, false)).ToArray();
        XElement[] Conditions() => a.Arguments.Select(x => Write(x, true)).ToArray();
        return a.Operator switch
        {
            "+" => Apply("plus", Numbers()),
            "-" => Apply("minus", Numbers()),
            "*" => Apply("times", Numbers()),
            "/" => Apply("divide", Numbers()),
            "^" => Apply("power", Numbers()),
            "sqrt" => Apply("root", Numbers()),
            "exp" => Apply("exp", Numbers()),
            "sin" => Apply("sin", Numbers()),
            "cos" => Apply("cos", Numbers()),
            "log" => Apply("ln", Numbers()),
            "abs" => Apply("abs", Numbers()),
            "min" => Apply("min", Numbers()),
            "max" => Apply("max", Numbers()),
            "<" => Apply("lt", Numbers()),
            "<=" => Apply("leq", Numbers()),
            ">" => Apply("gt", Numbers()),
            ">=" => Apply("geq", Numbers()),
            "==" => Apply("eq", Numbers()),
            "!=" => Apply("neq", Numbers()),
            "and" => Apply("and", Conditions()),
            "or" => Apply("or", Conditions()),
            "not" => Apply("not", Conditions()),
            "choose" => new XElement(M + "piecewise",
                new XElement(M + "piece", Write(a.Arguments[1], false), Write(a.Arguments[0], true)),
                new XElement(M + "otherwise", Write(a.Arguments[2], false))),
            _ => throw new InvalidOperationException($"operator {a.Operator}"),
        };
    }

    private static XElement Apply(string op, params XElement[] arguments) => new(M + "apply", new XElement(M + op), arguments);
}
