using CopyNumber.Storage;

namespace CopyNumber.Tests.Storage;

// A failed write must give the user one clear sentence naming the path they asked for, and must
// leave no file under that name (a truncated Parquet file has no footer, and the Apache Parquet
// format specification puts the whole FileMetaData in the footer, so such a file is unreadable).
public sealed class StorageFailureTests
{
    private static readonly TableSchema Schema = new([new("time", ColumnType.Double), new("species", ColumnType.String)]);
    private static readonly Dictionary<string, string> NoMetadata = new();

    private static readonly Array[] RowGroup =
    [
        Enumerable.Range(0, 2000).Select(i => i * 0.25).ToArray(),
        Enumerable.Range(0, 2000).Select(i => i % 3 == 0 ? "A" : "B").ToArray(),
    ];

    /// <summary>Creates, writes two row groups and completes; returns the failure if any step fails.</summary>
    private static OutputException? WriteTable(string path, Func<string, Stream> open)
    {
        try
        {
            using var writer = ParquetTableWriter.Create(path, Schema, NoMetadata, open);
            writer.WriteRowGroup(RowGroup);
            writer.WriteRowGroup(RowGroup);
            writer.Complete();
            return null;
        }
        catch (OutputException e)
        {
            return e;
        }
    }

    [Theory]
    [InlineData(0)]
    [InlineData(100)]
    [InlineData(5000)]
    public void A_disk_that_fills_up_gives_a_clear_error_and_leaves_no_file(long capacity)
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");

        var failure = WriteTable(path, temporary => new FillingStream(temporary, capacity));

        Assert.NotNull(failure);
        Assert.Equal(path, failure.Path);
        Assert.Contains($"'{path}'", failure.Message);
        Assert.Contains("disk is full", failure.Message);
        Assert.DoesNotContain(AtomicFile.PartialMarker, failure.Message);
        Assert.Empty(folder.Entries());
    }

    [Fact]
    public void A_disk_that_fills_up_during_the_last_byte_of_the_footer_leaves_no_file()
    {
        using var folder = new ScratchFolder();
        var reference = folder.File("reference.parquet");
        Assert.Null(WriteTable(reference, AtomicFile.OpenTemporary));
        var size = new FileInfo(reference).Length;
        File.Delete(reference);

        // One byte short of what the complete file needs: everything but the tail fits.
        var path = folder.File("t.parquet");
        var failure = WriteTable(path, temporary => new FillingStream(temporary, size - 1));

        Assert.NotNull(failure);
        Assert.Contains("disk is full", failure.Message);
        Assert.Empty(folder.Entries());

        // With exactly enough room the same table is written: the limit above was the only obstacle.
        Assert.Null(WriteTable(path, temporary => new FillingStream(temporary, size)));
        Assert.Equal(4000, ParquetReadBack.Of(path).TotalRows);
    }

    [Fact]
    public void A_missing_folder_is_named_in_the_error()
    {
        using var folder = new ScratchFolder();
        var missing = Path.Combine(folder.Path, "no-such-folder");
        var path = Path.Combine(missing, "t.parquet");

        var failure = Assert.Throws<OutputException>(() => ParquetTableWriter.Create(path, Schema.Columns, NoMetadata));

        Assert.Equal($"Cannot write '{path}': the folder '{missing}' does not exist.", failure.Message);
        Assert.Empty(folder.Entries());
    }

    [Fact]
    public void A_file_standing_where_the_folder_should_be_is_named_in_the_error()
    {
        // Works whoever runs the tests, root included (permission bits would not stop root).
        using var folder = new ScratchFolder();
        var blocker = folder.File("results");
        File.WriteAllText(blocker, "not a folder");
        var path = Path.Combine(blocker, "t.parquet");

        var failure = Assert.Throws<OutputException>(() => ParquetTableWriter.Create(path, Schema.Columns, NoMetadata));

        Assert.Equal($"Cannot write '{path}': '{blocker}' is a file, not a folder.", failure.Message);
        Assert.Equal(["results"], folder.Entries());
    }

    [Fact]
    public void A_rename_onto_a_folder_fails_cleanly_and_removes_the_temporary_file()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("t.parquet");
        using var writer = ParquetTableWriter.Create(path, Schema.Columns, NoMetadata);
        writer.WriteRowGroup(RowGroup);
        Directory.CreateDirectory(path);

        var failure = Assert.Throws<OutputException>(writer.Complete);

        Assert.StartsWith($"Cannot write '{path}': ", failure.Message);
        Assert.Equal(["t.parquet"], folder.Entries());
        Assert.True(Directory.Exists(path));
        Assert.Throws<InvalidOperationException>(() => writer.WriteRowGroup(RowGroup));
    }

    [Fact]
    public void The_operating_systems_own_disk_full_error_is_recognised()
    {
        // /dev/full is the Linux device on which every write fails with ENOSPC (Linux man-pages, full(4)).
        if (!OperatingSystem.IsLinux() || !File.Exists("/dev/full")) return;
        var error = Assert.ThrowsAny<IOException>(() =>
        {
            using var device = new FileStream("/dev/full", FileMode.Open, FileAccess.Write, FileShare.ReadWrite, bufferSize: 0);
            device.Write(new byte[16]);
        });
        Assert.True(AtomicFile.IsDiskFull(error), $"HResult {error.HResult}: {error.Message}");
        Assert.Contains("disk is full", AtomicFile.Failure("/somewhere/t.parquet", error).Message);
    }
}
