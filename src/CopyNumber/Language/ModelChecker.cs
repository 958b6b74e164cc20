namespace CopyNumber.Language;

/// <summary>
/// Checks what the parser read against the rules that span lines: every name is declared once and
/// not reserved, each expression uses only the names its position allows, schedule targets exist,
/// constants that can be worked out before a run are finite (and non-negative where they must be),
/// and the model has species and reactions. Reports go to the bag; nothing is thrown.
/// </summary>
internal sealed class ModelChecker
{
    private enum Kind { Species, Parameter, Readout }

    private sealed record Declared(Kind Kind, int Order, SourcePosition Position);

    /// <summary>Where an expression stands, which decides the names it may use.</summary>
    private enum Place { Parameter, MassConstant, RateLaw, ScheduleTime, ScheduleValue, Readout, Condition, BurstSize }

    /// <summary>Names that can never be declared.</summary>
    public static readonly IReadOnlySet<string> Reserved = new HashSet<string>(StringComparer.Ordinal) { "time", "replicate", "size" };

    private readonly ParsedModel _model;
    private readonly DiagnosticBag _bag;
    private readonly Dictionary<string, Declared> _names = new(StringComparer.Ordinal);
    private readonly List<string> _species = [];
    private readonly List<string> _parameters = [];
    private readonly Dictionary<string, double> _parameterValues = new(StringComparer.Ordinal);

    private ModelChecker(ParsedModel model, DiagnosticBag bag)
    {
        _model = model;
        _bag = bag;
    }

    /// <summary>Checks <paramref name="model"/>, reporting to <paramref name="bag"/>.</summary>
    public static void Check(ParsedModel model, DiagnosticBag bag)
    {
        var checker = new ModelChecker(model, bag);
        checker.DeclareNames();
        checker.CheckReactionNames();
        checker.CheckParameters();
        checker.CheckReactions();
        checker.CheckSchedule();
        checker.CheckTriggers();
        checker.CheckReadouts();
        checker.CheckNotEmpty();
    }

    private void DeclareNames()
    {
        var all = _model.Species.Select((d, i) => (d.Name, d.Position, Kind: Kind.Species, Order: i))
            .Concat(_model.Parameters.Select((d, i) => (d.Name, d.Position, Kind: Kind.Parameter, Order: i)))
            .Concat(_model.Readouts.Select((d, i) => (d.Name, d.Position, Kind: Kind.Readout, Order: i)))
            .OrderBy(d => d.Position.Line);
        foreach (var (name, position, kind, order) in all)
        {
            if (Reserved.Contains(name))
            {
                _bag.Report(position, ReservedMessage(name));
                continue;
            }
            if (_names.TryGetValue(name, out var earlier))
            {
                _bag.Report(position, $"duplicate name '{name}': already declared at line {earlier.Position.Line} as {Describe(earlier.Kind)}");
                continue;
            }
            _names[name] = new Declared(kind, order, position);
            if (kind == Kind.Species) _species.Add(name);
            if (kind == Kind.Parameter) _parameters.Add(name);
        }
    }

    private static string ReservedMessage(string name) => name == "size"
        ? "'size' is a reserved name and cannot be declared; the system size is set by a line 'size <number>'"
        : $"'{name}' is a reserved name (every output has a '{name}' column) and cannot be declared";

    private static string Describe(Kind kind) => kind switch
    {
        Kind.Species => "a species",
        Kind.Parameter => "a parameter",
        _ => "a readout",
    };

    private void CheckReactionNames()
    {
        // Reversible lines also claim name_fwd and name_rev, the names the compiler gives their halves.
        var taken = new Dictionary<string, (int Line, string Owner)>(StringComparer.Ordinal);
        foreach (var reaction in _model.Reactions)
        {
            if (Reserved.Contains(reaction.Name))
            {
                _bag.Report(reaction.Position, $"'{reaction.Name}' is a reserved name and cannot name a reaction");
                continue;
            }
            var claims = reaction.Reversible
                ? new[] { (reaction.Name, ""), (reaction.Name + "_fwd", $"the forward half of reversible reaction '{reaction.Name}'"), (reaction.Name + "_rev", $"the reverse half of reversible reaction '{reaction.Name}'") }
                : new[] { (reaction.Name, "") };
            var clash = claims.FirstOrDefault(c => taken.ContainsKey(c.Item1));
            if (clash.Item1 is { } clashing)
            {
                var (line, owner) = taken[clashing];
                var mine = clashing == reaction.Name ? "" : $" (reversible reaction '{reaction.Name}' is split into '{reaction.Name}_fwd' and '{reaction.Name}_rev')";
                var theirs = owner.Length == 0 ? "" : $" by {owner}";
                _bag.Report(reaction.Position, $"duplicate reaction name '{clashing}': already used at line {line}{theirs}{mine}");
                continue;
            }
            foreach (var (claimed, owner) in claims) taken[claimed] = (reaction.Position.Line, owner);
        }
    }

