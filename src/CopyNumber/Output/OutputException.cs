namespace CopyNumber.Output;

/// <summary>
/// A result could not be written: the folder is missing or not writable, the disk is full, or an
/// output folder would mix a new run with files already there. <see cref="Exception.Message"/> is
/// meant for the user as it stands and names <see cref="Path"/>; the operating system's own error,
/// when there is one, is kept as <see cref="Exception.InnerException"/>.
/// </summary>
public sealed class OutputException : Exception
{
    /// <summary>Creates the exception.</summary>
    /// <param name="message">One user-facing sentence that names <paramref name="path"/>.</param>
    /// <param name="path">The file or folder the user asked for (never an internal temporary name).</param>
    /// <param name="inner">The underlying error, if any.</param>
    public OutputException(string message, string path, Exception? inner = null)
        : base(message, inner)
    {
        Path = path;
    }

    /// <summary>The file or folder that could not be written, as a full path.</summary>
    public string Path { get; }
}
