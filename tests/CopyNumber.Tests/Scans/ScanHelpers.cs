using CopyNumber.Analysis;
using CopyNumber.Network;
using CopyNumber.Runs;
using CopyNumber.Runs.Scans;
using CopyNumber.Storage;

namespace CopyNumber.Tests.Scans;

/// <summary>Builds and runs scans in-process through the library, without the report (the contrast is computed, not written).</summary>
internal static class ScanHelpers
{
    public static LoadedModel Load(string text, string file = "model.cnet") =>
        ModelLoader.LoadText(text, file).Model ?? throw new InvalidOperationException("test model does not compile");

    public static ScanRequest Request(LoadedModel model, string folder, ulong seed, long replicates, TimeGrid grid, ContrastThresholds? thresholds, params string[] vary)
    {
        var axes = vary.Select(v => ScanAxis.Parse(v, model.Network)).ToArray();
        var specification = new RunSpecification { Model = model, Grid = grid, Replicates = replicates, Seed = seed, MethodRequested = "direct", Threads = 2, Command = "scan" };
        Directory.CreateDirectory(folder);
        return new ScanRequest(model, axes, ScanDesign.Grid, specification, thresholds ?? ContrastThresholds.Default, folder);
    }

    /// <summary>The contrast a scan computes for a point, without the report files.</summary>
    public static RunContrastResult ContrastOnly(string folder, ContrastThresholds thresholds) => RunContrast.Compute(RunFolder.Read(folder), thresholds);
}
