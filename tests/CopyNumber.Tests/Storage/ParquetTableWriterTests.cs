using CopyNumber.Storage;
using ParquetSharp;

namespace CopyNumber.Tests.Storage;

// What a reader must see is taken from the Apache Parquet format specification (parquet-format,
// Thrift FileMetaData: schema elements with physical type DOUBLE / INT64 / BYTE_ARRAY and the STRING
// logical type, repetition REQUIRED, num_rows, row_groups[].num_rows, key_value_metadata). Every file
// is read back with ParquetSharp, an implementation independent of the Parquet.Net writer under test.
public sealed class ParquetTableWriterTests
{
    private static readonly ColumnSpec[] Columns =
    [
        new("time", ColumnType.Double),
        new("replicate", ColumnType.Int64),
        new("species", ColumnType.String),
        new("count", ColumnType.Int64),
    ];

    private static readonly Dictionary<string, string> Metadata = new()
    {
        ["copynumber.model_file"] = "toggle switch.cnet",
        ["copynumber.model_text"] = "species A, B\nA -> B @ 0.5\n# Ca²⁺ and µ survive UTF-8\n",
        ["empty"] = "",
    };

    // Three row groups of unequal size, with the extreme and special IEEE 754 doubles (NaN, ±0, ±∞,
    // the smallest subnormal) and the int64 extremes, which Parquet stores as raw little-endian bits.
    private static readonly (double[] Time, long[] Replicate, string[] Species, long[] Count)[] Groups =
    [
        ([0.0, -0.0, 1.0 / 3.0, double.Epsilon], [0, 0, 1, 1], ["A", "B", "A", "Ca²⁺"], [long.MinValue, long.MaxValue, 0, -1]),
        ([double.NaN], [7], [""], [42]),
        ([double.MaxValue, double.PositiveInfinity, double.NegativeInfinity, 1e-300, 2.5, 10], [2, 2, 3, 3, 4, 4], ["B", "A", "B", "A", "µ", "B"], [1, 2, 3, 4, 5, 6]),
    ];

