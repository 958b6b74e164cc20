using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Stochastic;

/// <summary>
/// A stochastic simulator bound to one network. Holds per-thread mutable state, so use one instance per
/// thread; an instance runs any number of replicates one after the other, and every buffer is allocated
/// when it is created.
/// </summary>
public interface IStochasticSimulator
{
    /// <summary>
    /// Runs one replicate from the network's initial state and parameter values over <paramref name="grid"/>,
    /// drawing every random number from <paramref name="rng"/>, and hands the state at each grid time to
    /// <paramref name="observer"/>. Schedule changes apply exactly at their times.
    /// </summary>
    /// <exception cref="SimulationFailureException">
    /// A propensity was negative, NaN or infinite, a firing or a schedule change made a count negative, or a
    /// schedule value was not finite. The message names the reaction or species, the time and the state.
    /// </exception>
    ReplicateResult Run(ref Xoshiro256StarStar rng, TimeGrid grid, ITrajectoryObserver observer);

    /// <summary>
    /// The parameter values the following replicates start from, indexed like the network's parameters
    /// (a draw of <see cref="ParameterVariability"/>); null for the network's own initial values. The array
    /// is read at each replicate's start, not copied.
    /// </summary>
    void StartFrom(double[]? parameters);
}