    // The coefficient of variation: a constant of earlier parameters, ≥ 0; a uniform law must stay positive.
    private void CheckVariation(ParameterDecl parameter, ParameterVariation varies, int order)
    {
        if (!CheckNames(varies.Cv, Place.Parameter, order, parameter.Name) || Evaluate(varies.Cv) is not { } cv) return;
        if (!(cv >= 0) || !double.IsFinite(cv))
            _bag.Report(SpanOf(varies.Cv), $"the coefficient of variation of '{parameter.Name}' must be a finite number, zero or more, found {cv:G6}");
        else if (varies.Law == "uniform" && cv > 1 / Math.Sqrt(3))
            _bag.Report(SpanOf(varies.Cv), $"a uniform law with mean m and coefficient of variation {cv:G6} reaches below 0 (its support is m·(1 ± √3·cv)); the largest is 1/√3 ≈ 0.577");
    }

    private static IEnumerable<string> ExpressionNames(Expr expr) => expr switch
    {
        NameExpr name => [name.Name],
        NegateExpr negate => ExpressionNames(negate.Operand),
        BinaryExpr binary => ExpressionNames(binary.Left).Concat(ExpressionNames(binary.Right)),
        CallExpr call => call.Arguments.SelectMany(ExpressionNames),
        CompareExpr compare => ExpressionNames(compare.Left).Concat(ExpressionNames(compare.Right)),
        LogicExpr logic => ExpressionNames(logic.Left).Concat(ExpressionNames(logic.Right)),
        NotExpr not => ExpressionNames(not.Operand),
        _ => [],
    };

    private void CheckParameters()
    {
        for (var i = 0; i < _model.Parameters.Count; i++)
        {
            var parameter = _model.Parameters[i];
            var usable = CheckNames(parameter.Value, Place.Parameter, i, parameter.Name);
            foreach (var used in ExpressionNames(parameter.Value))
                if (_model.Parameters.Take(i).FirstOrDefault(p => p.Name == used && p.Varies is not null) is { } varying)
                    _bag.Report(SpanOf(parameter.Value), $"parameter '{parameter.Name}' uses '{varying.Name}', which varies per replicate; a parameter derived from it would not follow its draws (write the expression in the laws instead)");
            if (parameter.Varies is { } varies) CheckVariation(parameter, varies, i);
            if (!usable || _names.GetValueOrDefault(parameter.Name) is not { Kind: Kind.Parameter } declared || declared.Order != i) continue;
            if (Evaluate(parameter.Value) is not { } value) continue;
            if (!double.IsFinite(value))
            {
                _bag.Report(SpanOf(parameter.Value), $"parameter '{parameter.Name}' is {ConstantEvaluator.DescribeNonFinite(value)}; check for a division by zero or the log of a non-positive number");
                continue;
            }
            _parameterValues[parameter.Name] = value;
        }
    }

    private void CheckReactions()
    {
        foreach (var reaction in _model.Reactions)
        {
            CheckSide(reaction.Reactants);
            CheckSide(reaction.Products);
            CheckBursts(reaction);
            var forwardOk = CheckNames(reaction.Forward, PlaceOf(reaction.Law), 0, reaction.Name);
            var reverseOk = reaction.Reverse is null || CheckNames(reaction.Reverse, PlaceOf(reaction.BackLaw), 0, reaction.Name);
            var which = reaction.Reversible ? "forward " : "";
            if (forwardOk && reaction.Law == LawKind.Mass) CheckMassConstant(reaction.Forward, $"{which}mass-action constant of reaction '{reaction.Name}'");
            if (reverseOk && reaction.Reverse is not null && reaction.BackLaw == LawKind.Mass)
                CheckMassConstant(reaction.Reverse, $"reverse mass-action constant of reaction '{reaction.Name}'");
        }
    }

    private static Place PlaceOf(LawKind law) => law == LawKind.Mass ? Place.MassConstant : Place.RateLaw;

