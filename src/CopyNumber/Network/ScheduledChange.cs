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
/// A change applied exactly at <see cref="Time"/> by every simulator and by the rate equations. Changes
/// at equal times apply in file order (<see cref="Order"/>); when the change takes effect on a given grid
/// is decided by <see cref="Timeline"/>, which also expands a repeating change (<see cref="Every"/>) into
/// its instances. On a stochastic state a species' new value is rounded to the nearest integer; a
/// negative result stops the run with an error.
/// </summary>
/// <param name="Time">When (for a repeating change, the first time), in model time units.</param>
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
    /// The period of a repeating change, in model time units: it happens at <see cref="Time"/> + k·Every for
    /// k = 0, 1, 2, … up to <see cref="Until"/> (inclusive) and the run's final time; null for a change that
    /// happens once.
    /// </summary>
    public double? Every { get; init; }

    /// <summary>
    /// The last time a repeating change may happen, inclusive: an instance at Time + k·Every counts when it
    /// is at most Until + 10⁻⁹·Every, so round-off in k·Every does not drop the last one. +∞ (the default)
    /// repeats until the end of the run.
    /// </summary>
    public double Until { get; init; } = double.PositiveInfinity;

    /// <summary>
    /// The change's place in file order (an assignment's index among all timed assignments): changes at
    /// one instant apply in increasing order, each seeing the result of the one before.
    /// </summary>
    public int Order { get; init; }

    /// <summary>The assignment as the model writes it (<c>protein = protein / 2</c>), for <c>inspect</c> and messages.</summary>
    public string Text { get; init; } = "";

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
