using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Storage;

namespace CopyNumber.Runs.Scans;

/// <summary>What a scan reports as it goes: lines for the console, and a monitor per point's ensemble.</summary>
public sealed class ScanObserver
{
    /// <summary>A line about the scan's progress (which point, how many done, the method and why).</summary>
    public Action<string> Line { get; init; } = _ => { };

    /// <summary>Called as a point's ensemble starts with the replicates to run; returns the monitor to report to and a display to dispose at the end.</summary>
    public Func<long, (EnsembleMonitor Monitor, IDisposable? Display)>? Ensemble { get; init; }
}

/// <summary>What a scan (or the shard of one) produced.</summary>
/// <param name="Cells">The rows of the points finished, in point order.</param>
/// <param name="StopReason">Finished, or why it stopped early.</param>
/// <param name="Failure">Which point failed and why, when one did.</param>
/// <param name="PointsRun">Points simulated (wholly or in part) by this call.</param>
/// <param name="PointsKept">Points a resumed scan found finished.</param>
public sealed record ScanOutcome(IReadOnlyList<ScanCell> Cells, StopReason StopReason, string? Failure, int PointsRun, int PointsKept);

/// <summary>
/// Runs a scan: for every point of its shard one ensemble (<see cref="SimulationRun"/>, planned by
/// <see cref="RunPlan"/>) in its own run folder <c>point-NNNN</c> inside the scan folder, then that folder's
/// contrast at the per-point thresholds of <see cref="ScanErrorRate"/>, then the point's rows. Every point
/// uses the scan's seed, so replicate r draws the same stream at every point (common random numbers: the
/// difference between two points is not blurred by independent noise). Points run one after another, each
/// ensemble on all its threads. Resuming keeps finished points (their rows are recomputed from their
/// folders, the same computation as when they ran), resumes an interrupted point's ensemble, and runs the rest.
/// </summary>
public static class ScanRunner
{
    /// <summary>The table's file name inside the scan folder.</summary>
    public const string TableFile = RunFiles.Scan;

    /// <summary>Runs <paramref name="scan"/>; <paramref name="writeContrast"/> writes a finished point's contrast outputs (table, report) and returns its contrast.</summary>
    public static ScanOutcome Execute(ScanRequest scan, Func<string, ContrastThresholds, RunContrastResult> writeContrast, ScanObserver? observer = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(writeContrast);
        observer ??= new ScanObserver();
        var settings = ScanSettings.Of(scan);
        if (scan.Resume) settings.EnsureSameScan(ScanSettings.Read(scan.Folder), scan.Folder);
        settings.Write(scan.Folder);
        var perPoint = ScanErrorRate.PerPoint(scan.Thresholds, scan.Points.Count);
        var points = scan.ShardPoints;
        var cells = new List<ScanCell>();
        int run = 0, kept = 0, done = 0;
        foreach (var point in points)
        {
            var folder = Path.Combine(scan.Folder, point.FolderName);
            var (model, size) = ScanModel.At(scan.Model, scan.Axes, point);
            var described = ScanModel.Describe(scan.Axes, point);
            var stored = scan.Resume ? Stored(folder) : null;
            RunContrastResult contrast;
            if (stored is { NeedsResuming: false } && File.Exists(Path.Combine(folder, RunFiles.Contrast)))
            {
                kept++;
                contrast = RunContrast.Compute(RunFolder.Read(folder), perPoint);
            }
            else if (stored is { NeedsResuming: false })
            {
                kept++;
                contrast = writeContrast(folder, perPoint);
            }
            else
            {
                var specification = scan.Specification with { Model = model, Size = size };
                var storedSettings = stored is null ? null : StoredSettings.Read(stored);
                stored?.EnsureSameRun(specification.Settings(EnsembleOptions.DefaultBlockSize));
                var plan = RunPlan.Make(specification, storedSettings, cancel);
                Directory.CreateDirectory(folder);
                observer.Line($"point {done + 1} of {points.Count} ({described}): {specification.Replicates} replicates, {plan.MethodReason} -> {point.FolderName}");
                var toRun = specification.Replicates - (stored?.Manifest.ReplicatesFinished ?? 0);
                var (monitor, display) = observer.Ensemble?.Invoke(toRun) ?? (null!, null);
                SimulationOutcome outcome;
                using (display)
                    outcome = SimulationRun.Execute(new SimulationRequest(plan, folder) { Resume = stored is not null }, monitor, cancel);
                run++;
                if (outcome.StopReason != StopReason.Finished)
                {
                    Finish(scan, cells);
                    return new ScanOutcome(cells, outcome.StopReason, outcome.Failure is { } f ? $"at point {point.Index} ({described}): {f}" : null, run, kept);
                }
                contrast = writeContrast(folder, perPoint);
            }
            cells.AddRange(ScanCells.Of(point, model.Network, contrast, scan.Specification.Seed));
            done++;
        }
        Finish(scan, cells);
        return new ScanOutcome(cells, StopReason.Finished, null, run, kept);
    }

    /// <summary>Writes scan.parquet for the points finished (all of them, or those before a stop).</summary>
    private static void Finish(ScanRequest scan, IReadOnlyList<ScanCell> cells) =>
        WriteTable(scan.Folder, scan.Model, scan.Axes, cells);

    /// <summary>Writes <c>scan.parquet</c> into <paramref name="folder"/>.</summary>
    public static void WriteTable(string folder, Network.LoadedModel model, IReadOnlyList<ScanAxis> axes, IReadOnlyList<ScanCell> cells)
    {
        var settings = ScanSettings.Read(folder);
        var metadata = Provenance.For(model.Path, model.Text, settings.Shared.ToDictionary(p => p.Key, p => p.Value), DateTimeOffset.UtcNow);
        ScanTable.Write(Path.Combine(folder, TableFile), axes.Select(a => a.Name).ToArray(), cells, metadata);
    }

    /// <summary>The point's stored run when its folder holds one; a folder without a manifest or checkpoint (killed before the first write) is emptied and run afresh.</summary>
    private static StoredRun? Stored(string folder)
    {
        if (!Directory.Exists(folder)) return null;
        try
        {
            return StoredRun.OpenForResume(folder);
        }
        catch (RunFolderException) when (!File.Exists(Path.Combine(folder, RunFiles.Manifest)))
        {
            Directory.Delete(folder, recursive: true);
            return null;
        }
    }
}
