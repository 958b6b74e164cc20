namespace CopyNumber.Language;

/// <summary>The kinds of token a model line is made of.</summary>
internal enum TokenKind
{
    /// <summary>A name <c>[A-Za-z_][A-Za-z0-9_]*</c>; keywords are names recognised by position.</summary>
    Identifier,
    /// <summary>A well-formed numeric literal.</summary>
    Number,
    Plus,
    Minus,
    Star,
    Slash,
    Caret,
    LeftParen,
    RightParen,
    Comma,
    Colon,
    Equals,
    PlusEquals,
    MinusEquals,
    /// <summary><c>-&gt;</c></summary>
    Arrow,
    /// <summary><c>&lt;-&gt;</c></summary>
    BothArrow,
    /// <summary>A run of <c>&lt; - = &gt;</c> that looks like an arrow but is none, e.g. <c>=&gt;</c> or <c>--&gt;</c>.</summary>
    BadArrow,
    /// <summary><c>&lt;</c></summary>
    Less,
    /// <summary><c>&lt;=</c></summary>
    LessEqual,
    /// <summary><c>&gt;</c></summary>
    Greater,
    /// <summary><c>&gt;=</c></summary>
    GreaterEqual,
    /// <summary><c>==</c></summary>
    EqualEqual,
    /// <summary><c>!=</c></summary>
    NotEqual,
    /// <summary>Text the lexer could not read; <see cref="Token.Problem"/> says why.</summary>
    Invalid,
    /// <summary>The end of the line (or the start of its comment).</summary>
    End,
}

/// <summary>One token of a line.</summary>
/// <param name="Kind">What it is.</param>
/// <param name="Text">The characters as written.</param>
/// <param name="Position">Where it stands; the length is the text's length.</param>
/// <param name="Number">The value of a <see cref="TokenKind.Number"/> token.</param>
/// <param name="Problem">For an <see cref="TokenKind.Invalid"/> token, the message to report.</param>
internal readonly record struct Token(TokenKind Kind, string Text, SourcePosition Position, double Number = 0, string? Problem = null)
{
    /// <summary>The token as a user would quote it in a message.</summary>
    public string Describe() => Kind switch
    {
        TokenKind.End => "the end of the line",
        _ => $"'{Text}'",
    };

    /// <summary>True for an identifier spelled exactly <paramref name="word"/>.</summary>
    public bool IsWord(string word) => Kind == TokenKind.Identifier && Text == word;
}
