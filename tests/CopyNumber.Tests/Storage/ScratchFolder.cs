namespace CopyNumber.Tests.Storage;

/// <summary>A fresh empty folder under the system temporary folder, deleted with everything in it on dispose.</summary>
internal sealed class ScratchFolder : IDisposable
{
    public ScratchFolder()
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "copynumber-output-tests-" + Guid.NewGuid().ToString("N"));
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
