namespace CopyNumber.Language;

/// <summary>
/// Reads a model file line by line: decides what kind of line each is (section header, <c>size</c>,
/// or a declaration of the current section) and parses it. A line with a mistake yields one
/// diagnostic and is left out; parsing resumes at the next line, so every line is looked at once.
/// Section names, <c>mass</c>, <c>rate</c>, <c>back</c>, <c>held</c>, <c>at</c>, <c>every</c>,
/// <c>from</c>, <c>until</c> and <c>whenever</c> are keywords only where they stand: a lone word on a
/// line, the word after a reaction's products or law, the word after a species' amount, the word after a
/// change's assignments or timing.
/// </summary>
internal static partial class ModelParser
{
    /// <summary>Section header words, in the order the documentation lists them.</summary>
    public static readonly IReadOnlyDictionary<string, Section> SectionWords = new Dictionary<string, Section>(StringComparer.Ordinal)
    {
        ["species"] = Section.Species,
        ["parameters"] = Section.Parameters,
        ["reactions"] = Section.Reactions,
        ["changes"] = Section.Changes,
        ["readouts"] = Section.Readouts,
        ["cycle"] = Section.Cycle,
    };

    /// <summary>The first edition's name of the changes section, reported with the second edition's form.</summary>
    private const string FirstEditionSchedule = "schedule";

    /// <summary>The word on a species line that marks a species no reaction changes.</summary>
    public const string HeldWord = "held";

    private static readonly string SectionList = "species, parameters, reactions, changes, readouts and cycle";

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
            var line = new LineParser(tokens, bag.Lines[n - 1]);
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

        if (first.IsWord(FirstEditionSchedule) && second.Kind is TokenKind.End or TokenKind.Colon)
        {
            line.Fail(first.Position, "the 'schedule' section is the first edition's form; write the header 'changes' and each change as what, then when: 'A = A + 4  at time 5'");
            return Enter(line, Section.Changes, first, model);
        }

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

