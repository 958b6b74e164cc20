using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// <c>paths.parquet</c>: <c>replicate, time</c>, then one int64 column per species, for the replicates the
/// ensemble hands over (in replicate order). Rows are buffered into row groups of about 256k rows.
/// </summary>
/// <remarks>
/// Paths are the bulkiest and least essential output, so a failure to write them (typically a full disk)
/// never reaches the ensemble: the table is dropped there and then (its temporary file deleted, which
/// gives the space back to the summaries), later rows are ignored, and <see cref="Failure"/> says what
/// happened so the run can report it and still write its summary tables.
/// </remarks>
public sealed class PathsTable : IPathSink, IDisposable
{
    private const int RowsPerGroup = 1 << 18;
    private readonly ParquetTableWriter? _writer;
    private readonly string _path;
    private readonly TimeGrid _grid;
    private readonly int _species;
    private readonly long[] _replicate = new long[RowsPerGroup];
    private readonly double[] _time = new double[RowsPerGroup];
    private readonly long[][] _counts;
    private int _rows;

    /// <summary>Starts the table; call <see cref="Complete"/> when the ensemble has finished.</summary>
    public PathsTable(string path, ReactionNetwork network, TimeGrid grid, IReadOnlyDictionary<string, string> metadata)
        : this(path, network, grid, metadata, null)
    {
    }

    /// <summary>As the public constructor, with the temporary file opened by <paramref name="openTemporary"/> (tests put a disk that fills up here); null for the real file.</summary>
    internal PathsTable(string path, ReactionNetwork network, TimeGrid grid, IReadOnlyDictionary<string, string> metadata, Func<string, Stream>? openTemporary)
    {
        _grid = grid;
        _path = path;
        _species = network.Species.Count;
        _counts = Enumerable.Range(0, _species).Select(_ => new long[RowsPerGroup]).ToArray();
        try
        {
            _writer = ParquetTableWriter.Create(path, new TableSchema(ColumnsFor(network)), metadata, openTemporary ?? AtomicFile.OpenTemporary);
        }
        catch (OutputException e)
        {
            Failure = e;
        }
    }

    /// <summary>Why the table was dropped, or null while it is being written or once it is complete.</summary>
    public OutputException? Failure { get; private set; }

    /// <summary>
    /// Why paths were dropped, in one phrase for the user and the manifest: "no space left on device while
    /// writing paths.parquet (after 262144 rows); the paths were dropped".
    /// </summary>
    internal static string DroppedText(OutputException failure, string file, long rows) =>
        $"{(failure.InnerException is { } inner && AtomicFile.IsDiskFull(inner) ? "no space left on device" : failure.Message.TrimEnd('.'))} while writing {file} (after {rows} rows); the paths were dropped";

    /// <summary>The table's columns for <paramref name="network"/>: replicate, time, then a count per species.</summary>
    public static IReadOnlyList<ColumnSpec> ColumnsFor(ReactionNetwork network) =>
        network.Species.Select(s => new ColumnSpec(s, ColumnType.Int64))
            .Prepend(new ColumnSpec("time", ColumnType.Double))
            .Prepend(new ColumnSpec("replicate", ColumnType.Int64)).ToArray();

    /// <summary>Rows written or buffered so far.</summary>
    public long Rows => _rowsWritten + _rows;

    private long _rowsWritten;

    /// <inheritdoc />
    public void Write(long replicate, ReadOnlySpan<long> counts, int stride, int recordedPoints)
    {
        if (Failure is not null) return;
        for (var k = 0; k < recordedPoints; k++)
        {
            _replicate[_rows] = replicate;
            _time[_rows] = _grid[k];
            for (var i = 0; i < _species; i++) _counts[i][_rows] = counts[k * stride + i];
            if (++_rows == RowsPerGroup && !Flush()) return;
        }
    }

    /// <summary>Writes what is buffered and renames the file into place; after a failure (see <see cref="Failure"/>) it does nothing.</summary>
    public void Complete()
    {
        if (Failure is not null || !Flush()) return;
        try
        {
            if (_writer!.RowsWritten == 0) WriteGroup(0);
            _writer.Complete();
        }
        catch (OutputException e)
        {
            Failure = e;
        }
    }

    /// <inheritdoc />
    public void Dispose() => _writer?.Dispose();

    /// <summary>Writes the buffered rows; false when that failed and the table was dropped.</summary>
    private bool Flush()
    {
        if (_rows == 0) return true;
        try
        {
            WriteGroup(_rows);
            _rowsWritten += _rows;
            return true;
        }
        catch (OutputException e)
        {
            // The writer has closed and deleted its temporary file; the buffer is released so nothing more is kept.
            Failure = e;
            return false;
        }
        finally
        {
            _rows = 0;
        }
    }

    private void WriteGroup(int rows)
    {
        var data = new Array[2 + _species];
        data[0] = _replicate.AsSpan(0, rows).ToArray();
        data[1] = _time.AsSpan(0, rows).ToArray();
        for (var i = 0; i < _species; i++) data[2 + i] = _counts[i].AsSpan(0, rows).ToArray();
        _writer!.WriteRowGroup(data);
    }
}
