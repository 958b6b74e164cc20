namespace CopyNumber.Storage;

/// <summary>
/// A run's hold on its folder, from the moment it is chosen until the last file is written, so that two
/// runs can never mix their files in one folder (the job-array mistake of not varying <c>--out</c>).
/// </summary>
/// <remarks>
/// Two mechanisms, because neither is enough alone (docs/conventions.md, "Exclusive output folders"):
/// <list type="bullet">
/// <item>An advisory lock on <see cref="RunFiles.Lock"/>, held open with <see cref="FileShare.None"/>; on Linux
/// and macOS .NET takes it with <c>flock(LOCK_EX | LOCK_NB)</c>. The kernel releases it when the holder dies,
/// however it dies, so a live holder is told from a dead one without guessing. Cluster file systems may
/// not honour it (NFS without a lock manager, some parallel file systems), and it can be switched off
/// (<c>DOTNET_SYSTEM_IO_DISABLEFILELOCKING</c>).</item>
/// <item>A claim file <see cref="RunFiles.Claim"/> naming host, process id, process start time and command,
/// put in place by a rename that refuses to replace an existing file (<see cref="File.Move(string, string, bool)"/>
/// without overwrite: <c>link()</c> on Unix, atomic also on NFS), so of two runs exactly one gets it, with or
/// without working locks. It also lets the refusal name the holder.</item>
/// </list>
/// A claim whose lock is free and whose process is gone from this host was left by a run that died: it is
/// taken over when the caller allows it (<c>--resume</c>, <c>--force</c>). A claim from another host
/// cannot be checked from here and is refused unless the user says <c>--take-over</c>. Claims are
/// re-entrant within one process: <c>simulate</c> holds its folder across the run and its contrast, and
/// the contrast's own claim nests inside. Disposing the last claim deletes the claim and lock files.
/// </remarks>
public sealed class FolderClaim : IDisposable
{
    /// <summary>Claims held by this process, by full folder path, with how many nested holders each has.</summary>
    private static readonly Dictionary<string, Hold> HeldHere = new(OperatingSystem.IsLinux() ? StringComparer.Ordinal : StringComparer.OrdinalIgnoreCase);

    private Hold? _hold;

    private FolderClaim(string folder, Hold hold, ClaimHolder? replaced)
    {
        Folder = folder;
        _hold = hold;
        Replaced = replaced;
    }

    /// <summary>The folder held, as a full path.</summary>
    public string Folder { get; }

    /// <summary>The earlier holder whose claim was taken over (a run that died, or one on another host with <c>--take-over</c>); null otherwise.</summary>
    public ClaimHolder? Replaced { get; }

    /// <summary>
    /// Claims the existing folder <paramref name="folder"/> for <paramref name="command"/>, or joins this
    /// process's claim on it.
    /// </summary>
    /// <param name="folder">An existing folder.</param>
    /// <param name="command">What holds it, for the claim file and other runs' messages (e.g. <c>simulate</c>).</param>
    /// <param name="takeOverStale">Take over a claim left on this host by a process that is gone (<c>--resume</c>, <c>--force</c>).</param>
    /// <param name="takeOver">Take over any claim not backed by a live lock: also one from another host (<c>--take-over</c>).</param>
    /// <exception cref="OutputException">Refused (<see cref="OutputException.IsRefusal"/>): the folder is in use, or holds a claim the caller may not take over; or the claim could not be written.</exception>
    public static FolderClaim Take(string folder, string command, bool takeOverStale, bool takeOver)
    {
        ArgumentNullException.ThrowIfNull(command);
        var full = Path.TrimEndingDirectorySeparator(AtomicFile.FullPath(folder));
        lock (HeldHere)
        {
            if (HeldHere.TryGetValue(full, out var held))
            {
                held.Count++;
                return new FolderClaim(full, held, null);
            }
            var lockFile = OpenLock(full);
            try
            {
                var me = ClaimHolder.Current(command);
                var replaced = PlaceClaim(full, me, takeOverStale, takeOver);
                var hold = new Hold(lockFile, me);
                HeldHere.Add(full, hold);
                return new FolderClaim(full, hold, replaced);
            }
            catch
            {
                lockFile.Dispose();
                throw;
            }
        }
    }

    /// <summary>The holder named in <paramref name="folder"/>'s claim file, or null when there is none (or it is unreadable).</summary>
    public static ClaimHolder? HolderOf(string folder)
    {
        try
        {
            return ClaimHolder.Parse(File.ReadAllText(Path.Combine(folder, RunFiles.Claim)));
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            return null;
        }
    }

