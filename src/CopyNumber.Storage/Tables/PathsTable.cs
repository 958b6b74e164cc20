using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// <c>paths.parquet</c>: <c>replicate, time</c>, then one int64 column per species, for the replicates the
/// ensemble hands over (in replicate order). Rows are buffered into row groups of about 256k rows.
/// </summary>
public sealed class PathsTable : IPathSink, IDisposable
{
    private const int RowsPerGroup = 1 << 18;
    private readonly ParquetTableWriter _writer;
    private readonly TimeGrid _grid;
    private readonly int _species;
    private readonly long[] _replicate = new long[RowsPerGroup];
    private readonly double[] _time = new double[RowsPerGroup];
    private readonly long[][] _counts;
    private int _rows;

    /// <summary>Starts the table; call <see cref="Complete"/> when the ensemble has finished.</summary>
    public PathsTable(string path, ReactionNetwork network, TimeGrid grid, IReadOnlyDictionary<string, string> metadata)
    {
        _grid = grid;
        _species = network.Species.Count;
        _counts = Enumerable.Range(0, _species).Select(_ => new long[RowsPerGroup]).ToArray();
        _writer = ParquetTableWriter.Create(path, ColumnsFor(network), metadata);
    }

    /// <summary>The table's columns for <paramref name="network"/>: replicate, time, then a count per species.</summary>
    public static IReadOnlyList<ColumnSpec> ColumnsFor(ReactionNetwork network) =>
        network.Species.Select(s => new ColumnSpec(s, ColumnType.Int64))
            .Prepend(new ColumnSpec("time", ColumnType.Double))
            .Prepend(new ColumnSpec("replicate", ColumnType.Int64)).ToArray();

    /// <summary>Rows written or buffered so far.</summary>
    public long Rows => _writer.RowsWritten + _rows;

    /// <inheritdoc />
    public void Write(long replicate, ReadOnlySpan<long> counts, int stride, int recordedPoints)
    {
        for (var k = 0; k < recordedPoints; k++)
        {
            _replicate[_rows] = replicate;
            _time[_rows] = _grid[k];
            for (var i = 0; i < _species; i++) _counts[i][_rows] = counts[k * stride + i];
            if (++_rows == RowsPerGroup) Flush();
        }
    }

    /// <summary>Writes what is buffered and renames the file into place.</summary>
    public void Complete()
    {
        Flush();
        if (_writer.RowsWritten == 0) WriteGroup(0);
        _writer.Complete();
    }

    /// <inheritdoc />
    public void Dispose() => _writer.Dispose();

    private void Flush()
    {
        if (_rows == 0) return;
        WriteGroup(_rows);
        _rows = 0;
    }

    private void WriteGroup(int rows)
    {
        var data = new Array[2 + _species];
        data[0] = _replicate.AsSpan(0, rows).ToArray();
        data[1] = _time.AsSpan(0, rows).ToArray();
        for (var i = 0; i < _species; i++) data[2 + i] = _counts[i].AsSpan(0, rows).ToArray();
        _writer.WriteRowGroup(data);
    }
}
