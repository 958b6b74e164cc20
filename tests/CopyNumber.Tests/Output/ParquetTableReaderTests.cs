using CopyNumber.Output;

namespace CopyNumber.Tests.Output;

public class ParquetTableReaderTests
{
    [Fact]
    public void Reads_back_every_column_type_over_several_row_groups_and_the_metadata()
    {
        // Round trip through our writer and reader; the writer itself is checked against ParquetSharp in
        // ParquetTableWriterTests, so this checks the reader against values chosen in the test.
        using var scratch = new ScratchFolder();
        var path = scratch.File("t.parquet");
        using (var writer = ParquetTableWriter.Create(path, [new("x", ColumnType.Double), new("n", ColumnType.Int64), new("s", ColumnType.String)],
                   new Dictionary<string, string> { ["k"] = "v" }))
        {
            writer.WriteRowGroup([new[] { 1.5, double.NaN }, new[] { 1L, long.MaxValue }, new[] { "a", "b" }]);
            writer.WriteRowGroup([new[] { -0.0 }, new[] { -3L }, new[] { "ü" }]);
            writer.Complete();
        }
        var table = ParquetTable.Read(path);
        Assert.Equal(3, table.Rows);
        Assert.Equal([1.5, double.NaN, -0.0], table.Column<double>("x"));
        Assert.Equal([1L, long.MaxValue, -3L], table.Column<long>("n"));
        Assert.Equal(["a", "b", "ü"], table.Column<string>("s"));
        Assert.Equal("v", table.Metadata["k"]);
        Assert.Throws<OutputException>(() => table.Column<double>("missing"));
    }

    [Fact]
    public void A_file_that_is_not_Parquet_gives_an_output_error_naming_it()
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("junk.parquet");
        File.WriteAllText(path, "not a table");
        var error = Assert.Throws<OutputException>(() => ParquetTable.Read(path));
        Assert.Contains("junk.parquet", error.Message);
    }
}
