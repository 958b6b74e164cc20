using Parquet;

namespace CopyNumber.Output;

/// <summary>A whole Parquet table read back into memory: columns by name and the footer's key-value metadata.</summary>
public sealed class ParquetTable
{
    private readonly Dictionary<string, Array> _columns;

    private ParquetTable(Dictionary<string, Array> columns, IReadOnlyDictionary<string, string> metadata, long rows)
    {
        _columns = columns;
        Metadata = metadata;
        Rows = rows;
    }

    /// <summary>Key-value metadata of the file footer.</summary>
    public IReadOnlyDictionary<string, string> Metadata { get; }

    /// <summary>Number of rows.</summary>
    public long Rows { get; }

    /// <summary>Column names in file order.</summary>
    public IReadOnlyCollection<string> ColumnNames => _columns.Keys;

    /// <summary>A column's values (double[], long[] or string[]).</summary>
    /// <exception cref="OutputException">The table has no such column or it has another type.</exception>
    public T[] Column<T>(string name) =>
        _columns.TryGetValue(name, out var values) && values is T[] typed
            ? typed
            : throw new OutputException($"the table has no {typeof(T).Name} column '{name}'", name);

    /// <summary>Reads every row group of <paramref name="path"/>.</summary>
    /// <exception cref="OutputException">The file is missing or not a Parquet table.</exception>
    public static ParquetTable Read(string path)
    {
        try
        {
            return ReadAsync(path).GetAwaiter().GetResult();
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or InvalidDataException or NotSupportedException or ArgumentException)
        {
            throw new OutputException($"Cannot read '{path}': {e.Message}", path, e);
        }
    }

    private static async Task<ParquetTable> ReadAsync(string path)
    {
        await using var stream = File.OpenRead(path);
        await using var reader = await ParquetReader.CreateAsync(stream).ConfigureAwait(false);
        var fields = reader.Schema.GetDataFields();
        var parts = fields.ToDictionary(f => f.Name, _ => new List<Array>());
        long rows = 0;
        for (var g = 0; g < reader.RowGroupCount; g++)
        {
            using var group = reader.OpenRowGroupReader(g);
            rows += group.RowCount;
            var count = checked((int)group.RowCount);
            foreach (var field in fields)
            {
                Array values;
                if (field.ClrType == typeof(double))
                {
                    var buffer = new double[count];
                    await group.ReadAsync<double>(field, buffer.AsMemory(), null).ConfigureAwait(false);
                    values = buffer;
                }
                else if (field.ClrType == typeof(long))
                {
                    var buffer = new long[count];
                    await group.ReadAsync<long>(field, buffer.AsMemory(), null).ConfigureAwait(false);
                    values = buffer;
                }
                else if (field.ClrType == typeof(string) || field.ClrType == typeof(ReadOnlyMemory<char>))
                {
                    var buffer = new string?[count];
                    await group.ReadAsync(field, buffer.AsMemory(), null).ConfigureAwait(false);
                    values = buffer.Select(v => v ?? "").ToArray();
                }
                else throw new InvalidDataException($"column '{field.Name}' has type {field.ClrType.Name}, which CopyNumber tables never use");
                parts[field.Name].Add(values);
            }
        }
        var columns = new Dictionary<string, Array>(StringComparer.Ordinal);
        foreach (var field in fields)
        {
            var pieces = parts[field.Name];
            var type = pieces.Count > 0 ? pieces[0].GetType().GetElementType()! : field.ClrType;
            var all = Array.CreateInstance(type, pieces.Sum(p => p.Length));
            var at = 0;
            foreach (var piece in pieces)
            {
                piece.CopyTo(all, at);
                at += piece.Length;
            }
            columns[field.Name] = all;
        }
        return new ParquetTable(columns, new Dictionary<string, string>(reader.CustomMetadata ?? new Dictionary<string, string>()), rows);
    }
}
