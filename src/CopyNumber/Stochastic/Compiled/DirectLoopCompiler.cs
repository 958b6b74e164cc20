using System.Linq.Expressions;
using System.Reflection;
using System.Runtime.CompilerServices;
using CopyNumber.Kinetics;
using CopyNumber.Randomness;
using static System.Linq.Expressions.Expression;

namespace CopyNumber.Stochastic.Compiled;

/// <summary>
/// Writes the expression tree of <see cref="CompiledDirectLoop"/>'s event loop for one network: the general
/// loop of <see cref="DirectMethod{TSelection}"/> with every reaction's firing written out (count changes,
/// then its propensity updates in the firing program's order), the selection unrolled into a chain of
/// subtract-and-branch that jumps straight to the chosen reaction's code, and the checks that cannot fail
/// for this network left out: the overflow check of a count change that lowers the count, the usability
/// check of a constant propensity and of a product whose folded constant keeps it finite and ≥ 0.
/// </summary>
internal sealed class DirectLoopCompiler
{
    /// <summary>
    /// Largest constant for which c·x·y and c·x·(x−1) stay finite for counts up to 2^62 (2^124 ≈ 2.1·10³⁷):
    /// below it a bimolecular or homodimer propensity needs no usability check.
    /// </summary>
    private const double SafeProductConstant = 1e270;

    private readonly SimulatorState _state;
    private readonly FiringProgram _program;
    private readonly int _reactions;
    private readonly int _species;

    // Parameters of the generated method.
    private readonly ParameterExpression _stateArgument = Parameter(typeof(SimulatorState), "state");
    private readonly ParameterExpression _guardArgument = Parameter(typeof(RunawayGuard).MakeByRefType(), "guard");
    private readonly ParameterExpression _rngArgument = Parameter(typeof(Xoshiro256StarStar).MakeByRefType(), "rng");
    private readonly ParameterExpression _timeArgument = Parameter(typeof(double).MakeByRefType(), "time");
    private readonly ParameterExpression _horizon = Parameter(typeof(double), "horizon");
    private readonly ParameterExpression _budget = Parameter(typeof(long), "budget");
    private readonly ParameterExpression _recorder = Parameter(typeof(GridRecorder), "recorder");
    private readonly ParameterExpression _eventsArgument = Parameter(typeof(long).MakeByRefType(), "events");
    private readonly ParameterExpression _maxEvents = Parameter(typeof(long), "maxEvents");
    private readonly ParameterExpression _selectionArgument = Parameter(typeof(LinearSelection).MakeByRefType(), "selection");

    // Locals: the generator, time, counts and propensities of the segment.
    private readonly ParameterExpression _random = Variable(typeof(Xoshiro256StarStar), "random");
    private readonly ParameterExpression _t = Variable(typeof(double), "t");
    private readonly ParameterExpression _next = Variable(typeof(double), "next");
    private readonly ParameterExpression _fired = Variable(typeof(long), "fired");
    private readonly ParameterExpression _total = Variable(typeof(double), "total");
    private readonly ParameterExpression _peak = Variable(typeof(double), "peak");
    private readonly ParameterExpression _untilResum = Variable(typeof(int), "untilResum");
    private readonly ParameterExpression _nextGrid = Variable(typeof(double), "nextGrid");
    private readonly ParameterExpression _point = Variable(typeof(double), "point");
    private readonly ParameterExpression _change = Variable(typeof(double), "change");
    private readonly ParameterExpression _end = Variable(typeof(SegmentEnd), "end");
    private readonly ParameterExpression _countArray = Variable(typeof(long[]), "countArray");
    private readonly ParameterExpression _valueArray = Variable(typeof(double[]), "valueArray");
    private readonly ParameterExpression _switches = Variable(typeof(TransitionCounter), "switches");
    private readonly ParameterExpression _modes = Variable(typeof(ModeWatch), "modes");
    private readonly ParameterExpression[] _counts;
    private readonly ParameterExpression[] _propensities;

