using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// A state-triggered change, <c>P = 100, P2 = 0  whenever P2 &gt; 30</c>: its assignments apply, in order,
/// when <see cref="OnCounts"/> (or <see cref="OnState"/>) turns from 0 (false) to any other value (true).
/// </summary>
/// <remarks>
/// The compiled network carries its triggers so that no consumer can overlook one; a method that cannot
/// carry them out refuses the network (<see cref="ModelSupport"/>) rather than run a different model. The
/// rules (when a condition is evaluated, order, cascades) are in docs/network-language.md. The assignments are <see cref="ScheduledChange"/>s whose
/// <see cref="ScheduledChange.Time"/> is NaN (they have no time of their own), so the one implementation
/// of set, add and subtract (<see cref="ScheduledChange.Combine{T}"/>) serves them too.
/// </remarks>
/// <param name="Position">Where the change line starts in the model file.</param>
/// <param name="Text">The change line as the language writes it, for messages.</param>
/// <param name="Assignments">The changes, in the order they apply.</param>
/// <param name="OnCounts">The condition on a stochastic state: 1 (or any value other than 0) while it holds.</param>
/// <param name="OnState">The condition on a rate-equation state.</param>
public sealed record StateTrigger(
    SourcePosition Position,
    string Text,
    IReadOnlyList<ScheduledChange> Assignments,
    CountLaw OnCounts,
    StateLaw OnState)
{
    /// <summary>
    /// The species the condition reads, in increasing index order; null when unknown (then every event is
    /// taken to possibly change the condition's value). The exact simulators evaluate the condition only
    /// after an event that changes one of these.
    /// </summary>
    public IReadOnlyList<int>? SpeciesRead { get; init; }

    /// <summary>
    /// Rounds of triggered changes one instant may take (each round's changes turning further conditions
    /// true) before a method stops the run as an endless cascade; the same in every method.
    /// </summary>
    public const int MaxRounds = 1000;

    /// <summary>Whether a condition's value means it holds: neither 0 nor NaN. The one rule, for every method.</summary>
    public static bool Holds(double value) => value != 0.0 && !double.IsNaN(value);
}
