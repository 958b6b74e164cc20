using System.Globalization;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// The direct method for networks whose rate laws read <c>time</c>, made exact by thinning with a bounding
/// propensity (the extra-reaction algorithm of Voliotis, Thomas, Grima &amp; Bowsher 2016, PLoS Comput. Biol.
/// 12:e1004923; thinning of a Poisson process after Lewis &amp; Shedler 1979, Nav. Res. Logist. Q. 26:403).
/// </summary>
/// <remarks>
/// Between events the state is fixed and only the laws that read time change. Over a window [t, t + L] the
/// total propensity is bounded by B = Σ a_j (laws without time, exact) + Σ sup a_j (laws with time, by
/// interval arithmetic, <see cref="Network.TimeDependence"/>), widened by 10⁻⁹ relatively against round-off.
/// A candidate time t + τ, τ ~ Exp(B), beyond the window moves the clock to t + L with no event (exact: the
/// candidate process is memoryless); one inside is accepted with probability a0(t + τ)/B and then fires
/// reaction j with probability a_j(t + τ)/a0(t + τ), otherwise nothing happens (the extra reaction). The
/// accepted events are those of the inhomogeneous process with propensities a_j(x, t), exactly.
/// Window rule (ours; it sets the cost, not the law): L = <see cref="WindowEvents"/>/a0(t), cut at the
/// segment's end, halved while the bound is infinite (a law with a pole in the window). A value above its
/// bound stops the run with a message, never a silent error.
/// </remarks>
internal sealed class ThinnedDirectMethod : ExactSimulation
{
    /// <summary>A window covers about this many events at the current total propensity.</summary>
    public const double WindowEvents = 4.0;

    private const double BoundMargin = 1e-9;
    private const int MaxHalvings = 60;

    private readonly ReactionEffects _effects;
    private readonly FiringProgram _program;
    private readonly TimeDependence _time;
    private readonly int[] _timed;
    private readonly double[] _propensity;
    private RunawayGuard _guard = new(RunawayGuard.EventBound);
    private double _steady;
    private long _sinceResum;
    private double _timedAt = double.NaN;  // the time of the last TimedTotal at the current state (NaN: none)
    private double _timedSum;

    public ThinnedDirectMethod(ReactionNetwork network, SimulatorOptions options)
        : this(new SimulatorState(network, options.Modes), new ReactionEffects(network, includeFired: false), options.MaxEvents)
    {
        _guard = new RunawayGuard(options.RunawayEvents);
    }

    /// <summary>On a state owned by another simulator (tau-leaping's exact steps).</summary>
    internal ThinnedDirectMethod(SimulatorState state, ReactionEffects effects, long maxEvents) : base(state, maxEvents)
    {
        _effects = effects;
        _program = new FiringProgram(effects, state);
        _time = state.Network.TimeDependence;
        _timed = [.. _time.Reactions];
        _propensity = new double[state.ReactionCount];
    }

    /// <summary>Candidates rejected (the extra reaction) since this simulator was made; for tests.</summary>
    internal long Rejections { get; private set; }

    protected override void Begin(ref Xoshiro256StarStar rng, double time) => Refresh(time);

    protected override void AfterSchedule(double time) => Refresh(time);

