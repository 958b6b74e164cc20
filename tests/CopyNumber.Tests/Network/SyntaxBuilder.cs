using System.Globalization;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

/// <summary>
/// Builds a <see cref="ModelSyntax"/> by hand for compiler tests, without the model parser. Each
/// declaration is given its own line number (1, 2, 3, … in call order) so diagnostics can be located.
/// Expressions are read by a small test-only reader with conventional precedence: <c>+ -</c> below
/// <c>* /</c> below unary minus below <c>^</c> (right-associative), calls <c>f(a, b)</c>.
/// </summary>
internal sealed class SyntaxBuilder(double size = 1, string file = "test.cnet")
{
    private readonly List<SpeciesDecl> _species = [];
    private readonly List<ParameterDecl> _parameters = [];
    private readonly List<ReactionDecl> _reactions = [];
    private readonly List<ScheduleDecl> _schedule = [];
    private readonly List<ReadoutDecl> _readouts = [];
    private int _line;

    /// <summary>The line the last declaration was given.</summary>
    public int LastLine => _line;

    public SyntaxBuilder Species(string name, long initial)
    {
        _species.Add(new SpeciesDecl(name, initial, Next()));
        return this;
    }

    public SyntaxBuilder Parameter(string name, string value)
    {
        var at = Next();
        _parameters.Add(new ParameterDecl(name, Expression(value, at.Line), at));
        return this;
    }

    /// <summary>A mass-action reaction <c>equation</c> (<c>"2 A + B -> C"</c>, <c>"0 -> A"</c>) with constant k.</summary>
    public SyntaxBuilder Mass(string name, string equation, string k) => Reaction(name, equation, LawKind.Mass, k, null);

    /// <summary>A reaction with a written-out propensity.</summary>
    public SyntaxBuilder Rate(string name, string equation, string law) => Reaction(name, equation, LawKind.Rate, law, null);

    /// <summary>A reversible line <c>"A + B &lt;-&gt; C"</c> with forward and reverse constants.</summary>
    public SyntaxBuilder Reversible(string name, string equation, string forward, string reverse, LawKind law = LawKind.Mass) =>
        Reaction(name, equation, law, forward, reverse);

    public SyntaxBuilder At(string time, string target, ScheduleOperation operation, string value)
    {
        var at = Next();
        _schedule.Add(new ScheduleDecl(Expression(time, at.Line), target, at, operation, Expression(value, at.Line), at));
        return this;
    }

    public SyntaxBuilder Readout(string name, string value)
    {
        var at = Next();
        _readouts.Add(new ReadoutDecl(name, Expression(value, at.Line), at));
        return this;
    }

    public ModelSyntax Build() => new(file, size, _species.ToArray(), _parameters.ToArray(), _reactions.ToArray(),
        _schedule.ToArray(), _readouts.ToArray());

