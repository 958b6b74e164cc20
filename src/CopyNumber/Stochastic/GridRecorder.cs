using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// Hands the observer the state in force at each grid time. Exact for the exact methods: the state is
/// piecewise constant between events, so when the next event falls after some grid times the current
/// state is the state at every one of them. The convention is right-continuous: an event at exactly a
/// grid time is in the state recorded there, and so is a schedule change at that instant (the
/// <see cref="Timeline"/> snaps a change that coincides with a grid time onto it, so this exact
/// comparison agrees with the rate equations). The observer also gets the parameter values in force.
/// </summary>
internal sealed class GridRecorder
{
    private TimeGrid? _grid;
    private ITrajectoryObserver? _observer;
    private double[] _parameters = [];
    private int _next;

    /// <summary>The next grid time not yet recorded; +∞ once the whole grid is recorded.</summary>
    public double NextTime { get; private set; } = double.PositiveInfinity;

    /// <summary>True once every grid point has been recorded.</summary>
    public bool Finished => _grid is null || _next == _grid.Count;

    /// <summary>Starts a replicate: nothing recorded yet; <paramref name="parameters"/> is the replicate's live parameter array.</summary>
    public void Start(TimeGrid grid, ITrajectoryObserver observer, double[] parameters)
    {
        _grid = grid;
        _observer = observer;
        _parameters = parameters;
        _next = 0;
        NextTime = grid[0];
    }

    /// <summary>Records <paramref name="counts"/> at every unrecorded grid time strictly before <paramref name="time"/>.</summary>
    /// <returns>The new <see cref="NextTime"/>.</returns>
    public double RecordBefore(double time, long[] counts)
    {
        while (NextTime < time) RecordNext(counts);
        return NextTime;
    }

    /// <summary>Records <paramref name="counts"/> at every unrecorded grid time at or before <paramref name="time"/>.</summary>
    public void RecordThrough(double time, long[] counts)
    {
        while (NextTime <= time) RecordNext(counts);
    }

    private void RecordNext(long[] counts)
    {
        var grid = _grid!;
        _observer!.Record(_next, NextTime, counts, _parameters);
        _next++;
        NextTime = _next < grid.Count ? grid[_next] : double.PositiveInfinity;
    }
}
