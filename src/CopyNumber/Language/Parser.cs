namespace CopyNumber.Language;

/// <summary>
/// Reads a model file line by line: decides what kind of line each is (section header, <c>size</c>,
/// or a declaration of the current section) and parses it. A line with a mistake yields one
/// diagnostic and is left out; parsing resumes at the next line, so every line is looked at once.
/// Section names, <c>mass</c>, <c>rate</c> and <c>at</c> are keywords only where they stand: a lone
/// word on a line, the word after a reaction's products, the first word of a schedule line.
/// </summary>
internal static class ModelParser
{
    /// <summary>Section header words, in the order the documentation lists them.</summary>
    public static readonly IReadOnlyDictionary<string, Section> SectionWords = new Dictionary<string, Section>(StringComparer.Ordinal)
    {
        ["species"] = Section.Species,
        ["parameters"] = Section.Parameters,
        ["reactions"] = Section.Reactions,
        ["schedule"] = Section.Schedule,
        ["readouts"] = Section.Readouts,
    };

    private static readonly string SectionList = "species, parameters, reactions, schedule and readouts";

    /// <summary>Parses every line of the bag's file; syntax mistakes go to <paramref name="bag"/>.</summary>
    public static ParsedModel Parse(DiagnosticBag bag)
    {
        var model = new ParsedModel();
        var section = Section.None;
        SourcePosition? sizeLine = null;
        for (var n = 1; n <= bag.Lines.Count; n++)
        {
            var tokens = Lexer.Tokenize(bag.Lines[n - 1], n);
            if (tokens[0].Kind == TokenKind.End) continue;
            var line = new LineParser(tokens);
            var lineSection = section;
            section = ParseLine(line, section, model, ref sizeLine);
            if (line.Error is not { } error) continue;
            bag.Report(error.Position, error.Message);
            model.BadLines[lineSection] = model.BadLines.GetValueOrDefault(lineSection) + 1;
            // The first word of a broken declaration is probably a name the rest of the file uses.
            if (tokens[0].Kind == TokenKind.Identifier
                && (tokens[1].Kind == TokenKind.Equals || lineSection is Section.Species or Section.Parameters or Section.Readouts))
                model.NamesOnBadLines.Add(tokens[0].Text);
        }
        return model;
    }

    // Returns the section in force after this line.
    private static Section ParseLine(LineParser line, Section section, ParsedModel model, ref SourcePosition? sizeLine)
    {
        var first = line.Peek();
        var second = line.Peek(1);

        if (first.Kind == TokenKind.Identifier && SectionWords.TryGetValue(first.Text, out var named))
        {
            if (second.Kind == TokenKind.End) return Enter(line, named, first, model);
            if (second.Kind == TokenKind.Colon && line.Peek(2).Kind == TokenKind.End)
            {
                line.Fail(second.Position, $"a section header is the word alone: write '{first.Text}' without ':'");
                return Enter(line, named, first, model);
            }
            if (second.Kind is not (TokenKind.Equals or TokenKind.Colon))
            {
                line.Fail(second.Position, $"the section header '{first.Text}' must stand alone on its line; put each declaration on a line of its own below it");
                return Enter(line, named, first, model);
            }
        }

        if (first.Kind == TokenKind.Identifier && second.Kind == TokenKind.End)
        {
            if (first.Text == "size")
            {
                line.Fail(second.Position, "'size' needs a value: write 'size <positive number>'");
                return section;
            }
            if (NameSuggestions.Closest(first.Text, SectionWords.Keys) is { } meant)
            {
                line.Fail(first.Position, $"unknown section '{first.Text}'; did you mean '{meant}'?");
                return Enter(line, SectionWords[meant], first, model);
            }
            // A lone word is always a header: no declaration is a single word.
            var declaring = section is Section.Species or Section.Parameters or Section.Readouts
                ? $"; to declare '{first.Text}' write '{first.Text} = ...'"
                : "";
            line.Fail(first.Position, $"unknown section '{first.Text}'; the sections are {SectionList} (a line holding a single word is a section header){declaring}");
            return Section.Unknown;
        }

        if (first.IsWord("size") && second.Kind != TokenKind.Equals)
        {
            ParseSize(line, model, ref sizeLine);
            return section;
        }

        if (section == Section.Unknown)
        {
            // The header above was not understood, so neither is this line; its name must not show up as unknown later.
            if (first.Kind == TokenKind.Identifier && second.Kind == TokenKind.Equals) model.NamesOnBadLines.Add(first.Text);
            return section;
        }

        if (section != Section.Reactions && LooksLikeReaction(line))
        {
            line.Fail(first.Position, section == Section.None
                ? "reaction line before any section; put it under a 'reactions' header"
                : $"reaction line in the '{Word(section)}' section; reactions belong under the 'reactions' header");
            return section;
        }
        if (section != Section.Schedule && first.IsWord("at") && second.Kind is not (TokenKind.Equals or TokenKind.Colon))
        {
            line.Fail(first.Position, section == Section.None
                ? "schedule line before any section; put it under a 'schedule' header"
                : $"schedule line in the '{Word(section)}' section; timed changes belong under the 'schedule' header");
            return section;
        }

        switch (section)
        {
            case Section.None:
                if (first.Kind == TokenKind.Identifier && second.Kind == TokenKind.Equals)
                    line.Fail(first.Position, $"declaration of '{first.Text}' before any section; species go under a 'species' header, parameters under 'parameters', readouts under 'readouts'");
                else
                    line.FailAt(first, $"a section header ({SectionList})");
                break;
            case Section.Species:
                if (ParseSpecies(line) is { } species) model.Species.Add(species);
                break;
            case Section.Parameters:
                if (ParseNamedExpression(line, "parameter", model) is { } parameter) model.Parameters.Add(new ParameterDecl(parameter.Name, parameter.Value, parameter.Position));
                break;
            case Section.Readouts:
                if (ParseNamedExpression(line, "readout", model) is { } readout) model.Readouts.Add(new ReadoutDecl(readout.Name, readout.Value, readout.Position));
                break;
            case Section.Reactions:
                if (ParseReaction(line, model) is { } reaction) model.Reactions.Add(reaction);
                break;
            case Section.Schedule:
                if (ParseSchedule(line, model) is { } change) model.Schedule.Add(change);
                break;
        }
        return section;
    }

