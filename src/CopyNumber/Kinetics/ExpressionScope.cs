using CopyNumber.Language;

namespace CopyNumber.Kinetics;

/// <summary>
/// What the names of a model's expressions mean: species and parameters by index, the system size Ω as
/// a constant, and readouts as their own expressions (inlined wherever they are used). A compile-time
/// object: it caches expanded readouts and is not for concurrent use.
/// </summary>
public sealed class ExpressionScope
{
    /// <summary>The reserved name of the system size Ω.</summary>
    public const string SizeName = "size";

    /// <summary>The reserved name of the model time t, which only rate laws may read.</summary>
    public const string TimeName = "time";

    private readonly Dictionary<string, int> _species;
    private readonly Dictionary<string, int> _parameters;
    private readonly Dictionary<string, Expr> _readouts;
    private readonly Dictionary<string, Expr> _expandedReadouts = new();

    /// <summary>Creates a scope.</summary>
    /// <param name="species">Species names; a species' index is its position here.</param>
    /// <param name="parameters">Parameter names; a parameter's index is its position here.</param>
    /// <param name="size">The value <c>size</c> stands for (Ω, dimensionless).</param>
    /// <param name="readouts">Readout names and their expressions, or null for none.</param>
    public ExpressionScope(IReadOnlyList<string> species, IReadOnlyList<string> parameters, double size,
        IReadOnlyDictionary<string, Expr>? readouts = null)
    {
        _species = Indexed(species);
        _parameters = Indexed(parameters);
        _readouts = readouts?.ToDictionary() ?? new Dictionary<string, Expr>();
        Size = size;
        TimeSlot = parameters.Count;
    }

    /// <summary>The value of <c>size</c>.</summary>
    public double Size { get; }

    /// <summary>
    /// Where compiled laws read <c>time</c>: the parameter array's slot after the declared parameters
    /// (<see cref="Network.ReactionNetwork.TimeSlot"/>), which whoever evaluates a law that reads time sets first.
    /// </summary>
    public int TimeSlot { get; }

    /// <summary>The index of a species, or −1.</summary>
    public int SpeciesIndex(string name) => _species.GetValueOrDefault(name, -1);

    /// <summary>The index of a parameter, or −1.</summary>
    public int ParameterIndex(string name) => _parameters.GetValueOrDefault(name, -1);

    /// <summary>
    /// The expression with every readout name replaced by the readout's own (expanded) expression.
    /// Subtrees without readouts are shared with the input.
    /// </summary>
    /// <exception cref="ModelException">A readout refers to itself, directly or through others.</exception>
    public Expr Expand(Expr expression) =>
        ExpandWithin(expression, new HashSet<string>(), new Dictionary<Expr, Expr>(ReferenceEqualityComparer.Instance));

    /// <summary>The species an expression reads (readouts expanded), in increasing index order.</summary>
    public IReadOnlyList<int> SpeciesRead(Expr expression) =>
        ExpressionGraph.NamesUsed(Expand(expression)).Select(SpeciesIndex).Where(i => i >= 0).Order().ToArray();

    /// <summary>Every name occurrence in an expression, left to right, readouts not expanded.</summary>
    public static IEnumerable<NameExpr> Names(Expr expression)
    {
        switch (expression)
        {
            case NameExpr name:
                yield return name;
                break;
            case NegateExpr negate:
                foreach (var n in Names(negate.Operand)) yield return n;
                break;
            case BinaryExpr binary:
                foreach (var n in Names(binary.Left)) yield return n;
                foreach (var n in Names(binary.Right)) yield return n;
                break;
            default:
                foreach (var n in ExpressionGraph.Children(expression).SelectMany(Names)) yield return n;
                break;
        }
    }

    // Each node is expanded once (memo, by reference): an expression may be a shared graph
    // (ExpressionGraph), whose tree form is far larger.
    private Expr ExpandWithin(Expr expression, HashSet<string> expanding, Dictionary<Expr, Expr> done)
    {
        if (done.TryGetValue(expression, out var known)) return known;
        Expr expanded;
        switch (expression)
        {
            case NameExpr name when _readouts.TryGetValue(name.Name, out var definition):
            {
                if (_expandedReadouts.TryGetValue(name.Name, out var readout)) return readout;
                if (!expanding.Add(name.Name))
                    throw new ModelException(name.Position, $"readout '{name.Name}' is defined in terms of itself");
                expanded = ExpandWithin(definition, expanding, done);
                expanding.Remove(name.Name);
                _expandedReadouts[name.Name] = expanded;
                return expanded;
            }
            case NegateExpr negate:
            {
                var operand = ExpandWithin(negate.Operand, expanding, done);
                expanded = ReferenceEquals(operand, negate.Operand) ? negate : negate with { Operand = operand };
                break;
            }
            case BinaryExpr binary:
            {
                var left = ExpandWithin(binary.Left, expanding, done);
                var right = ExpandWithin(binary.Right, expanding, done);
                expanded = ReferenceEquals(left, binary.Left) && ReferenceEquals(right, binary.Right)
                    ? binary : binary with { Left = left, Right = right };
                break;
            }
            case CallExpr call:
            {
                var arguments = call.Arguments.Select(a => ExpandWithin(a, expanding, done)).ToArray();
                expanded = arguments.Zip(call.Arguments).All(p => ReferenceEquals(p.First, p.Second))
                    ? call : call with { Arguments = arguments };
                break;
            }
            case CompareExpr compare:
            {
                var left = ExpandWithin(compare.Left, expanding, done);
                var right = ExpandWithin(compare.Right, expanding, done);
                expanded = ReferenceEquals(left, compare.Left) && ReferenceEquals(right, compare.Right)
                    ? compare : compare with { Left = left, Right = right };
                break;
            }
            case LogicExpr logic:
            {
                var left = ExpandWithin(logic.Left, expanding, done);
                var right = ExpandWithin(logic.Right, expanding, done);
                expanded = ReferenceEquals(left, logic.Left) && ReferenceEquals(right, logic.Right)
                    ? logic : logic with { Left = left, Right = right };
                break;
            }
            case NotExpr not:
            {
                var operand = ExpandWithin(not.Operand, expanding, done);
                expanded = ReferenceEquals(operand, not.Operand) ? not : not with { Operand = operand };
                break;
            }
            default:
                return expression;
        }
        done[expression] = expanded;
        return expanded;
    }

    private static Dictionary<string, int> Indexed(IReadOnlyList<string> names)
    {
        var map = new Dictionary<string, int>(names.Count);
        for (var i = 0; i < names.Count; i++) map.TryAdd(names[i], i);
        return map;
    }
}
