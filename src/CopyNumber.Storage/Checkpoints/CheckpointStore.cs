using System.Diagnostics;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// Keeps a running simulation's finished blocks on disk as it goes (docs/conventions.md, "Checkpoints"):
/// the engine hands it consistent snapshots (<see cref="ICheckpointSink"/>) and the paths
/// (<see cref="IPathSink"/>); each checkpoint is the run's state tables (distributions, readout state)
/// for the earlier run being resumed and this one together, with a manifest listing their SHA-256 and
/// the path parts, built in <c>.checkpoint-g.tmp</c> and renamed to <c>.checkpoint-g</c> once every file
/// is on disk. The older generation is deleted after the rename, so at every instant the folder holds
/// at least one complete checkpoint once the first is written.
/// </summary>
/// <remarks>
/// Interval: the next checkpoint is due max(<see cref="MinimumInterval"/>, <see cref="OverheadFactor"/> ×
/// the time the last one took) after the last one ended, so writing them costs at most about 1/20 of
/// the run's time, and a SIGKILL loses at most that interval's blocks (plus those in progress).
/// Thread-safety: one lock orders <see cref="Seal"/>, <see cref="Save"/> and the final calls.
/// </remarks>
internal sealed class CheckpointStore : ICheckpointSink, IPathSink, IDisposable
{
    /// <summary>The shortest time between two checkpoints unless the run asks otherwise.</summary>
    public static readonly TimeSpan DefaultMinimumInterval = TimeSpan.FromSeconds(1);

    /// <summary>A checkpoint waits at least this many times as long as the last one took to write.</summary>
    public const double OverheadFactor = 20;

    private readonly object _gate = new();
    private readonly string _folder;
    private readonly RunIdentity _identity;
    private readonly EnsembleResult? _prior;
    private readonly Func<EnsembleResult, RunManifest> _manifestOf;
    private readonly ReactionNetwork _network;
    private readonly TimeGrid _grid;
    private readonly bool _enabled;
    private readonly Stopwatch _clock = Stopwatch.StartNew();
    private readonly SortedDictionary<string, string> _parts = new(StringComparer.Ordinal);
    private readonly List<(PathsTable Table, string Name)> _sealed = [];
    private (PathsTable Table, string Name)? _current;
    private long _generation;
    private long _lastPart;
    private long _dueTicks;
    private readonly Func<string, Stream>? _openPathsFile;
    private string? _pathsLost;
    private long _pathRows;

    /// <param name="folder">The run folder (full path).</param>
    /// <param name="identity">The run's identity, for the tables' provenance.</param>
    /// <param name="prior">The stored state being resumed, combined into every checkpoint; null for a first run.</param>
    /// <param name="priorParts">The paths of the stored state: the checkpoint's parts (name → SHA-256), kept as they are.</param>
    /// <param name="priorPathsFile">A final paths.parquet of the stored state, copied into a part; null when none.</param>
    /// <param name="manifestOf">The manifest of a checkpoint holding the given combined state.</param>
    /// <param name="network">The model, for the paths' columns.</param>
    /// <param name="grid">The run's grid.</param>
    /// <param name="minimumInterval">The shortest time between checkpoints; null disables them (paths are still kept in parts).</param>
    /// <param name="openPathsFile">Opens the temporary file of a paths part; tests put a disk that fills up here. Null for the real file.</param>
    public CheckpointStore(string folder, RunIdentity identity, EnsembleResult? prior, IReadOnlyDictionary<string, string> priorParts,
        string? priorPathsFile, Func<EnsembleResult, RunManifest> manifestOf, ReactionNetwork network, TimeGrid grid, TimeSpan? minimumInterval,
        Func<string, Stream>? openPathsFile = null)
    {
        _openPathsFile = openPathsFile;
        _folder = folder;
        _identity = identity;
        _prior = prior;
        _manifestOf = manifestOf;
        _network = network;
        _grid = grid;
        _enabled = minimumInterval is not null;
        MinimumInterval = minimumInterval ?? TimeSpan.MaxValue;
        (_generation, _lastPart) = Checkpoints.Highest(folder);
        foreach (var (name, sum) in priorParts) _parts[name] = sum;
        if (priorPathsFile is not null)
        {
            var name = Checkpoints.PathPartName(++_lastPart);
            var part = Path.Combine(folder, name);
            AtomicFile.Copy(priorPathsFile, part);
            _parts[name] = FileChecksums.Of(part);
        }
        _dueTicks = _enabled ? (long)(MinimumInterval.TotalSeconds * Stopwatch.Frequency) : long.MaxValue;
    }

    /// <summary>The shortest time between two checkpoints.</summary>
    public TimeSpan MinimumInterval { get; }

    /// <summary>Why the last checkpoint could not be written (e.g. a full disk), or null; the run goes on and tries again later.</summary>
    public OutputException? LastFailure { get; private set; }

    /// <summary>Checkpoints written by this store.</summary>
    public int Written { get; private set; }

    /// <inheritdoc />
    public bool IsDue => _clock.ElapsedTicks >= Interlocked.Read(ref _dueTicks);

