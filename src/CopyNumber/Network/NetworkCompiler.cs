using System.Globalization;
using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// Turns a checked model into an immutable <see cref="ReactionNetwork"/>: resolves names to indices,
/// evaluates parameters, splits reversible lines, builds N (dropping the entries of held species),
/// compiles every law to delegates (with symbolic derivatives for the exact Jacobian), classifies
/// readouts, orders the timed changes and compiles the state-triggered ones.
/// </summary>
public static partial class NetworkCompiler
{
    /// <summary>
    /// Compiles <paramref name="model"/>. Every compile-time mistake left after the checker (a parameter
    /// that is not a finite number, a negative or NaN mass-action constant, a negative schedule time, a
    /// count that overflows when scaled to a new size, ...) is reported as a diagnostic, sorted by position;
    /// the network is null when there is any.
    /// </summary>
    /// <param name="model">The parsed model, its names checked.</param>
    /// <param name="options">A size override and the source text for messages; null for neither.</param>
    public static CompileOutcome Compile(ModelSyntax model, CompileOptions? options = null) =>
        new Compilation(model, options ?? new CompileOptions()).Run();

    /// <summary>A reaction after reversible lines are split: one column of N.</summary>
    private sealed record Column(
        string Name,
        SourcePosition Position,
        (int Species, long Coefficient)[] Reactants,
        (int Species, long Coefficient)[] Products,
        LawKind Law,
        Expr LawExpression,
        (int Species, Expr Mean)[]? Bursts = null);

    /// <summary>The kinetics of one column, in the shapes Propensities and RateEquations take.</summary>
    private sealed record ColumnKinetics(
        StateLaw? MassConstant,
        CountLaw? CountRate,
        StateLaw? StateRate,
        IReadOnlyList<(int Species, StateLaw Derivative)> Derivatives,
        IReadOnlyCollection<int> SpeciesRead);

    private sealed partial class Compilation(ModelSyntax model, CompileOptions options)
    {
        private readonly List<Diagnostic> _diagnostics = [];
        private ExpressionScope _scope = null!;
        private double[] _parameterValues = [];
        private readonly HashSet<string> _brokenParameters = [];
        private readonly Dictionary<string, StateLaw> _constantLaws = [];
        private readonly List<ParameterVariability.Varying> _varying = [];

        public CompileOutcome Run()
        {
            var size = Size();
            if (size is null) return Failed();
            var speciesNames = model.Species.Select(s => s.Name).ToArray();
            var (counts, amounts) = InitialCounts(size.Value);
            var readoutDefinitions = new Dictionary<string, Expr>();
            foreach (var r in model.Readouts) readoutDefinitions.TryAdd(r.Name, r.Value);
            var parameterNames = model.Parameters.Select(p => p.Name).Concat(model.Cycle is null ? [] : [CellCycle.BirthName, CellCycle.LengthName]).ToArray();
            _scope = new ExpressionScope(speciesNames, parameterNames, size.Value, readoutDefinitions);
            _parameterValues = ParameterValues();
            if (model.Cycle is { } cycleLines) _parameterValues = [.. _parameterValues, 0.0, CycleLength(cycleLines)];

            var columns = Columns();
            var kinetics = columns.Select(CompileKinetics).ToArray();
            var readouts = model.Readouts.Select(CompileReadout).ToArray();
            var schedule = model.Schedule.Select(CompileChange).ToArray();
            var triggers = model.TriggerLines.Select(CompileTrigger).ToArray();
            if (_diagnostics.Count > 0) return Failed();

            var held = model.Species.Select(s => s.Fixed).ToArray();
            var stoichiometry = new Stoichiometry(model.Species.Count, Sparse(columns, held));
            var propensities = new Propensities(
                size.Value,
                columns.Select(c => (IReadOnlyList<(int, long)>)c.Reactants).ToArray(),
                kinetics.Select(k => k!.MassConstant).ToArray(),
                kinetics.Select(k => k!.CountRate).ToArray());
            var bursts = new BurstProducts(columns.Length, columns.SelectMany((c, j) => (c.Bursts ?? []).Select(b =>
                new BurstProducts.Burst(j, b.Species, ExpressionCompiler.CompileStateLaw(_scope.Expand(b.Mean), _scope)))));
            var rateEquations = new RateEquations(
                stoichiometry,
                propensities,
                kinetics.Select(k => k!.StateRate).ToArray(),
                kinetics.Select(k => k!.Derivatives).ToArray(),
                bursts);
            var dependencies = new DependencyGraph(stoichiometry, kinetics.Select(k => k!.SpeciesRead).ToArray());
            var timeDependence = TimeDependence.Compile(
                columns.Select(c => _growingLaws.TryGetValue(c, out var growing) ? growing : c.Law == LawKind.Rate ? _scope.Expand(c.LawExpression) : null).ToArray(), _scope);
            var cycle = model.Cycle is { } declared ? CompileCycle(declared) : null;
            if (_diagnostics.Count > 0) return Failed();
            var reactions = columns
                .Select(c => new Reaction(c.Name, c.Reactants, c.Products, c.Law, ExpressionText.Format(c.LawExpression)))
                .ToArray();
            var network = new ReactionNetwork(
                Path.GetFileNameWithoutExtension(model.File),
                model.File,
                size.Value,
                speciesNames,
                counts,
                parameterNames,
                _parameterValues,
                reactions,
                stoichiometry,
                dependencies,
                propensities,
                rateEquations,
                readouts.Select(r => r!).ToArray(),
                schedule.Select(s => s!).ToArray(),
                amounts,
                triggers.Select(t => t!).ToArray(),
                new ModelUnits(model.TimeUnit, model.SizeUnit),
                held,
                model.Species.Select(s => s.Position).ToArray(),
                timeDependence,
                bursts,
                _varying.Count > 0 ? new ParameterVariability(_varying) : null,
                cycle);
            return new CompileOutcome(network, []);
        }

