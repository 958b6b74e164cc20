using System.Globalization;
using System.Xml.Linq;

namespace CopyNumber.Sbml;

/// <summary>
/// MathML content markup (the subset SBML uses, SBML L3V2 core specification section 3.4, Hucka et al. 2019)
/// into <see cref="SbmlMath"/>. Function definitions are inlined at their call; anything the network language
/// cannot say (trigonometry, floor, delay, rateOf, …) is refused with the element it stands in.
/// </summary>
internal sealed class MathMlReader(IReadOnlyDictionary<string, (IReadOnlyList<string> Parameters, SbmlMath Body)> functions, double avogadro)
{
    public static readonly XNamespace MathMl = "http://www.w3.org/1998/Math/MathML";

    /// <summary>Reads the single expression inside a <c>&lt;math&gt;</c> element.</summary>
    public SbmlMath ReadMath(XElement math)
    {
        var content = math.Elements().Where(e => e.Name.LocalName is not "annotation" and not "semantics").ToList();
        var semantics = math.Elements().FirstOrDefault(e => e.Name.LocalName == "semantics");
        if (semantics is not null) content = [semantics.Elements().First()];
        if (content.Count != 1) throw new SbmlRefusal(math, "a <math> element must hold exactly one expression");
        return Read(content[0]);
    }

    public SbmlMath Read(XElement e)
    {
        switch (e.Name.LocalName)
        {
            case "cn": return new MathNumber(ReadNumber(e));
            case "ci": return new MathName(e.Value.Trim());
            case "csymbol": return ReadSymbol(e, []);
            case "true": return new MathNumber(1);
            case "false": return new MathNumber(0);
            case "pi": return new MathNumber(Math.PI);
            case "exponentiale": return new MathNumber(Math.E);
            case "apply": return ReadApply(e);
            case "piecewise": return ReadPiecewise(e);
            case "semantics": return Read(e.Elements().First());
            case "infinity" or "notanumber":
                throw new SbmlRefusal(e, $"<{e.Name.LocalName}/> has no written form in the network language");
            default:
                throw new SbmlRefusal(e, $"the MathML element <{e.Name.LocalName}> is not supported by the importer");
        }
    }

    private static double ReadNumber(XElement e)
    {
        var type = (string?)e.Attribute("type") ?? "real";
        var parts = e.Nodes().OfType<XText>().Select(t => t.Value.Trim()).Where(t => t.Length > 0).ToList();
        double Part(int i) => i < parts.Count && double.TryParse(parts[i], NumberStyles.Float, CultureInfo.InvariantCulture, out var v)
            ? v : throw new SbmlRefusal(e, $"malformed number '{e.Value.Trim()}' in <cn>");
        var value = type switch
        {
            "integer" or "real" or "double" => Part(0),
            // Parsed as one decimal number, so mantissa·10^exponent is the nearest double, not a product's round-off.
            "e-notation" => parts.Count == 2 && double.TryParse($"{parts[0]}e{parts[1]}", NumberStyles.Float, CultureInfo.InvariantCulture, out var v)
                ? v : throw new SbmlRefusal(e, $"malformed number '{e.Value.Trim()}' in <cn>"),
            "rational" => Part(0) / Part(1),
            _ => throw new SbmlRefusal(e, $"<cn type=\"{type}\"> is not a number type of SBML"),
        };
        if (!double.IsFinite(value)) throw new SbmlRefusal(e, $"the number '{e.Value.Trim()}' is not finite; the network language has no infinite numbers");
        return value;
    }

    private SbmlMath ReadSymbol(XElement e, IReadOnlyList<SbmlMath> arguments)
    {
        var url = ((string?)e.Attribute("definitionURL") ?? "").Trim();
        if (url.EndsWith("/time", StringComparison.Ordinal)) return new MathTime();
        if (url.EndsWith("/avogadro", StringComparison.Ordinal)) return new MathNumber(avogadro);
        var what = url.EndsWith("/delay", StringComparison.Ordinal) ? "delay" : url.EndsWith("/rateOf", StringComparison.Ordinal) ? "rateOf" : url;
        throw new SbmlRefusal(e, $"the csymbol '{what}' is not supported: the network language has no {(what == "delay" ? "delayed values" : what == "rateOf" ? "rates of change in expressions" : "such symbol")}");
    }

    private SbmlMath ReadPiecewise(XElement e)
    {
        var pieces = e.Elements().Where(x => x.Name.LocalName == "piece").ToList();
        var otherwise = e.Elements().FirstOrDefault(x => x.Name.LocalName == "otherwise");
        if (otherwise is null)
            throw new SbmlRefusal(e, "a <piecewise> without <otherwise> is undefined where no piece applies; the importer will not guess a value there");
        var result = Read(otherwise.Elements().Single());
        for (var i = pieces.Count - 1; i >= 0; i--)
        {
            var parts = pieces[i].Elements().ToList();
            if (parts.Count != 2) throw new SbmlRefusal(pieces[i], "a <piece> holds a value and a condition");
            result = SbmlMath.Apply("choose", Read(parts[1]), Read(parts[0]), result);
        }
        return result;
    }