    /// <inheritdoc />
    /// <remarks>Called by one thread at a time (the engine's path sequencer), in replicate order within a part.</remarks>
    public void Write(long replicate, ReadOnlySpan<long> counts, int stride, int recordedPoints)
    {
        if (Volatile.Read(ref _pathsLost) is not null) return; // dropped after a failed write (a full disk)
        if (_current is null)
        {
            var name = Checkpoints.PathPartName(Interlocked.Increment(ref _lastPart));
            _current = (new PathsTable(Path.Combine(_folder, name), _network, _grid, _identity.Provenance(null), _openPathsFile), name);
        }
        _current.Value.Table.Write(replicate, counts, stride, recordedPoints);
    }

    /// <inheritdoc />
    public void Seal()
    {
        lock (_gate)
        {
            if (_current is { } part) _sealed.Add(part);
            _current = null;
        }
    }

    /// <inheritdoc />
    /// <remarks>
    /// A checkpoint that cannot be written is given up (<see cref="LastFailure"/>) and tried again at the
    /// next interval; a path part that cannot be written makes <see cref="WritePaths"/> fail, since those
    /// paths are gone.
    /// </remarks>
    public void Save(EnsembleResult snapshot)
    {
        lock (_gate)
        {
            var started = _clock.Elapsed;
            try
            {
                CompleteSealedParts();
                if (_enabled) WriteGeneration(_prior is null ? snapshot : EnsembleResult.Combine(_prior, snapshot));
                LastFailure = null;
            }
            catch (OutputException e)
            {
                LastFailure = e;
            }
            if (!_enabled) return;
            // The rule of the type's remarks: max(minimum interval, 20 × this checkpoint's time) from now.
            var took = (_clock.Elapsed - started).TotalSeconds;
            var wait = Math.Max(MinimumInterval.TotalSeconds, OverheadFactor * took);
            Interlocked.Exchange(ref _dueTicks, (long)Math.Min((_clock.Elapsed.TotalSeconds + wait) * Stopwatch.Frequency, long.MaxValue / 2));
        }
    }

    /// <summary>
    /// Merges the path parts into <paramref name="destination"/>, rows in replicate order as one run writes them
    /// (an empty table when no part holds a path, e.g. a shard after the path replicates). Paths that cannot be
    /// written (a full disk, during the run or now) are dropped, their files removed to give the space back.
    /// </summary>
    /// <returns>Null when written; otherwise why the paths were dropped, in one phrase for the user and the manifest.</returns>
    public string? WritePaths(string destination)
    {
        lock (_gate)
        {
            try
            {
                CompleteSealedParts();
                if (_pathsLost is null)
                {
                    PathsMerge.Write(_parts.Keys.Select(n => Path.Combine(_folder, n)).ToArray(), destination, PathsTable.ColumnsFor(_network), _identity.Provenance(null));
                    return null;
                }
            }
            catch (OutputException e)
            {
                _pathsLost ??= Dropped(e);
            }
            foreach (var name in _parts.Keys) File.Delete(Path.Combine(_folder, name));
            _parts.Clear();
            return _pathsLost;
        }
    }

    private string Dropped(OutputException failure) =>
        PathsTable.DroppedText(failure, RunFiles.Paths, _pathRows);

    /// <inheritdoc />
    public void Dispose()
    {
        lock (_gate)
        {
            _current?.Table.Dispose();
            foreach (var (table, _) in _sealed) table.Dispose();
        }
    }

    private void CompleteSealedParts()
    {
        foreach (var (table, name) in _sealed.ToArray())
        {
            _sealed.Remove((table, name));
            try
            {
                table.Complete();
                if (table.Failure is { } failure) throw failure;
                _pathRows += table.Rows;
                _parts[name] = FileChecksums.Of(Path.Combine(_folder, name));
            }
            catch (OutputException e)
            {
                // The paths are lost from here on, but the checkpoints of the summaries go on without them.
                _pathRows += table.Rows;
                _pathsLost ??= Dropped(e);
            }
            finally
            {
                table.Dispose();
            }
        }
    }

    private void WriteGeneration(EnsembleResult combined)
    {
        var generation = ++_generation;
        var final = Checkpoints.FolderOf(_folder, generation);
        var building = final + Checkpoints.Unfinished;
        try
        {
            Checkpoints.DeleteFolder(building);
            Directory.CreateDirectory(building);
            var files = SummaryFiles.WriteState(building, combined, _identity.Provenance(combined));
            var manifest = _manifestOf(combined);
            SummaryFiles.RecordChecksums(manifest, building, files);
            manifest.Extra[ManifestFields.PathParts] = new SortedDictionary<string, string>(_parts, StringComparer.Ordinal);
            manifest.WriteAtomic(Path.Combine(building, RunFiles.Manifest));
            Directory.Move(building, final);
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e) && e is not OutputException)
        {
            DiscardQuietly(building);
            throw AtomicFile.Failure(final, e);
        }
        catch (OutputException)
        {
            DiscardQuietly(building);
            throw;
        }
        TestFaults.Committed(final);
        Written++;
        Checkpoints.DeleteOlderThan(_folder, generation);
    }

    private static void DiscardQuietly(string folder)
    {
        try
        {
            Checkpoints.DeleteFolder(folder);
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
        }
    }
}