        private CompileOutcome Failed() =>
            new(null, _diagnostics.OrderBy(d => d.Position.Line).ThenBy(d => d.Position.Column).ToArray());

        private double? Size()
        {
            if (!(model.Size > 0) || !double.IsFinite(model.Size))
            {
                Report(default, $"the system size must be a positive finite number, not {Describe(model.Size)}");
                return null;
            }
            if (options.SizeOverride is not { } size) return model.Size;
            if (size > 0 && double.IsFinite(size)) return size;
            Report(default, $"the size override must be a positive finite number, not {Describe(size)}");
            return null;
        }

        // Scaling by Ω/Ω₀ keeps each initial concentration count/Ω (up to rounding to a whole count); a
        // non-integer amount is scaled without rounding (only the deterministic methods accept it).
        private (long[] Counts, double[] Amounts) InitialCounts(double size)
        {
            var ratio = size / model.Size;
            var counts = new long[model.Species.Count];
            var amounts = new double[model.Species.Count];
            for (var i = 0; i < counts.Length; i++)
            {
                var species = model.Species[i];
                amounts[i] = species.InitialAmount * ratio;
                if (species.FractionalAmount is { } fraction)
                {
                    if (!(fraction >= 0) || !double.IsFinite(amounts[i]))
                        Report(species.Position, $"the initial amount of '{species.Name}' must be a finite number, zero or more");
                    counts[i] = (long)Math.Min(Math.Round(amounts[i], MidpointRounding.AwayFromZero), 9.2e18);
                    continue;
                }
                if (species.InitialCount < 0)
                {
                    Report(species.Position, $"the initial count of '{species.Name}' is negative");
                    continue;
                }
                if (ratio == 1 || species.InitialCount == 0) { counts[i] = species.InitialCount; amounts[i] = counts[i]; continue; }
                var scaled = Math.Round(species.InitialCount * ratio, MidpointRounding.AwayFromZero);
                // 2^63 is the first double a long cannot hold
                if (scaled >= 9223372036854775808.0)
                    Report(species.Position,
                        $"the initial count of '{species.Name}' becomes {Describe(scaled)} at size {Describe(size)}, more than a count can hold");
                else counts[i] = (long)scaled;
                amounts[i] = counts[i];
            }
            return (counts, amounts);
        }

