namespace CopyNumber.Storage;

/// <summary>
/// Checks that the tables of one run folder belong together and to its manifest: the same model (by
/// SHA-256), the same settings, and, for the summaries, the same replicates and finished blocks. A table
/// copied in from another run, or left from an earlier one, is refused by name instead of being read
/// against the wrong grid or the wrong replicates.
/// </summary>
internal sealed class TableAgreement(string folder, RunManifest manifest)
{
    private const string ReplicatesKey = Provenance.KeyPrefix + "replicates_finished";
    private const string BlocksKey = Provenance.KeyPrefix + RunFiles.FinishedBlocksKey;
    private (string File, string Blocks)? _firstBlocks;

    /// <summary>Checks one table's footer against the manifest and the tables noted before it.</summary>
    /// <param name="file">The table's file name, for the message.</param>
    /// <param name="footer">The table's key–value metadata.</param>
    /// <param name="summarises">True for a table of ensemble summaries, which must cover the manifest's replicates.</param>
    /// <exception cref="RunFolderException">The table belongs to another run or another state of this one.</exception>
    public void Note(string file, IReadOnlyDictionary<string, string> footer, bool summarises = true)
    {
        if (footer.TryGetValue(Provenance.ModelSha256Key, out var sha) && !string.IsNullOrEmpty(manifest.ModelSha256) && sha != manifest.ModelSha256)
            throw Mismatch($"{file} was made from another model (SHA-256 {Short(sha)}) than manifest.json records ({Short(manifest.ModelSha256)})");
        if (footer.TryGetValue(Provenance.ArgumentsKey, out var json) && ReadArguments(json) is { } arguments)
        {
            // The settings that fix the grid and the replicates; others (threads, the command) may differ legitimately.
            foreach (var key in DefiningSettings)
                if (arguments.TryGetValue(key, out var value) && manifest.Arguments.TryGetValue(key, out var recorded) && value != recorded)
                    throw Mismatch($"{file} was made with {key} {value} but manifest.json records {key} {recorded}");
        }
        if (!summarises) return;
        if (footer.TryGetValue(ReplicatesKey, out var replicates) && replicates != manifest.ReplicatesFinished.ToString(System.Globalization.CultureInfo.InvariantCulture))
            throw Mismatch($"{file} summarises {replicates} replicates but manifest.json records {manifest.ReplicatesFinished}");
        if (footer.TryGetValue(BlocksKey, out var blocks))
        {
            if (_firstBlocks is { } first && first.Blocks != blocks)
                throw Mismatch($"{file} covers blocks {blocks} but {first.File} covers {first.Blocks}");
            _firstBlocks ??= (file, blocks);
        }
    }

    /// <summary>The refusal for tables that do not belong together, with what to do about it.</summary>
    public RunFolderException Mismatch(string what) =>
        new($"the tables in '{folder}' do not belong together: {what}. The folder was edited, or mixed with another run's files; rerun the run into a new folder, or restore its own files.", folder);

    private static readonly string[] DefiningSettings = ["until", "every", "seed", "replicates", "size"];

    private static Dictionary<string, string>? ReadArguments(string json)
    {
        try
        {
            return System.Text.Json.JsonSerializer.Deserialize<Dictionary<string, string>>(json);
        }
        catch (System.Text.Json.JsonException)
        {
            return null;
        }
    }

    private static string Short(string sha) => sha.Length > 12 ? sha[..12] : sha;
}
