using CopyNumber.Language;

namespace CopyNumber.Kinetics;

/// <summary>
/// Expressions as shared graphs. Symbolic derivatives and inlined readouts reuse subexpressions by
/// reference instead of copying them, so an expression can be a directed acyclic graph whose tree form is
/// exponentially larger than the graph (a derivative of nested Hill functions refers to each inner
/// function and its derivative several times). Everything that walks such an expression visits each
/// node once, by reference: never by the records' structural equality, which would walk the tree form.
/// </summary>
public static class ExpressionGraph
{
    /// <summary>The operands of a node, left to right; none for numbers and names.</summary>
    public static IReadOnlyList<Expr> Children(Expr expression) => expression switch
    {
        NegateExpr negate => [negate.Operand],
        BinaryExpr binary => [binary.Left, binary.Right],
        CallExpr call => call.Arguments,
        CompareExpr compare => [compare.Left, compare.Right],
        LogicExpr logic => [logic.Left, logic.Right],
        NotExpr not => [not.Operand],
        _ => [],
    };

    /// <summary>
    /// Every distinct node (by reference) reachable from <paramref name="expression"/>, each after its
    /// operands (post-order), so a consumer may rely on having seen a node's operands first.
    /// </summary>
    public static IReadOnlyList<Expr> Nodes(Expr expression)
    {
        var order = new List<Expr>();
        var seen = new HashSet<Expr>(ReferenceEqualityComparer.Instance);
        // An explicit stack: nesting depth is not bounded by the language, the thread's stack is.
        var stack = new Stack<(Expr Node, int Next)>();
        if (seen.Add(expression)) stack.Push((expression, 0));
        while (stack.Count > 0)
        {
            var (node, next) = stack.Pop();
            var children = Children(node);
            if (next < children.Count)
            {
                stack.Push((node, next + 1));
                if (seen.Add(children[next])) stack.Push((children[next], 0));
                continue;
            }
            order.Add(node);
        }
        return order;
    }

    /// <summary>The number of distinct nodes of <paramref name="expression"/>: its size as a graph.</summary>
    public static int NodeCount(Expr expression) => Nodes(expression).Count;

    /// <summary>
    /// For each node, how many distinct parent nodes refer to it (a node used twice by one parent, as in
    /// <c>u * u</c>, counts twice). Nodes counted 2 or more are the shared ones a compiler emits once.
    /// </summary>
    public static Dictionary<Expr, int> UseCounts(Expr expression)
    {
        var uses = new Dictionary<Expr, int>(ReferenceEqualityComparer.Instance);
        foreach (var node in Nodes(expression))
        {
            uses.TryAdd(node, 0);
            foreach (var child in Children(node)) uses[child] = uses.GetValueOrDefault(child) + 1;
        }
        return uses;
    }

    /// <summary>The distinct names an expression uses (each name once, in no particular order).</summary>
    public static IEnumerable<string> NamesUsed(Expr expression) =>
        Nodes(expression).OfType<NameExpr>().Select(n => n.Name).Distinct();
}