    private SbmlMath ReadApply(XElement e)
    {
        var children = e.Elements().ToList();
        if (children.Count == 0) throw new SbmlRefusal(e, "an empty <apply>");
        var head = children[0];
        var qualifiers = children.Skip(1).Where(c => c.Name.LocalName is "degree" or "logbase").ToList();
        var args = children.Skip(1).Where(c => c.Name.LocalName is not "degree" and not "logbase").Select(Read).ToList();
        var name = head.Name.LocalName;
        if (name == "ci") return Call(head, head.Value.Trim(), args);
        if (name == "csymbol") return ReadSymbol(head, args);

        SbmlMath Need(int count)
        {
            if (args.Count != count) throw new SbmlRefusal(e, $"<{name}> takes {count} argument{(count == 1 ? "" : "s")}, given {args.Count}");
            return args[0];
        }
        SbmlMath Fold(string op, SbmlMath empty) => args.Count == 0 ? empty : args.Skip(1).Aggregate(args[0], (a, b) => SbmlMath.Apply(op, a, b));
        SbmlMath Pairwise(string op)
        {
            if (args.Count < 2) throw new SbmlRefusal(e, $"<{name}> compares at least two arguments");
            var all = Enumerable.Range(0, args.Count - 1).Select(i => SbmlMath.Apply(op, args[i], args[i + 1])).ToList();
            return all.Skip(1).Aggregate(all[0], (a, b) => SbmlMath.Apply("and", a, b));
        }
        SbmlMath Qualifier(string which, double absent)
        {
            var q = qualifiers.FirstOrDefault(x => x.Name.LocalName == which);
            return q is null ? new MathNumber(absent) : Read(q.Elements().Single());
        }

        switch (name)
        {
            case "plus": return Fold("+", new MathNumber(0));
            case "times": return Fold("*", new MathNumber(1));
            case "minus":
                if (args.Count == 1) return SbmlMath.Apply("-", args[0]);
                Need(2);
                return SbmlMath.Apply("-", args[0], args[1]);
            case "divide": Need(2); return SbmlMath.Apply("/", args[0], args[1]);
            case "power": Need(2); return SbmlMath.Apply("^", args[0], args[1]);
            case "root":
                Need(1);
                var degree = Qualifier("degree", 2);
                return SbmlMath.Apply("^", args[0], SbmlMath.Apply("/", new MathNumber(1), degree));
            case "exp": return SbmlMath.Apply("exp", Need(1));
            case "sin": return SbmlMath.Apply("sin", Need(1));
            case "cos": return SbmlMath.Apply("cos", Need(1));
            case "ln": return SbmlMath.Apply("log", Need(1));
            case "log":
                Need(1);
                return SbmlMath.Apply("/", SbmlMath.Apply("log", args[0]), SbmlMath.Apply("log", Qualifier("logbase", 10)));
            case "abs": return SbmlMath.Apply("abs", Need(1));
            case "max": return Fold("max", new MathNumber(0));
            case "min": return Fold("min", new MathNumber(0));
            case "eq": return Pairwise("==");
            case "neq": Need(2); return SbmlMath.Apply("!=", args[0], args[1]);
            case "gt": return Pairwise(">");
            case "lt": return Pairwise("<");
            case "geq": return Pairwise(">=");
            case "leq": return Pairwise("<=");
            case "and": return Fold("and", new MathNumber(1));
            case "or": return Fold("or", new MathNumber(0));
            case "xor":
                return args.Count == 0 ? new MathNumber(0)
                    : args.Skip(1).Aggregate(Truth(args[0]), (a, b) => SbmlMath.Apply("!=", a, Truth(b)));
            case "not": return SbmlMath.Apply("not", Need(1));
            case "implies": Need(2); return SbmlMath.Apply("or", SbmlMath.Apply("not", args[0]), args[1]);
            default:
                throw new SbmlRefusal(head, $"the MathML operator <{name}> is not supported: the network language has no {name}");
        }
    }

    private static SbmlMath Truth(SbmlMath x) => SbmlMath.Apply("!=", x, new MathNumber(0));

    /// <summary>A call of a function definition, inlined: the body with each parameter replaced by its argument.</summary>
    private SbmlMath Call(XElement head, string function, IReadOnlyList<SbmlMath> args)
    {
        if (!functions.TryGetValue(function, out var definition))
            throw new SbmlRefusal(head, $"'{function}' is called as a function but no function definition has that id");
        if (definition.Parameters.Count != args.Count)
            throw new SbmlRefusal(head, $"function '{function}' takes {definition.Parameters.Count} arguments, given {args.Count}");
        var binding = definition.Parameters.Zip(args).ToDictionary(p => p.First, p => p.Second);
        return definition.Body.Substitute(n => n is MathName name && binding.TryGetValue(name.Name, out var arg) ? arg : null);
    }

    /// <summary>Reads a function definition's lambda: its bound variables and its body (calls to earlier definitions inlined).</summary>
    public (IReadOnlyList<string> Parameters, SbmlMath Body) ReadLambda(XElement math)
    {
        var lambda = math.Descendants().FirstOrDefault(x => x.Name.LocalName == "lambda")
            ?? throw new SbmlRefusal(math, "a function definition's <math> must hold a <lambda>");
        var parameters = lambda.Elements().Where(x => x.Name.LocalName == "bvar").Select(b => b.Elements().First().Value.Trim()).ToList();
        var body = lambda.Elements().Where(x => x.Name.LocalName != "bvar").ToList();
        if (body.Count != 1) throw new SbmlRefusal(lambda, "a <lambda> must have exactly one body");
        return (parameters, Read(body[0]));
    }
}
