using Parquet.Schema;

namespace CopyNumber.Storage;

/// <summary>
/// The checked column list of one table, and the rule every row group must obey: one array per
/// column, in column order, of the column's CLR type (<c>double[]</c>, <c>long[]</c>,
/// <c>string[]</c>), all holding at least the row group's row count, strings without nulls.
/// </summary>
public sealed class TableSchema
{
    private readonly ColumnSpec[] _columns;

    /// <summary>Checks <paramref name="columns"/>: at least one, names non-blank and unique, types defined.</summary>
    /// <exception cref="ArgumentException">A rule above is broken; the message names the column.</exception>
    public TableSchema(IReadOnlyList<ColumnSpec> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        if (columns.Count == 0) throw new ArgumentException("a table needs at least one column", nameof(columns));
        var seen = new HashSet<string>(StringComparer.Ordinal);
        _columns = new ColumnSpec[columns.Count];
        for (var i = 0; i < columns.Count; i++)
        {
            var column = columns[i] ?? throw new ArgumentException($"column {i} is null", nameof(columns));
            if (string.IsNullOrWhiteSpace(column.Name)) throw new ArgumentException($"column {i} has a blank name", nameof(columns));
            if (!Enum.IsDefined(column.Type)) throw new ArgumentException($"column '{column.Name}' has an unknown type {(int)column.Type}", nameof(columns));
            if (!seen.Add(column.Name)) throw new ArgumentException($"column name '{column.Name}' appears twice", nameof(columns));
            _columns[i] = column;
        }
        Fields = Array.ConvertAll(_columns, ToField);
    }

    /// <summary>The columns in file order.</summary>
    public IReadOnlyList<ColumnSpec> Columns => _columns;

    /// <summary>The Parquet.Net fields, one per column; the same instances must be used for writing.</summary>
    internal DataField[] Fields { get; }

    /// <summary>The CLR array type a row group must supply for <paramref name="type"/>.</summary>
    public static Type ArrayTypeOf(ColumnType type) => type switch
    {
        ColumnType.Double => typeof(double[]),
        ColumnType.Int64 => typeof(long[]),
        ColumnType.String => typeof(string[]),
        _ => throw new ArgumentOutOfRangeException(nameof(type), type, "unknown column type"),
    };

    /// <summary>The common length of <paramref name="columns"/>, after checking they agree.</summary>
    /// <exception cref="ArgumentException">The arrays break the row-group rule or differ in length.</exception>
    internal int CommonLength(IReadOnlyList<Array> columns)
    {
        CheckShapes(columns);
        var length = columns[0].Length;
        for (var i = 1; i < columns.Count; i++)
        {
            if (columns[i].Length != length)
                throw new ArgumentException($"column '{_columns[i].Name}' has {columns[i].Length} values but column '{_columns[0].Name}' has {length}", nameof(columns));
        }
        return length;
    }

    /// <summary>Checks that the first <paramref name="rowCount"/> values of every array form a valid row group.</summary>
    /// <exception cref="ArgumentException">The arrays break the row-group rule.</exception>
    internal void CheckRowGroup(IReadOnlyList<Array> columns, int rowCount)
    {
        CheckShapes(columns);
        if (rowCount < 0) throw new ArgumentOutOfRangeException(nameof(rowCount), rowCount, "the row count cannot be negative");
        for (var i = 0; i < columns.Count; i++)
        {
            if (columns[i].Length < rowCount)
                throw new ArgumentException($"column '{_columns[i].Name}' has {columns[i].Length} values, fewer than the {rowCount} rows of the row group", nameof(columns));
            if (columns[i] is string[] texts)
            {
                var firstNull = Array.IndexOf(texts, null, 0, rowCount);
                if (firstNull >= 0) throw new ArgumentException($"column '{_columns[i].Name}' has no value in row {firstNull}; columns hold no nulls", nameof(columns));
            }
        }
    }

    private void CheckShapes(IReadOnlyList<Array> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        if (columns.Count != _columns.Length)
            throw new ArgumentException($"a row group needs {_columns.Length} column arrays, one per column, but {columns.Count} were given", nameof(columns));
        for (var i = 0; i < columns.Count; i++)
        {
            var expected = ArrayTypeOf(_columns[i].Type);
            if (columns[i] is null || columns[i].GetType() != expected)
                throw new ArgumentException($"column '{_columns[i].Name}' needs a {expected.Name} but got {columns[i]?.GetType().Name ?? "null"}", nameof(columns));
        }
    }

    private static DataField ToField(ColumnSpec column) => column.Type switch
    {
        ColumnType.Double => new DataField<double>(column.Name, nullable: false),
        ColumnType.Int64 => new DataField<long>(column.Name, nullable: false),
        ColumnType.String => new DataField<string>(column.Name, nullable: false),
        _ => throw new ArgumentOutOfRangeException(nameof(column), column.Type, "unknown column type"),
    };
}
