using System.Globalization;

namespace CopyNumber.Storage;

/// <summary>
/// The names and housekeeping of the checkpoint store inside a run folder (docs/conventions.md,
/// "Checkpoints"): generation g is the hidden subfolder <c>.checkpoint-g</c>, built as
/// <c>.checkpoint-g.tmp</c> and renamed into place once complete; the paths of the run go into hidden
/// parts <c>.paths-part-n.parquet</c> beside them until the final write merges them into paths.parquet.
/// </summary>
internal static class Checkpoints
{
    public const string Prefix = ".checkpoint-";
    public const string Unfinished = ".tmp";
    public const string PathPartPrefix = ".paths-part-";
    public const string PathPartSuffix = ".parquet";

    /// <summary>The folder of generation <paramref name="generation"/>.</summary>
    public static string FolderOf(string runFolder, long generation) =>
        Path.Combine(runFolder, Prefix + generation.ToString(CultureInfo.InvariantCulture));

    /// <summary>The name of path part <paramref name="number"/>.</summary>
    public static string PathPartName(long number) => PathPartPrefix + number.ToString(CultureInfo.InvariantCulture) + PathPartSuffix;

    /// <summary>The complete generations in <paramref name="runFolder"/>, newest first.</summary>
    public static IReadOnlyList<(long Generation, string Folder)> Complete(string runFolder) =>
        Directory.EnumerateDirectories(runFolder, Prefix + "*")
            .Select(d => (Generation: Number(Path.GetFileName(d), Prefix, ""), Folder: d))
            .Where(c => c.Generation >= 0)
            .OrderByDescending(c => c.Generation)
            .ToArray();

    /// <summary>The highest generation or part number in use, so that new ones never reuse a name.</summary>
    public static (long Generation, long PathPart) Highest(string runFolder)
    {
        var generation = Directory.EnumerateDirectories(runFolder, Prefix + "*")
            .Select(d => Path.GetFileName(d))
            .Select(n => Number(n.EndsWith(Unfinished, StringComparison.Ordinal) ? n[..^Unfinished.Length] : n, Prefix, ""))
            .DefaultIfEmpty(0).Max();
        var part = PathParts(runFolder).Select(p => Number(Path.GetFileName(p), PathPartPrefix, PathPartSuffix)).DefaultIfEmpty(0).Max();
        return (Math.Max(0, generation), Math.Max(0, part));
    }

    /// <summary>Every path part file in the folder.</summary>
    public static IEnumerable<string> PathParts(string runFolder) =>
        Directory.EnumerateFiles(runFolder, PathPartPrefix + "*" + PathPartSuffix);

    /// <summary>
    /// Removes what a killed writer can leave behind: <c>*.partial-*</c> files in the folder and in its
    /// checkpoints, unfinished checkpoint folders, and the path parts no complete checkpoint refers to
    /// (<paramref name="keepParts"/>: the names the checkpoint being resumed lists).
    /// </summary>
    public static void DiscardStale(string runFolder, IReadOnlySet<string> keepParts)
    {
        foreach (var folder in Directory.EnumerateDirectories(runFolder, Prefix + "*" + Unfinished)) DeleteFolder(folder);
        foreach (var (_, folder) in Complete(runFolder)) DiscardPartials(folder);
        DiscardPartials(runFolder);
        foreach (var part in PathParts(runFolder))
            if (!keepParts.Contains(Path.GetFileName(part))) File.Delete(part);
    }

    /// <summary>Deletes every checkpoint and path part: the final tables are written and the manifest names them.</summary>
    public static void Clear(string runFolder)
    {
        foreach (var folder in Directory.EnumerateDirectories(runFolder, Prefix + "*")) DeleteFolder(folder);
        foreach (var part in PathParts(runFolder)) File.Delete(part);
    }

    /// <summary>Deletes the generations older than <paramref name="generation"/>.</summary>
    public static void DeleteOlderThan(string runFolder, long generation)
    {
        foreach (var (older, folder) in Complete(runFolder))
            if (older < generation) DeleteFolder(folder);
    }

    public static void DeleteFolder(string folder)
    {
        if (Directory.Exists(folder)) Directory.Delete(folder, recursive: true);
    }

    private static void DiscardPartials(string folder)
    {
        foreach (var file in Directory.EnumerateFiles(folder, "*" + AtomicFile.PartialMarker + "*")) File.Delete(file);
    }

    private static long Number(string name, string prefix, string suffix) =>
        name.StartsWith(prefix, StringComparison.Ordinal) && name.EndsWith(suffix, StringComparison.Ordinal)
        && long.TryParse(name.AsSpan(prefix.Length, name.Length - prefix.Length - suffix.Length), NumberStyles.None, CultureInfo.InvariantCulture, out var n)
            ? n : -1;
}
