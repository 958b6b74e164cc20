using CopyNumber.Storage;

namespace CopyNumber.Tests.Storage;

// The rules checked here are the documented contract of OutputFolder (default folder
// "runs/<model>-<yyyyMMdd-HHmmss>", refusal of a non-empty named folder unless forced); the expected
// names are written out by hand from that format. The current directory is process-wide, so the
// tests pass an explicit base folder instead of changing it.
public sealed class OutputFolderTests
{
    private static readonly DateTimeOffset Start = new(2024, 3, 5, 7, 8, 9, TimeSpan.Zero);

    [Fact]
    public void The_default_name_is_model_date_and_clock_time_of_the_start()
    {
        Assert.Equal("toggle-20240305-070809", OutputFolder.DefaultName("toggle", Start));
        // The clock time is the one of the offset the start carries: 07:08:09 UTC is 12:38:09 at +05:30.
        Assert.Equal("toggle-20240305-123809", OutputFolder.DefaultName("toggle", Start.ToOffset(new TimeSpan(5, 30, 0))));
        Assert.Equal("my_model_v2-20240305-070809", OutputFolder.DefaultName("my model/v2", Start));
        Assert.Equal("hidden.v1-20240305-070809", OutputFolder.DefaultName("..hidden.v1", Start));
        Assert.Equal("model-20240305-070809", OutputFolder.DefaultName("", Start));
    }

    [Fact]
    public void Without_a_request_a_new_folder_with_the_default_name_is_created()
    {
        using var scratch = new ScratchFolder();
        var created = OutputFolder.CreateFresh(null, "toggle", Start, force: false, scratch.Path);
        // Under runs/ of the base folder (issue 16), never beside the user's own files.
        Assert.Equal(Path.Combine(scratch.Path, "runs", "toggle-20240305-070809"), created);
        Assert.True(Directory.Exists(created));

        // Still empty: the same name is fine again.
        Assert.Equal(created, OutputFolder.CreateFresh("  ", "toggle", Start, force: false, scratch.Path));

        // Taken by an earlier run's files: a numbered sibling, never the old folder.
        File.WriteAllText(Path.Combine(created, "counts.parquet"), "earlier");
        var second = OutputFolder.CreateFresh(null, "toggle", Start, force: false, scratch.Path);
        Assert.Equal(created + "-2", second);
        File.WriteAllText(Path.Combine(second, "counts.parquet"), "earlier");
        Assert.Equal(created + "-3", OutputFolder.CreateFresh(null, "toggle", Start, force: true, scratch.Path));
    }

    [Fact]
    public void A_named_folder_that_holds_files_is_refused_unless_forced()
    {
        using var scratch = new ScratchFolder();
        var named = Path.Combine(scratch.Path, "results");
        Directory.CreateDirectory(named);
        File.WriteAllText(Path.Combine(named, "keep.txt"), "earlier run");

        var refusal = Assert.Throws<OutputException>(() => OutputFolder.CreateFresh("results", "toggle", Start, force: false, scratch.Path));
        Assert.Equal(named, refusal.Path);
        Assert.Equal($"The output folder '{named}' already exists and is not empty; choose a new folder, or replace the run in it with --force.", refusal.Message);

        // Forcing replaces a run's own files only: a file we did not write is refused and kept.
        var forced = Assert.Throws<OutputException>(() => OutputFolder.CreateFresh("results", "toggle", Start, force: true, scratch.Path));
        Assert.True(forced.IsRefusal);
        Assert.Equal("earlier run", File.ReadAllText(Path.Combine(named, "keep.txt")));
        File.Delete(Path.Combine(named, "keep.txt"));
        File.WriteAllText(Path.Combine(named, RunFiles.Moments), "an earlier run's table");
        Assert.Equal(named, OutputFolder.CreateFresh("results", "toggle", Start, force: true, scratch.Path));
        Assert.Empty(Directory.EnumerateFileSystemEntries(named));
    }

    [Fact]
    public void A_named_folder_may_be_new_nested_empty_or_absolute()
    {
        using var scratch = new ScratchFolder();
        var nested = OutputFolder.CreateFresh(Path.Combine("a", "b", "c"), "toggle", Start, force: false, scratch.Path);
        Assert.Equal(Path.Combine(scratch.Path, "a", "b", "c"), nested);
        Assert.True(Directory.Exists(nested));

        Assert.Equal(nested, OutputFolder.CreateFresh(nested, "toggle", Start, force: false, "/elsewhere/ignored"));
    }

    [Fact]
    public void A_file_in_the_way_is_refused_even_when_forced()
    {
        using var scratch = new ScratchFolder();
        var file = scratch.File("results");
        File.WriteAllText(file, "x");
        var refusal = Assert.Throws<OutputException>(() => OutputFolder.CreateFresh("results", "toggle", Start, force: true, scratch.Path));
        Assert.Equal($"The output folder '{file}' is an existing file.", refusal.Message);
    }
}
