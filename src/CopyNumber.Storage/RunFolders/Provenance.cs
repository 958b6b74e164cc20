using System.Globalization;
using System.Reflection;
using System.Security.Cryptography;
using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;

namespace CopyNumber.Storage;

/// <summary>
/// What every output file records about how it was made, so a table found later can be traced to its
/// exact model text, arguments and tool build. The pairs go into Parquet footers as key-value metadata;
/// every key starts with <see cref="KeyPrefix"/>.
/// </summary>
public static class Provenance
{
    /// <summary>Prefix of every key this tool writes into file metadata.</summary>
    public const string KeyPrefix = "copynumber.";

    /// <summary>Key of <see cref="ToolVersion"/>.</summary>
    public const string ToolVersionKey = KeyPrefix + "tool_version";

    /// <summary>Key of the model file name as the user gave it.</summary>
    public const string ModelFileKey = KeyPrefix + "model_file";

    /// <summary>Key of the lowercase hexadecimal SHA-256 of the model text (see <see cref="Sha256Hex(string)"/>).</summary>
    public const string ModelSha256Key = KeyPrefix + "model_sha256";

    /// <summary>Key of the full model text, so the file alone suffices to rerun it.</summary>
    public const string ModelTextKey = KeyPrefix + "model_text";

    /// <summary>Key of the arguments, a JSON object of strings with keys in ordinal order.</summary>
    public const string ArgumentsKey = KeyPrefix + "arguments";

    /// <summary>Key of the run's start, ISO 8601 in UTC with fractional seconds ("o" format).</summary>
    public const string StartedUtcKey = KeyPrefix + "started_utc";

    private static readonly JsonSerializerOptions ArgumentJson = new() { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    /// <summary>
    /// The engine's version: the assembly's informational version (the project version, followed by
    /// <c>+</c> and the source revision when the build knows it).
    /// </summary>
    public static string ToolVersion { get; } =
        typeof(Provenance).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion
        ?? typeof(Provenance).Assembly.GetName().Version?.ToString()
        ?? "unknown";

    /// <summary>The metadata pairs for one run's output files.</summary>
    /// <param name="modelFile">The model file name as the user gave it.</param>
    /// <param name="modelText">The model text that was compiled.</param>
    /// <param name="arguments">The run's settings by name (seed, method, replicates, ...), as text.</param>
    /// <param name="startedUtc">When the run started; stored converted to UTC.</param>
    /// <param name="extra">Further pairs; each key gets <see cref="KeyPrefix"/> and must not collide with the keys above.</param>
    /// <exception cref="ArgumentException">An extra key is empty or collides with a standard key.</exception>
    public static IReadOnlyDictionary<string, string> For(
        string modelFile,
        string modelText,
        IReadOnlyDictionary<string, string> arguments,
        DateTimeOffset startedUtc,
        IReadOnlyDictionary<string, string>? extra = null)
    {
        ArgumentNullException.ThrowIfNull(modelFile);
        ArgumentNullException.ThrowIfNull(modelText);
        ArgumentNullException.ThrowIfNull(arguments);
        var pairs = new Dictionary<string, string>(StringComparer.Ordinal)
        {
            [ToolVersionKey] = ToolVersion,
            [ModelFileKey] = modelFile,
            [ModelSha256Key] = Sha256Hex(modelText),
            [ModelTextKey] = modelText,
            [ArgumentsKey] = ArgumentsJson(arguments),
            [StartedUtcKey] = startedUtc.ToUniversalTime().ToString("o", CultureInfo.InvariantCulture),
        };
        if (extra is not null)
        {
            foreach (var (key, value) in extra)
            {
                if (string.IsNullOrEmpty(key)) throw new ArgumentException("an extra provenance key must not be empty", nameof(extra));
                if (!pairs.TryAdd(KeyPrefix + key, value ?? throw new ArgumentException($"extra provenance key '{key}' has no value", nameof(extra))))
                    throw new ArgumentException($"extra provenance key '{key}' collides with a standard key", nameof(extra));
            }
        }
        return pairs;
    }

    /// <summary>Lowercase hexadecimal SHA-256 (FIPS 180-4) of <paramref name="text"/> encoded as UTF-8 without a byte-order mark.</summary>
    public static string Sha256Hex(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        return Sha256Hex(Encoding.UTF8.GetBytes(text));
    }

    /// <summary>Lowercase hexadecimal SHA-256 (FIPS 180-4) of <paramref name="bytes"/>, e.g. a file's raw contents.</summary>
    public static string Sha256Hex(ReadOnlySpan<byte> bytes) =>
        Convert.ToHexStringLower(SHA256.HashData(bytes));

    /// <summary>The arguments as one JSON object of strings, keys in ordinal order so equal arguments give equal text.</summary>
    public static string ArgumentsJson(IReadOnlyDictionary<string, string> arguments)
    {
        ArgumentNullException.ThrowIfNull(arguments);
        var ordered = new SortedDictionary<string, string>(StringComparer.Ordinal);
        foreach (var (key, value) in arguments) ordered[key] = value;
        return JsonSerializer.Serialize(ordered, ArgumentJson);
    }
}
