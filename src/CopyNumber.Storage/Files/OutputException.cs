namespace CopyNumber.Storage;

/// <summary>
/// A result could not be written: the folder is missing or not writable, the disk is full, or an
/// output folder would mix a new run with files already there. <see cref="Exception.Message"/> is
/// meant for the user as it stands and names <see cref="Path"/>; the operating system's own error,
/// when there is one, is kept as <see cref="Exception.InnerException"/>.
/// </summary>
public sealed class OutputException : CopyNumberException
{
    /// <summary>Creates the exception.</summary>
    /// <param name="message">One user-facing sentence that names <paramref name="path"/>.</param>
    /// <param name="path">The file or folder the user asked for (never an internal temporary name).</param>
    /// <param name="inner">The underlying error, if any.</param>
    public OutputException(string message, string path, Exception? inner = null)
        : base(message, ErrorKind.RunFailed, inner)
    {
        Path = path;
    }

    /// <summary>Creates the exception for a folder refused by rule rather than by the operating system.</summary>
    /// <param name="message">One user-facing sentence that names <paramref name="path"/>.</param>
    /// <param name="path">The folder the user asked for.</param>
    /// <param name="refused">True: the path was refused (e.g. a non-empty output folder), nothing failed.</param>
    public OutputException(string message, string path, bool refused)
        : base(message, refused ? ErrorKind.BadInput : ErrorKind.RunFailed)
    {
        Path = path;
        IsRefusal = refused;
    }

    /// <summary>
    /// True when the path was refused by rule (an output folder that already holds files, a file where a
    /// folder should be): the user's choice is at fault, not the storage, and nothing was written.
    /// </summary>
    public bool IsRefusal { get; }

    /// <summary>The file or folder that could not be written, as a full path.</summary>
    public string Path { get; }
}
