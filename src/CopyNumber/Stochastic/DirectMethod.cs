using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// Gillespie's direct method (Gillespie 1976, J. Comput. Phys. 22:403; 1977, J. Phys. Chem. 81:2340):
/// the waiting time to the next event is exponential with rate a0 = Σ a_j, and the event is reaction j
/// with probability a_j/a0. Exact.
/// </summary>
/// <remarks>
/// After reaction j fires only the propensities that read a species j changes are recomputed (the
/// dependency graph of Gibson &amp; Bruck 2000), and the selection structure updates a0 from them. Per event
/// the loop draws two numbers, walks j's changes and dependents through flat arrays without bounds
/// checks, evaluates mass-action propensities inline and allocates nothing. A schedule time is a stop:
/// the pending waiting time is discarded there, which is exact because it is memoryless.
/// </remarks>
internal sealed class DirectMethod<TSelection> : ExactSimulation
    where TSelection : struct, IReactionSelection<TSelection>
{
    private readonly ReactionEffects _effects;
    private TSelection _selection;

    public DirectMethod(ReactionNetwork network, SimulatorOptions options)
        : this(new SimulatorState(network), new ReactionEffects(network, includeFired: false), options.MaxEvents)
    {
    }

    /// <summary>A direct method working on a state owned by another simulator (tau-leaping's exact steps).</summary>
    internal DirectMethod(SimulatorState state, ReactionEffects effects, long maxEvents) : base(state, maxEvents)
    {
        _effects = effects;
        _selection = TSelection.Create(state.ReactionCount);
    }

    protected override void Begin(ref Xoshiro256StarStar rng, double time) => Refresh(time);

    protected override void AfterSchedule(double time) => Refresh(time);

    protected override SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents) =>
        Advance(ref rng, ref time, horizon, long.MaxValue, recorder, ref events, maxEvents);

    /// <summary>Re-evaluates every propensity from the current state and re-sums a0.</summary>
    internal void Refresh(double time)
    {
        for (var j = 0; j < State.ReactionCount; j++) _selection.Set(j, State.Evaluate(j, time));
        _selection.Resum();
    }

    /// <summary>
    /// Fires events until the next one would fall after <paramref name="horizon"/>, <paramref name="budget"/>
    /// events have fired, or <paramref name="events"/> reaches <paramref name="maxEvents"/>.
    /// Propensities must be current (<see cref="Refresh"/>) on entry.
    /// </summary>
    internal SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, long budget, GridRecorder recorder, ref long events, long maxEvents)
    {
        var state = State;
        var effects = _effects;
        var counts = state.Counts;
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(counts);
        ref var term0 = ref MemoryMarshal.GetArrayDataReference(state.Terms);
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
            var next = total > 0.0 ? t + random.NextExponential() / total : double.PositiveInfinity;
            if (StopsBefore(next, horizon, fired, maxEvents, out end)) break;
            if (nextGrid < next) nextGrid = recorder.RecordBefore(next, counts);
            t = next;
            var j = selection.Select(random.NextDouble() * total);
            effects.Fire(j, ref count0, state, t);
            foreach (var k in effects.DependentsOf(j))
            {
                var a = PropensityTerm.Evaluate(ref Unsafe.Add(ref term0, k), ref count0, k, state);
                if (!PropensityTerm.IsUsable(a)) state.ThrowBadPropensity(k, a, t);
                selection.Set(k, a);
            }
            selection.EndEvent();
            fired++;
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
