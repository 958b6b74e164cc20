namespace CopyNumber.Tests.Storage;

/// <summary>A fresh empty folder under the system temporary folder, deleted with everything in it on dispose.</summary>
internal sealed class ScratchFolder : IDisposable
{
    public ScratchFolder() : this(System.IO.Path.GetTempPath())
    {
    }

    /// <summary>A scratch folder inside <paramref name="parent"/> (e.g. the current directory, for paths printed relative to it).</summary>
    public ScratchFolder(string parent)
    {
        Path = System.IO.Path.Combine(parent, "copynumber-output-tests-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Path);
    }

    public string Path { get; }

    public string File(string name) => System.IO.Path.Combine(Path, name);

    /// <summary>Names of everything directly in the folder, sorted ordinally.</summary>
    public string[] Entries() =>
        Directory.EnumerateFileSystemEntries(Path).Select(e => System.IO.Path.GetFileName(e)!).Order(StringComparer.Ordinal).ToArray();

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (IOException)
        {
        }
    }
}
