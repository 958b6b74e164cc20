using Parquet;

namespace CopyNumber.Storage;

/// <summary>
/// Streams one table into a Parquet file, a row group at a time, so a run never holds the whole table
/// in memory. The file is built under a temporary sibling name (see <see cref="AtomicFile"/>) and only
/// <see cref="Complete"/> renames it to the requested path; disposing without completing deletes it,
/// so the requested path holds either a whole readable file or nothing.
/// </summary>
/// <remarks>
/// A synchronous facade over Parquet.Net's asynchronous writer. Each call runs the asynchronous work to
/// completion on the calling thread with no synchronization context installed, so continuations never
/// wait for a thread that is blocked on them. An instance is not thread-safe: one thread writes it.
/// Key-value metadata lands in the file footer (Parquet FileMetaData.key_value_metadata).
/// </remarks>
public sealed class ParquetTableWriter : IAsyncDisposable, IDisposable
{
    private readonly TableSchema _schema;
    private readonly Dictionary<string, string> _metadata;
    private Stream? _stream;
    private ParquetWriter? _parquet;
    private bool _completed;

    private ParquetTableWriter(string path, string temporaryPath, TableSchema schema, Dictionary<string, string> metadata, Stream stream, ParquetWriter parquet)
    {
        Path = path;
        TemporaryPath = temporaryPath;
        _schema = schema;
        _metadata = metadata;
        _stream = stream;
        _parquet = parquet;
    }

    /// <summary>The final path (full form) the table appears under once <see cref="Complete"/> succeeds.</summary>
    public string Path { get; }

    /// <summary>The table's columns.</summary>
    public TableSchema Schema => _schema;

    /// <summary>Rows written so far, over all row groups.</summary>
    public long RowsWritten { get; private set; }

    /// <summary>Row groups written so far.</summary>
    public int RowGroupsWritten { get; private set; }

    /// <summary>The temporary sibling the file is built under until it is complete.</summary>
    internal string TemporaryPath { get; }

    /// <summary>
    /// Starts a table at <paramref name="path"/>. The folder must exist; the file itself is created
    /// under a temporary name in that folder and appears at <paramref name="path"/> on <see cref="Complete"/>,
    /// replacing any file already there.
    /// </summary>
    /// <param name="path">Final file path, usually ending in <c>.parquet</c>.</param>
    /// <param name="columns">The columns, in file order; see <see cref="TableSchema"/> for the rules.</param>
    /// <param name="metadata">Key-value pairs for the file footer, for example from <see cref="Provenance.For"/>.</param>
    /// <exception cref="ArgumentException">The columns or the metadata are invalid.</exception>
    /// <exception cref="OutputException">The folder is missing or not writable, or the disk is full.</exception>
    public static ParquetTableWriter Create(string path, IReadOnlyList<ColumnSpec> columns, IReadOnlyDictionary<string, string> metadata) =>
        Create(path, new TableSchema(columns), metadata, AtomicFile.OpenTemporary);

    /// <summary>As the public <see cref="Create(string, IReadOnlyList{ColumnSpec}, IReadOnlyDictionary{string, string})"/>, with the temporary file opened by <paramref name="openTemporary"/> (tests use it to simulate a failing disk).</summary>
    internal static ParquetTableWriter Create(string path, TableSchema schema, IReadOnlyDictionary<string, string> metadata, Func<string, Stream> openTemporary)
    {
        ArgumentNullException.ThrowIfNull(schema);
        var copy = CheckedMetadata(metadata);
        var finalPath = AtomicFile.FullPath(path);
        var temporary = AtomicFile.TemporaryPathFor(finalPath);
        Stream? stream = null;
        try
        {
            stream = openTemporary(temporary);
            var parquetSchema = new Parquet.Schema.ParquetSchema(schema.Fields);
            var opened = stream;
            var parquet = Synchronously.Run(() => ParquetWriter.CreateAsync(parquetSchema, opened));
            parquet.CustomMetadata = copy;
            return new ParquetTableWriter(finalPath, temporary, schema, copy, stream, parquet);
        }
        catch (Exception e)
        {
            stream?.Dispose();
            AtomicFile.DiscardQuietly(temporary);
            if (AtomicFile.IsStorageFailure(e)) throw AtomicFile.Failure(finalPath, e);
            throw;
        }
    }

    /// <summary>Writes one row group whose rows are all the values of the given arrays.</summary>
    /// <param name="columns">One array per column in column order: <c>double[]</c>, <c>long[]</c> or <c>string[]</c> as the column's type says, all of one length. An empty group is skipped.</param>
    /// <exception cref="ArgumentException">The arrays do not fit the schema; nothing is written and the writer stays usable.</exception>
    /// <exception cref="OutputException">The disk refused the data; the temporary file is gone and the writer is closed.</exception>
    public void WriteRowGroup(IReadOnlyList<Array> columns)
    {
        EnsureOpen();
        WriteRowGroupCore(columns, _schema.CommonLength(columns));
    }

