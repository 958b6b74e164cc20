namespace CopyNumber.Language;

/// <summary>
/// The <c>cycle</c> section's lines, one setting each (our own syntax; docs/network-language.md, "cycle"):
/// <c>growth exponential|linear</c>, <c>length &lt;mean&gt; [gamma cv &lt;cv&gt;]</c>,
/// <c>genes &lt;species&gt;… double at &lt;phase&gt;</c> and <c>split binomial|halves</c>.
/// </summary>
internal static partial class ModelParser
{
    /// <summary>The growth laws of a cell's volume between divisions.</summary>
    public static readonly IReadOnlyList<string> GrowthLaws = ["exponential", "linear"];

    /// <summary>How molecules are shared between the two daughters at division.</summary>
    public static readonly IReadOnlyList<string> SplitRules = ["binomial", "halves"];

    private static readonly string CycleLineList = "'growth exponential', 'length 40', 'length 40 gamma cv 0.1', 'genes g double at 0.5' or 'split binomial'";

    private static void ParseCycleLine(LineParser line, CycleLines cycle)
    {
        var key = line.Peek();
        if (key.Kind != TokenKind.Identifier || key.Text is not ("growth" or "length" or "genes" or "split"))
        {
            line.FailAt(key, $"a cycle setting ({CycleLineList})");
            return;
        }
        if (cycle.Lines.TryGetValue(key.Text, out var earlier))
        {
            line.Fail(key.Position, $"the cycle's '{key.Text}' is set twice; the first is at line {earlier.Line}");
            return;
        }
        line.Next();
        switch (key.Text)
        {
            case "growth":
                if (Word(line, GrowthLaws, "growth") is not { } growth) return;
                cycle.Growth = growth;
                break;
            case "split":
                if (Word(line, SplitRules, "split") is not { } split) return;
                cycle.Split = split;
                break;
            case "length":
                if (line.ParseExpression("the cycle length") is not { } mean) return;
                Expr? cv = null;
                if (line.Peek().IsWord("gamma"))
                {
                    line.Next();
                    if (!line.Peek().IsWord("cv"))
                    {
                        line.Fail(line.Peek().Position, "expected 'cv' and the coefficient of variation after 'gamma', as in 'length 40 gamma cv 0.1'");
                        return;
                    }
                    line.Next();
                    if (line.ParseExpression("the cycle length's coefficient of variation") is not { } c) return;
                    cv = c.Expr;
                }
                if (!line.ExpectEnd("the cycle length (a fixed length, or 'gamma cv <cv>' after the mean)")) return;
                cycle.Length = (mean.Expr, cv);
                break;
            default:
                var genes = new List<(string, SourcePosition)>();
                while (line.Peek().Kind == TokenKind.Identifier && !line.Peek().IsWord("double"))
                {
                    var gene = line.Next();
                    genes.Add((gene.Text, gene.Position));
                }
                if (genes.Count == 0 || !line.Peek().IsWord("double") || !line.Peek(1).IsWord("at"))
                {
                    line.FailAt(line.Peek(), genes.Count == 0 ? "the gene species after 'genes', as in 'genes g double at 0.5'" : "'double at <phase>' after the gene species, as in 'genes g double at 0.5'");
                    return;
                }
                line.Next();
                line.Next();
                if (line.ParseExpression("the phase at which the genes double") is not { } phase) return;
                if (!line.ExpectEnd("the phase (a fraction of the cycle, 0 to below 1)")) return;
                cycle.Genes.AddRange(genes);
                cycle.GenePhase = phase.Expr;
                break;
        }
        cycle.Lines[key.Text] = key.Position;
    }

    private static string? Word(LineParser line, IReadOnlyList<string> allowed, string what)
    {
        var word = line.Peek();
        if (word.Kind != TokenKind.Identifier || !allowed.Contains(word.Text))
        {
            line.FailAt(word, $"{string.Join(" or ", allowed.Select(a => $"'{a}'"))} after '{what}'");
            return null;
        }
        line.Next();
        return line.ExpectEnd($"'{what} {word.Text}'") ? word.Text : null;
    }
}
