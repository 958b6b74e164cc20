using System.Globalization;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>Where a run's tables came from, for their provenance footers.</summary>
/// <param name="ModelFile">The model file name as the user gave it.</param>
/// <param name="ModelText">The model text.</param>
/// <param name="Arguments">The run's recorded arguments.</param>
/// <param name="Started">When the run started.</param>
/// <param name="TimeUnit">The model's declared time unit, recorded in the manifest; null when it declares none.</param>
internal sealed record RunIdentity(string ModelFile, string ModelText, IReadOnlyDictionary<string, string> Arguments, DateTimeOffset Started, string? TimeUnit = null)
{
    /// <summary>Footer pairs for a table that summarises <paramref name="result"/> (or for one that does not, when null).</summary>
    public IReadOnlyDictionary<string, string> Provenance(EnsembleResult? result, ValidationResult? validation = null)
    {
        if (result is null) return Storage.Provenance.For(ModelFile, ModelText, Arguments, Started);
        var extra = new Dictionary<string, string>
        {
            ["replicates_finished"] = result.ReplicatesFinished.ToString(CultureInfo.InvariantCulture),
            ["partial"] = result.Interrupted ? "true" : "false",
            [RunFiles.FinishedBlocksKey] = BlockRanges.Format(result.FinishedBlocks),
        };
        if (validation is not null) extra[ManifestFields.Validation] = ValidationManifest.Text(validation);
        return Storage.Provenance.For(ModelFile, ModelText, Arguments, Started, extra);
    }
}

/// <summary>
/// Writes the summary tables and the manifest of a run folder, the same way for <c>simulate</c> and
/// <c>merge</c>. The manifest goes last: a folder whose manifest matches its tables is complete.
/// </summary>
internal static class SummaryFiles
{
    /// <summary>Writes moments, distributions and (when the model has real readouts) the readout state; returns the paths.</summary>
    public static List<string> WriteTables(string folder, EnsembleResult result, DeterministicSolution? deterministic, RunIdentity identity, ValidationResult? validation = null)
    {
        var files = new List<string>();
        var provenance = identity.Provenance(result, validation);
        var moments = Path.Combine(folder, RunFiles.Moments);
        MomentsTable.Write(moments, result, deterministic, provenance);
        files.Add(moments);
        files.AddRange(WriteState(folder, result, provenance));
        if (result.Pairs.Count > 0)
        {
            var path = Path.Combine(folder, RunFiles.Covariances);
            CovariancesTable.Write(path, result, provenance);
            files.Add(path);
        }
        if (result.Noise is not null)
        {
            var path = Path.Combine(folder, RunFiles.Noise);
            NoiseTable.Write(path, result, provenance);
            files.Add(path);
        }
        if (result.ModeSwitching.Count > 0)
        {
            var path = Path.Combine(folder, RunFiles.Switching);
            SwitchingTable.Write(path, result.ModeSwitching, provenance);
            files.Add(path);
        }
        if (validation is not null)
        {
            var path = Path.Combine(folder, RunFiles.Validation);
            ValidationTable.Write(path, result, validation, provenance);
            files.Add(path);
        }
        return files;
    }

    /// <summary>
    /// Writes the tables a run is resumed or merged from: distributions (exact histograms as frequencies)
    /// and, when the model has real readouts, the moment tree's state; a checkpoint holds just these.
    /// </summary>
    public static List<string> WriteState(string folder, EnsembleResult result, IReadOnlyDictionary<string, string> provenance)
    {
        var distributions = Path.Combine(folder, RunFiles.Distributions);
        DistributionsTable.Write(distributions, result, provenance);
        List<string> files = [distributions];
        if (result.MomentTree.Cells > 0)
        {
            var state = Path.Combine(folder, RunFiles.ReadoutState);
            ReadoutStateTable.Write(state, result, provenance);
            files.Add(state);
        }
        return files;
    }

    /// <summary>Records the SHA-256 of <paramref name="files"/> (inside <paramref name="folder"/>) in <paramref name="manifest"/>'s <see cref="ManifestFields.Files"/>.</summary>
    public static void RecordChecksums(RunManifest manifest, string folder, IEnumerable<string> files) =>
        manifest.Extra[ManifestFields.Files] = FileChecksums.For(folder, files);

    /// <summary>The manifest of a folder holding <paramref name="result"/>.</summary>
    public static RunManifest Manifest(RunIdentity identity, EnsembleResult result, string method, int threads, StopReason stop, string? failure, string methodReason, string? deterministicFailure, ValidationResult? validation = null)
    {
        var manifest = new RunManifest
        {
            ModelFile = identity.ModelFile,
            ModelSha256 = Provenance.Sha256Hex(identity.ModelText),
            Seed = ulong.Parse(identity.Arguments["seed"], CultureInfo.InvariantCulture),
            Method = method,
            Threads = threads,
            ReplicatesRequested = result.ReplicatesRequested,
            ReplicatesFinished = result.ReplicatesFinished,
            EventsFired = result.EventsFired,
            WallSeconds = Math.Max(0, result.WallTime.TotalSeconds),
            StartedUtc = identity.Started,
            Partial = result.Interrupted,
        };
        foreach (var (key, value) in identity.Arguments) manifest.Arguments[key] = value;
        manifest.Extra[ManifestFields.MethodReason] = methodReason;
        manifest.Extra[ManifestFields.StoppedEarly] = result.ReplicatesStoppedEarly;
        manifest.Extra[ManifestFields.GridPoints] = result.Grid.Count;
        manifest.Extra[ManifestFields.BlockSize] = result.BlockSize;
        manifest.Extra[ManifestFields.TotalBlocks] = result.TotalBlocks;
        manifest.Extra[ManifestFields.FinishedBlocks] = BlockRanges.Format(result.FinishedBlocks);
        manifest.Extra[ManifestFields.StopReason] = stop.Name();
        manifest.Extra[ManifestFields.Switching] = SwitchingJson.Write(result.Switching);
        if (result.ModeSwitching.Count > 0) manifest.Extra[ManifestFields.ModeSwitching] = ModeSwitchingJson.Write(result.ModeSwitching);
        if (failure is not null) manifest.Extra[ManifestFields.Failure] = failure;
        if (identity.TimeUnit is not null) manifest.Extra[ManifestFields.TimeUnit] = identity.TimeUnit;
        if (deterministicFailure is not null) manifest.Extra[ManifestFields.DeterministicFailure] = deterministicFailure;
        if (validation is not null) manifest.Extra[ManifestFields.Validation] = ValidationManifest.Of(validation);
        return manifest;
    }
}
