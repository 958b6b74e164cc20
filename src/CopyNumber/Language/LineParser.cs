namespace CopyNumber.Language;

/// <summary>
/// Recursive-descent parsing of the pieces of one line: expressions, reaction sides, the law.
/// The first mistake of a line is kept in <see cref="Error"/> and every method then returns null,
/// so a line costs one pass over its tokens and yields at most one syntax diagnostic.
/// </summary>
/// <remarks>
/// Grammar of expressions, loosest first; <c>^</c> is right-associative and binds tighter than unary
/// minus, so <c>-x^2</c> is <c>-(x^2)</c> and <c>2^-1</c> is allowed:
/// <code>
/// condition   = conjunction { "or" conjunction }
/// conjunction = negation { "and" negation }
/// negation    = "not" negation | comparison
/// comparison  = sum [ ("&lt;" | "&lt;=" | "&gt;" | "&gt;=" | "==" | "!=") sum ]
/// sum     = product { ("+" | "-") product }
/// product = unary { ("*" | "/") unary }
/// unary   = "-" unary | power
/// power   = primary [ "^" unary ]
/// primary = number | name | name "(" [ condition { "," condition } ] ")" | "(" condition ")"
/// </code>
/// <c>and</c>, <c>or</c> and <c>not</c> are keywords only where they stand (after an operand; at the
/// start of an operand, followed by one), so they stay usable as names. A comparison does not chain:
/// <c>a &lt; b &lt; c</c> is reported.
/// </remarks>
internal sealed class LineParser
{
    /// <summary>Deepest nesting of parentheses, signs, powers and calls; keeps recursion far from the stack limit.</summary>
    public const int MaxNesting = 100;

    /// <summary>Most operations in one expression; keeps every later walk over the tree shallow.</summary>
    public const int MaxNodes = 1000;

    /// <summary>Largest stoichiometric coefficient accepted.</summary>
    public const long MaxCoefficient = 1_000_000;

    private readonly List<Token> _tokens;
    private int _next;
    private int _nesting;
    private int _nodes;

    /// <summary>Parses the tokens of one line (ending with <see cref="TokenKind.End"/>).</summary>
    /// <param name="tokens">The line's tokens.</param>
    /// <param name="text">The line's text, for suggestions that quote parts of it.</param>
    public LineParser(List<Token> tokens, string text = "")
    {
        _tokens = tokens;
        Text = text;
    }

    /// <summary>The line as written.</summary>
    public string Text { get; }

    /// <summary>The text from column <paramref name="from"/> up to (not including) column <paramref name="to"/>, trimmed.</summary>
    public string Slice(int from, int to) =>
        from >= 1 && to >= from && to - 1 <= Text.Length ? Text[(from - 1)..(to - 1)].Trim() : "";

    /// <summary>The text a span covers.</summary>
    public string Slice(SourcePosition span) => Slice(span.Column, span.Column + span.Length);

    /// <summary>The line's first mistake, if any.</summary>
    public (SourcePosition Position, string Message)? Error { get; private set; }

    /// <summary>The token <paramref name="ahead"/> places after the current one (the End token past the end).</summary>
    public Token Peek(int ahead = 0) => _tokens[Math.Min(_next + ahead, _tokens.Count - 1)];

    /// <summary>Consumes and returns the current token (End stays put).</summary>
    public Token Next()
    {
        var token = Peek();
        if (_next < _tokens.Count - 1) _next++;
        return token;
    }

    /// <summary>All tokens of the line.</summary>
    public IReadOnlyList<Token> Tokens => _tokens;

    /// <summary>Records <paramref name="message"/> at <paramref name="at"/> unless an earlier mistake is recorded; returns null for chaining.</summary>
    public T? Fail<T>(SourcePosition at, string message) where T : class
    {
        Error ??= (at, message);
        return null;
    }

    /// <summary>Records a mistake; returns false.</summary>
    public bool Fail(SourcePosition at, string message)
    {
        Error ??= (at, message);
        return false;
    }

    /// <summary>Reports the lexer's problem, a wrong arrow, or "expected … found …" for <paramref name="found"/>.</summary>
    public bool FailAt(Token found, string expected) => Fail(found.Position, Unexpected(found, expected));

    /// <summary>Consumes a token of <paramref name="kind"/> or records "expected <paramref name="expected"/>".</summary>
    public bool Expect(TokenKind kind, string expected)
    {
        if (Peek().Kind == kind) { Next(); return true; }
        return FailAt(Peek(), expected);
    }

