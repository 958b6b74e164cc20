using Parquet;
using Parquet.Schema;

namespace CopyNumber.Storage;

/// <summary>
/// Reads back the tables this tool writes: required DOUBLE, INT64 and UTF-8 columns, by name, a row
/// group or the whole file at a time. A synchronous facade over Parquet.Net, like
/// <see cref="ParquetTableWriter"/>. Any problem — a missing file, a file that is not Parquet, a
/// missing column — becomes a <see cref="RunFolderException"/> naming the file, since these files are
/// read only to resume or merge runs.
/// </summary>
internal sealed class ParquetTableReader : IDisposable
{
    private readonly FileStream _stream;
    private readonly ParquetReader _reader;
    private readonly Dictionary<string, DataField> _fields;

    private ParquetTableReader(string path, FileStream stream, ParquetReader reader)
    {
        Path = path;
        _stream = stream;
        _reader = reader;
        _fields = reader.Schema.GetDataFields().ToDictionary(f => f.Name, StringComparer.Ordinal);
        Metadata = reader.CustomMetadata ?? new Dictionary<string, string>();
    }

    /// <summary>The file, as a full path.</summary>
    public string Path { get; }

    /// <summary>The footer's key-value metadata.</summary>
    public IReadOnlyDictionary<string, string> Metadata { get; }

    /// <summary>Column names in file order.</summary>
    public IReadOnlyList<string> ColumnNames => _reader.Schema.GetDataFields().Select(f => f.Name).ToArray();

    /// <summary>Row groups in the file.</summary>
    public int RowGroups => _reader.RowGroupCount;

    /// <summary>Opens <paramref name="path"/>.</summary>
    /// <exception cref="RunFolderException">The file is missing or not a readable Parquet file.</exception>
    public static ParquetTableReader Open(string path)
    {
        var full = AtomicFile.FullPath(path);
        FileStream? stream = null;
        try
        {
            stream = new FileStream(full, FileMode.Open, FileAccess.Read, FileShare.Read);
            var opened = stream;
            var reader = Synchronously.Run(() => ParquetReader.CreateAsync(opened));
            return new ParquetTableReader(full, stream, reader);
        }
        catch (Exception e) when (e is not RunFolderException)
        {
            stream?.Dispose();
            var why = e is FileNotFoundException or DirectoryNotFoundException ? "the file is missing" : e.Message.TrimEnd('.');
            throw new RunFolderException($"Cannot read '{full}': {why}.", System.IO.Path.GetDirectoryName(full) ?? full, e);
        }
    }

    /// <summary>The value of metadata key <paramref name="key"/>.</summary>
    /// <exception cref="RunFolderException">The key is absent.</exception>
    public string Require(string key) =>
        Metadata.TryGetValue(key, out var value) ? value : throw Damaged($"it has no '{key}' entry in its metadata");

    /// <summary>Every value of DOUBLE column <paramref name="name"/>, over all row groups.</summary>
    /// <exception cref="RunFolderException">The column is missing or of another type.</exception>
    public double[] Doubles(string name) => All(name, Doubles);

    /// <summary>Every value of INT64 column <paramref name="name"/>, over all row groups.</summary>
    /// <exception cref="RunFolderException">The column is missing or of another type.</exception>
    public long[] Longs(string name) => All(name, Longs);

    /// <summary>Every value of string column <paramref name="name"/>, over all row groups.</summary>
    /// <exception cref="RunFolderException">The column is missing or of another type.</exception>
    public string[] Strings(string name) => All(name, Strings);

    /// <summary>The values of DOUBLE column <paramref name="name"/> in row group <paramref name="group"/>.</summary>
    public double[] Doubles(string name, int group) =>
        Read<double>(name, group, (rows, field, values) => rows.ReadAsync(field, new Memory<double>(values)).AsTask());

    /// <summary>The values of INT64 column <paramref name="name"/> in row group <paramref name="group"/>.</summary>
    public long[] Longs(string name, int group) =>
        Read<long>(name, group, (rows, field, values) => rows.ReadAsync(field, new Memory<long>(values)).AsTask());

    /// <summary>The values of string column <paramref name="name"/> in row group <paramref name="group"/>.</summary>
    public string[] Strings(string name, int group) =>
        Read<string>(name, group, (rows, field, values) => rows.ReadAsync(field, new Memory<string?>(values!)).AsTask());

    private T[] All<T>(string name, Func<string, int, T[]> readGroup)
    {
        var parts = new T[RowGroups][];
        for (var g = 0; g < parts.Length; g++) parts[g] = readGroup(name, g);
        return parts.Length == 1 ? parts[0] : parts.SelectMany(p => p).ToArray();
    }

    private T[] Read<T>(string name, int group, Func<ParquetRowGroupReader, DataField, T[], Task> read)
    {
        if (!_fields.TryGetValue(name, out var field)) throw Damaged($"it has no column '{name}'");
        // Parquet.Net describes UTF-8 columns as ReadOnlyMemory<char>; they read into strings all the same.
        var fits = field.ClrType == typeof(T) || (typeof(T) == typeof(string) && field.ClrType == typeof(ReadOnlyMemory<char>));
        if (!fits || field.IsNullable) throw Damaged($"its column '{name}' is not a required {(typeof(T) == typeof(string) ? "text" : typeof(T).Name)} column");
        try
        {
            using var rowGroup = _reader.OpenRowGroupReader(group);
            var values = new T[checked((int)rowGroup.RowCount)];
            Synchronously.Run(() => read(rowGroup, field, values));
            return values;
        }
        catch (Exception e) when (e is not RunFolderException)
        {
            throw Damaged($"its column '{name}' cannot be read ({e.Message.TrimEnd('.')})", e);
        }
    }

    /// <summary>An exception saying this file is not what it should be.</summary>
    public RunFolderException Damaged(string why, Exception? inner = null) =>
        new($"'{Path}' cannot be used: {why}.", System.IO.Path.GetDirectoryName(Path) ?? Path, inner);

    public void Dispose()
    {
        try
        {
            Synchronously.Run(async () => await _reader.DisposeAsync());
        }
        finally
        {
            _stream.Dispose();
        }
    }
}
