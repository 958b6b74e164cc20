using System.Globalization;

namespace CopyNumber.Language;

/// <summary>
/// Splits one model line into tokens. The language is line-oriented, so the lexer never looks past a
/// line break; every character is visited a bounded number of times (no backtracking), which keeps
/// the whole front end linear in the file length. Problems become <see cref="TokenKind.Invalid"/>
/// tokens, so the parser reports the leftmost mistake of a line.
/// </summary>
internal static class Lexer
{
    /// <summary>Tokens of <paramref name="line"/> (line number <paramref name="lineNumber"/>), ending with an <see cref="TokenKind.End"/> token.</summary>
    public static List<Token> Tokenize(string line, int lineNumber)
    {
        var tokens = new List<Token>();
        var i = 0;
        while (i < line.Length)
        {
            var c = line[i];
            if (c == '#') break;
            if (c is ' ' or '\t' or '\f' or '\v' or '\u00A0' or '\uFEFF') { i++; continue; }
            var start = i;
            if (IsNameStart(c))
            {
                while (i < line.Length && IsNamePart(line[i])) i++;
                tokens.Add(Make(TokenKind.Identifier, line, start, i, lineNumber));
            }
            else if (char.IsAsciiDigit(c) || (c == '.' && i + 1 < line.Length && char.IsAsciiDigit(line[i + 1])))
            {
                tokens.Add(ReadNumber(line, ref i, lineNumber));
            }
            else if (c is '<' or '>' || (c is '-' or '=' && i + 1 < line.Length && line[i + 1] is '<' or '>' or '-' or '='))
            {
                ReadArrowLike(line, ref i, lineNumber, tokens);
            }
            else if (c == '!' && i + 1 < line.Length && line[i + 1] == '=')
            {
                i += 2;
                tokens.Add(Make(TokenKind.NotEqual, line, start, i, lineNumber));
            }
            else
            {
                i++;
                var kind = c switch
                {
                    '+' when i < line.Length && line[i] == '=' => TokenKind.PlusEquals,
                    '+' => TokenKind.Plus,
                    '-' => TokenKind.Minus,
                    '=' => TokenKind.Equals,
                    '*' => TokenKind.Star,
                    '/' => TokenKind.Slash,
                    '^' => TokenKind.Caret,
                    '(' => TokenKind.LeftParen,
                    ')' => TokenKind.RightParen,
                    ',' => TokenKind.Comma,
                    ':' => TokenKind.Colon,
                    _ => TokenKind.Invalid,
                };
                if (kind == TokenKind.PlusEquals) i++;
                if (kind == TokenKind.Invalid)
                {
                    // Keep a surrogate pair together so the caret marks one visible character.
                    if (char.IsHighSurrogate(c) && i < line.Length && char.IsLowSurrogate(line[i])) i++;
                    var text = line[start..i];
                    tokens.Add(Make(TokenKind.Invalid, line, start, i, lineNumber) with { Problem = StrayCharacter(text) });
                }
                else
                {
                    tokens.Add(Make(kind, line, start, i, lineNumber));
                }
            }
        }
        tokens.Add(new Token(TokenKind.End, "", new SourcePosition(lineNumber, i + 1)));
        return tokens;
    }

    /// <summary>True for a character that may start a name.</summary>
    public static bool IsNameStart(char c) => char.IsAsciiLetter(c) || c == '_';

    /// <summary>True for a character that may continue a name.</summary>
    public static bool IsNamePart(char c) => char.IsAsciiLetterOrDigit(c) || c == '_';

    private static Token Make(TokenKind kind, string line, int start, int end, int lineNumber) =>
        new(kind, line[start..end], new SourcePosition(lineNumber, start + 1, end - start));

    private static string StrayCharacter(string text)
    {
        var shown = text.Length == 1 && char.IsControl(text[0]) ? $"U+{(int)text[0]:X4}" : $"'{text}'";
        return text switch
        {
            "." => "unexpected character '.'; a number needs a digit before or after its decimal point",
            "\"" or "'" => $"unexpected character {shown}; names and numbers are written without quotes",
            ";" => "unexpected character ';'; write one declaration per line, without a terminator",
            "!" => "unexpected character '!'; write 'not' to negate a condition and '!=' for 'not equal'",
            "&" or "|" => $"unexpected character '{text}'; write 'and' and 'or' to join conditions",
            _ => $"unexpected character {shown}",
        };
    }

