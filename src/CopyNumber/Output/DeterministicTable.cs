using CopyNumber.Deterministic;

namespace CopyNumber.Output;

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
}