    [Fact]
    public void Row_groups_of_every_column_type_read_back_identically_with_an_independent_reader()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("counts.parquet");
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            foreach (var g in Groups) writer.WriteRowGroup([g.Time, g.Replicate, g.Species, g.Count]);
            Assert.Equal(3, writer.RowGroupsWritten);
            Assert.Equal(11, writer.RowsWritten);
            writer.Complete();
        }

        var read = ParquetReadBack.Of(path);
        Assert.Equal(["time", "replicate", "species", "count"], read.Names);
        Assert.Equal([PhysicalType.Double, PhysicalType.Int64, PhysicalType.ByteArray, PhysicalType.Int64], read.PhysicalTypes);
        Assert.Equal([false, false, true, false], read.IsString);
        // Definition level 0 everywhere: every column is REQUIRED, so no value can be null.
        Assert.All(read.MaxDefinitionLevels, level => Assert.Equal(0, level));
        Assert.Equal([4L, 1L, 6L], read.RowGroupRows);
        Assert.Equal(11, read.TotalRows);

        var expectedTime = Groups.SelectMany(g => g.Time).ToArray();
        // Compared bit for bit so that -0.0 and NaN are checked too.
        Assert.Equal(expectedTime.Select(BitConverter.DoubleToInt64Bits), ((double[])read.Values[0]).Select(BitConverter.DoubleToInt64Bits));
        Assert.Equal(Groups.SelectMany(g => g.Replicate), (long[])read.Values[1]);
        Assert.Equal(Groups.SelectMany(g => g.Species), (string[])read.Values[2]);
        Assert.Equal(Groups.SelectMany(g => g.Count), (long[])read.Values[3]);

        foreach (var (key, value) in Metadata) Assert.Equal(value, read.KeyValues[key]);
    }

    [Fact]
    public void A_long_repetitive_string_column_survives_across_row_groups()
    {
        // 20 000 rows drawn from four species names: the case dictionary encoding is made for.
        string[] names = ["mRNA", "protein", "dimer", "gene_off"];
        using var folder = new ScratchFolder();
        var path = folder.File("long.parquet");
        var species = Enumerable.Range(0, 10_000).Select(i => names[(i * 7 + i / 13) % 4]).ToArray();
        var counts = Enumerable.Range(0, 10_000).Select(i => (long)i * i).ToArray();
        using (var writer = ParquetTableWriter.Create(path, [new("species", ColumnType.String), new("count", ColumnType.Int64)], new Dictionary<string, string>()))
        {
            writer.WriteRowGroup([species, counts]);
            writer.WriteRowGroup([species.Reverse().ToArray(), counts.Reverse().ToArray()]);
            writer.Complete();
        }

        var read = ParquetReadBack.Of(path);
        Assert.Equal([10_000L, 10_000L], read.RowGroupRows);
        Assert.Equal(species.Concat(species.Reverse()), (string[])read.Values[0]);
        Assert.Equal(counts.Concat(counts.Reverse()), (long[])read.Values[1]);
    }

    [Fact]
    public void The_row_count_overload_writes_only_the_leading_part_of_reused_buffers()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("reused.parquet");
        var time = new double[8];
        var count = new long[8];
        using (var writer = ParquetTableWriter.Create(path, [new("time", ColumnType.Double), new("count", ColumnType.Int64)], new Dictionary<string, string>()))
        {
            for (var group = 0; group < 3; group++)
            {
                var rows = group + 2;
                Array.Fill(time, -1.0);
                Array.Fill(count, -1L);
                for (var r = 0; r < rows; r++)
                {
                    time[r] = group + r / 10.0;
                    count[r] = group * 100 + r;
                }
                writer.WriteRowGroup([time, count], rows);
            }
            writer.WriteRowGroup([time, count], 0);
            writer.Complete();
        }

        var read = ParquetReadBack.Of(path);
        // The empty group is skipped, and no -1 fill value leaks in.
        Assert.Equal([2L, 3L, 4L], read.RowGroupRows);
        Assert.Equal([0.0, 0.1, 1.0, 1.1, 1.2, 2.0, 2.1, 2.2, 2.3], (double[])read.Values[0]);
        Assert.Equal([0L, 1, 100, 101, 102, 200, 201, 202, 203], (long[])read.Values[1]);
    }

    [Fact]
    public void A_table_without_rows_is_still_a_readable_file_with_its_schema_and_metadata()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("empty.parquet");
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata)) writer.Complete();

        var read = ParquetReadBack.Of(path);
        Assert.Equal(["time", "replicate", "species", "count"], read.Names);
        Assert.Equal(0, read.TotalRows);
        Assert.Empty(read.RowGroupRows);
        Assert.Equal(Metadata["copynumber.model_text"], read.KeyValues["copynumber.model_text"]);
    }

    [Fact]
    public void Metadata_set_before_completion_reaches_the_footer()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("late.parquet");
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            writer.WriteRowGroup([Groups[1].Time, Groups[1].Replicate, Groups[1].Species, Groups[1].Count]);
            writer.SetMetadata("copynumber.replicates_finished", "8");
            writer.SetMetadata("empty", "now set");
            writer.Complete();
        }

        var read = ParquetReadBack.Of(path);
        Assert.Equal("8", read.KeyValues["copynumber.replicates_finished"]);
        Assert.Equal("now set", read.KeyValues["empty"]);
        Assert.Equal("toggle switch.cnet", read.KeyValues["copynumber.model_file"]);
    }

    [Fact]
    public void Until_completion_the_final_name_holds_nothing_and_the_data_sits_in_a_partial_sibling()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        using var writer = ParquetTableWriter.Create(path, Columns, Metadata);
        writer.WriteRowGroup([Groups[0].Time, Groups[0].Replicate, Groups[0].Species, Groups[0].Count]);

        Assert.False(File.Exists(path));
        var entry = Assert.Single(folder.Entries());
        Assert.StartsWith("t.parquet" + AtomicFile.PartialMarker, entry);
        Assert.Equal(Path.Combine(folder.Path, entry), writer.TemporaryPath);

        writer.Complete();
        Assert.Equal(["t.parquet"], folder.Entries());
        Assert.Equal(4, ParquetReadBack.Of(path).TotalRows);
    }

    [Fact]
    public void An_existing_file_under_the_final_name_stays_intact_until_completion_replaces_it()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        File.WriteAllText(path, "earlier run");
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            writer.WriteRowGroup([Groups[1].Time, Groups[1].Replicate, Groups[1].Species, Groups[1].Count]);
            Assert.Equal("earlier run", File.ReadAllText(path));
            writer.Complete();
        }
        Assert.Equal(1, ParquetReadBack.Of(path).TotalRows);
    }

    [Fact]
    public void Disposing_without_completion_leaves_no_file_at_all()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            writer.WriteRowGroup([Groups[0].Time, Groups[0].Replicate, Groups[0].Species, Groups[0].Count]);
            writer.WriteRowGroup([Groups[2].Time, Groups[2].Replicate, Groups[2].Species, Groups[2].Count]);
        }
        Assert.Empty(folder.Entries());

        using (ParquetTableWriter.Create(path, Columns, Metadata))
        {
        }
        Assert.Empty(folder.Entries());
    }

    [Fact]
    public async Task Async_disposal_without_completion_leaves_no_file_either()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        await using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            writer.WriteRowGroup([Groups[1].Time, Groups[1].Replicate, Groups[1].Species, Groups[1].Count]);
        }
        Assert.Empty(folder.Entries());
    }

    [Fact]
    public void Rejected_row_groups_write_nothing_and_leave_the_writer_usable()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        var g = Groups[0];
        using (var writer = ParquetTableWriter.Create(path, Columns, Metadata))
        {
            var wrongType = Assert.Throws<ArgumentException>(() => writer.WriteRowGroup([g.Time, g.Time, g.Species, g.Count]));
            Assert.Contains("'replicate'", wrongType.Message);
            var tooFew = Assert.Throws<ArgumentException>(() => writer.WriteRowGroup([g.Time, g.Replicate, g.Species]));
            Assert.Contains("4 column arrays", tooFew.Message);
            var unequal = Assert.Throws<ArgumentException>(() => writer.WriteRowGroup([g.Time, g.Replicate, g.Species, new long[3]]));
            Assert.Contains("'count'", unequal.Message);
            var withNull = Assert.Throws<ArgumentException>(() => writer.WriteRowGroup([g.Time, g.Replicate, new[] { "A", null!, "B", "C" }, g.Count]));
            Assert.Contains("row 1", withNull.Message);
            Assert.Throws<ArgumentException>(() => writer.WriteRowGroup([g.Time, g.Replicate, g.Species, g.Count], 5));
            Assert.Equal(0, writer.RowsWritten);

            writer.WriteRowGroup([g.Time, g.Replicate, g.Species, g.Count]);
            writer.Complete();
            Assert.Throws<InvalidOperationException>(() => writer.WriteRowGroup([g.Time, g.Replicate, g.Species, g.Count]));
        }
        Assert.Equal([4L], ParquetReadBack.Of(path).RowGroupRows);
    }

    [Fact]
    public void Bad_schemas_are_refused_with_the_column_named()
    {
        Assert.Throws<ArgumentException>(() => new TableSchema([]));
        Assert.Contains("'A' appears twice", Assert.Throws<ArgumentException>(() => new TableSchema([new("A", ColumnType.Int64), new("A", ColumnType.Double)])).Message);
        Assert.Contains("blank name", Assert.Throws<ArgumentException>(() => new TableSchema([new(" ", ColumnType.Int64)])).Message);
        Assert.Contains("unknown type", Assert.Throws<ArgumentException>(() => new TableSchema([new("x", (ColumnType)9)])).Message);
        // Case matters in Parquet names, so "a" and "A" are two columns.
        Assert.Equal(2, new TableSchema([new("a", ColumnType.Int64), new("A", ColumnType.Int64)]).Columns.Count);
    }
}
