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

    public ReplicateResult Run(ref Xoshiro256StarStar rng, TimeGrid grid, ITrajectoryObserver observer) => Run(ref rng, grid, observer, null);

    // The lineage of a population snapshot records nothing on a grid: one of two points, both before any division.
    private static readonly TimeGrid LineageGrid = new(until: 1e-300, every: 1e-300);

    /// <summary>
    /// Runs one lineage for the population snapshot: cycle lengths scaled by <paramref name="lengthScale"/>
    /// (<see cref="CellDivision.LengthScale"/>), the state handed to <paramref name="sink"/> at the ages
    /// <paramref name="sampler"/> draws (seeded with <paramref name="agesSeed"/>), until its last record. The
    /// network has a cell cycle and no timed changes (the caller checks).
    /// </summary>
    internal ReplicateResult RunLineage(ref Xoshiro256StarStar rng, CycleSampler sampler, ulong agesSeed, double lengthScale, ICycleRecord sink)
    {
        _cell!.LengthScale = lengthScale;
        sampler.Start(agesSeed, sink);
        try
        {
            return Run(ref rng, LineageGrid, NoRecords.Instance, sampler);
        }
        finally
        {
            _cell.LengthScale = 1.0;
        }
    }

    private ReplicateResult Run(ref Xoshiro256StarStar rng, TimeGrid grid, ITrajectoryObserver observer, CycleSampler? sampler)
    {
        State.StartReplicate(_schedule, _recorder, grid, observer);
        State.SeedBursts(ref rng);
        _cell?.Start(ref rng, State);
        sampler?.NewCycle(0, 0.0, _cell!.Length);
        // A lineage for the snapshot runs until its sampler is done, past the grid.
        var until = sampler is null ? grid.Until : double.PositiveInfinity;
        var time = 0.0;
        var events = 0L;
        Begin(ref rng, time);
        while (true)
        {
            var scheduled = _schedule.NextTime;
            var cellEvent = _cell?.NextTime ?? double.PositiveInfinity;
            var sample = sampler?.NextTime ?? double.PositiveInfinity;
            var horizon = Math.Min(Math.Min(Math.Min(scheduled, cellEvent), sample), until);
            var end = Advance(ref rng, ref time, horizon, _recorder, ref events, _maxEvents);
            if (end == SegmentEnd.EventLimit) return new ReplicateResult(events, events, true) { Switches = State.Switches.Finish(), Modes = State.Modes.Finish(time) };
            if (end == SegmentEnd.Triggered)
            {
                State.Triggers.FirePending(State, time);
                if (State.Modes.Watching) State.Modes.ObserveAll(State.Counts, time);
                AfterSchedule(time);
                continue;
            }
            // A snapshot record reads the state and changes nothing; the pending candidate was discarded at the stop.
            if (sampler is not null && sample <= cellEvent && sample <= scheduled)
            {
                sampler.Take(State.Counts);
                if (sampler.Done) return new ReplicateResult(events, events, false) { Switches = State.Switches.Finish() };
                AfterSchedule(time);
                continue;
            }
            // A division (or the genes' doubling) is a stop like a timed change; at a tie it comes first.
            if (cellEvent <= until && cellEvent <= scheduled)
            {
                var divisions = _cell!.Divisions;
                _cell.Apply(time, State);
                if (sampler is not null && _cell.Divisions != divisions) sampler.NewCycle(_cell.Divisions, _cell.Birth, _cell.Length);
                State.Triggers.AfterTimedChanges(State, time);
                if (State.Modes.Watching) State.Modes.ObserveAll(State.Counts, time);
                AfterSchedule(time);
                continue;
            }
            if (scheduled <= until)
            {
                _schedule.ApplyDue(time, State);
                State.Triggers.AfterTimedChanges(State, time);
                if (State.Modes.Watching) State.Modes.ObserveAll(State.Counts, time);
                AfterSchedule(time);
                continue;
            }
            _recorder.RecordThrough(grid.Until, State.Counts);
            return new ReplicateResult(events, events, false) { Switches = State.Switches.Finish(), Modes = State.Modes.Finish(grid.Until) };
        }
    }

    private sealed class NoRecords : ITrajectoryObserver
    {
        public static readonly NoRecords Instance = new();
        public void Record(int gridIndex, double time, long[] counts, double[] parameters) { }
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
