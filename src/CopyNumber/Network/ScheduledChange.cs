using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>What a schedule line changes.</summary>
public enum ScheduleTarget
{
    /// <summary>A species count.</summary>
    Species,
    /// <summary>A parameter value (mass-action constants are recomputed).</summary>
    Parameter,
}

/// <summary>
/// A change applied exactly at <see cref="Time"/> by every simulator and by the rate equations. Lines
/// at equal times apply in file order; when the change takes effect on a given grid is decided by
/// <see cref="Timeline"/>. On a stochastic state a species' new value is rounded to the nearest
/// integer; a negative result stops the run with an error.
/// </summary>
/// <param name="Time">When, in model time units.</param>
/// <param name="Target">Species or parameter.</param>
/// <param name="TargetIndex">Index into species or parameters.</param>
/// <param name="TargetName">Name, for messages.</param>
/// <param name="Operation">Set, add or subtract.</param>
/// <param name="OnCounts">The value expression on a stochastic state.</param>
/// <param name="OnState">The value expression on a rate-equation state.</param>
public sealed record ScheduledChange(
    double Time,
    ScheduleTarget Target,
    int TargetIndex,
    string TargetName,
    ScheduleOperation Operation,
    CountLaw OnCounts,
    StateLaw OnState)
{
    /// <summary>
    /// The target's new value from its <paramref name="current"/> value and the evaluated expression
    /// <paramref name="value"/>: set, add or subtract. The one implementation of the operations, used on
    /// counts (long) by the simulators and on real states by the rate equations and the expansion.
    /// </summary>
    public T Combine<T>(T current, T value) where T : System.Numerics.INumberBase<T> => Operation switch
    {
        ScheduleOperation.Set => value,
        ScheduleOperation.Add => current + value,
        _ => current - value,
    };
}
