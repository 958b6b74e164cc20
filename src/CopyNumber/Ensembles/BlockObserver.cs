using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>
/// Copies each recorded state of the current replicate into its slot of the block, with readouts
/// evaluated on the counts and the parameter values in force at that grid time. It is also where a long replicate notices a cancellation: the simulators call nothing
/// else between events, so <see cref="Record"/> checks the token (one field read per grid point) and
/// abandons the replicate by throwing <see cref="ReplicateAbandoned"/>, which the worker catches; the
/// block is then dropped whole.
/// </summary>
internal sealed class BlockObserver : ITrajectoryObserver
{
    private readonly ReactionNetwork _network;
    private readonly int _species;
    private readonly Readout[] _countReadouts;
    private readonly Readout[] _realReadouts;
    private readonly CancellationToken _cancel;
    private ReplicateBlock _block = null!;
    private int _slot;

    public BlockObserver(ReactionNetwork network, CancellationToken cancel)
    {
        _network = network;
        _species = network.Species.Count;
        _countReadouts = network.Readouts.Where(r => r.IsCount).ToArray();
        _realReadouts = network.Readouts.Where(r => !r.IsCount).ToArray();
        _cancel = cancel;
    }

    public void Begin(ReplicateBlock block, int slot)
    {
        _block = block;
        _slot = slot;
        block.RecordedPoints[slot] = 0;
    }

    /// <remarks>Readouts read <paramref name="parameters"/>, the values in force at the grid time, as the rate equations do.</remarks>
    public void Record(int gridIndex, double time, long[] counts, double[] parameters)
    {
        if (_cancel.IsCancellationRequested) throw ReplicateAbandoned.Instance;
        var block = _block;
        var baseIndex = ((long)_slot * block.GridPoints + gridIndex) * block.CountStride;
        var target = block.Counts;
        for (var i = 0; i < _species; i++) target[baseIndex + i] = counts[i];
        for (var r = 0; r < _countReadouts.Length; r++)
        {
            var value = _countReadouts[r].OnCounts(counts, parameters);
            // Above 2^53 a double no longer holds every integer, and past 2^63 the cast to long saturates:
            // either way the stored count would be silently wrong, so the replicate fails instead.
            if (!(Math.Abs(value) <= SimulationFailureException.LargestExactReadout))
                throw SimulationFailureException.ReadoutOutOfRange(_network, _countReadouts[r], value, time, counts);
            target[baseIndex + _species + r] = (long)Math.Round(value);
        }
        if (_realReadouts.Length > 0)
        {
            var realBase = ((long)_slot * block.GridPoints + gridIndex) * block.RealStride;
            for (var r = 0; r < _realReadouts.Length; r++)
                block.Reals[realBase + r] = _realReadouts[r].OnCounts(counts, parameters);
        }
        block.RecordedPoints[_slot] = gridIndex + 1;
    }
}

/// <summary>Unwinds a replicate that was cancelled part-way; never escapes the ensemble.</summary>
internal sealed class ReplicateAbandoned : Exception
{
    public static readonly ReplicateAbandoned Instance = new();

    private ReplicateAbandoned() : base("the replicate was abandoned because the run was cancelled")
    {
    }
}
