namespace CopyNumber.Storage;

/// <summary>
/// The names of the manifest fields beyond <see cref="RunManifest"/>'s fixed ones, and of the
/// argument keys, written by <c>simulate</c> and <c>merge</c> and read back to resume and merge runs.
/// </summary>
public static class ManifestFields
{
    /// <summary>Where the error bars of a folder's means come from; present in an exact folder (written by <c>exact</c>).</summary>
    public const string ErrorKind = "error_kind";

    /// <summary>The value of <see cref="ErrorKind"/> in an exact folder.</summary>
    public const string ExactErrorKind = "exact: projection bound and time-stepping error";

    /// <summary>The check of a finished ensemble against the exact law of the master equation (<c>simulate --check-exact</c>).</summary>
    public const string ExactCheck = "exact_check";

    /// <summary>Replicates per block (int).</summary>
    public const string BlockSize = "block_size";

    /// <summary>B, the blocks of the whole run (int).</summary>
    public const string TotalBlocks = "total_blocks";

    /// <summary>The finished blocks as ranges, e.g. "0-41,43" (see <see cref="Ensembles.BlockRanges"/>).</summary>
    public const string FinishedBlocks = "finished_blocks";

    /// <summary>The model's declared time unit (<c>time unit minute</c>), a string; absent when the model declares none.</summary>
    public const string TimeUnit = "time_unit";

    /// <summary>Grid points (int).</summary>
    public const string GridPoints = "grid_points";

    /// <summary>Replicates that reached the event limit before the final time (int).</summary>
    public const string StoppedEarly = "replicates_stopped_early";

    /// <summary>Why the run ended: finished, interrupted, wall_limit or failed (see <see cref="StopReason"/>).</summary>
    public const string StopReason = "stop_reason";

    /// <summary>The message of the replicate failure that stopped the run, when one did.</summary>
    public const string Failure = "failure";

    /// <summary>Why the simulation method was chosen.</summary>
    public const string MethodReason = "method_reason";

    /// <summary>Why the rate equations could not be solved, when they could not.</summary>
    public const string DeterministicFailure = "deterministic_failure";

    /// <summary>Why paths.parquet was dropped (a full disk while writing it); absent when the paths were written or not asked for.</summary>
    public const string PathsFailure = "paths_failure";

    /// <summary>
    /// Switches per replicate of each two-state species over [0, T] (array of objects, one per species:
    /// species, over, replicates, excluded_replicates, mean, variance, std_error, mean_rate, switches_sum,
    /// switches_sum_of_squares; see <see cref="Ensembles.SwitchingStatistics"/>). The integer sums are read
    /// back to resume and merge runs exactly.
    /// </summary>
    public const string Switching = "switching";

    /// <summary>
    /// Switching between the low and high modes of each species given cores (array of objects, one per species,
    /// written by <see cref="ModeSwitchingJson"/>: species, cores, replicates, switches and residence times per
    /// mode with the exact integer sums behind them; see <see cref="Ensembles.ModeSwitching"/>). The sums are read
    /// back to resume and merge runs exactly.
    /// </summary>
    public const string ModeSwitching = "mode_switching";

    /// <summary>
    /// The argument recording the cores whose modes a run follows (<c>--switching</c> text, resolved: "U=9..21,V=9..21"
    /// or "none"); absent when the run followed none.
    /// </summary>
    public const string SwitchingArgument = "switching";

    /// <summary>Where the recorded cores came from: "option" (<c>--switching</c>) or "steady-states" (the rate equations' stable steady states).</summary>
    public const string SwitchingSourceArgument = "switching_source";

    /// <summary>The folders a merged run was made from (array of full paths).</summary>
    public const string MergedFrom = "merged_from";

    /// <summary>
    /// The validation sample of a tau-leaping run (object; see <see cref="ValidationManifest"/>); also the
    /// footer key (after <see cref="Provenance.KeyPrefix"/>) of the same JSON in the summary tables.
    /// </summary>
    public const string Validation = "validation";

    /// <summary>
    /// The SHA-256 of every table the folder's run wrote (object: file name inside the folder → lowercase
    /// hexadecimal SHA-256 of its bytes, FIPS 180-4); readers verify them (see <see cref="FileChecksums"/>).
    /// Absent in folders written before checksums existed.
    /// </summary>
    public const string Files = "files";

    /// <summary>
    /// In a checkpoint's manifest: the parts of paths.parquet that belong to the checkpoint (object: file
    /// name inside the run folder → SHA-256), merged into paths.parquet by the final write.
    /// </summary>
    public const string PathParts = "path_parts";

    /// <summary>Argument key of the shard, "i/n" ("1/1" for a whole run).</summary>
    public const string ShardArgument = "shard";

    /// <summary>
    /// The argument recording the species pairs whose covariance a run accumulates (<c>--covariance-pairs</c>: "U:V,A:B", "all" or
    /// "none"); absent when not given, and then the default rule applies (<see cref="CopyNumber.Ensembles.SpeciesPair.Default"/>).
    /// </summary>
    public const string CovariancePairsArgument = "covariance_pairs";

    /// <summary>
    /// The argument recording g, the replicates that share one draw of the varying parameters (<c>--replicates-per-draw</c>),
    /// recorded whenever the model varies a parameter; a folder without it (written before it was recorded) holds no noise
    /// decomposition in its readout state.
    /// </summary>
    public const string ReplicatesPerDrawArgument = "replicates_per_draw";

    /// <summary>
    /// The argument recording that the run has a control ensemble whose cells split in halves (<c>--partition-noise</c>; value
    /// "halves"); absent otherwise.
    /// </summary>
    public const string PartitionArgument = "partition_noise";

    /// <summary>Why partition.parquet is missing although the control was asked for (a control replicate failed, or it was interrupted).</summary>
    public const string PartitionFailure = "partition_failure";

    /// <summary>Argument key of the command that made the folder.</summary>
    public const string CommandArgument = "command";
}