    /// <summary>Releases this claim; the last one released in the process deletes the claim and lock files and frees the lock.</summary>
    public void Dispose()
    {
        lock (HeldHere)
        {
            var hold = _hold;
            _hold = null;
            if (hold is null || --hold.Count > 0) return;
            HeldHere.Remove(Folder);
            // The claim goes first, while the lock still keeps others out; a claim that names someone else
            // (taken over with --take-over while we ran) is theirs and stays.
            if (HolderOf(Folder) == hold.Holder) AtomicFile.DiscardQuietly(Path.Combine(Folder, RunFiles.Claim));
            AtomicFile.DiscardQuietly(Path.Combine(Folder, RunFiles.Lock));
            hold.Lock.Dispose();
        }
    }

    private static FileStream OpenLock(string folder)
    {
        var path = Path.Combine(folder, RunFiles.Lock);
        try
        {
            return new FileStream(path, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None, bufferSize: 1);
        }
        catch (IOException e) when (IsHeldElsewhere(e))
        {
            var holder = HolderOf(folder);
            throw InUse(folder, holder is null ? "another run (its claim is being written or removed)" : holder.Describe());
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot claim the folder '{folder}': {AtomicFile.Failure(path, e).Message}", folder, e);
        }
    }

    /// <summary>Puts this process's claim in place; returns the holder it replaced, if any.</summary>
    private static ClaimHolder? PlaceClaim(string folder, ClaimHolder me, bool takeOverStale, bool takeOver)
    {
        var path = Path.Combine(folder, RunFiles.Claim);
        if (TryPlace(path, me, replace: false)) return null;
        var holder = HolderOf(folder);
        if (holder is null)
        {
            if (!takeOver)
                throw Refused(folder, $"The folder '{folder}' holds an unreadable claim file {RunFiles.Claim}, so another run may be using it. If none is, claim the folder with --take-over.");
        }
        else if (holder.OnThisHost && !holder.IsGone)
        {
            // The lock was free yet the holder lives: this file system does not honour the lock.
            throw InUse(folder, holder.Describe());
        }
        else if (!holder.OnThisHost && !takeOver)
        {
            throw Refused(folder, $"The folder '{folder}' is claimed by a run on another host ({holder.Describe()}); this host cannot tell whether it still runs. If it does not, claim the folder with --take-over.");
        }
        else if (holder.OnThisHost && !takeOverStale && !takeOver)
        {
            throw Refused(folder, $"The folder '{folder}' was claimed by a run that ended without releasing it ({holder.Describe()}). Continue that run with --resume, or write over it with --force.");
        }
        TryPlace(path, me, replace: true);
        // Without a working lock two takers may both get here: the one whose claim is read back wins.
        if (HolderOf(folder) != me) throw InUse(folder, HolderOf(folder)?.Describe() ?? "another run");
        return holder;
    }

    private static bool TryPlace(string path, ClaimHolder me, bool replace)
    {
        var temporary = AtomicFile.TemporaryPathFor(path);
        try
        {
            File.WriteAllText(temporary, me.ToJson());
            File.Move(temporary, path, overwrite: replace);
            return true;
        }
        catch (IOException) when (!replace && File.Exists(path))
        {
            AtomicFile.DiscardQuietly(temporary);
            return false;
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            AtomicFile.DiscardQuietly(temporary);
            throw AtomicFile.Failure(path, e);
        }
    }

    /// <summary>Whether opening the lock file failed because another process holds its lock (EWOULDBLOCK; a sharing violation on Windows).</summary>
    private static bool IsHeldElsewhere(IOException e) =>
        OperatingSystem.IsWindows() ? e.HResult == unchecked((int)0x80070020)
        : OperatingSystem.IsMacOS() ? e.HResult == 35
        : e.HResult == 11;

    private static OutputException InUse(string folder, string holder) =>
        Refused(folder, $"The folder '{folder}' is in use by another run ({holder}). Wait for it to finish or choose another folder.");

    private static OutputException Refused(string folder, string message) => new(message, folder, refused: true);

    private sealed class Hold(FileStream lockFile, ClaimHolder holder)
    {
        public FileStream Lock { get; } = lockFile;
        public ClaimHolder Holder { get; } = holder;
        public int Count { get; set; } = 1;
    }
}
