namespace CopyNumber.Storage;

/// <summary>
/// The value type of one table column. Each maps to one Parquet physical type, and every column is
/// required (no nulls): Double is DOUBLE (IEEE 754 binary64), Int64 is INT64, String is BYTE_ARRAY
/// annotated as STRING (UTF-8).
/// </summary>
public enum ColumnType
{
    /// <summary>64-bit floating point; the row-group array is <c>double[]</c>.</summary>
    Double,

    /// <summary>64-bit signed integer; the row-group array is <c>long[]</c>.</summary>
    Int64,

    /// <summary>UTF-8 text such as species names; the row-group array is <c>string[]</c> without nulls.</summary>
    String,
}

/// <summary>One column of a table: its name as readers will see it, and its value type.</summary>
/// <param name="Name">Column name; non-blank and unique within its table (compared ordinally).</param>
/// <param name="Type">Value type.</param>
public sealed record ColumnSpec(string Name, ColumnType Type);
