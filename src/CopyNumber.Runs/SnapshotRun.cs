using System.Globalization;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>
/// <c>simulate … --view population</c>: after a finished run of a model with a cell cycle, the population
/// snapshot (<see cref="PopulationSnapshot"/>) with the run's seed, replicates and threads, its cycles set by
/// the run's length (<see cref="PopulationSnapshot.CyclesFor"/>). Writes <c>snapshot.parquet</c> and
/// <c>snapshot-moments.parquet</c> (<see cref="SnapshotTable"/>) and adds their checksums to the manifest.
/// </summary>
public static class SnapshotRun
{
    /// <summary>Why the run of <paramref name="specification"/> can have no snapshot with <paramref name="burnIn"/>, or null when it can.</summary>
    public static string? Problem(RunSpecification specification, int burnIn)
    {
        ArgumentNullException.ThrowIfNull(specification);
        var network = specification.Model.Network;
        if (PopulationSnapshot.Problem(network) is { } problem) return problem;
        if (!specification.Shard.IsWhole)
            return "the population view is computed for a whole run; leave out --shard (or run the snapshot on an unsharded run)";
        if (burnIn < 0) return $"--burn-in must be 0 or more divisions (got {burnIn})";
        var cycle = network.Cycle!;
        var cycles = PopulationSnapshot.CyclesFor(cycle, specification.Grid.Until, burnIn);
        if (cycles < 1)
            return $"the population view samples the whole mean cycles of the run after a burn-in of {burnIn} divisions, and --until {Text(specification.Grid.Until)} spans " +
                   $"{cycles + burnIn} cycles of mean length {Text(cycle.MeanLength)}; raise --until above {Text((burnIn + 1) * cycle.MeanLength)} or lower --burn-in";
        if (specification.Replicates < 2) return "the population view needs at least 2 replicates for its standard errors";
        return null;
    }

    /// <summary>Runs the snapshot for the finished run in <paramref name="folder"/> and writes its tables.</summary>
    /// <exception cref="ArgumentException">The run has no snapshot (<see cref="Problem"/>).</exception>
    /// <exception cref="Stochastic.SimulationFailureException">A lineage failed.</exception>
    /// <exception cref="OutputException">A file could not be written.</exception>
    public static SnapshotResult Run(string folder, RunSpecification specification, int burnIn, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(specification);
        if (Problem(specification, burnIn) is { } problem) throw new ArgumentException(problem, nameof(specification));
        var model = specification.Model;
        var cycles = PopulationSnapshot.CyclesFor(model.Network.Cycle!, specification.Grid.Until, burnIn);
        var result = PopulationSnapshot.Run(model.Network, new SnapshotOptions(specification.Replicates, specification.Seed, burnIn, cycles, specification.Threads)
        {
            Simulator = new Stochastic.SimulatorOptions(MaxEvents: specification.MaxEvents ?? long.MaxValue),
        }, cancel);
        var metadata = Provenance.For(model.Path, model.Text, new Dictionary<string, string>(specification.ToArguments())
        {
            ["view"] = "population",
            ["burn_in"] = burnIn.ToString(CultureInfo.InvariantCulture),
        }, DateTimeOffset.UtcNow);
        var laws = Path.Combine(folder, RunFiles.Snapshot);
        var moments = Path.Combine(folder, RunFiles.SnapshotMoments);
        SnapshotTable.Write(laws, moments, result, metadata);
        var manifestPath = Path.Combine(folder, RunFiles.Manifest);
        var manifest = RunManifest.Read(manifestPath);
        var sums = new SortedDictionary<string, string>(StringComparer.Ordinal);
        foreach (var (name, sum) in FileChecksums.Recorded(manifest, ManifestFields.Files, folder) ?? new Dictionary<string, string>()) sums[name] = sum;
        foreach (var (name, sum) in FileChecksums.For(folder, [laws, moments])) sums[name] = sum;
        manifest.Extra[ManifestFields.Files] = sums;
        manifest.WriteAtomic(manifestPath);
        return result;
    }

    /// <summary>The console's lines: per species the population's and the lineage's mean and variance with their errors, and the difference.</summary>
    public static string Describe(SnapshotResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var inv = CultureInfo.InvariantCulture;
        var text = new System.Text.StringBuilder();
        text.Append(inv, $"population snapshot ({result.Replicates} lineages, {result.Cycles} cycles each after {result.BurnIn} divisions, {result.AgesPerCycle} ages per cycle; growth rate {result.GrowthRate:G4}):\n");
        for (var s = 0; s < result.Species.Count; s++)
        {
            var (lineage, population) = result.Species[s];
            text.Append(inv, $"  {population.Species}: mean {Pm(population.Mean)} (lineage {Pm(lineage.Mean)}; difference {Pm(result.MeanDifference[s])}), ")
                .Append(inv, $"variance {Pm(population.Variance)} (lineage {Pm(lineage.Variance)}), CV² {population.Cv2.Value:G4} (lineage {lineage.Cv2.Value:G4})\n");
        }
        return text.ToString();
    }

    /// <summary>
    /// A warning per species whose population mean still drifts between the earlier and the later half of the
    /// sampled cycles (<see cref="SnapshotResult.Unsettled"/>), or nothing.
    /// </summary>
    public static IEnumerable<string> Warnings(SnapshotResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return result.Unsettled().Select(u => string.Create(CultureInfo.InvariantCulture,
            $"the population snapshot of {u.Species} is still drifting: its mean over the later half of the sampled cycles differs from the earlier half's by {Pm(u.Drift)}, " +
            $"so the lineages had not settled after the burn-in of {result.BurnIn} divisions; raise --burn-in (and --until)"));
    }

    private static string Pm(Estimate e) => string.Create(CultureInfo.InvariantCulture, $"{e.Value:G5} ± {e.StandardError:G2}");

    private static string Text(double value) => value.ToString("G6", CultureInfo.InvariantCulture);
}