    private static string Word(Section section) => SectionWords.First(p => p.Value == section).Key;

    private static Section Enter(LineParser line, Section section, Token header, ParsedModel model)
    {
        if (model.Headers.TryGetValue(section, out var earlier))
            line.Fail(header.Position, $"section '{Word(section)}' appears twice; the first '{Word(section)}' header is at line {earlier.Line}");
        else
            model.Headers[section] = header.Position;
        return section;
    }

    private static bool LooksLikeReaction(LineParser line)
    {
        if (line.Peek().Kind == TokenKind.Identifier && line.Peek(1).Kind == TokenKind.Colon) return true;
        foreach (var token in line.Tokens)
            if (token.Kind is TokenKind.Arrow or TokenKind.BothArrow) return true;
        return false;
    }

    private static void ParseSize(LineParser line, ParsedModel model, ref SourcePosition? sizeLine)
    {
        var keyword = line.Next();
        var value = line.Peek();
        if (value.Kind == TokenKind.Minus && line.Peek(1).Kind == TokenKind.Number)
        {
            line.Fail(value.Position with { Length = line.Peek(1).Position.Column + line.Peek(1).Position.Length - value.Position.Column },
                "the system size must be a positive number");
            return;
        }
        if (value.Kind != TokenKind.Number)
        {
            line.FailAt(value, "a positive number after 'size'");
            return;
        }
        line.Next();
        if (!line.ExpectEnd("the system size (it is a single number)")) return;
        if (!(value.Number > 0))
        {
            line.Fail(value.Position, "the system size must be a positive number");
            return;
        }
        if (sizeLine is { } earlier)
        {
            line.Fail(keyword.Position, $"the system size is set twice; the first 'size' line is line {earlier.Line}");
            return;
        }
        sizeLine = keyword.Position;
        model.Size = value.Number;
    }

    // The largest count held exactly by a double, so counts survive any later arithmetic unchanged.
    private const long LargestCount = 1L << 53;

