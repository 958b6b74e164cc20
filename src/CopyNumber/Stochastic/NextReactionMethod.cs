using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// The next reaction method of Gibson &amp; Bruck (2000, J. Phys. Chem. A 104:1876): every reaction holds an
/// absolute putative firing time τ_j in an indexed priority queue; the earliest fires. Exact, with one
/// exponential number per event.
/// </summary>
/// <remarks>
/// After reaction μ fires at t, μ draws a new time t + E/a_μ, and every other reaction whose propensity
/// changed keeps its random number by rescaling, τ_new = (a_old/a_new)(τ_old − t) + t. When a propensity
/// falls to 0 its unused unit-rate exponential a_old(τ_old − t) is stored and τ = ∞; when it becomes
/// positive again the stored amount gives τ = t + stored/a_new (the paper's treatment of a_old = 0).
/// A schedule change is handled the same way at its time, for every reaction whose propensity it changed;
/// the pending times all lie after it, so the rescaling is exact.
/// </remarks>
internal sealed class NextReactionMethod : ExactSimulation
{
    private readonly ReactionEffects _effects;
    private readonly FiringProgram _program;
    private readonly IndexedPriorityQueue _queue;
    private readonly double[] _propensity;
    private readonly double[] _parked;   // unit-rate exponential kept while a_j = 0
    private readonly double[] _initialTimes;
    private RunawayGuard _guard;

    public NextReactionMethod(ReactionNetwork network, SimulatorOptions options)
        : base(new SimulatorState(network, options.Modes), options.MaxEvents)
    {
        _guard = new RunawayGuard(options.RunawayEvents);
        _effects = new ReactionEffects(network, includeFired: true);
        _program = new FiringProgram(_effects, State);
        var m = State.ReactionCount;
        _queue = new IndexedPriorityQueue(m);
        _propensity = new double[m];
        _parked = new double[m];
        _initialTimes = new double[m];
    }

    protected override void Begin(ref Xoshiro256StarStar rng, double time)
    {
        _program.RefreshConstants(State);
        for (var j = 0; j < _propensity.Length; j++)
        {
            var a = State.Evaluate(j, time);
            var unit = rng.NextExponential();
            _propensity[j] = a;
            if (a > 0.0) _initialTimes[j] = time + unit / a;
            else
            {
                _parked[j] = unit;
                _initialTimes[j] = double.PositiveInfinity;
            }
        }
        _queue.Build(_initialTimes);
    }

    protected override void AfterSchedule(double time)
    {
        _program.RefreshConstants(State);
        for (var j = 0; j < _propensity.Length; j++)
        {
            var a = State.Evaluate(j, time);
            if (a != _propensity[j]) Rescale(j, a, time);
        }
    }

    // Fully optimised from the first call: a replicate spends its whole life in one call of this loop, so
    // waiting for tiered compilation would run long replicates in on-stack-replacement code.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    protected override SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents)
    {
        var state = State;
        var effects = _effects;
        var program = _program;
        var counts = state.Counts;
        var queue = _queue;
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(counts);
        ref var header0 = ref program.Headers;
        ref var update0 = ref program.Updates;
        ref var propensity0 = ref MemoryMarshal.GetArrayDataReference(_propensity);
        var random = rng;
        var t = time;
        var fired = events;
        var nextGrid = recorder.NextTime;
        SegmentEnd end;
        while (true)
        {
            var next = queue.TopKey;
            if (StopsBefore(next, horizon, fired, maxEvents, out end)) break;
            if (RunawayGuard.Due(fired, maxEvents)) CheckRunaway(t, horizon);
            if (nextGrid < next) nextGrid = recorder.RecordBefore(next, counts);
            t = next;
            var mu = queue.Top;
            ref var header = ref Unsafe.Add(ref header0, mu);
            program.Fire(ref header, mu, ref count0, state, effects, t);
            if (header.CountsSwitch) state.Switches.Fired(mu);
            if (header.WatchesMode) state.Modes.Fired(mu, counts, t);
            for (var u = header.UpdateStart; u < header.UpdateEnd; u++)
            {
                ref var update = ref Unsafe.Add(ref update0, u);
                var k = update.Reaction;
                var a = PropensityTerm.Evaluate(ref update.Term, ref count0, k, state);
                if (!PropensityTerm.IsUsable(a)) state.ThrowBadPropensity(k, a, t);
                if (k == mu)
                {
                    Unsafe.Add(ref propensity0, k) = a;
                    if (a > 0.0) queue.Update(k, t + random.NextExponential() / a);
                    else
                    {
                        _parked[k] = random.NextExponential();
                        queue.Update(k, double.PositiveInfinity);
                    }
                }
                else if (a != Unsafe.Add(ref propensity0, k)) Rescale(k, a, t);
            }
            fired++;
            if (header.ChecksTriggers && state.Triggers.AfterFiring(mu, state))
            {
                end = SegmentEnd.Triggered;
                break;
            }
        }
        rng = random;
        events = fired;
        time = t;
        return Finish(end, ref time, horizon, recorder, counts);
    }

    /// <summary>The runaway projection needs a0, which this method does not keep: summed here, every 2^16 events.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    private void CheckRunaway(double time, double horizon)
    {
        var total = 0.0;
        foreach (var a in _propensity) total += a;
        if (_guard.Exceeded(total, time, horizon, out var projected, out var growth))
            State.ThrowRunaway(time, horizon, total, projected, _guard.Bound, growth, _propensity);
    }

    /// <summary>Moves reaction k's putative time to its new propensity, reusing its random number.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private void Rescale(int k, double a, double t)
    {
        var old = _propensity[k];
        _propensity[k] = a;
        double tau;
        if (old > 0.0)
        {
            var remaining = _queue.Key(k) - t;
            if (a > 0.0) tau = t + old / a * remaining;
            else
            {
                _parked[k] = old * remaining;
                tau = double.PositiveInfinity;
            }
        }
        else tau = t + _parked[k] / a;
        _queue.Update(k, tau);
    }
}
