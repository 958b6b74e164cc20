using System.Text.Json;
using CopyNumber.Storage;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Resilience;

/// <summary>Models, command lines and comparisons shared by the resilience tests.</summary>
internal static class RunFolders
{
    /// <summary>
    /// Illustrative gene with bursty expression and a real-valued readout (so moments of reals are
    /// exercised beside the exact histograms); small enough that 1000 replicates take well under a second.
    /// </summary>
    public const string BurstyGene =
        "# illustrative: a gene switching on and off, its mRNA and a protein, with a ratio readout\n" +
        "species\n  off = 1\n  on = 0\n  m = 0\n  p = 0\n" +
        "parameters\n  kon = 0.5\n  koff = 0.5\n  ktx = 8\n  dm = 1\n  ktl = 2\n  dp = 0.5\n" +
        "reactions\n  activate: off -> on mass kon\n  silence: on -> off mass koff\n  transcribe: on -> on + m mass ktx\n" +
        "  decay_m: m -> 0 mass dm\n  translate: m -> m + p mass ktl\n  decay_p: p -> 0 mass dp\n" +
        "readouts\n  total = m + p\n  ratio = p / (m + 1)\n";

    /// <summary>The files whose every cell must agree between two runs of the same replicates.</summary>
    public static readonly string[] ResultFiles =
        [RunFiles.Moments, RunFiles.Distributions, RunFiles.ReadoutState, RunFiles.Deterministic, RunFiles.Covariances];

    public static string WriteModel(ScratchFolder scratch, string text = BurstyGene, string name = "gene.cnet")
    {
        var path = scratch.File(name);
        File.WriteAllText(path, text);
        return path;
    }

    /// <summary>simulate MODEL on the grid 0, 0.5, …, 5 with the given replicates and seed, then <paramref name="extra"/>.</summary>
    public static string[] Simulate(string model, long replicates, int seed, params string[] extra) =>
        ["simulate", model, "--until", "5", "--every", "0.5", "--replicates", replicates.ToString(), "--seed", seed.ToString(), .. extra];

    public static RunManifest Manifest(string folder) => RunManifest.Read(Path.Combine(folder, RunFiles.Manifest));

    public static JsonElement ManifestJson(string folder) =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, RunFiles.Manifest))).RootElement.Clone();

    /// <summary>
    /// Asserts that <paramref name="file"/> holds the same columns and, cell by cell, the same values in
    /// both folders, doubles compared bit for bit (so NaN equals NaN and 0 differs from −0). Both files are
    /// read with ParquetSharp, an implementation independent of the Parquet.Net that wrote them.
    /// </summary>
    public static void AssertSameCells(string expectedFolder, string actualFolder, string file)
    {
        var expected = ParquetReadBack.Of(Path.Combine(expectedFolder, file));
        var actual = ParquetReadBack.Of(Path.Combine(actualFolder, file));
        Assert.Equal(expected.Names, actual.Names);
        Assert.Equal(expected.TotalRows, actual.TotalRows);
        for (var c = 0; c < expected.Values.Length; c++)
        {
            var left = expected.Values[c];
            var right = actual.Values[c];
            Assert.Equal(left.Length, right.Length);
            for (var i = 0; i < left.Length; i++)
            {
                if (!Same(left.GetValue(i), right.GetValue(i)))
                    Assert.Fail($"{file}, column {expected.Names[c]}, row {i}: {left.GetValue(i)} expected, {right.GetValue(i)} found");
            }
        }
    }

    /// <summary>Asserts the message is for a person: no .NET stack trace lines, no exception type names.</summary>
    public static void AssertNoStackTrace(CliRun run)
    {
        foreach (var text in new[] { run.Output, run.Error })
        {
            Assert.DoesNotContain("   at ", text);
            Assert.DoesNotContain("Exception", text);
        }
    }

    private static bool Same(object? a, object? b) => (a, b) switch
    {
        (double x, double y) => BitConverter.DoubleToInt64Bits(x) == BitConverter.DoubleToInt64Bits(y),
        _ => Equals(a, b),
    };
}
