using System.Text.Json;
using CopyNumber.Storage;

namespace CopyNumber.Tests.Storage;

public sealed class ProvenanceTests
{
    // SHA-256 test vectors of NIST FIPS 180-2 (2002), Appendix B.1 ("abc") and B.2 (the 448-bit
    // message), and the well-known digest of the empty message; quoted from memory.
    [Theory]
    [InlineData("abc", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad")]
    [InlineData("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1")]
    [InlineData("", "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855")]
    public void Sha256_matches_the_published_test_vectors(string message, string digest)
    {
        Assert.Equal(digest, Provenance.Sha256Hex(message));
    }

    [Fact]
    public void Text_is_hashed_as_utf8_without_a_byte_order_mark()
    {
        // U+00B5 MICRO SIGN is C2 B5 and U+00B2 SUPERSCRIPT TWO is C2 B2 in UTF-8 (RFC 3629, §3).
        Assert.Equal(Provenance.Sha256Hex([0x43, 0x61, 0xC2, 0xB2, 0x20, 0xC2, 0xB5]), Provenance.Sha256Hex("Ca² µ"));
    }

    [Fact]
    public void The_metadata_pairs_record_model_arguments_start_and_tool()
    {
        var arguments = new Dictionary<string, string> { ["until"] = "50", ["method"] = "direct", ["Seed"] = "7" };
        var pairs = Provenance.For("toggle.cnet", "abc", arguments, new DateTimeOffset(2024, 3, 5, 9, 8, 9, 250, TimeSpan.FromHours(2)), new Dictionary<string, string> { ["table"] = "counts" });

        Assert.All(pairs.Keys, key => Assert.StartsWith(Provenance.KeyPrefix, key));
        Assert.Equal("toggle.cnet", pairs[Provenance.ModelFileKey]);
        Assert.Equal("abc", pairs[Provenance.ModelTextKey]);
        // FIPS 180-2 Appendix B.1 digest of "abc" (quoted from memory).
        Assert.Equal("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", pairs[Provenance.ModelSha256Key]);
        Assert.Equal(Provenance.ToolVersion, pairs[Provenance.ToolVersionKey]);
        Assert.Equal("counts", pairs["copynumber.table"]);
        // ISO 8601 in UTC: 09:08:09.250 at +02:00 is 07:08:09.250Z.
        Assert.Equal("2024-03-05T07:08:09.2500000+00:00", pairs[Provenance.StartedUtcKey]);

        using var json = JsonDocument.Parse(pairs[Provenance.ArgumentsKey]);
        var properties = json.RootElement.EnumerateObject().ToArray();
        // Ordinal order puts the capital "Seed" first.
        Assert.Equal(["Seed", "method", "until"], properties.Select(p => p.Name));
        Assert.Equal(["7", "direct", "50"], properties.Select(p => p.Value.GetString()));
    }

    [Fact]
    public void An_extra_key_may_not_overwrite_a_standard_one()
    {
        var clash = new Dictionary<string, string> { ["model_sha256"] = "forged" };
        Assert.Throws<ArgumentException>(() => Provenance.For("m.cnet", "x", new Dictionary<string, string>(), DateTimeOffset.UnixEpoch, clash));
    }

    [Fact]
    public void The_tool_version_starts_with_the_engine_assembly_version()
    {
        var version = typeof(Provenance).Assembly.GetName().Version!;
        Assert.StartsWith($"{version.Major}.{version.Minor}.{version.Build}", Provenance.ToolVersion);
    }
}