        private double[] ParameterValues()
        {
            var values = new double[model.Parameters.Count];
            for (var p = 0; p < values.Length; p++)
            {
                var parameter = model.Parameters[p];
                var defined = p;
                double? ValueOf(string name)
                {
                    if (name == ExpressionScope.SizeName) return _scope.Size;
                    var index = _scope.ParameterIndex(name);
                    return index >= 0 && index < defined ? values[index] : null;
                }

                var value = double.NaN;
                if (!Guard(() => value = Evaluate(parameter.Value, ValueOf, "a parameter", laterParameterIndex: defined)))
                {
                    _brokenParameters.Add(parameter.Name);
                    continue;
                }
                values[p] = value;
                if (parameter.Varies is { } varies && double.IsFinite(value))
                {
                    var cv = double.NaN;
                    if (Guard(() => cv = Evaluate(varies.Cv, ValueOf, "a coefficient of variation", laterParameterIndex: defined)))
                        _varying.Add(new ParameterVariability.Varying(p, varies.Law, value, cv));
                    if (varies.Law is "lognormal" or "gamma" && !(value > 0))
                        Report(parameter.Position, $"parameter '{parameter.Name}' varies by a {varies.Law} law, whose values are positive, so its mean must be positive, not {Describe(value)}");
                }
                if (double.IsFinite(value)) continue;
                if (!ReadsBrokenParameter(parameter.Value))
                    Report(parameter.Position, $"parameter '{parameter.Name}' evaluates to {Describe(value)}");
                _brokenParameters.Add(parameter.Name);
            }
            return values;
        }

        /// <summary>Whether an expression uses a parameter already reported; its own faults would only repeat that report.</summary>
        private bool ReadsBrokenParameter(Expr expression) =>
            ExpressionGraph.NamesUsed(_scope.Expand(expression)).Any(_brokenParameters.Contains);

        /// <summary>Evaluates a compile-time expression; a name without a value is explained.</summary>
        private double Evaluate(Expr expression, Func<string, double?> valueOf, string what, int laterParameterIndex = int.MaxValue)
        {
            if (ConstantEvaluation.TryEvaluate(expression, valueOf, out var value)) return value;
            var name = ExpressionScope.Names(expression).First(n => valueOf(n.Name) is null);
            var parameter = _scope.ParameterIndex(name.Name);
            var message = _scope.SpeciesIndex(name.Name) >= 0 ? $"{what} cannot depend on species '{name.Name}'"
                : parameter >= laterParameterIndex ? $"{what} can only use parameters defined before it, and '{name.Name}' is not"
                : $"'{name.Name}' cannot be used in {what}";
            throw new ModelException(name.Position, message);
        }

        private Column[] Columns()
        {
            var columns = new List<Column>();
            foreach (var line in model.Reactions)
            {
                var reactants = Side(line.Reactants);
                var products = Side(line.Products);
                if (!line.Reversible)
                {
                    columns.Add(new Column(line.Name, line.Position, reactants, products, line.Law, line.Forward,
                        line.Products.Terms.Where(t => t.BurstMean is not null).Select(t => (_scope.SpeciesIndex(t.Species), t.BurstMean!)).ToArray()));
                    continue;
                }
                if (line.Reverse is null)
                {
                    Report(line.Position, $"reversible reaction '{line.Name}' needs a second constant for its reverse direction");
                    continue;
                }
                columns.Add(new Column(line.Name + "_fwd", line.Position, reactants, products, line.Law, line.Forward));
                columns.Add(new Column(line.Name + "_rev", line.Position, products, reactants, line.BackLaw, line.Reverse));
            }
            foreach (var clash in columns.GroupBy(c => c.Name).Where(g => g.Count() > 1))
                Report(clash.Last().Position, $"reaction name '{clash.Key}' is used twice (a reversible reaction 'r' also makes 'r_fwd' and 'r_rev')");
            return columns.ToArray();
        }

        /// <summary>A reaction side with repeated species merged (A + A is 2 A), in order of first appearance.</summary>
        private (int Species, long Coefficient)[] Side(ReactionSide side)
        {
            var terms = new List<(int Species, long Coefficient)>();
            foreach (var term in side.Terms)
            {
                var species = _scope.SpeciesIndex(term.Species);
                if (species < 0) { Report(term.Position, $"unknown species '{term.Species}'"); continue; }
                if (term.Coefficient <= 0) { Report(term.Position, "a stoichiometric coefficient must be a positive whole number"); continue; }
                var at = terms.FindIndex(t => t.Species == species);
                if (at < 0) terms.Add((species, term.Coefficient));
                else terms[at] = (species, terms[at].Coefficient + term.Coefficient);
            }
            return terms.ToArray();
        }

