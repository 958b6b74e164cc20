using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// Holds the propensities a_j and their total a0 and picks reaction j with probability a_j/a0, as the
/// direct method needs (Gillespie 1977, J. Phys. Chem. 81:2340). Implemented by structs so the generic
/// simulator is compiled for each one and the calls inline.
/// </summary>
internal interface IReactionSelection<TSelf> where TSelf : struct, IReactionSelection<TSelf>
{
    /// <summary>A selection over <paramref name="reactions"/> reactions, all propensities 0.</summary>
    static abstract TSelf Create(int reactions);

    /// <summary>a0, the sum of all propensities.</summary>
    double Total { get; }

    /// <summary>Sets a_j (a finite value ≥ 0).</summary>
    void Set(int reaction, double propensity);

    /// <summary>
    /// Sets a_j like <see cref="Set"/> but leaves a0 to the caller: returns a_j(new) − a_j(old), which the
    /// caller adds up over an event's updates and hands to <see cref="AddToTotal"/> before the next
    /// <see cref="Total"/> or <see cref="Select"/>. The running sum can then stay in a register.
    /// </summary>
    double Replace(int reaction, double propensity);

    /// <summary>Adds the summed changes of <see cref="Replace"/> calls to a0.</summary>
    void AddToTotal(double change);

    /// <summary>
    /// The reaction j whose cumulative interval [Σ_{k&lt;j} a_k, Σ_{k≤j} a_k) holds <paramref name="point"/>,
    /// for 0 ≤ point &lt; <see cref="Total"/>; never a reaction with a_j = 0, even under round-off.
    /// </summary>
    /// <param name="point">The point.</param>
    /// <param name="rng">Further random numbers, for selections that sample within a part (rejection).</param>
    int Select(double point, ref Xoshiro256StarStar rng);

    /// <summary>Called once per event after the updates: a place to stop round-off drift in the total.</summary>
    void EndEvent();

    /// <summary>The stored propensities, indexed by reaction (for messages; not for the inner loop).</summary>
    ReadOnlySpan<double> Propensities { get; }

    /// <summary>Recomputes the total exactly from the stored propensities.</summary>
    void Resum();

    /// <summary>
    /// Forgets the previous replicate: every propensity 0 and no order left from earlier updates. Called at
    /// the start of each replicate, before the propensities are set in reaction order, so that a replicate's
    /// selections depend on its own stream only — not on which replicates the same simulator (thread) ran
    /// before it, which the ensemble does not fix.
    /// </summary>
    void Restart();
}