    /// <summary>Requires the end of the line after <paramref name="after"/>.</summary>
    public bool ExpectEnd(string after)
    {
        var token = Peek();
        if (token.Kind == TokenKind.End) return true;
        return token.Kind switch
        {
            TokenKind.Invalid or TokenKind.BadArrow => FailAt(token, ""),
            TokenKind.RightParen => Fail(token.Position, "unmatched ')'"),
            TokenKind.Identifier or TokenKind.Number or TokenKind.LeftParen =>
                Fail(token.Position, $"unexpected {token.Describe()} after {after}; is an operator missing?"),
            _ => Fail(token.Position, $"unexpected {token.Describe()} after {after}"),
        };
    }

    /// <summary>The message for an unexpected token; the lexer's own message for invalid text.</summary>
    public static string Unexpected(Token found, string expected) => found.Kind switch
    {
        TokenKind.Invalid => found.Problem!,
        TokenKind.BadArrow => WrongArrow(found.Text),
        _ => $"expected {expected}, found {found.Describe()}",
    };

    /// <summary>Why <paramref name="text"/> is not an arrow.</summary>
    public static string WrongArrow(string text) => text.StartsWith('<') && !text.EndsWith('>')
        ? $"'{text}' is not an arrow: reactions read from left to right; swap the sides and write '->' (a reversible reaction adds 'back' and the reverse law after the forward one)"
        : $"'{text}' is not an arrow; write '->' (a reversible reaction adds 'back' and the reverse law after the forward one)";

    /// <summary>
    /// Parses an expression and returns it with the span of text it covers. <paramref name="what"/>
    /// names it in messages ("the rate law").
    /// </summary>
    public (Expr Expr, SourcePosition Span)? ParseExpression(string what)
    {
        _nodes = 0;
        var first = Peek();
        var expr = ParseCondition(what);
        if (expr is null) return null;
        var last = _tokens[Math.Max(0, _next - 1)].Position;
        var length = last.Column + last.Length - first.Position.Column;
        return (expr, first.Position with { Length = Math.Max(1, length) });
    }

    private Expr? ParseCondition(string what)
    {
        var left = ParseConjunction(what);
        while (left is not null && Peek().IsWord("or"))
        {
            var op = Next();
            var right = ParseConjunction(what);
            left = right is null ? null : Node(new LogicExpr(false, left, right, op.Position));
        }
        return left;
    }

    private Expr? ParseConjunction(string what)
    {
        var left = ParseNegation(what);
        while (left is not null && Peek().IsWord("and"))
        {
            var op = Next();
            var right = ParseNegation(what);
            left = right is null ? null : Node(new LogicExpr(true, left, right, op.Position));
        }
        return left;
    }

    private Expr? ParseNegation(string what)
    {
        if (!(Peek().IsWord("not") && StartsOperand(Peek(1))))
            return ParseComparison(what);
        var not = Next();
        if (!Enter(not)) return null;
        var operand = ParseNegation(what);
        _nesting--;
        return operand is null ? null : Node(new NotExpr(operand, not.Position));
    }

    // The words that may follow a complete expression (joining conditions, or starting a law's or change's
    // next part): after 'not' they mean 'not' was a name.
    private static readonly HashSet<string> FollowingWords = new(StringComparer.Ordinal) { "and", "or", "at", "every", "from", "until", "whenever", "back" };

    // Whether 'not' followed by this token is the negation rather than a name.
    private static bool StartsOperand(Token next) =>
        next.Kind is TokenKind.Number or TokenKind.LeftParen or TokenKind.Minus
        || (next.Kind == TokenKind.Identifier && !FollowingWords.Contains(next.Text));

    private Expr? ParseComparison(string what)
    {
        var left = ParseSum(what);
        if (left is null || ComparisonOf(Peek().Kind) is not { } comparison) return left;
        var op = Next();
        var right = ParseSum(what);
        if (right is null) return null;
        if (ComparisonOf(Peek().Kind) is not null)
            return Fail<Expr>(Peek().Position, $"comparisons do not chain: write 'a < b and b < c' instead of 'a < b < c'");
        return Node(new CompareExpr(comparison, left, right, op.Position));
    }

    private static Comparison? ComparisonOf(TokenKind kind) => kind switch
    {
        TokenKind.Less => Comparison.Less,
        TokenKind.LessEqual => Comparison.LessOrEqual,
        TokenKind.Greater => Comparison.Greater,
        TokenKind.GreaterEqual => Comparison.GreaterOrEqual,
        TokenKind.EqualEqual => Comparison.Equal,
        TokenKind.NotEqual => Comparison.NotEqual,
        _ => null,
    };

