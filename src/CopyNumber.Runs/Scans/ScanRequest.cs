using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Runs.Scans;

/// <summary>A scan, typed: the model, the varied names, the design and its points, the run settings every point shares, and where it goes.</summary>
/// <param name="Model">The model as written (each point's model is made from it by <see cref="ScanModel"/>).</param>
/// <param name="Axes">The varied names.</param>
/// <param name="Design">Grid or Latin hypercube.</param>
/// <param name="Specification">The run settings of every point (grid, replicates, seed, method); its model and size are replaced per point. The same seed at every point gives replicate r the same stream everywhere (common random numbers).</param>
/// <param name="Thresholds">The verdicts' thresholds for the whole map (α per quantity and verdict over the map; see <see cref="ScanErrorRate"/>).</param>
/// <param name="Folder">The scan folder, claimed by the caller.</param>
public sealed record ScanRequest(LoadedModel Model, IReadOnlyList<ScanAxis> Axes, ScanDesign Design, RunSpecification Specification, ContrastThresholds Thresholds, string Folder)
{
    /// <summary>Every point of the map, from the design and the seed.</summary>
    public IReadOnlyList<ScanPoint> Points { get; } = Design.Points(Axes, Specification.Seed);

    /// <summary>The points this run covers: point p belongs to shard (p mod n) + 1, so every shard gets points from all over the map.</summary>
    public Shard Shard { get; init; } = Shard.Whole;

    /// <summary>Continue the scan in <see cref="Folder"/>: finished points are kept, an interrupted one is resumed.</summary>
    public bool Resume { get; init; }

    /// <summary>The points of <see cref="Shard"/>.</summary>
    public IReadOnlyList<ScanPoint> ShardPoints => Points.Where(p => p.Index % Shard.Count == Shard.Number - 1).ToArray();
}
