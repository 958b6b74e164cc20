using System.Text.Encodings.Web;
using System.Text.Json;
using System.Text.Json.Serialization;

namespace CopyNumber.Storage;

/// <summary>
/// The run's summary file (JSON), written beside its tables and rewritten as the run progresses.
/// Field names are snake_case and fixed (model_file, model_sha256, arguments, seed, method, threads,
/// replicates_requested, replicates_finished, events_fired, wall_seconds, events_per_second,
/// tool_version, started_utc, partial); later additions go into <see cref="Extra"/>, whose entries
/// appear as further top-level fields.
/// </summary>
public sealed class RunManifest
{
    private static readonly JsonSerializerOptions Json = new()
    {
        WriteIndented = true,
        Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
    };

    private static readonly HashSet<string> FixedFields = new(StringComparer.Ordinal)
    {
        "model_file", "model_sha256", "arguments", "seed", "method", "threads", "replicates_requested",
        "replicates_finished", "events_fired", "wall_seconds", "events_per_second", "tool_version",
        "started_utc", "partial",
    };

    private DateTimeOffset _startedUtc = DateTimeOffset.UnixEpoch;

    /// <summary>The model file name as the user gave it.</summary>
    [JsonPropertyName("model_file")]
    public string ModelFile { get; set; } = "";

    /// <summary>Lowercase hexadecimal SHA-256 of the model text (see <see cref="Provenance.Sha256Hex(string)"/>).</summary>
    [JsonPropertyName("model_sha256")]
    public string ModelSha256 { get; set; } = "";

    /// <summary>The run's settings by name, as text; a JSON object of strings.</summary>
    [JsonPropertyName("arguments")]
    public SortedDictionary<string, string> Arguments { get; set; } = new(StringComparer.Ordinal);

    /// <summary>The run seed every replicate stream is derived from.</summary>
    [JsonPropertyName("seed")]
    public ulong Seed { get; set; }

    /// <summary>The simulation method's name.</summary>
    [JsonPropertyName("method")]
    public string Method { get; set; } = "";

    /// <summary>Worker threads used.</summary>
    [JsonPropertyName("threads")]
    public int Threads { get; set; }

    /// <summary>Replicates asked for.</summary>
    [JsonPropertyName("replicates_requested")]
    public long ReplicatesRequested { get; set; }

    /// <summary>Replicates run to the end so far.</summary>
    [JsonPropertyName("replicates_finished")]
    public long ReplicatesFinished { get; set; }

    /// <summary>Reaction events fired over all replicates (for tau-leaping, reactions counted in leaps).</summary>
    [JsonPropertyName("events_fired")]
    public long EventsFired { get; set; }

    /// <summary>Elapsed wall-clock time of the run so far, in seconds; finite and not negative.</summary>
    [JsonPropertyName("wall_seconds")]
    public double WallSeconds { get; set; }

    /// <summary><see cref="EventsFired"/> / <see cref="WallSeconds"/>; null while no time has elapsed. Derived, so never out of step.</summary>
    [JsonPropertyName("events_per_second")]
    public double? EventsPerSecond => WallSeconds > 0 ? EventsFired / WallSeconds : null;

    /// <summary>The tool build; defaults to <see cref="Provenance.ToolVersion"/>.</summary>
    [JsonPropertyName("tool_version")]
    public string ToolVersion { get; set; } = Provenance.ToolVersion;

    /// <summary>When the run started; stored converted to UTC, written as ISO 8601.</summary>
    [JsonPropertyName("started_utc")]
    public DateTimeOffset StartedUtc
    {
        get => _startedUtc;
        set => _startedUtc = value.ToUniversalTime();
    }

    /// <summary>True while the run is in progress or if it stopped before all replicates finished.</summary>
    [JsonPropertyName("partial")]
    public bool Partial { get; set; }