    private readonly LabelTarget _loop = Label("loop");
    private readonly LabelTarget _afterFiring = Label("afterFiring");
    private readonly LabelTarget _exit = Label("exit");
    private readonly LabelTarget[] _fire;

    public DirectLoopCompiler(SimulatorState state, FiringProgram program)
    {
        _state = state;
        _program = program;
        _reactions = state.ReactionCount;
        _species = state.SpeciesCount;
        _counts = Enumerable.Range(0, _species).Select(i => Variable(typeof(long), $"x{i}")).ToArray();
        _propensities = Enumerable.Range(0, _reactions).Select(j => Variable(typeof(double), $"a{j}")).ToArray();
        _fire = Enumerable.Range(0, _reactions).Select(j => Label($"fire{j}")).ToArray();
    }

    /// <summary>Generates and compiles the loop.</summary>
    public CompiledAdvance Compile()
    {
        var body = new List<Expression>();
        body.AddRange(Enter());
        body.Add(Label(_loop));
        body.AddRange(DrawWaitingTime());
        body.AddRange(Select());
        for (var j = 0; j < _reactions; j++) body.AddRange(Fire(j));
        body.Add(Label(_afterFiring));
        body.AddRange(EndEvent());
        body.Add(Goto(_loop));
        body.Add(Label(_exit));
        body.AddRange(Leave());
        body.Add(_end);
        var locals = new List<ParameterExpression>
        {
            _random, _t, _next, _fired, _total, _peak, _untilResum, _nextGrid, _point, _change, _end, _countArray, _valueArray, _switches, _modes,
        };
        locals.AddRange(_counts);
        locals.AddRange(_propensities);
        var lambda = Lambda<CompiledAdvance>(Block(locals, body), "DirectLoop",
            [_stateArgument, _guardArgument, _rngArgument, _timeArgument, _horizon, _budget, _recorder, _eventsArgument, _maxEvents, _selectionArgument]);
        return lambda.Compile();
    }

    private IEnumerable<Expression> Enter()
    {
        yield return Assign(_countArray, Property(_stateArgument, nameof(SimulatorState.Counts)));
        yield return Assign(_switches, Property(_stateArgument, nameof(SimulatorState.Switches)));
        yield return Assign(_modes, Property(_stateArgument, nameof(SimulatorState.Modes)));
        yield return Assign(_valueArray, Field(_selectionArgument, nameof(LinearSelection._values)));
        yield return Assign(_random, _rngArgument);
        yield return Assign(_t, _timeArgument);
        yield return Assign(_fired, _eventsArgument);
        yield return Assign(_total, Field(_selectionArgument, nameof(LinearSelection._total)));
        yield return Assign(_peak, Field(_selectionArgument, nameof(LinearSelection._peak)));
        yield return Assign(_untilResum, Field(_selectionArgument, nameof(LinearSelection._untilResum)));
        yield return Assign(_nextGrid, Property(_recorder, nameof(GridRecorder.NextTime)));
        for (var i = 0; i < _species; i++) yield return Assign(_counts[i], ArrayIndex(_countArray, Constant(i)));
        for (var j = 0; j < _reactions; j++) yield return Assign(_propensities[j], ArrayIndex(_valueArray, Constant(j)));
    }

    private IEnumerable<Expression> Leave()
    {
        yield return StoreCounts();
        yield return StorePropensities();
        yield return Assign(Field(_selectionArgument, nameof(LinearSelection._total)), _total);
        yield return Assign(Field(_selectionArgument, nameof(LinearSelection._peak)), _peak);
        yield return Assign(Field(_selectionArgument, nameof(LinearSelection._untilResum)), _untilResum);
        yield return Assign(_rngArgument, _random);
        yield return Assign(_eventsArgument, _fired);
        yield return Assign(_timeArgument, _t);
    }

    private Expression StoreCounts() =>
        Block(typeof(void), Enumerable.Range(0, _species).Select(i => Assign(ArrayAccess(_countArray, Constant(i)), _counts[i])));

    private Expression StorePropensities() =>
        Block(typeof(void), Enumerable.Range(0, _reactions).Select(j => Assign(ArrayAccess(_valueArray, Constant(j)), _propensities[j])));

