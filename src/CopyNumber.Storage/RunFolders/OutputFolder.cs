using System.Globalization;
using System.Text;

namespace CopyNumber.Storage;

/// <summary>
/// Chooses and creates the folder one run writes into, so that a run never mixes its files with an
/// earlier run's. The default folder is <c>runs/&lt;model&gt;-&lt;yyyyMMdd-HHmmss&gt;</c> under the current directory.
/// </summary>
public static class OutputFolder
{
    /// <summary>The folder, under the current directory, that holds the runs given no output folder: one place to
    /// list, archive or ignore (the repository's .gitignore names it), instead of run folders among the user's files.</summary>
    public const string DefaultParent = "runs";

    /// <summary>Longest suffix tried when the default name is already taken (<c>-2</c> … <c>-99</c>).</summary>
    private const int MaxSuffix = 99;

    /// <summary>
    /// Creates (if needed) and claims the run's output folder (<see cref="FolderClaim"/>): the claim is taken
    /// before the folder is checked for being empty, so no other run can slip in between the check and the
    /// first write. Dispose the claim when the last file is written.
    /// </summary>
    /// <param name="requested">
    /// The folder the user named, relative to the current directory or absolute; <c>null</c> or blank
    /// for the default folder <c>runs/&lt;default name&gt;</c>. A named folder may exist if it is empty; if it holds anything it is refused
    /// unless <paramref name="force"/> is set, in which case the files of the earlier run are removed first
    /// (<see cref="FolderContents.ClearForNewRun"/>; a folder holding files we did not write is refused).
    /// </param>
    /// <param name="modelName">The model's name, usually its file name without extension; characters other
    /// than ASCII letters, digits, '-', '_' and '.' become '_' so the folder name is valid on every file system.</param>
    /// <param name="start">The run's start; the default name shows its clock time in the offset it carries
    /// (pass <see cref="DateTimeOffset.Now"/> for local time).</param>
    /// <param name="force">Write over the run in a non-empty folder the user named, taking over its claim if its process is gone from this host.</param>
    /// <param name="takeOver">Take over a claim the holder cannot be checked for (another host's, or an unreadable one).</param>
    /// <param name="command">The command claiming, named to other runs refused the folder.</param>
    /// <remarks>A default name already taken by a non-empty or claimed folder (two runs in one second) gets a suffix
    /// <c>-2</c>, <c>-3</c>, … instead of being refused, since the user did not choose it.</remarks>
    /// <exception cref="OutputException">The folder is refused (not empty, in use, is a file), or cannot be created.</exception>
    public static FolderClaim Claim(string? requested, string modelName, DateTimeOffset start, bool force, bool takeOver = false, string command = "simulate") =>
        Claim(requested, modelName, start, force, takeOver, command, Directory.GetCurrentDirectory());

    /// <summary>As <see cref="Claim(string?, string, DateTimeOffset, bool, bool, string)"/>, releasing the claim at once; for tests of the naming and emptiness rules.</summary>
    internal static string CreateFresh(string? requested, string modelName, DateTimeOffset start, bool force, string? baseDirectory = null)
    {
        using var claim = Claim(requested, modelName, start, force, takeOver: false, "test", baseDirectory ?? Directory.GetCurrentDirectory());
        return claim.Folder;
    }

    private static FolderClaim Claim(string? requested, string modelName, DateTimeOffset start, bool force, bool takeOver, string command, string baseDirectory)
    {
        ArgumentNullException.ThrowIfNull(modelName);
        if (!string.IsNullOrWhiteSpace(requested))
        {
            var full = AtomicFile.FullPath(Path.Combine(baseDirectory, requested));
            // Refused before anything is created in it, unless a claim there should name its holder instead.
            if (HoldsAnything(full) && !force && !File.Exists(Path.Combine(full, RunFiles.Claim))) throw NotEmpty(full);
            var claim = FolderClaim.Take(Create(full), command, takeOverStale: force, takeOver);
            try
            {
                if (HoldsAnything(full))
                {
                    if (!force) throw NotEmpty(full);
                    FolderContents.ClearForNewRun(full);
                }
                return claim;
            }
            catch
            {
                claim.Dispose();
                throw;
            }
        }

        var baseName = DefaultName(modelName, start);
        for (var attempt = 1; attempt <= MaxSuffix; attempt++)
        {
            var name = attempt == 1 ? baseName : $"{baseName}-{attempt.ToString(CultureInfo.InvariantCulture)}";
            var full = AtomicFile.FullPath(Path.Combine(baseDirectory, DefaultParent, name));
            if (HoldsAnything(full) || File.Exists(Path.Combine(full, RunFiles.Claim))) continue;
            FolderClaim claim;
            try
            {
                claim = FolderClaim.Take(Create(full), command, takeOverStale: false, takeOver: false);
            }
            catch (OutputException e) when (e.IsRefusal)
            {
                continue; // another run took this name first
            }
            if (!HoldsAnything(full)) return claim;
            claim.Dispose();
        }
        var first = AtomicFile.FullPath(Path.Combine(baseDirectory, DefaultParent, baseName));
        throw new OutputException($"The output folder '{first}' and its numbered variants up to -{MaxSuffix} all exist already; name an output folder explicitly.", first, refused: true);
    }

    private static OutputException NotEmpty(string full) =>
        new($"The output folder '{full}' already exists and is not empty; choose a new folder, or replace the run in it with --force.", full, refused: true);

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
            return FolderContents.HoldsAnything(full);
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