        /// <summary>
        /// N = products − reactants, column by column: never the dense species × reactions matrix, which for a
        /// chain of 30 000 reactions would take 7 GB. A held species' entries are dropped (its row of N is 0),
        /// as for an SBML boundary species: a reaction reads its count but does not change it.
        /// </summary>
        private static IReadOnlyList<(int Species, long Change)>[] Sparse(Column[] columns, bool[] held) =>
            columns.Select(c => (IReadOnlyList<(int, long)>)c.Reactants.Select(r => (r.Species, -r.Coefficient))
                .Concat(c.Products).Where(e => !held[e.Species]).ToArray()).ToArray();

        private ColumnKinetics? CompileKinetics(Column column)
        {
            ColumnKinetics? kinetics = null;
            Guard(() => kinetics = model.Cycle is not null && GrowingKinetics(column) is { } growing ? growing
                : column.Law == LawKind.Mass ? MassAction(column) : RateLaw(column));
            return kinetics;
        }

        private ColumnKinetics MassAction(Column column)
        {
            var expanded = _scope.Expand(column.LawExpression);
            var read = _scope.SpeciesRead(expanded);
            if (read.Count > 0)
                throw new ModelException(column.LawExpression.Position,
                    $"the mass-action constant of reaction '{column.Name}' cannot depend on species '{model.Species[read[0]].Name}'; write a rate law instead");
            // Large generated networks repeat a few constants (k, 2*k, ...): one delegate for each text.
            var text = ExpressionText.Format(expanded);
            if (!_constantLaws.TryGetValue(text, out var constant))
                _constantLaws[text] = constant = ExpressionCompiler.CompileStateLaw(expanded, _scope);
            var k = constant([], _parameterValues);
            if ((!double.IsFinite(k) || k < 0) && !ReadsBrokenParameter(expanded))
                throw new ModelException(column.LawExpression.Position,
                    $"the mass-action constant of reaction '{column.Name}' is {Describe(k)}; it must be a finite number, zero or more");
            return new ColumnKinetics(constant, null, null, [], column.Reactants.Select(r => r.Species).ToArray());
        }

        private ColumnKinetics RateLaw(Column column) => RateLaw(_scope.Expand(column.LawExpression));

        // A propensity written out; also the laws that a cell cycle rewrites with the volume V(t).
        private ColumnKinetics RateLaw(Expr expanded)
        {
            var read = _scope.SpeciesRead(expanded);
            var derivatives = new List<(int Species, StateLaw Derivative)>();
            foreach (var species in read)
            {
                var derivative = SymbolicDerivative.Differentiate(expanded, model.Species[species].Name);
                if (derivative is NumberExpr { Value: 0 }) continue; // RateEquations leaves absent entries at zero
                derivatives.Add((species, ExpressionCompiler.CompileStateLaw(derivative, _scope)));
            }
            return new ColumnKinetics(null,
                ExpressionCompiler.CompileCountLaw(expanded, _scope),
                ExpressionCompiler.CompileStateLaw(expanded, _scope),
                derivatives,
                read);
        }

        private Readout? CompileReadout(ReadoutDecl readout)
        {
            Readout? compiled = null;
            Guard(() =>
            {
                var expanded = _scope.Expand(readout.Value);
                compiled = new Readout(
                    readout.Name,
                    ExpressionText.Format(readout.Value),
                    IntegerCombination.Holds(expanded, _scope),
                    ExpressionCompiler.CompileCountLaw(expanded, _scope),
                    ExpressionCompiler.CompileStateLaw(expanded, _scope));
            });
            return compiled;
        }

