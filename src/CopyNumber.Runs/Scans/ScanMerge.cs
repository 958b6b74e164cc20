using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;
using System.Globalization;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// Combines the shards of one scan (<c>--shard i/n</c> over points) into one scan folder: every point's run
/// folder is copied in, <c>scan.json</c> records the whole map, and <c>scan.parquet</c> is computed from the
/// point folders by the same computation a scan runs after each point, so the merged table equals that of one
/// uninterrupted scan cell for cell.
/// </summary>
public static class ScanMerge
{
    /// <summary>What a merge produced: the rows, the model and the axes (for the report).</summary>
    public sealed record Result(IReadOnlyList<ScanCell> Cells, LoadedModel Model, IReadOnlyList<ScanAxis> Axes, int Points);

    /// <summary>Merges <paramref name="inputs"/> into the claimed, empty folder <paramref name="output"/>.</summary>
    /// <exception cref="RunFolderException">An input is not part of the same scan, or a point is missing or unfinished.</exception>
    public static Result Execute(IReadOnlyList<string> inputs, string output, ContrastThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(inputs);
        var first = ScanSettings.Read(inputs[0]);
        foreach (var input in inputs.Skip(1)) first.EnsureSameScan(ScanSettings.Read(input), input);
        var shared = first.Shared;
        var loaded = ModelLoader.LoadText(shared["model_text"], shared["model_file"]).Model
            ?? throw new RunFolderException($"the model recorded in '{inputs[0]}/{ScanSettings.FileName}' no longer compiles", inputs[0]);
        var axes = shared["vary"].Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(text => ScanAxis.Parse(text, loaded.Network)).ToArray();
        var seed = ulong.Parse(shared["seed"], NumberStyles.None, CultureInfo.InvariantCulture);
        var points = ScanDesign.Parse(shared["design"]).Points(axes, seed);
        var perPoint = ScanErrorRate.PerPoint(thresholds, points.Count);
        var cells = new List<ScanCell>();
        foreach (var point in points)
        {
            var source = inputs.Select(i => Path.Combine(i, point.FolderName))
                .FirstOrDefault(f => File.Exists(Path.Combine(f, RunFiles.Manifest)) && !StoredRun.Open(f).NeedsResuming)
                ?? throw new RunFolderException($"no input holds point {point.Index} ({ScanModel.Describe(axes, point)}) finished; run its shard (or resume it) and merge again", inputs[0]);
            var target = Path.Combine(output, point.FolderName);
            CopyFolder(source, target);
            var (model, _) = ScanModel.At(loaded, axes, point);
            cells.AddRange(ScanCells.Of(point, model.Network, RunContrast.Compute(RunFolder.Read(target), perPoint), seed));
        }
        new ScanSettings(shared, Shard.Whole).Write(output);
        ScanRunner.WriteTable(output, loaded, axes, cells);
        return new Result(cells, loaded, axes, points.Count);
    }

    private static void CopyFolder(string source, string target)
    {
        Directory.CreateDirectory(target);
        foreach (var file in Directory.EnumerateFiles(source))
        {
            var name = Path.GetFileName(file);
            if (name is RunFiles.Claim or RunFiles.Lock) continue;
            AtomicFile.Copy(file, Path.Combine(target, name));
        }
        foreach (var folder in Directory.EnumerateDirectories(source))
            CopyFolder(folder, Path.Combine(target, Path.GetFileName(folder)));
    }
}