    private Expr? ParseSum(string what) => ParseChain(what, TokenKind.Plus, TokenKind.Minus, ParseProduct);

    private Expr? ParseProduct(string what) => ParseChain(what, TokenKind.Star, TokenKind.Slash, ParseUnary);

    // operand { (first | second) operand }, grouped to the left; a loop, not recursion, so long chains are cheap.
    private Expr? ParseChain(string what, TokenKind first, TokenKind second, Func<string, Expr?> operand)
    {
        var left = operand(what);
        while (left is not null && (Peek().Kind == first || Peek().Kind == second))
        {
            var op = Next();
            var right = operand(what);
            left = right is null ? null : Node(new BinaryExpr(op.Text[0], left, right, op.Position));
        }
        return left;
    }

    private Expr? ParseUnary(string what)
    {
        if (Peek().Kind != TokenKind.Minus) return ParsePower(what);
        var minus = Next();
        if (!Enter(minus)) return null;
        var operand = ParseUnary(what);
        _nesting--;
        return operand is null ? null : Node(new NegateExpr(operand, minus.Position));
    }

    private Expr? ParsePower(string what)
    {
        var baseExpr = ParsePrimary(what);
        if (baseExpr is null || Peek().Kind != TokenKind.Caret) return baseExpr;
        var caret = Next();
        if (!Enter(caret)) return null;
        var exponent = ParseUnary(what);
        _nesting--;
        return exponent is null ? null : Node(new BinaryExpr('^', baseExpr, exponent, caret.Position));
    }

    private Expr? ParsePrimary(string what)
    {
        var token = Peek();
        switch (token.Kind)
        {
            case TokenKind.Number:
                Next();
                return Node(new NumberExpr(token.Number, token.Position));
            case TokenKind.Identifier when token.Text == "not" && StartsOperand(Peek(1)):
                // 'not' binds looser than comparisons and arithmetic, so inside a sum or product it needs brackets
                return Fail<Expr>(token.Position, "'not' applies to a whole condition; inside arithmetic put it in parentheses, as in '(not A > 3)'");
            case TokenKind.Identifier when Peek(1).Kind == TokenKind.LeftParen:
                return ParseCall(what);
            case TokenKind.Identifier:
                Next();
                return Node(new NameExpr(token.Text, token.Position));
            case TokenKind.LeftParen:
            {
                Next();
                if (!Enter(token)) return null;
                var inner = ParseCondition(what);
                _nesting--;
                if (inner is null) return null;
                if (Peek().Kind != TokenKind.RightParen)
                    return Fail<Expr>(Peek().Position, $"missing ')' to close the '(' at column {token.Position.Column}, found {Peek().Describe()}");
                Next();
                return inner;
            }
            case TokenKind.End:
                return Fail<Expr>(token.Position, $"{what} is incomplete: expected a number, a name or '(' at the end of the line");
            default:
                return Fail<Expr>(token.Position, Unexpected(token, $"a number, a name or '(' in {what}"));
        }
    }

    private Expr? ParseCall(string what)
    {
        var name = Next();
        var open = Next();
        if (!Enter(open)) return null;
        var arguments = new List<Expr>();
        if (Peek().Kind != TokenKind.RightParen)
        {
            while (true)
            {
                var argument = ParseCondition(what);
                if (argument is null) { _nesting--; return null; }
                arguments.Add(argument);
                if (Peek().Kind != TokenKind.Comma) break;
                Next();
            }
        }
        _nesting--;
        if (Peek().Kind != TokenKind.RightParen)
            return Fail<Expr>(Peek().Position, $"missing ')' to close the call of '{name.Text}', found {Peek().Describe()}");
        Next();
        return Node(new CallExpr(name.Text, arguments, name.Position));
    }

    private bool Enter(Token at)
    {
        if (++_nesting <= MaxNesting) return true;
        _nesting--;
        return Fail(at.Position, $"expression nested too deeply (more than {MaxNesting} levels of parentheses, signs or powers)");
    }

    private Expr? Node(Expr node)
    {
        if (++_nodes <= MaxNodes) return node;
        return Fail<Expr>(node.Position, $"expression too long (more than {MaxNodes} numbers, names and operations)");
    }