    private void CheckMassConstant(Expr constant, string what)
    {
        if (Evaluate(constant) is not { } value) return;
        if (!double.IsFinite(value))
            _bag.Report(SpanOf(constant), $"the {what} is {ConstantEvaluator.DescribeNonFinite(value)}");
        else if (value < 0)
            _bag.Report(SpanOf(constant), $"the {what} is negative ({value:G6} with the initial parameter values)");
    }

    // A burst's mean is a constant like a mass-action constant: positive and finite, no species, no time.
    private void CheckBursts(ReactionDecl reaction)
    {
        foreach (var term in reaction.Products.Terms)
        {
            if (term.BurstMean is not { } mean) continue;
            if (reaction.Reversible)
                _bag.Report(term.Position, $"reaction '{reaction.Name}' makes a burst and cannot be reversible; write the reverse direction as a reaction of its own");
            if (reaction.Reactants.Terms.Any(r => r.Species == term.Species))
                _bag.Report(term.Position, $"'{term.Species}' is both consumed and made in a burst by reaction '{reaction.Name}'; a burst makes a species the reaction does not consume");
            if (_model.Species.Any(s => s.Name == term.Species && s.Fixed))
                _bag.Report(term.Position, $"'{term.Species}' is held, so no reaction changes it; it cannot be made in a burst");
            if (!CheckNames(mean, Place.BurstSize, 0, reaction.Name) || Evaluate(mean) is not { } value) continue;
            if (!(value > 0) || !double.IsFinite(value))
                _bag.Report(SpanOf(mean), $"the mean burst size of '{term.Species}' in reaction '{reaction.Name}' must be a positive finite number, found {value:G6}");
        }
    }

    private void CheckSide(ReactionSide side)
    {
        foreach (var term in side.Terms)
        {
            var name = term.Species;
            if (_names.TryGetValue(name, out var declared))
            {
                if (declared.Kind != Kind.Species)
                    _bag.Report(term.Position, $"'{name}' is {Describe(declared.Kind)} (line {declared.Position.Line}), not a species");
            }
            else if (Reserved.Contains(name))
                _bag.Report(term.Position, $"'{name}' is a reserved name, not a species");
            else if (!_model.NamesOnBadLines.Contains(name))
                _bag.Report(term.Position, $"unknown species '{name}'{NameSuggestions.Hint(name, _species)}");
        }
    }

    private void CheckSchedule()
    {
        // The assignments of one line share its time expressions (by reference): check them once per line.
        var checkedTimes = new HashSet<Expr>(ReferenceEqualityComparer.Instance);
        foreach (var change in _model.Schedule)
        {
            if (checkedTimes.Add(change.Time)) CheckTiming(change);
            CheckTarget(change.Target, change.TargetPosition, change.Operation);
            CheckNames(change.Value, Place.ScheduleValue, 0, change.Target);
        }
    }

    private void CheckTiming(ScheduleDecl change)
    {
        double? first;
        if (change.Every is { } every)
        {
            var period = CheckNames(every, Place.ScheduleTime, 0, "") ? Evaluate(every) : null;
            if (period is { } p && !double.IsFinite(p))
                _bag.Report(SpanOf(every), $"the period of the repeating change is {ConstantEvaluator.DescribeNonFinite(p)}");
            else if (period is { } q && q <= 0)
                _bag.Report(SpanOf(every), $"the period of a repeating change must be positive, found {q:G6}");
            // without 'from' the first time is the period itself, checked just above
            first = ReferenceEquals(change.Time, every) ? period : CheckTime(change.Time, "first time of the repeating change");
        }
        else
        {
            first = CheckTime(change.Time, "change time");
        }
        if (change.Until is { } until && CheckTime(until, "last time of the repeating change") is { } last && first is { } from && last < from)
            _bag.Report(SpanOf(until), $"the last time of the repeating change ({last:G6}) is before its first time ({from:G6})");
    }

    // A time of a change: numbers, parameters and size; finite and not negative. Its value, when known.
    private double? CheckTime(Expr time, string what)
    {
        if (!CheckNames(time, Place.ScheduleTime, 0, "") || Evaluate(time) is not { } value) return null;
        if (!double.IsFinite(value))
            _bag.Report(SpanOf(time), $"the {what} is {ConstantEvaluator.DescribeNonFinite(value)}");
        else if (value < 0)
            _bag.Report(SpanOf(time), $"the {what} must not be negative, found {value:G6}");
        else
            return value;
        return null;
    }

