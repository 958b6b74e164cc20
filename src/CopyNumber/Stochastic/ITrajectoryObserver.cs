namespace CopyNumber.Stochastic;

/// <summary>Receives one replicate's state at the grid times, in grid order, each point once.</summary>
public interface ITrajectoryObserver
{
    /// <summary>
    /// Called with the state in force at grid time <paramref name="time"/>: after every event at or before
    /// it, including schedule changes at exactly that time. The simulator reuses <paramref name="counts"/>:
    /// copy what you need and do not keep the array.
    /// </summary>
    /// <param name="gridIndex">Index of the grid point, 0-based; consecutive calls have consecutive indices from 0.</param>
    /// <param name="time">The grid time, in model time units.</param>
    /// <param name="counts">Copy numbers, indexed like the network's species.</param>
    /// <param name="parameters">
    /// The parameter values in force at <paramref name="time"/> (after the schedule's changes up to it),
    /// indexed like the network's parameters; reused like <paramref name="counts"/>. Readouts read these.
    /// </param>
    void Record(int gridIndex, double time, long[] counts, double[] parameters);
}