    /// <summary>The waiting time, the stops (horizon, event limit), the runaway check, grid recording.</summary>
    private IEnumerable<Expression> DrawWaitingTime()
    {
        var exponential = Call(_random, typeof(Xoshiro256StarStar).GetMethod(nameof(Xoshiro256StarStar.NextExponential))!);
        yield return IfThenElse(GreaterThan(_total, Constant(0.0)),
            Block(
                IfThen(GreaterThan(_total, Constant(double.MaxValue)),
                    Block(StorePropensities(), Call(Exit(nameof(CompiledLoopExits.TotalOverflow)), _stateArgument, _t, _valueArray))),
                Assign(_next, Add(_t, Divide(exponential, _total)))),
            Assign(_next, Constant(double.PositiveInfinity)));
        yield return IfThen(GreaterThan(_next, _horizon), Block(Assign(_end, Constant(SegmentEnd.Horizon)), Goto(_exit)));
        yield return IfThen(GreaterThanOrEqual(_fired, _maxEvents), Block(Assign(_end, Constant(SegmentEnd.EventLimit)), Goto(_exit)));
        yield return IfThen(Call(typeof(RunawayGuard).GetMethod(nameof(RunawayGuard.Due))!, _fired, _maxEvents),
            Block(StorePropensities(),
                Call(Exit(nameof(CompiledLoopExits.CheckRunaway)), _guardArgument, _stateArgument, _total, _t, _horizon, _valueArray)));
        yield return IfThen(LessThan(_nextGrid, _next),
            Block(StoreCounts(),
                Assign(_nextGrid, Call(_recorder, typeof(GridRecorder).GetMethod(nameof(GridRecorder.RecordBefore))!, _next, _countArray))));
        yield return Assign(_t, _next);
    }

    /// <summary>
    /// <see cref="LinearSelection.Select(double)"/> unrolled: subtract each propensity in order and jump to
    /// the first reaction that takes the point below 0; after rounding, the last positive one.
    /// </summary>
    private IEnumerable<Expression> Select()
    {
        var nextDouble = Call(_random, typeof(Xoshiro256StarStar).GetMethod(nameof(Xoshiro256StarStar.NextDouble))!);
        yield return Assign(_point, Multiply(nextDouble, _total));
        for (var j = 0; j < _reactions; j++)
        {
            yield return SubtractAssign(_point, _propensities[j]);
            yield return IfThen(LessThan(_point, Constant(0.0)), Goto(_fire[j]));
        }
        for (var j = _reactions - 1; j >= 0; j--)
            yield return IfThen(GreaterThan(_propensities[j], Constant(0.0)), Goto(_fire[j]));
        yield return Call(Exit(nameof(CompiledLoopExits.NothingToSelect)));
        yield return Goto(_exit);
    }