    private void CheckTriggers()
    {
        foreach (var trigger in _model.Triggers)
        {
            foreach (var assignment in trigger.Assignments)
            {
                CheckTarget(assignment.Target, assignment.TargetPosition, assignment.Operation);
                CheckNames(assignment.Value, Place.ScheduleValue, 0, assignment.Target);
            }
            CheckNames(trigger.Condition, Place.Condition, 0, "");
        }
    }

    private void CheckTarget(string name, SourcePosition at, ScheduleOperation operation)
    {
        if (_names.TryGetValue(name, out var declared))
        {
            if (declared.Kind == Kind.Readout)
                _bag.Report(at, $"readout '{name}' cannot be changed; a change sets a species or a parameter");
            else if (declared.Kind == Kind.Parameter && operation != ScheduleOperation.Set)
                _bag.Report(at, $"parameter '{name}' can only be set with '=', not changed with '{(operation == ScheduleOperation.Add ? "+=" : "-=")}'; write '{name} = {name} {(operation == ScheduleOperation.Add ? '+' : '-')} ...'");
        }
        else if (name == "size")
            _bag.Report(at, "the system size cannot be changed");
        else if (Reserved.Contains(name))
            _bag.Report(at, $"'{name}' cannot be changed; a change sets a species or a parameter");
        else if (!_model.NamesOnBadLines.Contains(name))
            _bag.Report(at, $"unknown change target '{name}'{NameSuggestions.Hint(name, _species.Concat(_parameters))}");
    }

    private void CheckReadouts()
    {
        foreach (var readout in _model.Readouts)
            CheckNames(readout.Value, Place.Readout, 0, readout.Name);
    }

    private void CheckNotEmpty()
    {
        if (_model.Species.Count == 0 && _model.BadLines.GetValueOrDefault(Section.Species) == 0)
            _bag.Report(_model.Headers.GetValueOrDefault(Section.Species, new SourcePosition(1, 1)),
                "the model declares no species; list them under a 'species' header, as in 'A = 10'");
        if (_model.Reactions.Count == 0 && _model.BadLines.GetValueOrDefault(Section.Reactions) == 0)
            _bag.Report(_model.Headers.GetValueOrDefault(Section.Reactions, new SourcePosition(1, 1)),
                "the model has no reactions; list them under a 'reactions' header, as in 'decay: A -> 0 mass 0.1'");
        if (_model.Cycle.Header is { } cycle && _model.Cycle.Length is null && _model.BadLines.GetValueOrDefault(Section.Cycle) == 0)
            _bag.Report(cycle, "the cycle needs its length, as in 'length 40' or 'length 40 gamma cv 0.1'");
    }

    /// <summary>
    /// Reports every name and call in <paramref name="expr"/> that its place does not allow; true when
    /// there was nothing to report. Walks with an explicit stack, so long expressions cost no recursion.
    /// </summary>
    /// <param name="expr">The expression.</param>
    /// <param name="place">Where it stands.</param>
    /// <param name="order">For a parameter, its index: it may use only parameters before it.</param>
    /// <param name="owner">The declaration the expression belongs to, for messages.</param>
    private bool CheckNames(Expr expr, Place place, int order, string owner)
    {
        var before = _bag.Count;
        var pending = new Stack<Expr>();
        pending.Push(expr);
        while (pending.TryPop(out var node))
        {
            switch (node)
            {
                case NameExpr name:
                    CheckName(name, place, order, owner);
                    break;
                case NegateExpr negate:
                    pending.Push(negate.Operand);
                    break;
                case BinaryExpr binary:
                    pending.Push(binary.Right);
                    pending.Push(binary.Left);
                    break;
                case CallExpr call:
                    CheckCall(call);
                    for (var i = call.Arguments.Count - 1; i >= 0; i--) pending.Push(call.Arguments[i]);
                    break;
                case CompareExpr compare:
                    pending.Push(compare.Right);
                    pending.Push(compare.Left);
                    break;
                case LogicExpr logic:
                    pending.Push(logic.Right);
                    pending.Push(logic.Left);
                    break;
                case NotExpr not:
                    pending.Push(not.Operand);
                    break;
            }
        }
        return _bag.Count == before;
    }