    private static SpeciesDecl? ParseSpecies(LineParser line)
    {
        if (ParseNameAndEquals(line, "species", "as in 'A = 10'", " and an initial count") is not { } name) return null;
        var count = line.Peek();
        if (count.Kind == TokenKind.Minus && line.Peek(1).Kind == TokenKind.Number)
        {
            var number = line.Peek(1);
            var span = count.Position with { Length = number.Position.Column + number.Position.Length - count.Position.Column };
            line.Fail(span, $"initial count of '{name.Text}' must be a non-negative integer, found '-{number.Text}'");
            return null;
        }
        if (count.Kind != TokenKind.Number)
        {
            if (count.Kind is TokenKind.Identifier or TokenKind.LeftParen)
                line.Fail(count.Position, $"initial count of '{name.Text}' must be a non-negative integer written as a number, found {count.Describe()}");
            else
                line.FailAt(count, $"an initial count (a non-negative integer) for '{name.Text}'");
            return null;
        }
        line.Next();
        if (count.Number != Math.Floor(count.Number))
        {
            line.Fail(count.Position, $"initial count of '{name.Text}' must be a non-negative integer, found '{count.Text}'");
            return null;
        }
        // The double the lexer made has already rounded 2^53 + 1 down to 2^53, so the digits decide.
        if (!decimal.TryParse(count.Text, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var exact) || exact > LargestCount)
        {
            line.Fail(count.Position, $"initial count of '{name.Text}' is too large (at most 2^53 = {LargestCount})");
            return null;
        }
        if (line.Peek().Kind != TokenKind.End)
        {
            var after = line.Peek();
            line.Fail(after.Position, after.Kind is TokenKind.Invalid or TokenKind.BadArrow
                ? LineParser.Unexpected(after, "")
                : $"initial count of '{name.Text}' must be a single non-negative integer; unexpected {after.Describe()} after it");
            return null;
        }
        return new SpeciesDecl(name.Text, (long)count.Number, name.Position);
    }

    private static (string Name, Expr Value, SourcePosition Position)? ParseNamedExpression(LineParser line, string what, ParsedModel model)
    {
        if (ParseNameAndEquals(line, what, "as in 'x = ...'", "") is not { } name) return null;
        if (line.ParseExpression($"the value of {what} '{name.Text}'") is not { } value) return null;
        if (!line.ExpectEnd($"the value of {what} '{name.Text}'")) return null;
        model.Spans[value.Expr] = value.Span;
        return (name.Text, value.Expr, name.Position);
    }

    // "name =" at the start of a declaration; returns the name token.
    private static Token? ParseNameAndEquals(LineParser line, string what, string example, string afterEquals)
    {
        var name = line.Peek();
        if (name.Kind != TokenKind.Identifier)
        {
            line.FailAt(name, $"a {what} name at the start of the line, {example}");
            return null;
        }
        line.Next();
        if (line.Peek().Kind != TokenKind.Equals)
        {
            line.FailAt(line.Peek(), $"'='{afterEquals} after {what} '{name.Text}'");
            return null;
        }
        line.Next();
        return name;
    }

    private static ReactionDecl? ParseReaction(LineParser line, ParsedModel model)
    {
        var name = line.Peek();
        var second = line.Peek(1);
        if (name.Kind == TokenKind.Identifier && second.Kind == TokenKind.Equals)
        {
            line.Fail(name.Position, $"declaration '{name.Text} = ...' in the 'reactions' section; species go under 'species', parameters under 'parameters', readouts under 'readouts'");
            return null;
        }
        // "A + B -> C" and "A -> B" lack the name; "bind A -> B" lacks only the colon.
        if (name.Kind != TokenKind.Identifier || second.Kind is TokenKind.Plus or TokenKind.Arrow or TokenKind.BothArrow or TokenKind.BadArrow)
        {
            if (name.Kind == TokenKind.Invalid) { line.FailAt(name, ""); return null; }
            line.Fail(name.Position, "missing reaction name: a reaction line starts with its name and ':', as in 'bind: A + B -> C mass k'");
            return null;
        }
        line.Next();
        if (!line.Expect(TokenKind.Colon, $"':' after the reaction name '{name.Text}'")) return null;

        var reactants = line.ParseSide("reactants");
        if (reactants is null) return null;
        var arrow = line.Peek();
        if (arrow.Kind is not (TokenKind.Arrow or TokenKind.BothArrow))
        {
            line.Fail(arrow.Position, arrow.Kind switch
            {
                TokenKind.Invalid or TokenKind.BadArrow => LineParser.Unexpected(arrow, ""),
                TokenKind.Identifier when arrow.Text is "mass" or "rate" => $"missing arrow: expected '->' or '<->' and the products before '{arrow.Text}'",
                TokenKind.End => "missing arrow: expected '->' or '<->' and the products after the reactants",
                TokenKind.Equals => "'=' is not an arrow; write '->' for a one-way reaction or '<->' for a reversible one",
                _ => $"expected '+' or an arrow ('->' or '<->') after the reactants, found {arrow.Describe()}",
            });
            return null;
        }
        line.Next();
        var reversible = arrow.Kind == TokenKind.BothArrow;
        var products = line.ParseSide("products");
        if (products is null) return null;

        var law = line.Peek();
        if (!(law.IsWord("mass") || law.IsWord("rate")))
        {
            line.Fail(law.Position, MissingLaw(law, products));
            return null;
        }
        line.Next();
        var kind = law.Text == "mass" ? LawKind.Mass : LawKind.Rate;
        var lawName = kind == LawKind.Mass ? "the mass-action constant" : "the rate law";
        if (line.ParseExpression(lawName) is not { } forward) return null;
        model.Spans[forward.Expr] = forward.Span;
        Expr? reverse = null;
        var comma = line.Peek();
        if (comma.Kind == TokenKind.Comma)
        {
            line.Next();
            if (line.ParseExpression(kind == LawKind.Mass ? "the reverse mass-action constant" : "the rate law") is not { } second2) return null;
            reverse = second2.Expr;
            model.Spans[reverse] = second2.Span;
        }
        if (!line.ExpectEnd(reverse is null && reversible ? $"{lawName} (a reversible reaction lists two constants separated by ',')" : lawName)) return null;

        // These mistakes keep the reaction: its names are still checked, and it still claims its name.
        if (reversible && kind == LawKind.Rate)
            line.Fail(law.Position, $"reversible reaction '{name.Text}' needs mass-action constants, 'mass k_fwd, k_rev'; write a reversible rate law as two one-way reactions");
        else if (reversible && reverse is null)
            line.Fail(law.Position, $"reversible reaction '{name.Text}' needs two constants, forward and reverse: 'mass k_fwd, k_rev'");
        else if (!reversible && reverse is not null)
            line.Fail(comma.Position, kind == LawKind.Mass
                ? $"one-way reaction '{name.Text}' takes one constant; write '<->' for a reversible reaction with 'mass k_fwd, k_rev'"
                : $"a rate law is a single expression; write '<->' only with 'mass k_fwd, k_rev'");
        return new ReactionDecl(name.Text, name.Position, reactants, products, reversible, kind, forward.Expr, reverse);
    }