    /// <summary>
    /// Writes one row group from the first <paramref name="rowCount"/> values of each array, so a
    /// caller can reuse buffers larger than the group.
    /// </summary>
    /// <param name="columns">One array per column in column order, each at least <paramref name="rowCount"/> long.</param>
    /// <param name="rowCount">Rows in this group; zero writes nothing.</param>
    /// <exception cref="ArgumentException">The arrays do not fit the schema; nothing is written and the writer stays usable.</exception>
    /// <exception cref="OutputException">The disk refused the data; the temporary file is gone and the writer is closed.</exception>
    public void WriteRowGroup(IReadOnlyList<Array> columns, int rowCount)
    {
        EnsureOpen();
        WriteRowGroupCore(columns, rowCount);
    }

    /// <summary>Adds or replaces one footer key-value pair; allowed until <see cref="Complete"/>, so totals known only at the end can be recorded.</summary>
    public void SetMetadata(string key, string value)
    {
        EnsureOpen();
        CheckPair(key, value);
        _metadata[key] = value;
    }

    /// <summary>
    /// Writes the footer, forces the file to disk and renames it to <see cref="Path"/>. After this
    /// the writer accepts nothing more; disposing it is still required and harmless.
    /// </summary>
    /// <exception cref="OutputException">The footer or the rename failed; nothing is left under either name.</exception>
    public void Complete()
    {
        EnsureOpen();
        var parquet = _parquet!;
        var stream = _stream!;
        Guarded(() =>
        {
            parquet.CustomMetadata = _metadata;
            Synchronously.Run(async () => await parquet.DisposeAsync());
            _parquet = null;
            if (stream is FileStream file) file.Flush(flushToDisk: true);
            else stream.Flush();
            stream.Dispose();
            _stream = null;
            AtomicFile.Commit(TemporaryPath, Path);
        });
        _completed = true;
    }

    /// <summary>Closes the writer; if <see cref="Complete"/> did not succeed, the temporary file is deleted and <see cref="Path"/> is left untouched.</summary>
    public void Dispose()
    {
        if (_completed) return;
        Abandon();
    }

    /// <summary>As <see cref="Dispose"/>; the work is synchronous.</summary>
    public ValueTask DisposeAsync()
    {
        Dispose();
        return ValueTask.CompletedTask;
    }

    private void WriteRowGroupCore(IReadOnlyList<Array> columns, int rowCount)
    {
        _schema.CheckRowGroup(columns, rowCount);
        if (rowCount == 0) return;
        var parquet = _parquet!;
        var fields = _schema.Fields;
        Guarded(() => Synchronously.Run(async () =>
        {
            using var group = parquet.CreateRowGroup();
            for (var i = 0; i < fields.Length; i++)
            {
                switch (columns[i])
                {
                    case double[] reals:
                        await group.WriteAsync(fields[i], new ReadOnlyMemory<double>(reals, 0, rowCount));
                        break;
                    case long[] integers:
                        await group.WriteAsync(fields[i], new ReadOnlyMemory<long>(integers, 0, rowCount));
                        break;
                    case string[] texts:
                        await group.WriteAsync(fields[i], new ArraySegment<string>(texts, 0, rowCount));
                        break;
                }
            }
            group.CompleteValidate();
        }));
        RowGroupsWritten++;
        RowsWritten += rowCount;
    }

    /// <summary>Runs a step that touches the file; any failure closes the writer and deletes the temporary file, and a storage failure becomes an <see cref="OutputException"/>.</summary>
    private void Guarded(Action step)
    {
        try
        {
            step();
        }
        catch (Exception e)
        {
            Abandon();
            if (AtomicFile.IsStorageFailure(e)) throw AtomicFile.Failure(Path, e);
            throw;
        }
    }

    private void Abandon()
    {
        // The stream goes first so that disposing the Parquet writer cannot append a footer that
        // would make the abandoned bytes look like a finished file.
        var stream = _stream;
        var parquet = _parquet;
        _stream = null;
        _parquet = null;
        try
        {
            stream?.Dispose();
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
        }
        if (parquet is not null)
        {
            try
            {
                Synchronously.Run(async () => await parquet.DisposeAsync());
            }
            catch (Exception)
            {
                // Expected, as the stream underneath is closed; and whatever else the library throws
                // while being discarded must not hide the error that made us discard it.
            }
        }
        AtomicFile.DiscardQuietly(TemporaryPath);
    }

    private void EnsureOpen()
    {
        if (_completed) throw new InvalidOperationException($"the table '{Path}' is already complete");
        if (_parquet is null) throw new InvalidOperationException($"the table '{Path}' was closed after an error and cannot be written");
    }

    private static Dictionary<string, string> CheckedMetadata(IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(metadata);
        var copy = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (key, value) in metadata)
        {
            CheckPair(key, value);
            copy[key] = value;
        }
        return copy;
    }

    private static void CheckPair(string key, string value)
    {
        if (string.IsNullOrEmpty(key)) throw new ArgumentException("a metadata key must not be empty", nameof(key));
        if (value is null) throw new ArgumentException($"metadata key '{key}' has no value", nameof(value));
    }
}
