using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>The rate-equation solution as a table: <c>time</c>, then one double column per species and readout.</summary>
public static class DeterministicTable
{
    /// <summary>Writes <paramref name="solution"/> to <paramref name="path"/> atomically, with the given provenance in the footer.</summary>
    public static void Write(string path, DeterministicSolution solution, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = solution.Columns.Select(c => new ColumnSpec(c, ColumnType.Double)).Prepend(new ColumnSpec("time", ColumnType.Double)).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var rows = solution.Grid.Count;
        var data = new Array[columns.Length];
        data[0] = solution.Grid.Times.ToArray();
        for (var c = 0; c < solution.Columns.Count; c++)
        {
            var column = new double[rows];
            for (var k = 0; k < rows; k++) column[k] = solution.Values[k, c];
            data[c + 1] = column;
        }
        writer.WriteRowGroup(data);
        writer.Complete();
    }

    /// <summary>Reads back a table <see cref="Write"/> wrote for a run on <paramref name="grid"/> whose model has <paramref name="speciesCount"/> species.</summary>
    /// <exception cref="RunFolderException">The file is unreadable or does not fit the grid.</exception>
    internal static DeterministicSolution Read(string path, TimeGrid grid, int speciesCount)
    {
        using var reader = ParquetTableReader.Open(path);
        var columns = reader.ColumnNames.Skip(1).ToArray();
        var time = reader.Doubles("time");
        if (time.Length != grid.Count || time.Where((t, k) => t != grid[k]).Any()) throw reader.Damaged("its times are not those of the run's grid");
        var values = new double[grid.Count, columns.Length];
        for (var c = 0; c < columns.Length; c++)
        {
            var column = reader.Doubles(columns[c]);
            for (var k = 0; k < grid.Count; k++) values[k, c] = column[k];
        }
        return new DeterministicSolution(grid, columns, speciesCount, values, new OdeStatistics());
    }
}