    protected override SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents) =>
        Advance(ref rng, ref time, horizon, long.MaxValue, recorder, ref events, maxEvents);

    /// <summary>Evaluates every propensity at <paramref name="time"/> and re-sums the part that does not read time.</summary>
    internal void Refresh(double time)
    {
        _program.RefreshConstants(State);
        State.SetTime(time);
        _timedAt = double.NaN;
        _steady = 0.0;
        for (var j = 0; j < _propensity.Length; j++)
        {
            _propensity[j] = State.Evaluate(j, time);
            if (!_time.ReadsTime(j)) _steady += _propensity[j];
        }
        _sinceResum = 0;
    }

    /// <summary>
    /// Fires events until the next would fall after <paramref name="horizon"/>, <paramref name="budget"/>
    /// events have fired, or <paramref name="events"/> reaches <paramref name="maxEvents"/>.
    /// Propensities must be current (<see cref="Refresh"/>) on entry.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, long budget, GridRecorder recorder, ref long events, long maxEvents)
    {
        var state = State;
        var counts = state.Counts;
        ref var count0 = ref MemoryMarshal.GetArrayDataReference(counts);
        ref var header0 = ref _program.Headers;
        ref var update0 = ref _program.Updates;
        var t = time;
        var fired = events;
        SegmentEnd end;
        while (true)
        {
            var now = TimedTotal(t) + _steady;
            if (now > double.MaxValue) state.ThrowTotalOverflow(t, _propensity);
            var window = now > 0.0 ? Math.Min(horizon, t + WindowEvents / now) : horizon;
            if (!(window > t)) window = horizon; // a step below the resolution of t would never move the clock
            var bound = Bound(t, ref window);
            var next = bound > 0.0 ? t + rng.NextExponential() / bound : double.PositiveInfinity;
            if (next > window)
            {
                if (window >= horizon)
                {
                    end = SegmentEnd.Horizon;
                    break;
                }
                t = window;
                continue;
            }
            if (fired >= maxEvents)
            {
                end = SegmentEnd.EventLimit;
                break;
            }
            var total = TimedTotal(next) + _steady;
            if (total > bound) ThrowBoundExceeded(next, total, bound);
            var point = rng.NextDouble() * bound;
            t = next;
            if (point >= total)
            {
                Rejections++;
                continue;
            }
            if (RunawayGuard.Due(fired, maxEvents) && _guard.Exceeded(total, t, horizon, out var projected, out var growth))
                state.ThrowRunaway(t, horizon, total, projected, _guard.Bound, growth, _propensity);
            recorder.RecordBefore(t, counts);
            _timedAt = double.NaN; // the state changes
            var j = Select(point);
            ref var header = ref Unsafe.Add(ref header0, j);
            _program.Fire(ref header, j, ref count0, state, _effects, t);
            if (header.CountsSwitch) state.Switches.Fired(j);
            if (header.WatchesMode) state.Modes.Fired(j, counts, t);
            for (var u = header.UpdateStart; u < header.UpdateEnd; u++)
            {
                var k = Unsafe.Add(ref update0, u).Reaction;
                var a = state.Evaluate(k, t);
                if (!_time.ReadsTime(k)) _steady += a - _propensity[k];
                _propensity[k] = a;
            }
            if (++_sinceResum >= 1 << 16) Resum();
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
        events = fired;
        time = t;
        return Finish(end, ref time, horizon, recorder, counts);
    }

    // Σ a_j(t) over the laws that read time, stored for the selection; the time slot is left at t. A rejected
    // candidate leaves the state and the clock where the next window starts, so its sum is reused there.
    private double TimedTotal(double t)
    {
        if (t == _timedAt) return _timedSum;
        State.SetTime(t);
        var sum = 0.0;
        foreach (var j in _timed)
        {
            var a = State.Evaluate(j, t);
            _propensity[j] = a;
            sum += a;
        }
        _timedAt = t;
        _timedSum = sum;
        return sum;
    }

    // B over [t, window], the window halved while a law cannot be bounded on it.
    private double Bound(double t, ref double window)
    {
        for (var halving = 0; ; halving++)
        {
            var bound = _steady;
            foreach (var j in _timed) bound += _time.UpperBound(j, State.Counts, State.Parameters, t, window);
            bound = Math.Max(bound, 0.0) * (1 + BoundMargin);
            if (bound <= double.MaxValue) return bound;
            if (halving == MaxHalvings) ThrowUnbounded(t, window);
            window = t + (window - t) / 2;
        }
    }

    private int Select(double point)
    {
        var last = 0;
        for (var j = 0; j < _propensity.Length; j++)
        {
            if (_propensity[j] <= 0.0) continue;
            last = j;
            point -= _propensity[j];
            if (point < 0.0) return j;
        }
        return last;
    }

    private void Resum()
    {
        _steady = 0.0;
        for (var j = 0; j < _propensity.Length; j++)
            if (!_time.ReadsTime(j)) _steady += _propensity[j];
        _sinceResum = 0;
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private void ThrowUnbounded(double t, double window) =>
        throw new SimulationFailureException(
            $"a rate law that reads time cannot be bounded on [{Text(t)}, {Text(window)}] (it may have a pole there); " +
            "exact simulation by thinning needs every law that reads time to stay finite", t);

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static void ThrowBoundExceeded(double t, double total, double bound) =>
        throw new SimulationFailureException(
            $"at time {Text(t)} the total propensity {Text(total)} exceeds its bound {Text(bound)} from interval arithmetic; " +
            "this is a fault of the simulator, please report it with the model", t);

    private static string Text(double value) => value.ToString("G6", CultureInfo.InvariantCulture);
}