    // digits [. digits*] [e [+-] digits+]  |  . digits+ [e [+-] digits+]
    private static Token ReadNumber(string line, ref int i, int lineNumber)
    {
        var start = i;
        while (i < line.Length && char.IsAsciiDigit(line[i])) i++;
        var integerEnd = i;
        if (i < line.Length && line[i] == '.')
        {
            i++;
            while (i < line.Length && char.IsAsciiDigit(line[i])) i++;
        }
        var wellFormed = true;
        if (i < line.Length && line[i] is 'e' or 'E')
        {
            var exponent = i + 1;
            if (exponent < line.Length && line[exponent] is '+' or '-') exponent++;
            var digits = exponent;
            while (digits < line.Length && char.IsAsciiDigit(line[digits])) digits++;
            if (digits > exponent) i = digits;
            else wellFormed = false;
        }
        if (!wellFormed || (i < line.Length && (IsNamePart(line[i]) || line[i] == '.')))
        {
            // Swallow the rest of the word so the caret covers all of it.
            while (i < line.Length && (IsNamePart(line[i]) || line[i] == '.')) i++;
            var bad = Make(TokenKind.Invalid, line, start, i, lineNumber);
            var text = bad.Text;
            var looksLikeCoefficient = integerEnd > start && integerEnd < text.Length + start && IsNameStart(line[integerEnd])
                                       && line[integerEnd..i].All(IsNamePart);
            var hint = looksLikeCoefficient
                ? $" (write '{line[start..integerEnd]} {line[integerEnd..i]}' with a space for {line[start..integerEnd]} copies of {line[integerEnd..i]})"
                : "";
            return bad with { Problem = $"malformed number '{text}'{hint}" };
        }
        var token = Make(TokenKind.Number, line, start, i, lineNumber);
        var value = double.Parse(token.Text, NumberStyles.AllowDecimalPoint | NumberStyles.AllowExponent, CultureInfo.InvariantCulture);
        if (double.IsInfinity(value))
            return token with { Kind = TokenKind.Invalid, Problem = $"number '{token.Text}' is too large" };
        return token with { Number = value };
    }

    // A maximal run of < - = > is read whole. "->" is the arrow and "<->" the first edition's double
    // arrow (reported by the parser with the second edition's form); "<", "<=", ">", ">=" and "==" are
    // comparisons, and a comparison followed only by minus signs ("x >-1", "x ==-1") is the comparison
    // and the signs; "<-" stays a wrong arrow (a reaction written right to left). Any other run with an angle ("=>", "<-", "-->", "<=>") is a wrong arrow. A run
    // without an angle ("-=", "=-", "--", "==-") is split into operators, so no character is scanned twice.
    private static void ReadArrowLike(string line, ref int i, int lineNumber, List<Token> tokens)
    {
        var start = i;
        var end = i;
        var hasAngle = false;
        while (end < line.Length && line[end] is '<' or '-' or '=' or '>')
        {
            hasAngle |= line[end] is '<' or '>';
            end++;
        }
        var run = line.AsSpan(start, end - start);
        var operatorEnd = end;
        while (operatorEnd > start + 1 && line[operatorEnd - 1] == '-') operatorEnd--;
        var comparison = Comparison(line.AsSpan(start, operatorEnd - start));
        if (run.StartsWith("<-") || run is "->" || (hasAngle && comparison is null))
        {
            var kind = run switch { "->" => TokenKind.Arrow, "<->" => TokenKind.BothArrow, _ => TokenKind.BadArrow };
            tokens.Add(Make(kind, line, start, end, lineNumber));
            i = end;
            return;
        }
        if (comparison is { } compare)
        {
            tokens.Add(Make(compare, line, start, operatorEnd, lineNumber));
            i = operatorEnd;
        }
        while (i < end)
        {
            var from = i;
            TokenKind kind;
            if (line[i] == '-' && i + 1 < end && line[i + 1] == '=') { kind = TokenKind.MinusEquals; i += 2; }
            else if (line[i] == '=' && i + 1 < end && line[i + 1] == '=') { kind = TokenKind.EqualEqual; i += 2; }
            else { kind = line[i] == '-' ? TokenKind.Minus : TokenKind.Equals; i++; }
            tokens.Add(Make(kind, line, from, i, lineNumber));
        }
    }

    private static TokenKind? Comparison(ReadOnlySpan<char> text) => text switch
    {
        "<" => TokenKind.Less,
        "<=" => TokenKind.LessEqual,
        ">" => TokenKind.Greater,
        ">=" => TokenKind.GreaterEqual,
        "==" => TokenKind.EqualEqual,
        _ => null,
    };
}