    /// <summary>
    /// Further top-level fields; keys must differ from the fixed field names. Values may be anything
    /// System.Text.Json serialises (numbers, strings, dictionaries, <see cref="System.Text.Json.Nodes.JsonNode"/>);
    /// fields read back from a file arrive as <see cref="JsonElement"/>.
    /// </summary>
    [JsonExtensionData]
    public Dictionary<string, object?> Extra { get; set; } = new(StringComparer.Ordinal);

    /// <summary>
    /// The extra field <paramref name="key"/> as text (a JSON string as it is, a number in its JSON
    /// spelling), or null when it is absent or not a string or number.
    /// </summary>
    public string? ExtraText(string key)
    {
        if (!Extra.TryGetValue(key, out var value) || value is null) return null;
        return value switch
        {
            JsonElement { ValueKind: JsonValueKind.String } e => e.GetString(),
            JsonElement { ValueKind: JsonValueKind.Number } e => e.GetRawText(),
            JsonElement => null,
            string text => text,
            IFormattable number => number.ToString(null, System.Globalization.CultureInfo.InvariantCulture),
            _ => null,
        };
    }

    /// <summary>The manifest as indented JSON.</summary>
    /// <exception cref="InvalidOperationException"><see cref="WallSeconds"/> is negative or not finite, or an <see cref="Extra"/> key repeats a fixed field.</exception>
    public string ToJson()
    {
        if (!double.IsFinite(WallSeconds) || WallSeconds < 0)
            throw new InvalidOperationException($"wall_seconds must be finite and not negative, not {WallSeconds}");
        foreach (var key in Extra.Keys)
        {
            if (FixedFields.Contains(key)) throw new InvalidOperationException($"extra field '{key}' repeats a fixed manifest field");
        }
        return JsonSerializer.Serialize(this, Json);
    }

    /// <summary>Reads a manifest from JSON text; unknown fields land in <see cref="Extra"/>.</summary>
    /// <exception cref="JsonException">The text is not a manifest.</exception>
    public static RunManifest FromJson(string json)
    {
        ArgumentNullException.ThrowIfNull(json);
        return JsonSerializer.Deserialize<RunManifest>(json, Json) ?? throw new JsonException("the manifest is JSON null");
    }

    /// <summary>Writes the manifest to <paramref name="path"/> atomically (see <see cref="AtomicFile"/>), replacing an earlier version.</summary>
    /// <exception cref="OutputException">The file could not be written.</exception>
    public void WriteAtomic(string path) => AtomicFile.WriteAllText(path, ToJson());

    /// <summary>Reads the manifest file at <paramref name="path"/>.</summary>
    /// <exception cref="OutputException">The file cannot be read; the message names the path.</exception>
    /// <exception cref="RunFolderException">The file is not a manifest (edited or damaged).</exception>
    public static RunManifest Read(string path)
    {
        var full = AtomicFile.FullPath(path);
        string text;
        try
        {
            text = File.ReadAllText(full);
        }
        catch (Exception e) when (AtomicFile.IsStorageFailure(e))
        {
            throw new OutputException($"Cannot read the run manifest '{full}': {e.Message.TrimEnd('.')}.", full, e);
        }
        try
        {
            return FromJson(text);
        }
        catch (JsonException e)
        {
            throw new RunFolderException($"The run manifest '{full}' is not valid: {InWords(e)}; it was edited or damaged after it was written.", full, e);
        }
    }

    /// <summary>Where and what is wrong, in our words rather than the JSON reader's (which names .NET types).</summary>
    private static string InWords(JsonException e)
    {
        var where = e.LineNumber is { } line ? $"line {line + 1}, column {(e.BytePositionInLine ?? 0) + 1}" : "somewhere in the file";
        var field = e.Path is { Length: > 2 } path && path.StartsWith("$.", StringComparison.Ordinal) ? path[2..] : null;
        return field is not null && e.Message.Contains("could not be converted", StringComparison.Ordinal)
            ? $"the field '{field}' ({where}) does not hold the kind of value a manifest records there"
            : $"it is not well-formed JSON ({where})";
    }
}
