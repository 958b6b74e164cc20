namespace CopyNumber.Storage;

/// <summary>
/// A run folder given to resume or merge cannot be used: it is missing, incomplete or damaged, or it
/// does not belong with the settings or the other folders it is combined with. The message is meant
/// for the user as it stands and says what differs or what is missing.
/// </summary>
public sealed class RunFolderException : CopyNumberException
{
    /// <summary>Creates the exception.</summary>
    /// <param name="message">User-facing sentences naming the folder or file.</param>
    /// <param name="folder">The folder concerned, as a full path.</param>
    /// <param name="inner">The underlying error, if any.</param>
    public RunFolderException(string message, string folder, Exception? inner = null)
        : base(message, ErrorKind.BadInput, inner)
    {
        Folder = folder;
    }

    /// <summary>The folder concerned, as a full path.</summary>
    public string Folder { get; }
}