    private static string MissingLaw(Token found, ReactionSide products)
    {
        // "A -> mass k": the word read as the only product was meant as the law.
        if (products.Terms is [{ Coefficient: 1, Species: "mass" or "rate" } only] && found.Kind != TokenKind.Plus)
            return $"missing products before '{only.Species}'; write '0' for nothing, as in 'A -> 0 {only.Species} ...'";
        if (found.Kind == TokenKind.End)
            return "missing law: add 'mass <constant>' or 'rate <expression>' after the products";
        if (found.Kind is TokenKind.Invalid or TokenKind.BadArrow)
            return LineParser.Unexpected(found, "");
        if (found.Kind == TokenKind.Identifier && NameSuggestions.Closest(found.Text, ["mass", "rate"]) is { } meant)
            return $"unknown law '{found.Text}'; did you mean '{meant}'?";
        return $"expected '+', 'mass' or 'rate' after the products, found {found.Describe()}";
    }

    private static ScheduleDecl? ParseSchedule(LineParser line, ParsedModel model)
    {
        var at = line.Peek();
        if (!at.IsWord("at"))
        {
            if (at.Kind == TokenKind.Identifier && line.Peek(1).Kind == TokenKind.Equals)
                line.Fail(at.Position, $"a schedule line reads 'at <time>: {at.Text} = <value>'; declarations belong under 'species', 'parameters' or 'readouts'");
            else
                line.FailAt(at, "'at' to start a schedule line, as in 'at 50: k = 2'");
            return null;
        }
        line.Next();
        if (line.ParseExpression("the schedule time") is not { } time) return null;
        model.Spans[time.Expr] = time.Span;
        if (!line.Expect(TokenKind.Colon, "':' after the schedule time")) return null;
        var target = line.Peek();
        if (target.Kind != TokenKind.Identifier)
        {
            line.FailAt(target, "a species or parameter to change after ':'");
            return null;
        }
        line.Next();
        var op = line.Peek();
        var operation = op.Kind switch
        {
            TokenKind.Equals => ScheduleOperation.Set,
            TokenKind.PlusEquals => ScheduleOperation.Add,
            TokenKind.MinusEquals => ScheduleOperation.Subtract,
            _ => (ScheduleOperation?)null,
        };
        if (operation is null)
        {
            line.FailAt(op, $"'=', '+=' or '-=' after '{target.Text}'");
            return null;
        }
        line.Next();
        if (line.ParseExpression($"the new value of '{target.Text}'") is not { } value) return null;
        if (!line.ExpectEnd($"the new value of '{target.Text}'")) return null;
        model.Spans[value.Expr] = value.Span;
        return new ScheduleDecl(time.Expr, target.Text, target.Position, operation.Value, value.Expr, at.Position);
    }
}
