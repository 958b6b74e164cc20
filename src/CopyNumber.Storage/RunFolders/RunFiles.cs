namespace CopyNumber.Storage;

/// <summary>The names of the files inside a run folder: the one list every writer and reader uses.</summary>
public static class RunFiles
{
    /// <summary>File names inside a run folder.</summary>
    public const string Moments = "moments.parquet", Distributions = "distributions.parquet",
        Deterministic = "deterministic.parquet", Paths = "paths.parquet", Manifest = "manifest.json",
        ReadoutState = "readout-state.parquet", Validation = "validation.parquet", Stationary = "stationary.parquet",
        Joint = "joint.parquet", Noise = "noise.parquet", Covariances = "covariances.parquet",
        Switching = "switching.parquet", Partition = "partition.parquet";

    /// <summary>What <c>simulate --view population</c> adds: the population snapshot's laws and moments beside the lineage's (<see cref="SnapshotTable"/>).</summary>
    public const string Snapshot = "snapshot.parquet", SnapshotMoments = "snapshot-moments.parquet";

    /// <summary>What <c>contrast</c> writes into a run folder: its table, the Markdown and HTML reports, and the folder of the Markdown report's figures (PNG files, each with its SVG).</summary>
    public const string Contrast = "contrast.parquet", ReportMarkdown = "report.md", ReportHtml = "report.html", Figures = "figures";

    /// <summary>What <c>contrast</c> adds when the rate equations oscillate or ring: the averaged and LNA spectra, and the per-replicate periods and amplitudes.</summary>
    public const string OscillationSpectrum = "oscillation-spectrum.parquet", OscillationReplicates = "oscillation-replicates.parquet";

    /// <summary>What <c>contrast</c> adds when the cells divide: the LNA's variance split into the reactions' and the partitioning's parts (<see cref="PartitionLnaTable"/>).</summary>
    public const string PartitionLna = "partition-lna.parquet";

    /// <summary>What <c>contrast</c> adds when the schedule cuts the run into more than one phase: the verdicts per phase.</summary>
    public const string Phases = "phases.parquet";

    /// <summary>What <c>contrast --pair A,B</c> adds: the two species' joint histogram over the replicates whose paths are stored (<see cref="JointTable"/>'s columns).</summary>
    public const string Pair = "pair.parquet";

    /// <summary>What a size sweep writes into its folder beside one run folder per size (<see cref="SweepRunPrefix"/><c>&lt;size&gt;</c>) and the two reports.</summary>
    public const string Sweep = "sweep.parquet", SweepRunPrefix = "size-";

    /// <summary>What a scan (and a sweep, which is one) writes beside one run folder per point (<see cref="ScanPointPrefix"/><c>NNNN</c>): its table and its record.</summary>
    public const string Scan = "scan.parquet", ScanRecord = "scan.json", ScanPointPrefix = "point-";

    /// <summary>
    /// The claim of the run that holds the folder (host, process, start; see <see cref="FolderClaim"/>) and the
    /// file its advisory lock is taken on. Both exist only while a run holds the folder, or after one died.
    /// </summary>
    public const string Claim = ".copynumber-claim", Lock = ".copynumber-lock";

    /// <summary>
    /// Tables a later step adds to a finished run (<c>simulate --view population</c> after its ensemble): written, then
    /// recorded in the manifest. A kill between the two leaves them unrecorded; readers then ignore them with a warning
    /// instead of refusing the whole folder, whose own tables are whole.
    /// </summary>
    public static readonly IReadOnlyList<string> AddedAfterRun = [Snapshot, SnapshotMoments];

    /// <summary>True when every one of <paramref name="names"/> (of <see cref="AddedAfterRun"/>) is recorded among the checksums of the manifest in <paramref name="folder"/>.</summary>
    public static bool RecordedAddOns(string folder, params string[] names)
    {
        var manifest = Path.Combine(folder, Manifest);
        if (!File.Exists(manifest)) return false;
        var recorded = FileChecksums.Recorded(RunManifest.Read(manifest), ManifestFields.Files, folder);
        return recorded is not null && names.All(recorded.ContainsKey);
    }

    /// <summary>The tables a run folder's manifest lists with their checksums (<see cref="ManifestFields.Files"/>) when they were written.</summary>
    public static readonly IReadOnlyList<string> Tables = [Deterministic, Moments, Distributions, ReadoutState, Validation, Paths, Noise, Covariances, Switching, Snapshot, SnapshotMoments, Partition];

    /// <summary>Where a resumed run writes its own paths before they are merged into <see cref="Paths"/>.</summary>
    internal const string ResumedPaths = "paths-resumed.parquet";

    /// <summary>Footer key (after <see cref="Provenance.KeyPrefix"/>) of the finished blocks a table covers.</summary>
    public const string FinishedBlocksKey = "finished_blocks";

    /// <summary>
    /// Every file name a run folder may hold directly (tables, manifest, contrast outputs, claim and lock).
    /// <c>--force</c> removes exactly these (and their unfinished <c>.partial-</c> siblings), and refuses a
    /// folder holding anything else; a writer of a new file in a run folder must add its name here.
    /// </summary>
    public static readonly IReadOnlySet<string> Known = new HashSet<string>(StringComparer.Ordinal)
    {
        Moments, Distributions, Deterministic, Paths, Manifest, ReadoutState, Validation, Stationary, Joint, ResumedPaths, Noise, Covariances, Switching, Partition,
        Snapshot, SnapshotMoments,
        Contrast, ReportMarkdown, ReportHtml, OscillationSpectrum, OscillationReplicates, Phases, Pair, PartitionLna, Claim, Lock,
    };

    /// <summary>Whether <paramref name="name"/> is a file name we write into a run folder: one of <see cref="Known"/> or a temporary sibling of one.</summary>
    public static bool IsKnown(string name) =>
        Known.Contains(BaseName(name));

    /// <summary><paramref name="name"/> without an <see cref="AtomicFile.PartialMarker"/> suffix.</summary>
    internal static string BaseName(string name)
    {
        var marker = name.IndexOf(AtomicFile.PartialMarker, StringComparison.Ordinal);
        return marker < 0 ? name : name[..marker];
    }
}