        private ScheduledChange? CompileChange(ScheduleDecl change)
        {
            ScheduledChange? compiled = null;
            Guard(() =>
            {
                var time = Evaluate(change.Time, ParameterOrSize, "a change time");
                if ((!double.IsFinite(time) || time < 0) && !ReadsBrokenParameter(change.Time))
                    throw new ModelException(change.Time.Position, $"the change time is {Describe(time)}; it must be a finite number, zero or more");
                double? every = null;
                if (change.Every is { } period)
                {
                    every = Evaluate(period, ParameterOrSize, "the period of a repeating change");
                    if (!(every > 0) || !double.IsFinite(every.Value))
                        throw new ModelException(period.Position, $"the period of the repeating change is {Describe(every.Value)}; it must be a positive finite number");
                }
                var until = change.Until is { } last ? Evaluate(last, ParameterOrSize, "the last time of a repeating change") : double.PositiveInfinity;
                if (double.IsNaN(until) || until < time)
                    throw new ModelException(change.Until!.Position, $"the last time of the repeating change is {Describe(until)}; it must not be before the first time {Describe(time)}");
                compiled = Assignment(change.Target, change.TargetPosition, change.Operation, change.Value, time) with
                {
                    Every = every,
                    Until = until,
                    Order = _changesCompiled,
                };
            });
            _changesCompiled++;
            return compiled;
        }

        private int _changesCompiled;

        /// <summary>One assignment of a change line, resolved; <paramref name="time"/> is NaN for a triggered one.</summary>
        private ScheduledChange Assignment(string target, SourcePosition at, ScheduleOperation operation, Expr value, double time)
        {
            var species = _scope.SpeciesIndex(target);
            var parameter = _scope.ParameterIndex(target);
            if (species < 0 && parameter < 0)
                throw new ModelException(at, $"'{target}' is neither a species nor a parameter");
            if (species < 0 && operation != ScheduleOperation.Set)
                throw new ModelException(at, $"parameter '{target}' can only be set, not added to or subtracted from");
            return new ScheduledChange(
                time,
                species >= 0 ? ScheduleTarget.Species : ScheduleTarget.Parameter,
                species >= 0 ? species : parameter,
                target,
                operation,
                ExpressionCompiler.CompileCountLaw(value, _scope),
                ExpressionCompiler.CompileStateLaw(value, _scope))
            { Text = $"{target} {Operator(operation)} {ExpressionText.Format(value)}" };
        }

        private StateTrigger? CompileTrigger(TriggerDecl trigger)
        {
            StateTrigger? compiled = null;
            Guard(() =>
            {
                var assignments = trigger.Assignments.Select(a => Assignment(a.Target, a.TargetPosition, a.Operation, a.Value, double.NaN)).ToArray();
                var text = string.Join(", ", trigger.Assignments.Select(a => $"{a.Target} {Operator(a.Operation)} {ExpressionText.Format(a.Value)}"))
                           + "  whenever " + ExpressionText.Format(trigger.Condition);
                var condition = _scope.Expand(trigger.Condition);
                compiled = new StateTrigger(trigger.Position, text, assignments,
                    ExpressionCompiler.CompileCountLaw(condition, _scope),
                    ExpressionCompiler.CompileStateLaw(condition, _scope))
                { SpeciesRead = _scope.SpeciesRead(condition) };
            });
            return compiled;
        }

        private static string Operator(ScheduleOperation operation) => operation switch
        {
            ScheduleOperation.Set => "=",
            ScheduleOperation.Add => "+=",
            _ => "-=",
        };

        private double? ParameterOrSize(string name)
        {
            if (name == ExpressionScope.SizeName) return _scope.Size;
            var index = _scope.ParameterIndex(name);
            return index >= 0 ? _parameterValues[index] : null;
        }

        /// <summary>Runs one item's compilation; a model mistake becomes a diagnostic and the item is skipped.</summary>
        private bool Guard(Action step)
        {
            try
            {
                step();
                return true;
            }
            catch (ModelException e)
            {
                Report(e.Position, e.Message);
                return false;
            }
        }

        private void Report(SourcePosition position, string message)
        {
            var lines = options.SourceLines;
            var line = lines is not null && position.Line >= 1 && position.Line <= lines.Count ? lines[position.Line - 1] : "";
            _diagnostics.Add(new Diagnostic(model.File, position, message, line));
        }

        private static string Describe(double value) =>
            double.IsNaN(value) ? "NaN (not a number)"
            : double.IsPositiveInfinity(value) ? "infinite"
            : double.IsNegativeInfinity(value) ? "minus infinity"
            : value.ToString("G6", CultureInfo.InvariantCulture);
    }
}
