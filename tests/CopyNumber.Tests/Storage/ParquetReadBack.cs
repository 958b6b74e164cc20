using ParquetSharp;

namespace CopyNumber.Tests.Storage;

/// <summary>
/// Everything a reader sees in a Parquet file, read with ParquetSharp (Apache Arrow's C++ Parquet
/// implementation underneath) so our Parquet.Net output is checked by an independent implementation.
/// The items read are those the Apache Parquet format specification (parquet-format, FileMetaData)
/// puts in the footer: schema, num_rows, row_groups with their num_rows, key_value_metadata.
/// </summary>
internal sealed class ParquetReadBack
{
    public required string[] Names { get; init; }
    public required PhysicalType[] PhysicalTypes { get; init; }
    public required bool[] IsString { get; init; }
    public required short[] MaxDefinitionLevels { get; init; }
    public required long TotalRows { get; init; }
    public required long[] RowGroupRows { get; init; }
    public required IReadOnlyDictionary<string, string> KeyValues { get; init; }

    /// <summary>Each column's values over all row groups, as double[], long[] or string[].</summary>
    public required Array[] Values { get; init; }

    public static ParquetReadBack Of(string path)
    {
        using var file = new ParquetFileReader(path);
        var meta = file.FileMetaData;
        var schema = meta.Schema;
        var columns = schema.NumColumns;
        var names = new string[columns];
        var physical = new PhysicalType[columns];
        var isString = new bool[columns];
        var maxDefinition = new short[columns];
        for (var c = 0; c < columns; c++)
        {
            var descriptor = schema.Column(c);
            names[c] = descriptor.Name;
            physical[c] = descriptor.PhysicalType;
            isString[c] = descriptor.LogicalType is StringLogicalType;
            maxDefinition[c] = descriptor.MaxDefinitionLevel;
        }

        var groupRows = new long[meta.NumRowGroups];
        var parts = Enumerable.Range(0, columns).Select(_ => new List<Array>()).ToArray();
        for (var g = 0; g < meta.NumRowGroups; g++)
        {
            using var group = file.RowGroup(g);
            var rows = checked((int)group.MetaData.NumRows);
            groupRows[g] = rows;
            for (var c = 0; c < columns; c++)
            {
                using var column = group.Column(c);
                parts[c].Add(physical[c] switch
                {
                    PhysicalType.Double => ReadAll<double>(column, rows),
                    PhysicalType.Int64 => ReadAll<long>(column, rows),
                    PhysicalType.ByteArray => ReadAll<string>(column, rows),
                    var other => throw new InvalidOperationException($"unexpected physical type {other}"),
                });
            }
        }

        var metadata = meta.KeyValueMetadata.ToDictionary(p => p.Key, p => p.Value, StringComparer.Ordinal);
        var result = new ParquetReadBack
        {
            Names = names,
            PhysicalTypes = physical,
            IsString = isString,
            MaxDefinitionLevels = maxDefinition,
            TotalRows = meta.NumRows,
            RowGroupRows = groupRows,
            KeyValues = metadata,
            Values = parts.Select(Concatenate).ToArray(),
        };
        file.Close();
        return result;
    }

    private static T[] ReadAll<T>(ColumnReader column, int rows)
    {
        using var reader = column.LogicalReader<T>();
        return reader.ReadAll(rows);
    }

    private static Array Concatenate(List<Array> pieces)
    {
        if (pieces.Count == 0) return Array.Empty<object>();
        var all = Array.CreateInstance(pieces[0].GetType().GetElementType()!, pieces.Sum(p => p.Length));
        var at = 0;
        foreach (var piece in pieces)
        {
            piece.CopyTo(all, at);
            at += piece.Length;
        }
        return all;
    }
}
