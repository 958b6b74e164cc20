namespace CopyNumber.Storage;

/// <summary>
/// What an output folder holds, measured against the files we write (<see cref="RunFiles.Known"/>): whether
/// it is empty for a new run, what <c>--force</c> removes, and the previous outputs of <c>contrast</c>.
/// </summary>
public static class FolderContents
{
    /// <summary>Whether <paramref name="folder"/> holds anything besides a claim and lock (which are the claim's business).</summary>
    public static bool HoldsAnything(string folder) =>
        Directory.Exists(folder) && Directory.EnumerateFileSystemEntries(folder).Select(Path.GetFileName).Any(n => !IsClaimFile(n!));

    /// <summary>
    /// Empties <paramref name="folder"/> for a new run written over an old one (<c>--force</c>): removes the files
    /// a run folder, its contrast, a size sweep or a scan may hold, and nothing else. A folder holding anything we
    /// did not write is refused with nothing removed, since <c>--force</c> is meant to replace a run, not
    /// to delete the user's files. The claim and lock stay: the caller holds them.
    /// </summary>
    /// <exception cref="OutputException">Refused (files we did not write), or a file could not be removed.</exception>
    public static void ClearForNewRun(string folder)
    {
        var foreign = Foreign(folder, allowSweep: true).ToList();
        if (foreign.Count > 0)
        {
            var shown = string.Join(", ", foreign.Take(5).Select(f => $"'{f}'")) + (foreign.Count > 5 ? $" and {foreign.Count - 5} more" : "");
            throw new OutputException(
                $"The output folder '{folder}' holds files copynumber did not write ({shown}); --force only replaces a run folder's own files. Move those files away or choose another folder.",
                folder, refused: true);
        }
        Remove(folder, entry =>
        {
            var name = Path.GetFileName(entry);
            return !IsClaimFile(name);
        });
    }

    /// <summary>Removes what an earlier <c>contrast</c> wrote into <paramref name="folder"/> (its table, reports and figures), so a new contrast leaves none of the old behind.</summary>
    /// <exception cref="OutputException">A file could not be removed.</exception>
    public static void RemoveContrastOutputs(string folder)
    {
        foreach (var name in new[] { RunFiles.Contrast, RunFiles.ReportMarkdown, RunFiles.ReportHtml, RunFiles.OscillationSpectrum, RunFiles.OscillationReplicates, RunFiles.Phases, RunFiles.Pair, RunFiles.PartitionLna })
            Delete(Path.Combine(folder, name));
        RemoveFigures(Path.Combine(folder, RunFiles.Figures));
    }

    /// <summary>Paths (relative to <paramref name="folder"/>) of entries we did not write.</summary>
    private static IEnumerable<string> Foreign(string folder, bool allowSweep)
    {
        if (!Directory.Exists(folder)) yield break;
        foreach (var entry in Directory.EnumerateFileSystemEntries(folder).Order(StringComparer.Ordinal))
        {
            var name = Path.GetFileName(entry);
            if (Directory.Exists(entry))
            {
                if (name == RunFiles.Figures)
                {
                    foreach (var figure in Directory.EnumerateFileSystemEntries(entry).Order(StringComparer.Ordinal))
                        if (!IsFigure(figure)) yield return Path.Combine(name, Path.GetFileName(figure));
                }
                else if (allowSweep && (name.StartsWith(RunFiles.SweepRunPrefix, StringComparison.Ordinal) || name.StartsWith(RunFiles.ScanPointPrefix, StringComparison.Ordinal)))
                {
                    foreach (var inner in Foreign(entry, allowSweep: false)) yield return Path.Combine(name, inner);
                }
                else
                {
                    yield return name + Path.DirectorySeparatorChar;
                }
            }
            else if (!RunFiles.IsKnown(name) && !(allowSweep && RunFiles.BaseName(name) is RunFiles.Sweep or RunFiles.Scan or RunFiles.ScanRecord))
            {
                yield return name;
            }
        }
    }

    // A report's figures are PNG files, each with its SVG beside it.
    private static bool IsFigure(string path) =>
        File.Exists(path) && RunFiles.BaseName(Path.GetFileName(path)) is var name
        && (name.EndsWith(".png", StringComparison.Ordinal) || name.EndsWith(".svg", StringComparison.Ordinal));

    private static bool IsClaimFile(string name) => RunFiles.BaseName(name) is RunFiles.Claim or RunFiles.Lock;

    private static void RemoveFigures(string figures)
    {
        if (!Directory.Exists(figures)) return;
        foreach (var figure in Directory.EnumerateFiles(figures))
            if (IsFigure(figure)) Delete(figure);
        if (!Directory.EnumerateFileSystemEntries(figures).Any()) Guard(figures, () => Directory.Delete(figures));
    }

    private static void Remove(string folder, Func<string, bool> chosen)
    {
        foreach (var entry in Directory.EnumerateFileSystemEntries(folder).Where(chosen).ToList())
        {
            if (!Directory.Exists(entry)) Delete(entry);
            else if (Path.GetFileName(entry) == RunFiles.Figures) RemoveFigures(entry);
            else
            {
                Remove(entry, _ => true);
                Guard(entry, () => Directory.Delete(entry));
            }
        }
    }

    private static void Delete(string path) => Guard(path, () => File.Delete(path));

    private static void Guard(string path, Action remove)
    {
        try
        {
            remove();
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot remove '{path}' from the earlier run: {e.Message.TrimEnd('.')}.", path, e);
        }
    }
}
