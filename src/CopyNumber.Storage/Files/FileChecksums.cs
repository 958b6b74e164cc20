using System.Security.Cryptography;
using System.Text.Json;

namespace CopyNumber.Storage;

/// <summary>
/// The SHA-256 (FIPS 180-4) of the files of a run folder, recorded in its manifest when they are written
/// (<see cref="ManifestFields.Files"/>) and verified whenever the folder is read to resume, merge or
/// contrast, so that a file changed or damaged after it was written (a flipped bit, a truncated copy)
/// is refused with a message instead of giving a wrong answer. A checksum detects accidents, not
/// deliberate edits: whoever can edit a table can edit the manifest too.
/// </summary>
public static class FileChecksums
{
    /// <summary>Lowercase hexadecimal SHA-256 of the bytes of <paramref name="path"/>.</summary>
    /// <exception cref="OutputException">The file cannot be read.</exception>
    public static string Of(string path)
    {
        try
        {
            using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, bufferSize: 1 << 16);
            return Convert.ToHexStringLower(SHA256.HashData(stream));
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot read '{path}' to compute its checksum: {e.Message.TrimEnd('.')}.", path, e);
        }
    }

    /// <summary>The checksums of <paramref name="files"/> (full paths inside <paramref name="folder"/>), keyed by their names relative to the folder.</summary>
    public static SortedDictionary<string, string> For(string folder, IEnumerable<string> files)
    {
        var sums = new SortedDictionary<string, string>(StringComparer.Ordinal);
        foreach (var file in files) sums[Path.GetRelativePath(folder, file)] = Of(file);
        return sums;
    }

    /// <summary>The checksums recorded in the manifest field <paramref name="field"/>, or null when the manifest has none (a folder written before they existed).</summary>
    /// <exception cref="RunFolderException">The field is there but is not an object of strings.</exception>
    public static IReadOnlyDictionary<string, string>? Recorded(RunManifest manifest, string field, string folder)
    {
        ArgumentNullException.ThrowIfNull(manifest);
        if (!manifest.Extra.TryGetValue(field, out var value) || value is null) return null;
        switch (value)
        {
            case IReadOnlyDictionary<string, string> sums:
                return sums;
            case JsonElement { ValueKind: JsonValueKind.Object } element:
                var read = new Dictionary<string, string>(StringComparer.Ordinal);
                foreach (var entry in element.EnumerateObject())
                {
                    if (entry.Value.ValueKind != JsonValueKind.String || !IsSha256(entry.Value.GetString()!) || !IsPlainName(entry.Name))
                        throw new RunFolderException($"The manifest of '{folder}' is not valid: its '{field}' entry for '{entry.Name}' is not a file name with a SHA-256.", folder);
                    read[entry.Name] = entry.Value.GetString()!;
                }
                return read;
            default:
                throw new RunFolderException($"The manifest of '{folder}' is not valid: '{field}' is not an object of file names and SHA-256 sums.", folder);
        }
    }

    /// <summary>
    /// Checks every file of <paramref name="sums"/> (names inside <paramref name="folder"/>) against its
    /// recorded checksum, and that each of <paramref name="required"/> that exists is among them.
    /// </summary>
    /// <param name="sums">File name → SHA-256, as recorded.</param>
    /// <param name="folder">The folder the names are relative to.</param>
    /// <param name="recordedIn">The manifest that recorded them, for the message.</param>
    /// <param name="required">Names of files the reader will use; an existing one without a checksum is refused.</param>
    /// <exception cref="RunFolderException">A file is missing, unlisted or does not have its recorded checksum.</exception>
    public static void Verify(IReadOnlyDictionary<string, string> sums, string folder, string recordedIn, params string[] required)
    {
        foreach (var name in required)
        {
            if (!sums.ContainsKey(name) && File.Exists(Path.Combine(folder, name)))
                throw new RunFolderException($"'{Path.Combine(folder, name)}' has no checksum in '{recordedIn}', which lists every file its run wrote: the file was put there afterwards, or the manifest was edited. Rerun the run, or restore the folder from a copy.", folder);
        }
        foreach (var (name, expected) in sums)
        {
            var path = Path.Combine(folder, name);
            if (!File.Exists(path))
                throw new RunFolderException($"'{path}' is missing, although '{recordedIn}' lists it: the folder was changed after it was written. Restore the file from a copy, or rerun the run.", folder);
            var actual = Of(path);
            if (actual != expected)
                throw new RunFolderException(
                    $"'{path}' was changed or damaged after it was written: its SHA-256 is {actual}, but '{recordedIn}' records {expected}. " +
                    "Its numbers cannot be trusted; restore the file from a copy, or rerun the run.", folder);
        }
    }

    /// <summary>
    /// Verifies the tables of the run folder <paramref name="folder"/> against its manifest; a folder
    /// written before checksums existed is read as before, with a warning added to <paramref name="warnings"/>.
    /// </summary>
    /// <exception cref="RunFolderException">A table was changed or damaged after it was written.</exception>
    public static void VerifyRunFolder(RunManifest manifest, string folder, ICollection<string> warnings)
    {
        var sums = Recorded(manifest, ManifestFields.Files, folder);
        if (sums is null)
        {
            warnings.Add($"'{folder}' was written by a version of CopyNumber without checksums: it is read as before, but damage to its tables cannot be detected.");
            return;
        }
        Verify(sums, folder, Path.Combine(folder, RunFiles.Manifest), [.. RunFiles.Tables.Except(RunFiles.AddedAfterRun)]);
        foreach (var name in RunFiles.AddedAfterRun)
            if (!sums.ContainsKey(name) && File.Exists(Path.Combine(folder, name)))
                warnings.Add($"'{Path.Combine(folder, name)}' has no checksum in the manifest: it was being added when the process stopped, so it is ignored; run 'simulate --view population' again to remake it.");
    }

    private static bool IsSha256(string text) => text.Length == 64 && text.All(char.IsAsciiHexDigitLower);

    /// <summary>A name inside the folder: no folder part, so a manifest cannot point a reader elsewhere.</summary>
    private static bool IsPlainName(string name) =>
        name.Length > 0 && name == Path.GetFileName(name) && name is not ("." or "..");
}