    /// <summary>Reaction j's firing: count changes with their overflow headroom, the switch count, the watched modes, its propensity updates.</summary>
    private IEnumerable<Expression> Fire(int j)
    {
        yield return Label(_fire[j]);
        var header = Unsafe.Add(ref _program.Headers, j);
        for (var e = header.ChangeStart; e < header.ChangeEnd; e++)
        {
            var change = Unsafe.Add(ref _program.Changes, e);
            var count = _counts[change.Species];
            // A lowering change has headroom long.MaxValue: its check cannot fail and is left out.
            if (change.Headroom != long.MaxValue)
                yield return IfThen(GreaterThan(count, Constant(change.Headroom)),
                    Block(StoreCounts(), Call(Exit(nameof(CompiledLoopExits.CountOverflow)),
                        _stateArgument, Constant(j), Constant(change.Species), Constant(change.Amount), _t)));
            yield return AddAssign(count, Constant(change.Amount));
        }
        if (header.CountsSwitch)
            yield return Call(_switches, typeof(TransitionCounter).GetMethod(nameof(TransitionCounter.Fired))!, Constant(j), Constant(1L));
        // The watched species' new counts are in locals here, so they are handed over directly.
        foreach (var slot in _state.Modes.SlotsChangedBy(j).ToArray())
            yield return Call(_modes, typeof(ModeWatch).GetMethod(nameof(ModeWatch.Observe))!, Constant(slot), _counts[_state.Modes.Cores[slot].Species], _t);
        yield return Assign(_change, Constant(0.0));
        for (var u = header.UpdateStart; u < header.UpdateEnd; u++)
        {
            var update = Unsafe.Add(ref _program.Updates, u);
            var k = update.Reaction;
            var value = Variable(typeof(double), "value");
            var propensity = Propensity(update.Term);
            var steps = new List<Expression> { Assign(value, propensity) };
            if (u >= header.PlainEnd && !AlwaysUsable(update.Term))
                steps.Add(IfThen(Not(Call(typeof(UnusableRate).GetMethod(nameof(UnusableRate.IsUsable))!, value)),
                    Block(StoreCounts(), Call(Exit(nameof(CompiledLoopExits.BadPropensity)), _stateArgument, Constant(k), value, _t))));
            // LinearSelection.Replace, then the sum of changes: change += a − a_old; a_old = a.
            steps.Add(AddAssign(_change, Subtract(value, _propensities[k])));
            steps.Add(Assign(_propensities[k], value));
            yield return Block(typeof(void), [value], steps);
        }
        yield return Goto(_afterFiring);
    }

    /// <summary>
    /// <see cref="PropensityTerm.Evaluate"/> for the term's form with its constant as a literal, in the same
    /// order of operations (left to right) so the value has the same bits.
    /// </summary>
    private Expression Propensity(PropensityTerm term)
    {
        var c = Constant(term.Constant);
        return term.Form switch
        {
            PropensityForm.Constant => c,
            PropensityForm.Unimolecular => Multiply(c, Convert(_counts[term.SpeciesA], typeof(double))),
            PropensityForm.Bimolecular => Multiply(Multiply(c, Convert(_counts[term.SpeciesA], typeof(double))), Convert(_counts[term.SpeciesB], typeof(double))),
            PropensityForm.Homodimer => Multiply(Multiply(c, Convert(_counts[term.SpeciesA], typeof(double))),
                Subtract(Convert(_counts[term.SpeciesA], typeof(double)), Constant(1.0))),
            _ => throw new InvalidOperationException($"no generated code for propensity form {term.Form}"),
        };
    }

    /// <summary>True when the term's value is finite and ≥ 0 for every count from 0 to 2^62.</summary>
    private static bool AlwaysUsable(PropensityTerm term) =>
        term.Constant >= 0 && term.Form switch
        {
            PropensityForm.Constant => term.Constant <= double.MaxValue,
            PropensityForm.Unimolecular => term.Constant <= 1e290,
            PropensityForm.Bimolecular or PropensityForm.Homodimer => term.Constant <= SafeProductConstant,
            _ => false,
        };

    /// <summary>a0 += the event's change, then <see cref="LinearSelection.EndEvent"/>'s re-sum rule, the event count and the budget.</summary>
    private IEnumerable<Expression> EndEvent()
    {
        yield return AddAssign(_total, _change);
        yield return IfThen(GreaterThan(_total, _peak), Assign(_peak, _total));
        Expression sum = Constant(0.0);
        for (var j = 0; j < _reactions; j++) sum = Add(sum, _propensities[j]);
        yield return IfThen(
            OrElse(Equal(PreDecrementAssign(_untilResum), Constant(0)),
                LessThan(_total, Multiply(_peak, Constant(LinearSelection.CancellationFloor)))),
            Block(Assign(_total, sum), Assign(_peak, _total), Assign(_untilResum, Constant(LinearSelection.ResumEvery))));
        yield return PreIncrementAssign(_fired);
        yield return IfThen(Equal(PreDecrementAssign(_budget), Constant(0L)),
            Block(Assign(_end, Constant(SegmentEnd.Budget)), Goto(_exit)));
    }

    private static MethodInfo Exit(string name) =>
        typeof(CompiledLoopExits).GetMethod(name, BindingFlags.Static | BindingFlags.Public | BindingFlags.NonPublic)!;
}
