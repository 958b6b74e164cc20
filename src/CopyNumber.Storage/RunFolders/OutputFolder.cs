using System.Globalization;
using System.Text;

namespace CopyNumber.Storage;

/// <summary>
/// Chooses and creates the folder one run writes into, so that a run never mixes its files with an
/// earlier run's. The default name is <c>&lt;model&gt;-&lt;yyyyMMdd-HHmmss&gt;</c> under the current directory.
/// </summary>
public static class OutputFolder
{
    /// <summary>Longest suffix tried when the default name is already taken (<c>-2</c> … <c>-99</c>).</summary>
    private const int MaxSuffix = 99;

    /// <summary>
    /// Creates (if needed) and returns the full path of the run's output folder.
    /// </summary>
    /// <param name="requested">
    /// The folder the user named, relative to the current directory or absolute; <c>null</c> or blank
    /// for the default name. A named folder may exist if it is empty; if it holds anything it is refused
    /// unless <paramref name="force"/> is set, in which case it is used as it is (nothing is deleted, and
    /// files of the same names are replaced).
    /// </param>
    /// <param name="modelName">The model's name, usually its file name without extension; characters other
    /// than ASCII letters, digits, '-', '_' and '.' become '_' so the folder name is valid on every file system.</param>
    /// <param name="start">The run's start; the default name shows its clock time in the offset it carries
    /// (pass <see cref="DateTimeOffset.Now"/> for local time).</param>
    /// <param name="force">Allow writing into a non-empty folder the user named.</param>
    /// <remarks>A default name already taken by a non-empty folder (two runs in one second) gets a suffix
    /// <c>-2</c>, <c>-3</c>, … instead of being refused, since the user did not choose it.</remarks>
    /// <exception cref="OutputException">The folder is refused, is a file, or cannot be created.</exception>
    public static string CreateFresh(string? requested, string modelName, DateTimeOffset start, bool force) =>
        CreateFresh(requested, modelName, start, force, Directory.GetCurrentDirectory());

    /// <summary>As the public overload, with the default name placed under <paramref name="baseDirectory"/> instead of the current directory.</summary>
    internal static string CreateFresh(string? requested, string modelName, DateTimeOffset start, bool force, string baseDirectory)
    {
        ArgumentNullException.ThrowIfNull(modelName);
        if (!string.IsNullOrWhiteSpace(requested))
        {
            var full = AtomicFile.FullPath(Path.Combine(baseDirectory, requested));
            if (HoldsAnything(full) && !force)
                throw new OutputException($"The output folder '{full}' already exists and is not empty; choose a new folder or allow writing into it.", full, refused: true);
            return Create(full);
        }

        var baseName = DefaultName(modelName, start);
        for (var attempt = 1; attempt <= MaxSuffix; attempt++)
        {
            var name = attempt == 1 ? baseName : $"{baseName}-{attempt.ToString(CultureInfo.InvariantCulture)}";
            var full = AtomicFile.FullPath(Path.Combine(baseDirectory, name));
            if (!HoldsAnything(full)) return Create(full);
        }
        var first = AtomicFile.FullPath(Path.Combine(baseDirectory, baseName));
        throw new OutputException($"The output folder '{first}' and its numbered variants up to -{MaxSuffix} all exist already; name an output folder explicitly.", first, refused: true);
    }

    /// <summary>The default folder name <c>&lt;model&gt;-&lt;yyyyMMdd-HHmmss&gt;</c> for a run of <paramref name="modelName"/> started at <paramref name="start"/>.</summary>
    public static string DefaultName(string modelName, DateTimeOffset start) =>
        $"{SafeName(modelName)}-{start.ToString("yyyyMMdd-HHmmss", CultureInfo.InvariantCulture)}";

    /// <summary><paramref name="modelName"/> with characters outside ASCII letters, digits, '-', '_' and '.' replaced by '_', leading dots dropped; "model" if nothing is left.</summary>
    internal static string SafeName(string modelName)
    {
        var safe = new StringBuilder(modelName.Length);
        foreach (var c in modelName)
            safe.Append(char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '_');
        var trimmed = safe.ToString().TrimStart('.');
        return trimmed.Length == 0 ? "model" : trimmed;
    }

    private static bool HoldsAnything(string full)
    {
        if (File.Exists(full)) throw new OutputException($"The output folder '{full}' is an existing file.", full, refused: true);
        try
        {
            return Directory.Exists(full) && Directory.EnumerateFileSystemEntries(full).Any();
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot look into the output folder '{full}': {e.Message.TrimEnd('.')}.", full, e);
        }
    }

    private static string Create(string full)
    {
        // The runtime says only "Could not find a part of the path" when a parent is a file; name the file.
        for (var parent = Path.GetDirectoryName(full); !string.IsNullOrEmpty(parent); parent = Path.GetDirectoryName(parent))
            if (File.Exists(parent))
                throw new OutputException($"The output folder '{full}' cannot be made: '{parent}' is a file, not a folder.", full, refused: true);
        try
        {
            Directory.CreateDirectory(full);
            return full;
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot create the output folder '{full}': {e.Message.TrimEnd('.')}.", full, e);
        }
    }
}