    private void CheckName(NameExpr use, Place place, int order, string owner)
    {
        var name = use.Name;
        var at = use.Position;
        switch (name)
        {
            case "size":
                return;
            case "time" when place == Place.RateLaw:
                return;
            case "time":
                _bag.Report(at, place == Place.MassConstant
                    ? "a mass-action constant may not depend on 'time'; write a rate law, as in 'rate k * (1 + sin(w * time)) * A'"
                    : $"{Describe(place)} may not depend on 'time'; only rate laws may (use a change line 'x = ...  at time T' to change a value at a given time)");
                return;
            case "replicate":
                _bag.Report(at, "expressions may not use 'replicate': every replicate runs the same model (use a change line for changes over time)");
                return;
        }
        if (!_names.TryGetValue(name, out var declared))
        {
            if (_model.NamesOnBadLines.Contains(name)) return;
            _bag.Report(at, $"unknown name '{name}'{NameSuggestions.Hint(name, Allowed(place, order))}");
            return;
        }
        switch (declared.Kind, place)
        {
            case (Kind.Species, Place.Parameter):
                _bag.Report(at, $"parameter '{owner}' may not depend on species '{name}'; a parameter is a constant (use a rate law or a readout for expressions of species)");
                break;
            case (Kind.Species, Place.BurstSize):
                _bag.Report(at, $"a mean burst size may not depend on species '{name}'; it is a number, parameter or 'size'");
                break;
            case (Kind.Species, Place.MassConstant):
                _bag.Report(at, $"mass-action constant may not depend on species '{name}'; write a rate law instead");
                break;
            case (Kind.Species, Place.ScheduleTime):
                _bag.Report(at, $"a change time may not depend on species '{name}'; it is a number, parameter or 'size' (a change on a condition of the state is written with 'whenever')");
                break;
            case (Kind.Parameter, Place.Parameter) when declared.Order == order:
                _bag.Report(at, $"parameter '{name}' is used in its own definition");
                break;
            case (Kind.Parameter, Place.Parameter) when declared.Order > order:
                _bag.Report(at, $"parameter '{name}' is defined further down (line {declared.Position.Line}); a parameter may use only parameters defined above it");
                break;
            case (Kind.Readout, Place.Readout):
                _bag.Report(at, $"readout '{owner}' may not use another readout ('{name}'); write its expression out");
                break;
            case (Kind.Readout, _):
                _bag.Report(at, $"readout '{name}' cannot be used in {Describe(place)}; readouts are outputs only, write the expression out");
                break;
        }
    }

    private static string Describe(Place place) => place switch
    {
        Place.Parameter => "a parameter",
        Place.MassConstant => "a mass-action constant",
        Place.RateLaw => "a rate law",
        Place.ScheduleTime => "a change time",
        Place.ScheduleValue => "a change value",
        Place.Condition => "a condition",
        Place.BurstSize => "a mean burst size",
        _ => "a readout",
    };

    private IEnumerable<string> Allowed(Place place, int order)
    {
        var species = place is Place.RateLaw or Place.ScheduleValue or Place.Readout or Place.Condition ? _species : [];
        var parameters = place == Place.Parameter
            ? _parameters.Where(p => _names[p].Order < order)
            : _parameters;
        return species.Concat(parameters).Append("size");
    }

    private void CheckCall(CallExpr call)
    {
        if (BuiltinFunctions.Arity.TryGetValue(call.Function, out var arity))
        {
            if (arity != call.Arguments.Count)
            {
                var plural = arity == 1 ? "argument" : "arguments";
                _bag.Report(call.Position, $"function '{call.Function}' takes {arity} {plural}, {BuiltinFunctions.Signature[call.Function]}, but is given {call.Arguments.Count}");
            }
            return;
        }
        if (_names.ContainsKey(call.Function) || Reserved.Contains(call.Function))
        {
            _bag.Report(call.Position, $"'{call.Function}' is not a function; write '*' to multiply, as in '{call.Function} * (...)'");
            return;
        }
        var hint = NameSuggestions.Hint(call.Function, BuiltinFunctions.Arity.Keys);
        _bag.Report(call.Position, hint.Length > 0
            ? $"unknown function '{call.Function}'{hint}"
            : $"unknown function '{call.Function}'; the functions are {string.Join(", ", BuiltinFunctions.Arity.Keys)}");
    }

    private double? Evaluate(Expr expr) =>
        ConstantEvaluator.Evaluate(expr, name => name == "size" ? _model.Size : _parameterValues.TryGetValue(name, out var v) ? v : null);

    private SourcePosition SpanOf(Expr expr) => _model.Spans.GetValueOrDefault(expr, expr.Position);
}
