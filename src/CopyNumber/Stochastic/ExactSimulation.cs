using System.Runtime.CompilerServices;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// The replicate loop shared by the exact methods. Grid times need no stop: the state is constant between
/// events, so the recorder is handed it before each event that passes grid times. Schedule times are
/// stops: the method advances to the stop, discarding the pending event, the changes are applied and the
/// method adjusts its pending event times to the new propensities. A state-triggered change is a stop
/// too, made by the event that turned its condition true (<see cref="SegmentEnd.Triggered"/>): the
/// change applies at that event's time and the method adjusts its pending event times the same way.
/// </summary>
internal abstract class ExactSimulation : IStochasticSimulator
{
    private readonly ScheduleCursor _schedule;
    private readonly GridRecorder _recorder = new();
    private readonly long _maxEvents;
    private readonly CellDivision? _cell;

    protected ExactSimulation(SimulatorState state, long maxEvents)
    {
        State = state;
        _schedule = new ScheduleCursor(state.Network);
        _maxEvents = maxEvents;
        if (state.Network.Cycle is { } cycle) _cell = new CellDivision(cycle);
    }

    protected SimulatorState State { get; }

    public void StartFrom(double[]? parameters) => State.StartParameters = parameters;

    public ReplicateResult Run(ref Xoshiro256StarStar rng, TimeGrid grid, ITrajectoryObserver observer)
    {
        State.StartReplicate(_schedule, _recorder, grid, observer);
        State.SeedBursts(ref rng);
        _cell?.Start(ref rng, State);
        var time = 0.0;
        var events = 0L;
        Begin(ref rng, time);
        while (true)
        {
            var scheduled = _schedule.NextTime;
            var cellEvent = _cell?.NextTime ?? double.PositiveInfinity;
            var horizon = Math.Min(Math.Min(scheduled, cellEvent), grid.Until);
            var end = Advance(ref rng, ref time, horizon, _recorder, ref events, _maxEvents);
            if (end == SegmentEnd.EventLimit) return new ReplicateResult(events, events, true) { Switches = State.Switches.Finish() };
            if (end == SegmentEnd.Triggered)
            {
                State.Triggers.FirePending(State, time);
                AfterSchedule(time);
                continue;
            }
            // A division (or the genes' doubling) is a stop like a timed change; at a tie it comes first.
            if (cellEvent <= grid.Until && cellEvent <= scheduled)
            {
                _cell!.Apply(time, State);
                State.Triggers.AfterTimedChanges(State, time);
                AfterSchedule(time);
                continue;
            }
            if (scheduled <= grid.Until)
            {
                _schedule.ApplyDue(time, State);
                State.Triggers.AfterTimedChanges(State, time);
                AfterSchedule(time);
                continue;
            }
            _recorder.RecordThrough(grid.Until, State.Counts);
            return new ReplicateResult(events, events, false) { Switches = State.Switches.Finish() };
        }
    }

    /// <summary>Evaluates every propensity from the (reset) state and sets up the pending event(s).</summary>
    protected abstract void Begin(ref Xoshiro256StarStar rng, double time);

    /// <summary>
    /// Fires events until the next would fall after <paramref name="horizon"/> (then time becomes the
    /// horizon and the grid points before it are recorded) or the event limit is reached.
    /// </summary>
    protected abstract SegmentEnd Advance(ref Xoshiro256StarStar rng, ref double time, double horizon, GridRecorder recorder, ref long events, long maxEvents);

    /// <summary>Brings propensities and pending events up to date after timed or triggered changes at <paramref name="time"/>.</summary>
    protected abstract void AfterSchedule(double time);

    /// <summary>True when the event due at <paramref name="next"/> must not fire: it lies beyond the horizon, or the limit is reached.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private protected static bool StopsBefore(double next, double horizon, long fired, long maxEvents, out SegmentEnd end)
    {
        if (next > horizon)
        {
            end = SegmentEnd.Horizon;
            return true;
        }
        end = SegmentEnd.EventLimit;
        return fired >= maxEvents;
    }

    /// <summary>
    /// The direct method's next event time: <paramref name="time"/> plus an exponential waiting time of rate
    /// <paramref name="total"/> (a0), or +∞ when no reaction can fire. The caller has stopped the run if a0 overflowed.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private protected static double NextEventTime(double time, double total, ref Xoshiro256StarStar random) =>
        total > 0.0 ? time + random.NextExponential() / total : double.PositiveInfinity;

    /// <summary>Ends a segment: at the horizon, time moves to it and the grid points before it are recorded.</summary>
    private protected static SegmentEnd Finish(SegmentEnd end, ref double time, double horizon, GridRecorder recorder, long[] counts)
    {
        if (end == SegmentEnd.Horizon)
        {
            time = horizon;
            recorder.RecordBefore(horizon, counts);
        }
        return end;
    }
}