        if (first.IsWord("size") && second.IsWord("unit"))
        {
            ParseUnit(line, "size", model.SizeUnit, unit => model.SizeUnit = unit);
            return section;
        }
        if (first.IsWord("size") && second.Kind != TokenKind.Equals)
        {
            ParseSize(line, model, ref sizeLine);
            return section;
        }
        if (first.IsWord("time") && second.IsWord("unit"))
        {
            ParseUnit(line, "time", model.TimeUnit, unit => model.TimeUnit = unit);
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
        if (section != Section.Changes && (first.IsWord("at") && second.Kind is not (TokenKind.Equals or TokenKind.Colon) || LooksLikeChange(line)))
        {
            line.Fail(first.Position, section == Section.None
                ? "change line before any section; put it under a 'changes' header"
                : $"change line in the '{Word(section)}' section; changes belong under the 'changes' header");
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
                if (ParseNamedExpression(line, "parameter", model) is { } parameter) model.Parameters.Add(new ParameterDecl(parameter.Name, parameter.Value, parameter.Position, parameter.Varies));
                break;
            case Section.Readouts:
                if (ParseNamedExpression(line, "readout", model) is { } readout) model.Readouts.Add(new ReadoutDecl(readout.Name, readout.Value, readout.Position));
                break;
            case Section.Reactions:
                if (ParseReaction(line, model) is { } reaction) model.Reactions.Add(reaction);
                break;
            case Section.Changes:
                ParseChange(line, model);
                break;
            case Section.Cycle:
                ParseCycleLine(line, model.Cycle);
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
        if (section == Section.Cycle) model.Cycle.Header ??= header.Position;
        return section;
    }

    // "x = ... at time T", "x = ... every P", "x = ..., y = ... whenever c": a timing word after an assignment.
    private static bool LooksLikeChange(LineParser line)
    {
        if (line.Peek().Kind != TokenKind.Identifier || line.Peek(1).Kind is not (TokenKind.Equals or TokenKind.PlusEquals or TokenKind.MinusEquals))
            return false;
        var tokens = line.Tokens;
        for (var i = 3; i < tokens.Count - 1; i++)
        {
            if (tokens[i - 1].Kind is TokenKind.Identifier or TokenKind.Number or TokenKind.RightParen
                && (tokens[i].IsWord("at") && tokens[i + 1].IsWord("time") || tokens[i].IsWord("every") || tokens[i].IsWord("whenever")))
                return true;
        }
        return false;
    }

    private static void ParseUnit(LineParser line, string of, string? earlier, Action<string> set)
    {
        line.Next();
        line.Next();
        var unit = line.Peek();
        if (unit.Kind != TokenKind.Identifier)
        {
            line.FailAt(unit, $"a unit name after '{of} unit', as in '{of} unit {(of == "time" ? "minute" : "litre")}'");
            return;
        }
        line.Next();
        if (!line.ExpectEnd($"the {of} unit (it is a single name)")) return;
        if (earlier is not null)
        {
            line.Fail(unit.Position, $"the {of} unit is declared twice; it is already '{earlier}'");
            return;
        }
        set(unit.Text);
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
        if (ParseNameAndEquals(line, "species", "as in 'A = 10'", " and an initial amount") is not { } name) return null;
        var count = line.Peek();
        if (count.Kind == TokenKind.Minus && line.Peek(1).Kind == TokenKind.Number)
        {
            var number = line.Peek(1);
            var span = count.Position with { Length = number.Position.Column + number.Position.Length - count.Position.Column };
            line.Fail(span, $"initial amount of '{name.Text}' must not be negative, found '-{number.Text}'");
            return null;
        }
        if (count.Kind != TokenKind.Number)
        {
            if (count.Kind is TokenKind.Identifier or TokenKind.LeftParen)
                line.Fail(count.Position, $"initial amount of '{name.Text}' must be a non-negative number written as a number, found {count.Describe()}");
            else
                line.FailAt(count, $"an initial amount (a non-negative number) for '{name.Text}'");
            return null;
        }
        line.Next();
        var whole = count.Number == Math.Floor(count.Number);
        // The double the lexer made has already rounded 2^53 + 1 down to 2^53, so the digits decide.
        if (!decimal.TryParse(count.Text, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var exact) || exact > LargestCount)
        {
            line.Fail(count.Position, $"initial amount of '{name.Text}' is too large (at most 2^53 = {LargestCount})");
            return null;
        }
        var held = false;
        if (line.Peek().IsWord(HeldWord))
        {
            line.Next();
            held = true;
        }
        if (line.Peek().Kind != TokenKind.End)
        {
            var after = line.Peek();
            line.Fail(after.Position, after.Kind is TokenKind.Invalid or TokenKind.BadArrow
                ? LineParser.Unexpected(after, "")
                : after.Kind == TokenKind.Identifier && !held && NameSuggestions.Closest(after.Text, [HeldWord]) is { } meant
                    ? $"unknown word '{after.Text}' after the amount of '{name.Text}'; did you mean '{meant}'?"
                    : $"initial amount of '{name.Text}' must be a single non-negative number, optionally followed by '{HeldWord}'; unexpected {after.Describe()} after it");
            return null;
        }
        return whole
            ? new SpeciesDecl(name.Text, (long)count.Number, name.Position, held)
            : new SpeciesDecl(name.Text, (long)Math.Round(count.Number, MidpointRounding.AwayFromZero), name.Position, held, count.Number);
    }

    private static (string Name, Expr Value, SourcePosition Position, ParameterVariation? Varies)? ParseNamedExpression(LineParser line, string what, ParsedModel model)
    {
        if (ParseNameAndEquals(line, what, "as in 'x = ...'", "") is not { } name) return null;
        if (line.ParseExpression($"the value of {what} '{name.Text}'") is not { } value) return null;
        ParameterVariation? varies = null;
        if (what == "parameter" && line.Peek().IsWord(VariesWord))
        {
            if (ParseVariation(line, name.Text) is not { } variation) return null;
            varies = variation;
        }
        if (line.Peek().IsWord("at") || line.Peek().IsWord("every") || line.Peek().IsWord("whenever"))
        {
            line.Fail(line.Peek().Position, $"a change of '{name.Text}' at a time or on a condition is a change line; put it under the 'changes' header");
            return null;
        }
        if (!line.ExpectEnd($"the value of {what} '{name.Text}'")) return null;
        model.Spans[value.Expr] = value.Span;
        return (name.Text, value.Expr, name.Position, varies);
    }

    /// <summary>The word after a parameter's value that makes it vary per replicate.</summary>
    public const string VariesWord = "varies";

    // "varies <law> cv <expression>" after a parameter's value.
    private static ParameterVariation? ParseVariation(LineParser line, string parameter)
    {
        line.Next();
        var law = line.Peek();
        if (law.Kind != TokenKind.Identifier || !ParameterVariation.VariationLaws.Contains(law.Text))
        {
            line.Fail(law.Position, $"expected a law after 'varies' ({string.Join(", ", ParameterVariation.VariationLaws)}), as in '{parameter} = 6  varies gamma cv 0.3'; found {law.Describe()}");
            return null;
        }
        line.Next();
        if (!line.Peek().IsWord("cv"))
        {
            line.Fail(line.Peek().Position, $"expected 'cv' and the coefficient of variation after '{law.Text}', as in '{parameter} = 6  varies {law.Text} cv 0.3'");
            return null;
        }
        line.Next();
        if (line.ParseExpression($"the coefficient of variation of '{parameter}'") is not { } cv) return null;
        return new ParameterVariation(law.Text, cv.Expr, law.Position);
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
                TokenKind.Identifier when arrow.Text is "mass" or "rate" => $"missing arrow: expected '->' and the products before '{arrow.Text}'",
                TokenKind.End => "missing arrow: expected '->' and the products after the reactants",
                TokenKind.Equals => "'=' is not an arrow; write '->' (a reversible reaction adds 'back' and the reverse law after the forward one)",
                _ => $"expected '+' or the arrow '->' after the reactants, found {arrow.Describe()}",
            });
            return null;
        }
        line.Next();
        var doubleArrow = arrow.Kind == TokenKind.BothArrow;
        var productsStart = line.Peek().Position.Column;
        var products = line.ParseSide("products");
        if (products is null) return null;

        var law = line.Peek();
        if (!(law.IsWord("mass") || law.IsWord("rate")))
        {
            line.Fail(law.Position, MissingLaw(law, products));
            return null;
        }
        var productsText = line.Slice(productsStart, law.Position.Column);
        line.Next();
        var kind = law.Text == "mass" ? LawKind.Mass : LawKind.Rate;
        var lawName = kind == LawKind.Mass ? "the mass-action constant" : "the rate law";
        if (line.ParseExpression(lawName) is not { } forward) return null;
        model.Spans[forward.Expr] = forward.Span;

        // The first edition's second constant, "mass kf, kr": read it to suggest the second edition's form.
        (Expr Expr, SourcePosition Span)? firstEditionReverse = null;
        var comma = line.Peek();
        if (comma.Kind == TokenKind.Comma)
        {
            line.Next();
            if (line.ParseExpression(kind == LawKind.Mass ? "the reverse mass-action constant" : "the rate law") is not { } second2) return null;
            firstEditionReverse = second2;
            model.Spans[second2.Expr] = second2.Span;
        }

        Expr? reverse = null;
        LawKind? reverseKind = null;
        var back = line.Peek();
        if (back.IsWord("back") && firstEditionReverse is null)
        {
            line.Next();
            var backLaw = line.Peek();
            if (!(backLaw.IsWord("mass") || backLaw.IsWord("rate")))
            {
                line.Fail(backLaw.Position, backLaw.Kind == TokenKind.End
                    ? "'back' needs the reverse law: 'back mass <constant>' or 'back rate <propensity>'"
                    : backLaw.Kind == TokenKind.Identifier && NameSuggestions.Closest(backLaw.Text, ["mass", "rate"]) is { } meantLaw
                        ? $"unknown law '{backLaw.Text}' after 'back'; did you mean '{meantLaw}'?"
                        : $"expected 'mass' or 'rate' after 'back', found {backLaw.Describe()}");
                return null;
            }
            line.Next();
            reverseKind = backLaw.Text == "mass" ? LawKind.Mass : LawKind.Rate;
            if (line.ParseExpression(reverseKind == LawKind.Mass ? "the reverse mass-action constant" : "the reverse rate law") is not { } reversed) return null;
            reverse = reversed.Expr;
            model.Spans[reverse] = reversed.Span;
            if (!line.ExpectEnd(reverseKind == LawKind.Mass ? "the reverse mass-action constant" : "the reverse rate law")) return null;
        }
        else if (!line.ExpectEnd(lawName))
        {
            return null;
        }

        // The first edition's forms keep the reaction (its names are still checked and it still claims its
        // name); the message shows the same reaction in the second edition's form.
        var reactantsText = line.Slice(name.Position.Column + name.Position.Length + 1, arrow.Position.Column).TrimStart(':').Trim();
        string Suggestion(string reverseLaw) =>
            $"'{name.Text}: {reactantsText} -> {productsText}  {law.Text} {line.Slice(forward.Span)}  back {reverseLaw}'";
        if (doubleArrow)
        {
            var reverseLaw = firstEditionReverse is { } r ? $"{law.Text} {line.Slice(r.Span)}" : reverse is not null ? $"{(reverseKind == LawKind.Mass ? "mass" : "rate")} {line.Slice(model.Spans[reverse])}" : "mass <reverse constant>";
            line.Fail(arrow.Position, $"the double arrow '<->' is the first edition's form; write one arrow and the reverse law after 'back': {Suggestion(reverseLaw)}");
            if (firstEditionReverse is { } pair) { reverse = pair.Expr; reverseKind = kind; }
            else if (reverse is null) reverse = forward.Expr;
            return new ReactionDecl(name.Text, name.Position, reactants, products, true, kind, forward.Expr, reverse, reverseKind);
        }
        if (firstEditionReverse is { } listed)
        {
            line.Fail(comma.Position, $"a second constant after ',' is the first edition's form of a reversible reaction; write the reverse law after 'back': {Suggestion($"{law.Text} {line.Slice(listed.Span)}")}");
            return new ReactionDecl(name.Text, name.Position, reactants, products, true, kind, forward.Expr, listed.Expr, kind);
        }
        return new ReactionDecl(name.Text, name.Position, reactants, products, reverse is not null, kind, forward.Expr, reverse, reverseKind);
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
        if (found.IsWord("back"))
            return "missing law: the forward law ('mass <constant>' or 'rate <expression>') comes before 'back'";
        return $"expected '+', 'mass' or 'rate' after the products, found {found.Describe()}";
    }

    // assignment { "," assignment } ( "at" "time" T | "every" P [ "from" T ] [ "until" U ] | "whenever" condition )
    private static void ParseChange(LineParser line, ParsedModel model)
    {
        var start = line.Peek();
        if (start.IsWord("at") && line.Peek(1).Kind is not (TokenKind.Equals or TokenKind.PlusEquals or TokenKind.MinusEquals))
        {
            FirstEditionChange(line);
            return;
        }
        var assignments = new List<AssignmentDecl>();
        while (true)
        {
            var target = line.Peek();
            if (assignments.Count > 0 && (target.IsWord("at") || target.IsWord("every") || target.IsWord("whenever"))
                && OperationOf(line.Peek(1).Kind) is null)
            {
                line.Fail(line.Tokens.Last(t => t.Kind == TokenKind.Comma && t.Position.Column < target.Position.Column).Position,
                    "a ',' before the timing: remove it or add another assignment after it");
                return;
            }
            if (target.Kind != TokenKind.Identifier)
            {
                line.FailAt(target, assignments.Count == 0
                    ? "a species or parameter to change at the start of a change line, as in 'k = 2  at time 50'"
                    : "a species or parameter to change after ','");
                return;
            }
            line.Next();
            var op = line.Peek();
            var operation = OperationOf(op.Kind);
            if (operation is null)
            {
                line.FailAt(op, $"'=', '+=' or '-=' after '{target.Text}'");
                return;
            }
            line.Next();
            if (line.ParseExpression($"the new value of '{target.Text}'") is not { } value) return;
            model.Spans[value.Expr] = value.Span;
            assignments.Add(new AssignmentDecl(target.Text, target.Position, operation.Value, value.Expr));
            if (line.Peek().Kind != TokenKind.Comma) break;
            line.Next();
        }

        var timing = line.Peek();
        if (timing.IsWord("at"))
        {
            line.Next();
            if (!line.Peek().IsWord("time"))
            {
                line.FailAt(line.Peek(), "'time' after 'at', as in 'at time 50'");
                return;
            }
            line.Next();
            if (Timed(line, model, "the change time") is not { } time) return;
            if (!line.ExpectEnd("the change time")) return;
            foreach (var a in assignments)
                model.Schedule.Add(new ScheduleDecl(time, a.Target, a.TargetPosition, a.Operation, a.Value, start.Position));
            return;
        }
        if (timing.IsWord("every"))
        {
            line.Next();
            if (Timed(line, model, "the period") is not { } every) return;
            var from = every;
            Expr? until = null;
            if (line.Peek().IsWord("from"))
            {
                line.Next();
                if (Timed(line, model, "the first time") is not { } first) return;
                from = first;
            }
            if (line.Peek().IsWord("until"))
            {
                line.Next();
                if (Timed(line, model, "the last time") is not { } last) return;
                until = last;
            }
            if (!line.ExpectEnd(until is null ? "the repetition ('from <time>' and 'until <time>' may follow, in that order)" : "the last time")) return;
            foreach (var a in assignments)
                model.Schedule.Add(new ScheduleDecl(from, a.Target, a.TargetPosition, a.Operation, a.Value, start.Position, every, until));
            return;
        }
        if (timing.IsWord("whenever"))
        {
            line.Next();
            if (line.ParseExpression("the condition") is not { } condition) return;
            model.Spans[condition.Expr] = condition.Span;
            if (!line.ExpectEnd("the condition")) return;
            model.Triggers.Add(new TriggerDecl(assignments, condition.Expr, start.Position));
            return;
        }
        if (timing.Kind == TokenKind.End)
            line.Fail(timing.Position, "a change needs its timing after the assignments: 'at time <time>', 'every <period>' or 'whenever <condition>'");
        else if (timing.Kind is TokenKind.Invalid or TokenKind.BadArrow)
            line.FailAt(timing, "");
        else if (timing.Kind == TokenKind.Identifier && NameSuggestions.Closest(timing.Text, ["at", "every", "whenever"]) is { } meant)
            line.Fail(timing.Position, $"unknown timing '{timing.Text}'; did you mean '{meant}'?");
        else
            line.Fail(timing.Position, $"expected ',' and another assignment, or the timing ('at time', 'every', 'whenever'), found {timing.Describe()}");
    }

    private static ScheduleOperation? OperationOf(TokenKind kind) => kind switch
    {
        TokenKind.Equals => ScheduleOperation.Set,
        TokenKind.PlusEquals => ScheduleOperation.Add,
        TokenKind.MinusEquals => ScheduleOperation.Subtract,
        _ => null,
    };

    private static Expr? Timed(LineParser line, ParsedModel model, string what)
    {
        if (line.ParseExpression(what) is not { } value) return null;
        model.Spans[value.Expr] = value.Span;
        return value.Expr;
    }

    // "at <time>: <target> <op> <value>": read it as the first edition did, then report it with the
    // second edition's form; the line is not kept.
    private static void FirstEditionChange(LineParser line)
    {
        var at = line.Next();
        if (line.ParseExpression("the change time") is not { } time) return;
        if (!line.Expect(TokenKind.Colon, "':' after the time of a first-edition change line 'at <time>: ...'")) return;
        var target = line.Peek();
        if (target.Kind != TokenKind.Identifier)
        {
            line.FailAt(target, "a species or parameter to change after ':'");
            return;
        }
        line.Next();
        var op = line.Peek();
        if (OperationOf(op.Kind) is null)
        {
            line.FailAt(op, $"'=', '+=' or '-=' after '{target.Text}'");
            return;
        }
        line.Next();
        if (line.ParseExpression($"the new value of '{target.Text}'") is not { } value) return;
        if (!line.ExpectEnd($"the new value of '{target.Text}'")) return;
        line.Fail(at.Position, $"a change line opening with 'at' is the first edition's form; write what, then when: '{target.Text} {op.Text} {line.Slice(value.Span)}  at time {line.Slice(time.Span)}'");
    }
}
