using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic.Compiled;

namespace CopyNumber.Stochastic;

/// <summary>
/// Gillespie's direct method (Gillespie 1976, J. Comput. Phys. 22:403; 1977, J. Phys. Chem. 81:2340):
/// the waiting time to the next event is exponential with rate a0 = Σ a_j, and the event is reaction j
/// with probability a_j/a0. Exact.
/// </summary>
/// <remarks>
/// After reaction j fires only the propensities that read a species j changes are recomputed (the
/// dependency graph of Gibson &amp; Bruck 2000), and the selection structure updates a0 from them. Per event
/// the loop draws two numbers (the exponential by Math.Log, exact), runs j's precompiled
/// <see cref="FiringProgram"/> — count changes with their overflow headroom, then the unimolecular
/// updates that need no check, then the rest — and allocates nothing. A total propensity that overflows
/// to +∞ and a replicate that <see cref="RunawayGuard"/> projects to need more events than its bound stop the
/// run with a message. A schedule time is a stop: the pending waiting time is discarded there, which is
/// exact because it is memoryless.
/// </remarks>
internal sealed class DirectMethod<TSelection> : ExactSimulation
    where TSelection : struct, IReactionSelection<TSelection>
{
    private readonly ReactionEffects _effects;
    private readonly FiringProgram _program;
    private TSelection _selection;
    private RunawayGuard _guard = new(RunawayGuard.EventBound);
    private readonly CompiledDirectLoop? _compiled;
    private bool _compiledFits;

    public DirectMethod(ReactionNetwork network, SimulatorOptions options)
        : this(network, options, CompiledLoopWanted)
    {
    }

    /// <summary>
    /// A direct method for <paramref name="network"/>; with <paramref name="compiled"/> it runs the event loop
    /// generated for the network (<see cref="CompiledDirectLoop"/>) whenever that applies.
    /// </summary>
    internal DirectMethod(ReactionNetwork network, SimulatorOptions options, bool compiled)
        : this(new SimulatorState(network, options.Modes), new ReactionEffects(network, includeFired: false), options.MaxEvents)
    {
        _guard = new RunawayGuard(options.RunawayEvents);
        if (compiled && typeof(TSelection) == typeof(LinearSelection)) _compiled = CompiledDirectLoop.For(network, options.Modes);
    }

    /// <summary>
    /// False when the environment variable COPYNUMBER_GENERAL_LOOP is 1: the diagnostic switch that makes
    /// a whole run use the general loop, for paired timings (docs/performance.md).
    /// </summary>
    internal static bool CompiledLoopWanted { get; } = Environment.GetEnvironmentVariable("COPYNUMBER_GENERAL_LOOP") != "1";

    /// <summary>True when this simulator runs the loop generated for its network (with its current constants).</summary>
    internal bool RunsCompiledLoop => _compiledFits;

    /// <summary>A direct method working on a state owned by another simulator (tau-leaping's exact steps).</summary>
    internal DirectMethod(SimulatorState state, ReactionEffects effects, long maxEvents) : base(state, maxEvents)
    {
        _effects = effects;
        _program = new FiringProgram(effects, state);
        _selection = TSelection.Create(state.ReactionCount);
    }

    protected override void Begin(ref Xoshiro256StarStar rng, double time)
    {
        _selection.Restart();
        Refresh(time);
    }

    protected override void AfterSchedule(double time) => Refresh(time);

    protected override SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents) =>
        Advance(ref rng, ref time, horizon, long.MaxValue, recorder, ref events, maxEvents);

    /// <summary>Re-evaluates every propensity from the current state and re-sums a0.</summary>
    internal void Refresh(double time)
    {
        _program.RefreshConstants(State);
        for (var j = 0; j < State.ReactionCount; j++) _selection.Set(j, State.Evaluate(j, time));
        _selection.Resum();
        _compiledFits = _compiled is not null && _compiled.Matches(State);
    }

    /// <summary>The runaway rule (<see cref="RunawayGuard"/>), shared with the generated loop.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    internal static void CheckRunaway(ref RunawayGuard guard, SimulatorState state, double total, double time, double horizon, ReadOnlySpan<double> propensities)
    {
        if (guard.Exceeded(total, time, horizon, out var projected, out var growth))
            state.ThrowRunaway(time, horizon, total, projected, guard.Bound, growth, propensities);
    }

    /// <summary>
    /// Fires events until the next one would fall after <paramref name="horizon"/>, <paramref name="budget"/>
    /// events have fired, or <paramref name="events"/> reaches <paramref name="maxEvents"/>.
    /// Propensities must be current (<see cref="Refresh"/>) on entry.
    /// </summary>
    // Fully optimised from the first call: a replicate spends its whole life in one call of this loop, so
    // waiting for tiered compilation would run long replicates in on-stack-replacement code.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, long budget, GridRecorder recorder, ref long events, long maxEvents)
    {
        if (_compiledFits)
        {
            var reached = _compiled!.Advance!(State, ref _guard, ref rng, ref time, horizon, budget, recorder, ref events, maxEvents,
                ref Unsafe.As<TSelection, LinearSelection>(ref _selection));
            return Finish(reached, ref time, horizon, recorder, State.Counts);
        }
        var state = State;
        var effects = _effects;
        var program = _program;
        var counts = state.Counts;
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(counts);
        ref var header0 = ref program.Headers;
        ref var update0 = ref program.Updates;
        // Locals, not fields, so the generator's and the selection's state can live in registers.
        var random = rng;
        var selection = _selection;
        var t = time;
        var fired = events;
        var nextGrid = recorder.NextTime;
        SegmentEnd end;
        while (true)
        {
            var total = selection.Total;
            if (total > double.MaxValue) state.ThrowTotalOverflow(t, selection.Propensities);
            var next = NextEventTime(t, total, ref random);
            if (StopsBefore(next, horizon, fired, maxEvents, out end)) break;
            if (RunawayGuard.Due(fired, maxEvents)) CheckRunaway(ref _guard, state, total, t, horizon, selection.Propensities);
            if (nextGrid < next) nextGrid = recorder.RecordBefore(next, counts);
            t = next;
            var j = selection.Select(random.NextDouble() * total, ref random);
            ref var header = ref Unsafe.Add(ref header0, j);
            program.Fire(ref header, j, ref count0, state, effects, t);
            if (header.CountsSwitch) state.Switches.Fired(j);
            if (header.WatchesMode) state.Modes.Fired(j, counts, t);
            // The event's change of a0 is summed here, in a register, and added once.
            var change = 0.0;
            var u = header.UpdateStart;
            for (; u < header.PlainEnd; u++)
            {
                ref var update = ref Unsafe.Add(ref update0, u);
                change += selection.Replace(update.Reaction, update.Term.Constant * Unsafe.Add(ref count0, update.Term.SpeciesA));
            }
            for (; u < header.UpdateEnd; u++)
            {
                ref var update = ref Unsafe.Add(ref update0, u);
                var a = PropensityTerm.Evaluate(ref update.Term, ref count0, update.Reaction, state);
                if (!PropensityTerm.IsUsable(a)) state.ThrowBadPropensity(update.Reaction, a, t);
                change += selection.Replace(update.Reaction, a);
            }
            selection.AddToTotal(change);
            selection.EndEvent();
            fired++;
            if (header.ChecksTriggers && state.Triggers.AfterFiring(j, state))
            {
                end = SegmentEnd.Triggered;
                break;
            }
            if (--budget == 0)
            {
                end = SegmentEnd.Budget;
                break;
            }
        }
        rng = random;
        _selection = selection;
        events = fired;
        time = t;
        return Finish(end, ref time, horizon, recorder, counts);
    }
}
