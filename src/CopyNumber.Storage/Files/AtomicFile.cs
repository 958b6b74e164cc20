using System.Text;

namespace CopyNumber.Storage;

/// <summary>
/// Writes a file so that its final name only ever holds complete contents: the bytes go to a
/// temporary sibling <c>&lt;path&gt;.partial-&lt;guid&gt;</c>, are forced to disk, and the sibling is
/// then renamed over the final name. A rename within one folder replaces the target atomically on
/// POSIX file systems (IEEE Std 1003.1, rename()) and on NTFS, so a reader sees the old file or the new
/// one, never a mixture; after a crash at worst a <c>.partial-</c> file is left beside it.
/// Failures become <see cref="OutputException"/> naming the final path.
/// </summary>
public static class AtomicFile
{
    /// <summary>The infix that marks a temporary sibling; anything named <c>*.partial-*</c> is unfinished.</summary>
    public const string PartialMarker = ".partial-";

    private static readonly UTF8Encoding Utf8WithoutMark = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    /// <summary>A fresh temporary name in the same folder as <paramref name="finalPath"/>.</summary>
    public static string TemporaryPathFor(string finalPath) =>
        finalPath + PartialMarker + Guid.NewGuid().ToString("N");

    /// <summary>Writes <paramref name="text"/> as UTF-8 (no byte-order mark) to <paramref name="path"/> atomically, replacing any file there.</summary>
    /// <exception cref="OutputException">The file could not be written; nothing new is left under <paramref name="path"/>.</exception>
    public static void WriteAllText(string path, string text) =>
        WriteAllBytes(path, Utf8WithoutMark.GetBytes(text));

    /// <summary>Writes <paramref name="content"/> to <paramref name="path"/> atomically, replacing any file there.</summary>
    /// <exception cref="OutputException">The file could not be written; nothing new is left under <paramref name="path"/>.</exception>
    public static void WriteAllBytes(string path, ReadOnlySpan<byte> content)
    {
        var finalPath = FullPath(path);
        var temporary = TemporaryPathFor(finalPath);
        try
        {
            using (var stream = OpenTemporary(temporary))
            {
                stream.Write(content);
                stream.Flush(flushToDisk: true);
            }
            Commit(temporary, finalPath);
        }
        catch (Exception e) when (IsStorageFailure(e))
        {
            DiscardQuietly(temporary);
            throw Failure(finalPath, e);
        }
    }

    /// <summary>Copies <paramref name="source"/> to <paramref name="destination"/> atomically (through a forced-to-disk temporary sibling), replacing any file there.</summary>
    /// <exception cref="OutputException">The copy could not be written; nothing new is left under <paramref name="destination"/>.</exception>
    public static void Copy(string source, string destination)
    {
        var finalPath = FullPath(destination);
        var temporary = TemporaryPathFor(finalPath);
        try
        {
            using (var input = new FileStream(source, FileMode.Open, FileAccess.Read, FileShare.Read, bufferSize: 1 << 16))
            using (var stream = OpenTemporary(temporary))
            {
                input.CopyTo(stream);
                stream.Flush(flushToDisk: true);
            }
            Commit(temporary, finalPath);
        }
        catch (Exception e) when (IsStorageFailure(e) && e is not OutputException)
        {
            DiscardQuietly(temporary);
            throw Failure(finalPath, e);
        }
    }

    /// <summary>
    /// Renames the finished <paramref name="temporaryPath"/> to <paramref name="finalPath"/>, replacing any
    /// file there. The caller must have flushed and closed the temporary file.
    /// </summary>
    /// <exception cref="OutputException">The rename failed; the temporary file is deleted.</exception>
    public static void Commit(string temporaryPath, string finalPath)
    {
        try
        {
            File.Move(temporaryPath, finalPath, overwrite: true);
        }
        catch (Exception e) when (IsStorageFailure(e))
        {
            DiscardQuietly(temporaryPath);
            throw Failure(finalPath, e);
        }
        TestFaults.Committed(finalPath);
    }

    /// <summary>Creates <paramref name="temporaryPath"/>, which must not exist yet, for reading and writing.</summary>
    internal static FileStream OpenTemporary(string temporaryPath) =>
        new(temporaryPath, FileMode.CreateNew, FileAccess.ReadWrite, FileShare.None, bufferSize: 1 << 16);

    /// <summary>Deletes <paramref name="temporaryPath"/> if it exists; a failure to delete is ignored because the caller is already reporting the real error.</summary>
    internal static void DiscardQuietly(string temporaryPath)
    {
        try
        {
            File.Delete(temporaryPath);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    /// <summary>The full form of a user-given path, or an <see cref="OutputException"/> if it is not a valid path at all.</summary>
    internal static string FullPath(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        if (string.IsNullOrWhiteSpace(path)) throw new OutputException("The output path is empty.", path);
        try
        {
            return System.IO.Path.GetFullPath(path);
        }
        catch (Exception e) when (e is ArgumentException or NotSupportedException or PathTooLongException)
        {
            throw new OutputException($"'{path}' is not a valid output path: {e.Message}", path, e);
        }
    }

    /// <summary>Whether <paramref name="error"/> (or an error it wraps) comes from the file system rather than from a bug.</summary>
    internal static bool IsStorageFailure(Exception error) => StorageCause(error) is not null;

    /// <summary>The user-facing exception for a storage failure while writing <paramref name="finalPath"/>.</summary>
    internal static OutputException Failure(string finalPath, Exception error)
    {
        var cause = StorageCause(error) ?? error;
        return new OutputException($"Cannot write '{finalPath}': {Reason(cause, finalPath)}.", finalPath, cause);
    }

    private static Exception? StorageCause(Exception? error)
    {
        for (var e = error; e is not null; e = e.InnerException)
        {
            if (e is IOException or UnauthorizedAccessException) return e;
            if (e is AggregateException { InnerExceptions.Count: 1 } aggregate) return StorageCause(aggregate.InnerExceptions[0]);
        }
        return null;
    }

    private static string Reason(Exception cause, string finalPath) => cause switch
    {
        _ when IsDiskFull(cause) => "the disk is full (or the disk quota is used up)",
        DirectoryNotFoundException => MissingFolder(finalPath),
        UnauthorizedAccessException => "permission denied",
        _ => cause.Message.TrimEnd('.'),
    };

    private static string MissingFolder(string finalPath)
    {
        // Walk up to the first component that exists: the user needs to know which one is wrong.
        for (var folder = System.IO.Path.GetDirectoryName(finalPath); folder is not null; folder = System.IO.Path.GetDirectoryName(folder))
        {
            if (File.Exists(folder)) return $"'{folder}' is a file, not a folder";
            if (Directory.Exists(folder)) break;
        }
        return $"the folder '{System.IO.Path.GetDirectoryName(finalPath)}' does not exist";
    }

    /// <summary>
    /// Whether <paramref name="cause"/> reports a full disk. On Unix .NET puts the errno in HResult
    /// (ENOSPC 28, EDQUOT 122 on Linux, 69 on macOS); on Windows it is ERROR_DISK_FULL or ERROR_HANDLE_DISK_FULL.
    /// </summary>
    internal static bool IsDiskFull(Exception cause)
    {
        if (cause is not IOException) return false;
        var code = cause.HResult;
        if (OperatingSystem.IsWindows()) return code is unchecked((int)0x80070070) or unchecked((int)0x80070027);
        if (OperatingSystem.IsMacOS()) return code is 28 or 69;
        return code is 28 or 122;
    }
}
