namespace CopyNumber.Storage;

/// <summary>
/// <c>joint.parquet</c> (written by <c>exact --joint A,B</c>): the joint law of two species at every grid time, one
/// row per (time, count of the first, count of the second) with positive probability, in that order. The column
/// names carry the species (<c>first</c>, <c>second</c> name them; the counts are <c>first_count</c>,
/// <c>second_count</c>), and the probabilities at one time sum to 1 (normalised on the projection, like
/// distributions.parquet of an exact run). <c>pair.parquet</c> (<c>contrast --pair A,B</c>) has the same columns, the
/// probabilities being the fractions of the replicates with stored paths.
/// </summary>
public static class JointTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames = ["time", "first", "first_count", "second", "second_count", "probability"];

    /// <summary>Writes the joint laws of <paramref name="first"/> and <paramref name="second"/>, one row group per grid time.</summary>
    public static void Write(string path, string first, string second, IReadOnlyList<double> times,
        IReadOnlyList<IReadOnlyList<(long First, long Second, double Probability)>> laws, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(times);
        ArgumentNullException.ThrowIfNull(laws);
        ColumnSpec[] columns =
        [
            new("time", ColumnType.Double), new("first", ColumnType.String), new("first_count", ColumnType.Int64),
            new("second", ColumnType.String), new("second_count", ColumnType.Int64), new("probability", ColumnType.Double),
        ];
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        for (var k = 0; k < times.Count; k++)
        {
            var law = laws[k];
            writer.WriteRowGroup([
                Enumerable.Repeat(times[k], law.Count).ToArray(), Enumerable.Repeat(first, law.Count).ToArray(), law.Select(e => e.First).ToArray(),
                Enumerable.Repeat(second, law.Count).ToArray(), law.Select(e => e.Second).ToArray(), law.Select(e => e.Probability).ToArray(),
            ]);
        }
        if (writer.RowsWritten == 0) writer.WriteRowGroup([Array.Empty<double>(), Array.Empty<string>(), Array.Empty<long>(), Array.Empty<string>(), Array.Empty<long>(), Array.Empty<double>()]);
        writer.Complete();
    }
}
