using CopyNumber.Storage;
using System.Globalization;
using System.Text.Json.Nodes;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Runs;

/// <summary>What a merge produced.</summary>
/// <param name="Ensemble">The combined summaries.</param>
/// <param name="Manifest">The manifest as written.</param>
/// <param name="Files">The files written, in the order written.</param>
public sealed record MergeOutcome(EnsembleResult Ensemble, RunManifest Manifest, IReadOnlyList<string> Files)
{
    /// <summary>What the user should know about the inputs (e.g. a folder written without checksums).</summary>
    public IReadOnlyList<string> Warnings { get; init; } = [];
}

/// <summary>
/// Combines run folders over disjoint blocks of one run — the shards of a job array, or an incomplete
/// merge and the shards it lacked — into one folder with the same files a single <c>simulate</c> run
/// writes. Histograms add exactly and real moments are combined in the run's fixed tree, so merging all
/// the shards gives, cell for cell, the tables of one run of all the replicates. The rate-equation
/// table is copied from the first input that has one.
/// </summary>
public static class RunMerge
{
    /// <summary>Merges <paramref name="inputs"/> into the folder <paramref name="output"/>, which must be new or empty unless <paramref name="force"/> is set.</summary>
    /// <exception cref="RunFolderException">An input cannot be read, the inputs belong to different runs (model, grid, seed, method, …), or two hold the same block.</exception>
    /// <exception cref="OutputException">A file could not be written, or the output folder is one of the inputs.</exception>
    /// <param name="inputs">The run folders to merge.</param>
    /// <param name="output">The folder to write; claimed for the merge (<see cref="FolderClaim"/>).</param>
    /// <param name="force">Replace the run in a non-empty <paramref name="output"/>.</param>
    /// <param name="takeOver">Take over a claim on <paramref name="output"/> by a run on another host.</param>
    public static MergeOutcome Execute(IReadOnlyList<string> inputs, string output, bool force = false, bool takeOver = false)
    {
        ArgumentNullException.ThrowIfNull(inputs);
        if (inputs.Count == 0) throw new ArgumentException("at least one run folder is needed", nameof(inputs));
        var runs = inputs.Select(StoredRun.Open).ToArray();
        // With --force the output folder's files are replaced, so an input named as the output would lose its shard.
        if (!string.IsNullOrWhiteSpace(output) && runs.FirstOrDefault(r => SameFolder(r.Folder, output)) is { } target)
            throw new OutputException($"The output folder '{AtomicFile.FullPath(output)}' is one of the folders being merged ('{target.Folder}'); merging into it would overwrite that shard. Choose a new folder.", AtomicFile.FullPath(output), refused: true);
        var first = runs[0];
        foreach (var run in runs.Skip(1))
        {
            var differences = RunSettings.Of(first).Differences(RunSettings.Of(run), $"'{first.Folder}'", $"'{run.Folder}'", includeShard: false);
            if (differences.Count > 0)
                throw new RunFolderException($"'{run.Folder}' is not part of the same run as '{first.Folder}':\n  {string.Join("\n  ", differences)}", run.Folder);
        }
        var owner = new Dictionary<long, StoredRun>();
        foreach (var run in runs)
        {
            foreach (var block in run.FinishedBlocks)
            {
                if (owner.TryAdd(block, run)) continue;
                var other = owner[block];
                throw new RunFolderException(
                    ReferenceEquals(other, run) || other.Folder == run.Folder
                        ? $"'{run.Folder}' is given twice."
                        : $"'{other.Folder}' and '{run.Folder}' both hold block {block} (replicates {block * run.BlockSize}–{Math.Min(run.Manifest.ReplicatesRequested, (block + 1) * run.BlockSize) - 1}); the shards overlap, so merging them would count those replicates twice.",
                    run.Folder);
            }
        }

        var text = first.ModelText();
        var loaded = ModelLoader.LoadText(text, first.Manifest.ModelFile);
        if (loaded.Model is null)
            throw new RunFolderException($"The model stored in '{first.Folder}' no longer compiles: {loaded.Diagnostics.FirstOrDefault()?.Message}.", first.Folder);
        var network = loaded.Model.Network;
        var combined = runs.Select(r => r.Load(network)).Aggregate(EnsembleResult.Combine);

        using var claim = OutputFolder.Claim(output, network.Name, DateTimeOffset.Now, force, takeOver, "merge");
        var folder = claim.Folder;
        var arguments = new Dictionary<string, string>(first.Manifest.Arguments, StringComparer.Ordinal)
        {
            [ManifestFields.ShardArgument] = combined.Shard.ToString(),
        };
        var identity = new RunIdentity(first.Manifest.ModelFile, text, arguments, runs.Min(r => r.Manifest.StartedUtc), network.Units.Time);
        var files = new List<string>();
        DeterministicSolution? deterministic = null;
        var withSolution = runs.FirstOrDefault(r => File.Exists(Path.Combine(r.Folder, RunFiles.Deterministic)));
        if (withSolution is not null)
        {
            var source = Path.Combine(withSolution.Folder, RunFiles.Deterministic);
            deterministic = DeterministicTable.Read(source, combined.Grid, network.Species.Count);
            var copy = Path.Combine(folder, RunFiles.Deterministic);
            AtomicFile.WriteAllBytes(copy, ReadAll(source, withSolution.Folder));
            files.Add(copy);
        }
        if (long.TryParse(arguments.GetValueOrDefault("paths"), NumberStyles.None, CultureInfo.InvariantCulture, out var pathCount) && pathCount > 0)
        {
            var sources = runs.Select(r => Path.Combine(r.Folder, RunFiles.Paths)).Where(File.Exists).ToArray();
            var destination = Path.Combine(folder, RunFiles.Paths);
            PathsMerge.Write(sources, destination, PathsTable.ColumnsFor(network), identity.Provenance(null));
            files.Add(destination);
        }
        // The validation sample is run by the first shard only; it is compared again with the merged ensemble.
        ValidationResult? validation = null;
        foreach (var run in runs)
        {
            if (ValidationTable.Read(run.Folder, combined) is not { } sample) continue;
            validation = ValidationResult.Of(combined, sample, combined.WallTime);
            var automatic = arguments.GetValueOrDefault("method") == "auto";
            validation = validation with { Action = validation.Decide(automatic, wholeRun: false) };
            break;
        }
        files.AddRange(SummaryFiles.WriteTables(folder, combined, deterministic, identity, validation));

        var failures = runs.Select(r => r.Manifest.ExtraText(ManifestFields.Failure)).OfType<string>().ToArray();
        var reasons = runs.Select(r => r.Manifest.ExtraText(ManifestFields.StopReason)).ToHashSet();
        var stop = !combined.Interrupted ? StopReason.Finished
            : failures.Length > 0 ? StopReason.Failed
            : reasons.Contains(StopReason.WallLimit.Name()) ? StopReason.WallLimit
            : reasons.Contains(StopReason.Interrupted.Name()) ? StopReason.Interrupted
            : StopReason.Incomplete;
        var manifest = SummaryFiles.Manifest(identity, combined, first.Manifest.Method, runs.Max(r => r.Manifest.Threads), stop,
            failures.FirstOrDefault(), first.Manifest.ExtraText(ManifestFields.MethodReason) ?? "", withSolution is null ? first.Manifest.ExtraText(ManifestFields.DeterministicFailure) : null, validation);
        manifest.Extra[ManifestFields.MergedFrom] = new JsonArray(runs.Select(r => (JsonNode?)JsonValue.Create(r.Folder)).ToArray());
        SummaryFiles.RecordChecksums(manifest, folder, files);
        var manifestPath = Path.Combine(folder, RunFiles.Manifest);
        manifest.WriteAtomic(manifestPath);
        files.Add(manifestPath);
        return new MergeOutcome(combined, manifest, files) { Warnings = runs.SelectMany(r => r.Warnings).ToArray() };
    }

    private static byte[] ReadAll(string path, string folder)
    {
        try
        {
            return File.ReadAllBytes(path);
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new RunFolderException($"Cannot read '{path}': {e.Message.TrimEnd('.')}.", folder, e);
        }
    }

    private static bool SameFolder(string a, string b) =>
        string.Equals(Path.TrimEndingDirectorySeparator(AtomicFile.FullPath(a)), Path.TrimEndingDirectorySeparator(AtomicFile.FullPath(b)),
            OperatingSystem.IsLinux() ? StringComparison.Ordinal : StringComparison.OrdinalIgnoreCase);
}
