using System.Globalization;
using System.Text.Json;
using CopyNumber.Ensembles;
using CopyNumber.Storage;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// A scan's record, <c>scan.json</c> in the scan folder: what every part of one scan must share (model, varied
/// names and their SPECs, design, points, seed, grid, replicates, method, ε; the model's text, so a merge
/// can rebuild the points) and the shard this
/// folder holds. A resumed scan and the shards a merge combines are checked against it, field by field.
/// </summary>
public sealed record ScanSettings(IReadOnlyDictionary<string, string> Shared, Shard Shard)
{
    /// <summary>The file's name.</summary>
    public const string FileName = RunFiles.ScanRecord;

    /// <summary>The settings of <paramref name="scan"/>.</summary>
    public static ScanSettings Of(ScanRequest scan)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var spec = scan.Specification;
        var shared = new SortedDictionary<string, string>(StringComparer.Ordinal)
        {
            ["model_sha256"] = spec.ModelSha256,
            ["model_file"] = spec.Model.Path,
            ["vary"] = string.Join(" ", scan.Axes.Select(a => $"{a.Name}={a.Spec}")),
            ["design"] = scan.Design.ToString(),
            ["points"] = scan.Points.Count.ToString(CultureInfo.InvariantCulture),
            ["model_text"] = spec.Model.Text,
        };
        foreach (var (key, value) in spec.ToArguments())
            if (key is not (ManifestFields.ShardArgument or ManifestFields.CommandArgument)) shared[key] = value;
        return new ScanSettings(shared, scan.Shard);
    }

    /// <summary>The replicates per point whose paths the scan keeps, as recorded; null when scan.json does not record it.</summary>
    public long? PathReplicates =>
        Shared.TryGetValue(StoredSettings.PathsKey, out var text)
        && long.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var paths) ? paths : null;

    /// <summary>Writes <c>scan.json</c> into <paramref name="folder"/> atomically.</summary>
    public void Write(string folder)
    {
        var all = new SortedDictionary<string, string>(Shared.ToDictionary(p => p.Key, p => p.Value), StringComparer.Ordinal) { ["shard"] = Shard.ToString() };
        AtomicFile.WriteAllText(Path.Combine(folder, FileName), JsonSerializer.Serialize(all, new JsonSerializerOptions { WriteIndented = true }));
    }

    /// <summary>Whether <paramref name="folder"/> holds a scan (its <c>scan.json</c>).</summary>
    public static bool IsScan(string folder) => File.Exists(Path.Combine(folder, FileName));

    /// <summary>Reads <c>scan.json</c> from <paramref name="folder"/>.</summary>
    /// <exception cref="RunFolderException">It is missing or does not read.</exception>
    public static ScanSettings Read(string folder)
    {
        var path = Path.Combine(folder, FileName);
        try
        {
            var all = JsonSerializer.Deserialize<Dictionary<string, string>>(File.ReadAllText(path)) ?? throw new JsonException("null");
            if (!all.Remove("shard", out var shardText) || !Shard.TryParse(shardText, out var shard, out _))
                throw new JsonException("no shard");
            return new ScanSettings(new SortedDictionary<string, string>(all, StringComparer.Ordinal), shard);
        }
        catch (Exception e) when (e is JsonException or IOException or UnauthorizedAccessException)
        {
            throw new RunFolderException($"'{path}' is not a scan's record ({e.Message.TrimEnd('.')}); it is missing, edited or damaged.", folder, e);
        }
    }

    /// <summary>Refuses <paramref name="other"/> when it is not part of the same scan.</summary>
    /// <exception cref="RunFolderException">A shared setting differs; the message names it.</exception>
    public void EnsureSameScan(ScanSettings other, string folder)
    {
        ArgumentNullException.ThrowIfNull(other);
        foreach (var key in Shared.Keys.Union(other.Shared.Keys).Order(StringComparer.Ordinal))
        {
            var mine = Shared.GetValueOrDefault(key) ?? "(none)";
            var theirs = other.Shared.GetValueOrDefault(key) ?? "(none)";
            if (mine != theirs)
                throw new RunFolderException($"The scan in '{folder}' is another scan: its {key} is {theirs}, here {mine}.", folder);
        }
    }
}
