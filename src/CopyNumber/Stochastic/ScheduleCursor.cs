using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// Walks a network's schedule during one replicate. A schedule time acts as a stop for every simulator:
/// the simulator advances exactly to it, the changes due then are applied in file order, and the
/// simulator continues from the changed state.
/// </summary>
/// <remarks>
/// A species' new value is the schedule expression evaluated on the current state and rounded to the
/// nearest integer, halves away from zero; a negative result or a value that is not finite stops the run.
/// A parameter change recomputes the stochastic constants. Changes at times ≤ 0 apply before the
/// first grid point; changes after the final grid time are never reached.
/// </remarks>
internal sealed class ScheduleCursor
{
    // Beyond ±2^62 a rounded double no longer converts to a count safely.
    private const double LargestCount = 4.6e18;

    private readonly ScheduledChange[] _changes;
    private int _next;
    private double _until;

    public ScheduleCursor(ReactionNetwork network)
    {
        _changes = network.Schedule.ToArray();
        foreach (var change in _changes)
        {
            var limit = change.Target == ScheduleTarget.Species ? network.Species.Count : network.Parameters.Count;
            if ((uint)change.TargetIndex >= (uint)limit)
                throw new ArgumentException($"the schedule change of '{change.TargetName}' at time {change.Time} targets index {change.TargetIndex}, outside the network", nameof(network));
        }
    }

    /// <summary>Time of the next change to apply, or +∞ when none is left before the end of the run.</summary>
    public double NextTime { get; private set; } = double.PositiveInfinity;

    /// <summary>Starts a replicate that ends at <paramref name="until"/>.</summary>
    public void Start(double until)
    {
        _until = until;
        _next = 0;
        UpdateNextTime();
    }

    /// <summary>Applies every change due at or before <paramref name="time"/>, in order.</summary>
    /// <returns>True when any change was applied (the caller must then recompute propensities).</returns>
    public bool ApplyDue(double time, SimulatorState state)
    {
        var applied = false;
        var parametersChanged = false;
        while (_next < _changes.Length && _changes[_next].Time <= time && _changes[_next].Time <= _until)
        {
            var change = _changes[_next++];
            var value = change.OnCounts(state.Counts, state.Parameters);
            if (change.Target == ScheduleTarget.Species) ApplyToSpecies(change, value, state.Counts);
            else
            {
                ApplyToParameter(change, value, state.Parameters);
                parametersChanged = true;
            }
            applied = true;
        }
        if (parametersChanged) state.RefreshConstants();
        UpdateNextTime();
        return applied;
    }

    private static void ApplyToSpecies(ScheduledChange change, double value, long[] counts)
    {
        if (!double.IsFinite(value) || Math.Abs(value) > LargestCount) throw SimulationFailureException.ScheduleNotFinite(change, value);
        var amount = (long)Math.Round(value, MidpointRounding.AwayFromZero);
        var current = counts[change.TargetIndex];
        var result = change.Operation switch
        {
            Language.ScheduleOperation.Set => amount,
            Language.ScheduleOperation.Add => current + amount,
            _ => current - amount,
        };
        if (result < 0) throw SimulationFailureException.ScheduleMadeNegative(change, result);
        counts[change.TargetIndex] = result;
    }

    private static void ApplyToParameter(ScheduledChange change, double value, double[] parameters)
    {
        var current = parameters[change.TargetIndex];
        var result = change.Operation switch
        {
            Language.ScheduleOperation.Set => value,
            Language.ScheduleOperation.Add => current + value,
            _ => current - value,
        };
        if (!double.IsFinite(result)) throw SimulationFailureException.ScheduleNotFinite(change, result);
        parameters[change.TargetIndex] = result;
    }

    private void UpdateNextTime() =>
        NextTime = _next < _changes.Length && _changes[_next].Time <= _until
            ? Math.Max(_changes[_next].Time, 0.0)
            : double.PositiveInfinity;
}
