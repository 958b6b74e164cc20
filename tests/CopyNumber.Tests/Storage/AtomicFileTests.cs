using CopyNumber.Storage;

namespace CopyNumber.Tests.Storage;

// Replacement by rename within one folder is atomic on POSIX file systems (IEEE Std 1003.1, rename()):
// the final name shows the old contents or the new, and the temporary sibling is gone afterwards.
public sealed class AtomicFileTests
{
    [Fact]
    public void Text_replaces_the_old_file_and_leaves_no_temporary_sibling()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("manifest.json");
        File.WriteAllText(path, "old");

        AtomicFile.WriteAllText(path, "{\"µ\": 1}");

        Assert.Equal(["manifest.json"], folder.Entries());
        // UTF-8 without byte-order mark: µ (U+00B5) is C2 B5 (RFC 3629, §3).
        Assert.Equal([0x7B, 0x22, 0xC2, 0xB5, 0x22, 0x3A, 0x20, 0x31, 0x7D], File.ReadAllBytes(path));
    }

    [Fact]
    public void Temporary_names_are_siblings_of_the_final_name_and_never_repeat()
    {
        var first = AtomicFile.TemporaryPathFor("/data/run/counts.parquet");
        var second = AtomicFile.TemporaryPathFor("/data/run/counts.parquet");
        Assert.StartsWith("/data/run/counts.parquet" + AtomicFile.PartialMarker, first);
        Assert.Equal("/data/run", Path.GetDirectoryName(first));
        Assert.NotEqual(first, second);
    }

    [Fact]
    public void Writing_into_a_missing_folder_names_the_final_path()
    {
        using var folder = new ScratchFolder();
        var path = Path.Combine(folder.Path, "gone", "manifest.json");
        var failure = Assert.Throws<OutputException>(() => AtomicFile.WriteAllText(path, "{}"));
        Assert.Equal(path, failure.Path);
        Assert.Contains("does not exist", failure.Message);
        Assert.Empty(folder.Entries());
    }
}
