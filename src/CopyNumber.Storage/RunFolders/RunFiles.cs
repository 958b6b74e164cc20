namespace CopyNumber.Storage;

/// <summary>The names of the files inside a run folder: the one list every writer and reader uses.</summary>
public static class RunFiles
{
    /// <summary>File names inside a run folder.</summary>
    public const string Moments = "moments.parquet", Distributions = "distributions.parquet",
        Deterministic = "deterministic.parquet", Paths = "paths.parquet", Manifest = "manifest.json",
        ReadoutState = "readout-state.parquet", Validation = "validation.parquet";

    /// <summary>The tables a run folder's manifest lists with their checksums (<see cref="ManifestFields.Files"/>) when they were written.</summary>
    public static readonly IReadOnlyList<string> Tables = [Deterministic, Moments, Distributions, ReadoutState, Validation, Paths];

    /// <summary>Where a resumed run writes its own paths before they are merged into <see cref="Paths"/>.</summary>
    internal const string ResumedPaths = "paths-resumed.parquet";

    /// <summary>Footer key (after <see cref="Provenance.KeyPrefix"/>) of the finished blocks a table covers.</summary>
    public const string FinishedBlocksKey = "finished_blocks";
}