    /// <summary>Compiles the model and fails the test, showing every diagnostic, unless it compiles cleanly.</summary>
    public ReactionNetwork Compile(CompileOptions? options = null)
    {
        var outcome = NetworkCompiler.Compile(Build(), options);
        Assert.True(outcome.Network is not null, string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        Assert.Empty(outcome.Diagnostics);
        return outcome.Network!;
    }

    /// <summary>Compiles the model expecting it to fail; returns the diagnostics.</summary>
    public IReadOnlyList<Diagnostic> Failures(CompileOptions? options = null)
    {
        var outcome = NetworkCompiler.Compile(Build(), options);
        Assert.Null(outcome.Network);
        Assert.NotEmpty(outcome.Diagnostics);
        return outcome.Diagnostics;
    }

    private SyntaxBuilder Reaction(string name, string equation, LawKind law, string forward, string? reverse)
    {
        var at = Next();
        var reversible = equation.Contains("<->");
        var sides = equation.Split(reversible ? "<->" : "->");
        _reactions.Add(new ReactionDecl(name, at, Side(sides[0], at), Side(sides[1], at), reversible, law,
            Expression(forward, at.Line), reverse is null ? null : Expression(reverse, at.Line)));
        return this;
    }

    private static ReactionSide Side(string text, SourcePosition at)
    {
        text = text.Trim();
        if (text == "0") return new ReactionSide([], at);
        var terms = text.Split('+').Select(t =>
        {
            var parts = t.Trim().Split(' ', StringSplitOptions.RemoveEmptyEntries);
            return parts.Length == 1
                ? new SpeciesTerm(1, parts[0], at)
                : new SpeciesTerm(long.Parse(parts[0], CultureInfo.InvariantCulture), parts[1], at);
        });
        return new ReactionSide(terms.ToArray(), at);
    }

    private SourcePosition Next() => new(++_line, 1, 1);

    /// <summary>Reads an expression; every node is placed on <paramref name="line"/> at its column.</summary>
    public static Expr Expression(string text, int line = 1) => new Reader(text, line).ReadAll();

    private sealed class Reader(string text, int line)
    {
        private int _at;

        public Expr ReadAll()
        {
            var e = Sum();
            Skip();
            if (_at != text.Length) throw new FormatException($"unexpected '{text[_at]}' at {_at} in '{text}'");
            return e;
        }

        private SourcePosition Here => new(line, _at + 1, 1);

        private Expr Sum() => LeftGrouped(Product, '+', '-');

        private Expr Product() => LeftGrouped(Unary, '*', '/');

        private Expr LeftGrouped(Func<Expr> operand, char first, char second)
        {
            var e = operand();
            while (Peek() == first || Peek() == second)
            {
                var (op, at) = (text[_at], Here);
                _at++;
                e = new BinaryExpr(op, e, operand(), at);
            }
            return e;
        }

        private Expr Unary()
        {
            if (Peek() != '-') return Power();
            var at = Here;
            _at++;
            return new NegateExpr(Unary(), at);
        }

        private Expr Power()
        {
            var e = Atom();
            if (Peek() != '^') return e;
            var at = Here;
            _at++;
            return new BinaryExpr('^', e, Unary(), at);
        }

        private Expr Atom()
        {
            var c = Peek();
            var at = Here;
            if (c == '(')
            {
                _at++;
                var inner = Sum();
                Expect(')');
                return inner;
            }
            if (char.IsDigit(c) || c == '.')
            {
                var start = _at;
                while (_at < text.Length && (char.IsDigit(text[_at]) || text[_at] == '.')) _at++;
                if (_at < text.Length && text[_at] is 'e' or 'E')
                {
                    _at++;
                    if (text[_at] is '+' or '-') _at++;
                    while (_at < text.Length && char.IsDigit(text[_at])) _at++;
                }
                return new NumberExpr(double.Parse(text[start.._at], CultureInfo.InvariantCulture), at with { Length = _at - start });
            }
            if (char.IsLetter(c) || c == '_')
            {
                var start = _at;
                while (_at < text.Length && (char.IsLetterOrDigit(text[_at]) || text[_at] == '_')) _at++;
                var name = text[start.._at];
                if (Peek() != '(') return new NameExpr(name, at with { Length = name.Length });
                _at++;
                var arguments = new List<Expr>();
                if (Peek() != ')')
                    do arguments.Add(Sum());
                    while (TryTake(','));
                Expect(')');
                return new CallExpr(name, arguments, at);
            }
            throw new FormatException($"unexpected '{c}' at {_at} in '{text}'");
        }

        private void Skip()
        {
            while (_at < text.Length && text[_at] == ' ') _at++;
        }

        private char Peek()
        {
            Skip();
            return _at < text.Length ? text[_at] : '\0';
        }

        private bool TryTake(char c)
        {
            if (Peek() != c) return false;
            _at++;
            return true;
        }

        private void Expect(char c)
        {
            if (!TryTake(c)) throw new FormatException($"expected '{c}' at {_at} in '{text}'");
        }
    }
}
