using System.Globalization;

namespace CopyNumber.Storage;

/// <summary>
/// What makes two runs parts of one: the model (by SHA-256 of its text), the recorded arguments (grid,
/// replicates, seed, method, ε, event limit, paths, shard) and the block size. Parts whose settings
/// agree run disjoint replicates of one ensemble and can be combined exactly; the thread count is not
/// a setting, since it does not change any result.
/// </summary>
/// <param name="ModelSha256">Lowercase hexadecimal SHA-256 of the model text.</param>
/// <param name="Arguments">The arguments as recorded in the manifest.</param>
/// <param name="BlockSize">Replicates per block.</param>
public sealed record RunSettings(string ModelSha256, IReadOnlyDictionary<string, string> Arguments, int BlockSize)
{
    /// <summary>The settings a stored run was made with.</summary>
    public static RunSettings Of(StoredRun run)
    {
        ArgumentNullException.ThrowIfNull(run);
        return new RunSettings(run.Manifest.ModelSha256, run.Manifest.Arguments, run.BlockSize);
    }

    /// <summary>
    /// Each way <paramref name="other"/> differs from these settings, as a line for the user, e.g.
    /// "--seed: 8 in B, 7 in A"; empty when they agree. The command that wrote a folder and where its switching cores
    /// came from never matter; the shard matters only when <paramref name="includeShard"/> is set.
    /// </summary>
    public IReadOnlyList<string> Differences(RunSettings other, string thisName, string otherName, bool includeShard)
    {
        ArgumentNullException.ThrowIfNull(other);
        var lines = new List<string>();
        if (ModelSha256 != other.ModelSha256)
            lines.Add($"the model: {otherName} ran a model with SHA-256 {Short(other.ModelSha256)}, {thisName} one with {Short(ModelSha256)} (the model text differs)");
        foreach (var key in Arguments.Keys.Union(other.Arguments.Keys).Order(StringComparer.Ordinal))
        {
            // Where the switching cores came from is provenance: the same cores, given or taken from the steady states, make the same run.
            if (key == ManifestFields.CommandArgument || key == ManifestFields.SwitchingSourceArgument || (!includeShard && key == ManifestFields.ShardArgument)) continue;
            var mine = Arguments.TryGetValue(key, out var a) ? a : "(not recorded)";
            var theirs = other.Arguments.TryGetValue(key, out var b) ? b : "(not recorded)";
            if (mine != theirs) lines.Add($"--{key.Replace('_', '-')}: {theirs} in {otherName}, {mine} in {thisName}");
        }
        if (BlockSize != other.BlockSize)
            lines.Add($"the block size: {other.BlockSize.ToString(CultureInfo.InvariantCulture)} in {otherName}, {BlockSize.ToString(CultureInfo.InvariantCulture)} in {thisName}");
        return lines;
    }

    private static string Short(string sha) => sha.Length > 12 ? sha[..12] + "…" : sha;
}
