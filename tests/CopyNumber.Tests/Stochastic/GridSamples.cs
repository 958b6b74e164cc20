using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Every replicate's counts at every grid point, and a check of the observer contract on the way: each
/// grid point recorded once, in order, at its own time, with no negative count.
/// </summary>
internal sealed class GridSamples : ITrajectoryObserver
{
    private readonly TimeGrid _grid;
    private readonly int _species;
    private readonly long[] _counts;
    private readonly int[] _recorded;
    private int _replicate;

    public GridSamples(TimeGrid grid, int species, int replicates)
    {
        _grid = grid;
        _species = species;
        Replicates = replicates;
        _counts = new long[(long)replicates * grid.Count * species];
        _recorded = new int[replicates];
    }

    public int Replicates { get; }
    public long Events { get; private set; }
    public long Steps { get; private set; }
    public int StoppedEarly { get; private set; }

    /// <summary>Runs <paramref name="replicates"/> replicates of <paramref name="network"/>, replicate r on stream (seed, r).</summary>
    public static GridSamples Run(ReactionNetwork network, SimulationMethod method, TimeGrid grid, int replicates, ulong seed, SimulatorOptions? options = null)
    {
        var simulator = Simulators.Create(method, network, options ?? new SimulatorOptions());
        var samples = new GridSamples(grid, network.Species.Count, replicates);
        for (var r = 0; r < replicates; r++)
        {
            var rng = ReplicateStreams.For(seed, r);
            samples._replicate = r;
            var result = simulator.Run(ref rng, grid, samples);
            samples.Events += result.Events;
            samples.Steps += result.Steps;
            if (result.HitEventLimit) samples.StoppedEarly++;
            else Assert.Equal(grid.Count, samples._recorded[r]);
        }
        return samples;
    }

    public void Record(int gridIndex, double time, long[] counts, double[] parameters)
    {
        // Plain tests, failing through Assert only when broken: this runs at every grid point.
        if (gridIndex != _recorded[_replicate]) Assert.Fail($"grid point {gridIndex} recorded when {_recorded[_replicate]} was due");
        if (time != _grid[gridIndex]) Assert.Fail($"grid point {gridIndex} recorded at t = {time}, not {_grid[gridIndex]}");
        if (counts.Length != _species) Assert.Fail($"{counts.Length} counts for {_species} species");
        var offset = ((long)_replicate * _grid.Count + gridIndex) * _species;
        for (var i = 0; i < _species; i++)
        {
            if (counts[i] < 0) Assert.Fail($"negative count {counts[i]} of species {i} at t = {time}");
            _counts[offset + i] = counts[i];
        }
        _recorded[_replicate]++;
    }

    /// <summary>Grid points recorded for replicate <paramref name="replicate"/>.</summary>
    public int RecordedPoints(int replicate) => _recorded[replicate];

    /// <summary>Count of <paramref name="species"/> at grid point <paramref name="gridIndex"/> in replicate <paramref name="replicate"/>.</summary>
    public long At(int replicate, int gridIndex, int species) =>
        _counts[((long)replicate * _grid.Count + gridIndex) * _species + species];

    /// <summary>Counts of <paramref name="species"/> at a grid point across replicates.</summary>
    public long[] Column(int gridIndex, int species)
    {
        var column = new long[Replicates];
        for (var r = 0; r < Replicates; r++) column[r] = At(r, gridIndex, species);
        return column;
    }

    /// <summary>Grid index of time <paramref name="time"/> (which must be a grid point).</summary>
    public int IndexOf(double time)
    {
        for (var k = 0; k < _grid.Count; k++)
            if (Math.Abs(_grid[k] - time) <= 1e-12 * Math.Max(1, time)) return k;
        throw new ArgumentException($"{time} is not a grid time");
    }
}