    /// <summary>
    /// Parses a reaction side: <c>0</c>, or <c>[n] species</c> terms joined by <c>+</c>. The same species
    /// twice on a side is merged into one term (coefficients added, first position kept). A term's
    /// position is that of its species name.
    /// </summary>
    /// <param name="role">"reactants" or "products", for messages.</param>
    public ReactionSide? ParseSide(string role)
    {
        var first = Peek();
        // "0 mass k": the empty side, then the law; "0 A" is a zero coefficient, reported below.
        if (first.Kind == TokenKind.Number && first.Text == "0" && (Peek(1).Kind != TokenKind.Identifier || Peek(1).IsWord("mass") || Peek(1).IsWord("rate")))
        {
            Next();
            if (Peek().Kind == TokenKind.Plus)
                return Fail<ReactionSide>(first.Position, "'0' is the empty side and cannot be combined with species; leave it out");
            return new ReactionSide([], first.Position);
        }
        if (first.Kind is TokenKind.Arrow or TokenKind.BothArrow)
            return Fail<ReactionSide>(first.Position, $"missing {role} before {first.Describe()}; write '0' for nothing");
        if (first.Kind == TokenKind.End)
            return Fail<ReactionSide>(first.Position, $"missing {role}; write '0' for nothing");

        var terms = new List<SpeciesTerm>();
        var indexOf = new Dictionary<string, int>(StringComparer.Ordinal);
        while (true)
        {
            var term = ParseTerm(role);
            if (term is null) return null;
            if (indexOf.TryGetValue(term.Species, out var earlier))
            {
                if (term.BurstMean is not null || terms[earlier].BurstMean is not null)
                    return Fail<ReactionSide>(term.Position, $"'{term.Species}' stands twice in the {role} and once in a burst; a burst's species stands alone on its side");
                var merged = terms[earlier].Coefficient + term.Coefficient;
                if (merged > MaxCoefficient)
                    return Fail<ReactionSide>(term.Position, $"stoichiometric coefficient of '{term.Species}' is larger than {MaxCoefficient}");
                terms[earlier] = terms[earlier] with { Coefficient = merged };
            }
            else
            {
                indexOf[term.Species] = terms.Count;
                terms.Add(term);
            }
            if (Peek().Kind != TokenKind.Plus) break;
            Next();
        }
        return new ReactionSide(terms, first.Position);
    }

    private SpeciesTerm? ParseTerm(string role)
    {
        var start = Peek();
        if (start.IsWord(BurstWord) && Peek(1).Kind == TokenKind.LeftParen) return ParseBurst(role);
        long coefficient = 1;
        if (start.Kind == TokenKind.Number)
        {
            Next();
            if (start.Number != Math.Floor(start.Number) || start.Number < 1)
                return Fail<SpeciesTerm>(start.Position, $"stoichiometric coefficient must be a positive integer, found '{start.Text}'");
            if (start.Number > MaxCoefficient)
                return Fail<SpeciesTerm>(start.Position, $"stoichiometric coefficient '{start.Text}' is larger than {MaxCoefficient}");
            coefficient = (long)start.Number;
            if (Peek().Kind != TokenKind.Identifier)
                return Fail<SpeciesTerm>(Peek().Position, Unexpected(Peek(), $"a species after the coefficient '{start.Text}'"));
        }
        var name = Peek();
        if (name.Kind != TokenKind.Identifier)
            return Fail<SpeciesTerm>(name.Position, Unexpected(name, $"a species in the {role}"));
        Next();
        return new SpeciesTerm(coefficient, name.Text, name.Position);
    }

    /// <summary>The word that opens a burst term, <c>burst(b) species</c>; a keyword only when followed by '('.</summary>
    public const string BurstWord = "burst";

    // burst ( mean ) species: products only, no coefficient.
    private SpeciesTerm? ParseBurst(string role)
    {
        var start = Next();
        if (role != "products")
            return Fail<SpeciesTerm>(start.Position, "a burst makes products: write it after the arrow, as in '0 -> burst(b) mrna'");
        Next(); // '('
        var mean = ParseExpression("the mean burst size");
        if (mean is null) return null;
        if (Peek().Kind != TokenKind.RightParen)
            return Fail<SpeciesTerm>(Peek().Position, Unexpected(Peek(), "')' after the mean burst size"));
        Next();
        var name = Peek();
        if (name.Kind != TokenKind.Identifier)
            return Fail<SpeciesTerm>(name.Position, Unexpected(name, "a species after 'burst(...)'"));
        Next();
        return new SpeciesTerm(1, name.Text, name.Position, mean.Value.Expr);
    }
}
