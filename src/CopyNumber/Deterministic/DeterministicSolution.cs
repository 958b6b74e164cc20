using CopyNumber.Network;

namespace CopyNumber.Deterministic;

/// <summary>
/// The rate-equation trajectory on a time grid: one row per grid point, one column per species (copy
/// numbers, real-valued) followed by one per readout, both in the network's declaration order.
/// </summary>
public sealed class DeterministicSolution
{
    private readonly double[,] _values;

    /// <summary>Creates a solution; used by <see cref="RateEquationSolver"/>.</summary>
    public DeterministicSolution(TimeGrid grid, IReadOnlyList<string> columns, int speciesCount, double[,] values, OdeStatistics statistics)
    {
        Grid = grid;
        Columns = columns.ToArray();
        SpeciesCount = speciesCount;
        _values = values;
        Statistics = statistics;
    }

    /// <summary>The recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>Column names: the species, then the readouts.</summary>
    public IReadOnlyList<string> Columns { get; }

    /// <summary>How many leading columns are species.</summary>
    public int SpeciesCount { get; }

    /// <summary>Values[grid point, column]; species in copy numbers, readouts in their own units. Do not modify.</summary>
    public double[,] Values => _values;

    /// <summary>The value at grid point <paramref name="point"/> of column <paramref name="column"/>.</summary>
    public double this[int point, int column] => _values[point, column];

    /// <summary>Work counters of the integration.</summary>
    public OdeStatistics Statistics { get; }

    /// <summary>Index of a column by name, or −1.</summary>
    public int ColumnIndex(string name)
    {
        for (var c = 0; c < Columns.Count; c++) if (Columns[c] == name) return c;
        return -1;
    }

    /// <summary>A copy of one column over the grid.</summary>
    public double[] Column(int column)
    {
        var result = new double[Grid.Count];
        for (var k = 0; k < result.Length; k++) result[k] = _values[k, column];
        return result;
    }
}
