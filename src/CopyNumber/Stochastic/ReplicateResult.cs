namespace CopyNumber.Stochastic;

/// <summary>What one replicate did.</summary>
/// <param name="Events">Reaction firings executed (for tau-leaping, the sum of all firings in all leaps and exact steps).</param>
/// <param name="Steps">Simulator steps: equal to <paramref name="Events"/> for the exact methods; leaps plus exact steps for tau-leaping.</param>
/// <param name="HitEventLimit">
/// True when the replicate stopped before the end of the grid because it reached
/// <see cref="SimulatorOptions.MaxEvents"/>; only the grid points before its last event were recorded.
/// </param>
public readonly record struct ReplicateResult(long Events, long Steps, bool HitEventLimit)
{
    /// <summary>
    /// Switches of each two-state species over the replicate (slot s is
    /// <see cref="Network.TwoStateSpecies.Of"/>(network).Species[s]): firings of reactions that change it,
    /// plus flips made by schedule changes after t = 0; −1 where a schedule change broke the species'
    /// confining law. Empty for a network without two-state species. A view of the simulator's buffer,
    /// valid until its next replicate.
    /// </summary>
    public ReadOnlyMemory<long> Switches { get; init; }

    /// <summary>
    /// Visits to the modes of each species given cores (slot s is the s-th core of
    /// <see cref="SimulatorOptions.Modes"/>), followed at the events; empty without cores. A view of the
    /// simulator's buffer, valid until its next replicate.
    /// </summary>
    public ReadOnlyMemory<ModeVisits> Modes { get; init; }
}
