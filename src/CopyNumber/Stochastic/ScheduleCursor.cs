using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// Walks a <see cref="Timeline"/>'s changes during one replicate. A change instant is a stop for every
/// simulator: the simulator advances exactly to it, the changes due then are applied in file order, and
/// the simulator continues from the changed state. The instants are the timeline's, already snapped to
/// grid times they coincide with, so a simulator compares them with grid times exactly.
/// </summary>
/// <remarks>
/// A species' new value is the schedule expression evaluated on the current state and rounded to the
/// nearest integer, halves away from zero; a negative result or a value that is not finite stops the run.
/// A parameter change recomputes the stochastic constants.
/// </remarks>
internal sealed class ScheduleCursor
{
    // Beyond ±2^62 a rounded double no longer converts to a count safely.
    private const double LargestCount = 4.6e18;

    private readonly ReactionNetwork _network;
    private Timeline? _timeline;
    private int _next;

    public ScheduleCursor(ReactionNetwork network)
    {
        _network = network;
        foreach (var change in network.Schedule)
        {
            var limit = change.Target == ScheduleTarget.Species ? network.Species.Count : network.Parameters.Count;
            if ((uint)change.TargetIndex >= (uint)limit)
                throw new ArgumentException($"the schedule change of '{change.TargetName}' at time {change.Time} targets index {change.TargetIndex}, outside the network", nameof(network));
        }
    }

    /// <summary>Time of the next change to apply, or +∞ when none is left.</summary>
    public double NextTime { get; private set; } = double.PositiveInfinity;

    /// <summary>Starts a replicate on <paramref name="grid"/> (the timeline is looked up once per grid).</summary>
    public void Start(TimeGrid grid)
    {
        if (!ReferenceEquals(_timeline?.Grid, grid)) _timeline = Timeline.Of(_network, grid);
        _next = 0;
        UpdateNextTime();
    }

    /// <summary>Applies every change due at or before <paramref name="time"/>, in order.</summary>
    /// <param name="time">The simulator's time.</param>
    /// <param name="state">The replicate's state, changed in place.</param>
    /// <returns>True when any change was applied (the caller must then recompute propensities).</returns>
    public bool ApplyDue(double time, SimulatorState state)
    {
        var changes = _timeline!.Changes;
        var applied = false;
        var parametersChanged = false;
        var switches = state.Switches;
        if (switches.Counting) switches.BeforeSchedule(state.Counts);
        while (_next < changes.Length && changes[_next].Time <= time)
        {
            parametersChanged |= Apply(changes[_next++], state, time);
            applied = true;
        }
        if (parametersChanged) state.RefreshConstants();
        if (applied && switches.Counting) switches.AfterSchedule(state.Counts, countFlips: time > 0);
        UpdateNextTime();
        return applied;
    }

    /// <summary>
    /// Applies one change (timed or triggered) to <paramref name="state"/> at <paramref name="time"/>: the one
    /// implementation of the rounding and the checks; the caller refreshes the constants when it returns true.
    /// </summary>
    /// <returns>True when a parameter changed.</returns>
    internal static bool Apply(ScheduledChange change, SimulatorState state, double time)
    {
        if (!double.IsNaN(change.Time)) time = change.Time; // a timed change reports its own time
        var value = change.OnCounts(state.Counts, state.Parameters);
        if (change.Target == ScheduleTarget.Species)
        {
            if (!double.IsFinite(value) || Math.Abs(value) > LargestCount) throw SimulationFailureException.ScheduleNotFinite(change, value, time);
            var result = change.Combine(state.Counts[change.TargetIndex], (long)Math.Round(value, MidpointRounding.AwayFromZero));
            if (result < 0) throw SimulationFailureException.ScheduleMadeNegative(change, result, time);
            state.Counts[change.TargetIndex] = result;
            return false;
        }
        var changed = change.Combine(state.Parameters[change.TargetIndex], value);
        if (!double.IsFinite(changed)) throw SimulationFailureException.ScheduleNotFinite(change, changed, time);
        state.Parameters[change.TargetIndex] = changed;
        return true;
    }

    private void UpdateNextTime()
    {
        var changes = _timeline!.Changes;
        NextTime = _next < changes.Length ? changes[_next].Time : double.PositiveInfinity;
    }
}
