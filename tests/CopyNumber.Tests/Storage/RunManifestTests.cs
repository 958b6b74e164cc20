using System.Text.Json;
using System.Text.Json.Nodes;
using CopyNumber.Storage;

namespace CopyNumber.Tests.Storage;

// The manifest is read by other programs, so its JSON is checked with a plain JsonDocument parse
// (RFC 8259 JSON; timestamps ISO 8601) against the field names RunManifest documents, not by
// deserialising it with the class that wrote it.
public sealed class RunManifestTests
{
    private static readonly string[] DocumentedFields =
    [
        "model_file", "model_sha256", "arguments", "seed", "method", "threads", "replicates_requested",
        "replicates_finished", "events_fired", "wall_seconds", "events_per_second", "tool_version",
        "started_utc", "partial",
    ];

    private static RunManifest Filled() => new()
    {
        ModelFile = "models/toggle.cnet",
        ModelSha256 = Provenance.Sha256Hex("abc"),
        Arguments = new(StringComparer.Ordinal) { ["until"] = "100", ["every"] = "0.5", ["method"] = "direct" },
        Seed = ulong.MaxValue,
        Method = "direct",
        Threads = 2,
        ReplicatesRequested = 1000,
        ReplicatesFinished = 640,
        EventsFired = 1_000_000,
        WallSeconds = 2.5,
        ToolVersion = "0.1.0+test",
        StartedUtc = new DateTimeOffset(2024, 3, 5, 9, 8, 9, TimeSpan.FromHours(2)),
        Partial = true,
    };

    [Fact]
    public void The_json_carries_exactly_the_documented_fields_with_their_json_types()
    {
        var manifest = Filled();
        manifest.Extra["stiffness_ratio"] = 3.25;
        using var document = JsonDocument.Parse(manifest.ToJson());
        var root = document.RootElement;

        Assert.Equal(DocumentedFields.Append("stiffness_ratio").Order(StringComparer.Ordinal), root.EnumerateObject().Select(p => p.Name).Order(StringComparer.Ordinal));
        Assert.Equal("models/toggle.cnet", root.GetProperty("model_file").GetString());
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", root.GetProperty("model_sha256").GetString());
        var arguments = root.GetProperty("arguments");
        Assert.Equal(JsonValueKind.Object, arguments.ValueKind);
        Assert.Equal("0.5", arguments.GetProperty("every").GetString());
        // The largest 64-bit seed must survive as an exact integer, not a rounded double.
        Assert.Equal(18446744073709551615UL, root.GetProperty("seed").GetUInt64());
        Assert.Equal("direct", root.GetProperty("method").GetString());
        Assert.Equal(2, root.GetProperty("threads").GetInt32());
        Assert.Equal(1000, root.GetProperty("replicates_requested").GetInt64());
        Assert.Equal(640, root.GetProperty("replicates_finished").GetInt64());
        Assert.Equal(1_000_000, root.GetProperty("events_fired").GetInt64());
        Assert.Equal(2.5, root.GetProperty("wall_seconds").GetDouble());
        // 1 000 000 events in 2.5 s is 400 000 per second.
        Assert.Equal(400_000.0, root.GetProperty("events_per_second").GetDouble());
        Assert.Equal("0.1.0+test", root.GetProperty("tool_version").GetString());
        // 09:08:09 at +02:00 is 07:08:09 UTC.
        Assert.Equal("2024-03-05T07:08:09+00:00", root.GetProperty("started_utc").GetString());
        Assert.Equal(JsonValueKind.True, root.GetProperty("partial").ValueKind);
        Assert.Equal(3.25, root.GetProperty("stiffness_ratio").GetDouble());
    }

    [Fact]
    public void A_manifest_round_trips_through_its_file()
    {
        using var folder = new ScratchFolder();
        var path = folder.File("manifest.json");
        var written = Filled();
        written.Extra["notes"] = new JsonObject { ["stopped_by"] = "interrupt" };
        written.WriteAtomic(path);
        written.Partial = false;
        written.ReplicatesFinished = 1000;
        written.WriteAtomic(path);

        Assert.Equal(["manifest.json"], folder.Entries());
        var bytes = File.ReadAllBytes(path);
        Assert.NotEqual(0xEF, bytes[0]); // no UTF-8 byte-order mark (RFC 8259 §8.1 forbids adding one)

        var read = RunManifest.Read(path);
        Assert.Equal(written.ModelFile, read.ModelFile);
        Assert.Equal(written.ModelSha256, read.ModelSha256);
        Assert.Equal(written.Arguments, read.Arguments);
        Assert.Equal(written.Seed, read.Seed);
        Assert.Equal(written.Method, read.Method);
        Assert.Equal(written.Threads, read.Threads);
        Assert.Equal(written.ReplicatesRequested, read.ReplicatesRequested);
        Assert.Equal(1000, read.ReplicatesFinished);
        Assert.Equal(written.EventsFired, read.EventsFired);
        Assert.Equal(written.WallSeconds, read.WallSeconds);
        Assert.Equal(written.EventsPerSecond, read.EventsPerSecond);
        Assert.Equal(written.ToolVersion, read.ToolVersion);
        Assert.Equal(written.StartedUtc, read.StartedUtc);
        Assert.Equal(TimeSpan.Zero, read.StartedUtc.Offset);
        Assert.False(read.Partial);
        // Only the extra field comes back as extra: the derived events_per_second is not mistaken for one.
        Assert.Equal(["notes"], read.Extra.Select(p => p.Key));
        Assert.Equal("interrupt", ((JsonElement)read.Extra["notes"]!).GetProperty("stopped_by").GetString());
        Assert.Equal(written.ToJson(), read.ToJson());
    }

    [Fact]
    public void The_event_rate_is_absent_until_time_has_elapsed()
    {
        var manifest = Filled();
        manifest.WallSeconds = 0;
        Assert.Null(manifest.EventsPerSecond);
        using var document = JsonDocument.Parse(manifest.ToJson());
        Assert.Equal(JsonValueKind.Null, document.RootElement.GetProperty("events_per_second").ValueKind);
    }

    [Fact]
    public void Inconsistent_manifests_are_refused_before_anything_is_written()
    {
        var manifest = Filled();
        manifest.Extra["seed"] = 1;
        Assert.Contains("'seed'", Assert.Throws<InvalidOperationException>(manifest.ToJson).Message);

        var broken = Filled();
        broken.WallSeconds = double.NaN;
        Assert.Throws<InvalidOperationException>(broken.ToJson);
        broken.WallSeconds = -1;
        Assert.Throws<InvalidOperationException>(broken.ToJson);
    }

    [Fact]
    public void Reading_a_missing_or_malformed_manifest_names_the_file()
    {
        using var folder = new ScratchFolder();
        var missing = folder.File("absent.json");
        Assert.StartsWith($"Cannot read the run manifest '{missing}': ", Assert.Throws<OutputException>(() => RunManifest.Read(missing)).Message);

        var malformed = folder.File("bad.json");
        File.WriteAllText(malformed, "{ \"seed\": \"not a number\" }");
        // A file that reads but is not a manifest is a damaged run folder (bad input), not a failed write.
        Assert.StartsWith($"The run manifest '{malformed}' is not valid: ", Assert.Throws<RunFolderException>(() => RunManifest.Read(malformed)).Message);
    }
}
