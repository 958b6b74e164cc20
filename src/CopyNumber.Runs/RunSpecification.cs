using System.Globalization;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Runs;

/// <summary>
/// Everything that defines one ensemble run, typed: the model, the time grid, the replicates and their
/// seed, the method asked for, the simulator's settings, the paths kept, the shard, and the limits. The
/// CLI builds it from options once; the manifest stores it through <see cref="ToArguments"/> and
/// <see cref="StoredSettings.Read"/>, the one mapping in each direction, so a resumed or merged run is
/// compared and continued from these values and never from argument text.
/// </summary>
public sealed record RunSpecification
{
    /// <summary>Default tau-leaping error control ε (Cao, Gillespie &amp; Petzold 2006).</summary>
    public const double DefaultEpsilon = 0.03;

    /// <summary>The model, compiled (at <see cref="Size"/> when that is set).</summary>
    public required LoadedModel Model { get; init; }

    /// <summary>The command that runs it ("simulate", "sweep"), recorded for provenance.</summary>
    public string Command { get; init; } = "simulate";

    /// <summary>The system size Ω the model was compiled at when it is not the model's own (a sweep's size); null otherwise.</summary>
    public double? Size { get; init; }

    /// <summary>Recording times 0, Δ, …, T (model time units).</summary>
    public required TimeGrid Grid { get; init; }

    /// <summary>Replicates of the whole run (of all shards together).</summary>
    public required long Replicates { get; init; }

    /// <summary>The run seed; replicate r draws from its own stream derived from it.</summary>
    public required ulong Seed { get; init; }

    /// <summary>The method asked for: one of <see cref="MethodChoice.Names"/>.</summary>
    public string MethodRequested { get; init; } = "auto";

    /// <summary>Tau-leaping error control ε in (0, 1).</summary>
    public double Epsilon { get; init; } = DefaultEpsilon;

    /// <summary>Events after which a replicate stops (counted and reported); null for no limit.</summary>
    public long? MaxEvents { get; init; }

    /// <summary>Replicates whose whole paths are written (the first ones); 0 for none.</summary>
    public long PathReplicates { get; init; }

    /// <summary>The part of the replicates this run covers.</summary>
    public Shard Shard { get; init; } = Shard.Whole;

    /// <summary>A fixed size for a tau-leaping run's validation sample; null for the sizing rule.</summary>
    public long? ValidationReplicates { get; init; }

    /// <summary>
    /// The species pairs whose covariance is accumulated, as given to <c>--covariance-pairs</c> ("U:V,A:B", "all" or "none");
    /// null for the default (every pair of a network of at most <see cref="SpeciesPair.AllPairsUpTo"/> species, none beyond).
    /// </summary>
    public string? CovariancePairs { get; init; }

    /// <summary>
    /// g, the replicates that share one draw of the parameters that vary per cell (the nested design of the noise
    /// decomposition); used and recorded only when the model varies a parameter. 2, 4, 8, 16 or 32 (two groups fill a block).
    /// </summary>
    public int ReplicatesPerDraw { get; init; } = Ensembles.EnsembleOptions.DefaultReplicatesPerDraw;

    /// <summary>
    /// The cores whose modes are followed at the events, resolved (<c>--switching</c> syntax, "U=9..21,V=9..21"; see
    /// <see cref="ModeCore.Parse"/>); null or "none" for none.
    /// </summary>
    public string? Switching { get; init; }

    /// <summary>Where <see cref="Switching"/> came from: "option" or "steady-states"; null when there are no cores.</summary>
    public string? SwitchingSource { get; init; }

    /// <summary>The cores of <see cref="Switching"/> for the model.</summary>
    public IReadOnlyList<ModeCore> SwitchingCores => Switching is { } text ? ModeCore.Parse(text, Model.Network) : [];

    /// <summary>
    /// Also run the control ensemble whose cells split in halves, for the variance binomial partitioning adds
    /// (<c>--partition-noise</c>; <see cref="Ensembles.PartitionControl"/>): twice the replicates' cost.
    /// </summary>
    public bool PartitionNoise { get; init; }

    /// <summary>Wall-clock limit after which the run stops like an interruption; null for none. Not a setting of the result.</summary>
    public TimeSpan? WallLimit { get; init; }

    /// <summary>Worker threads. Not a setting of the result: summaries are identical for any thread count.</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>Lowercase hexadecimal SHA-256 of the model text.</summary>
    public string ModelSha256 => Provenance.Sha256Hex(Model.Text);

    /// <summary>The settings as the manifest's <c>arguments</c> record them (the format folders of earlier versions share).</summary>
    public IReadOnlyDictionary<string, string> ToArguments()
    {
        var arguments = new Dictionary<string, string>(StringComparer.Ordinal)
        {
            [ManifestFields.CommandArgument] = Command,
            [StoredSettings.Until] = Invariant(Grid.Until),
            [StoredSettings.Every] = Invariant(Grid.Every),
            [StoredSettings.ReplicatesKey] = Invariant(Replicates),
            [StoredSettings.MethodKey] = MethodRequested,
            [StoredSettings.EpsilonKey] = Invariant(Epsilon),
            [StoredSettings.SeedKey] = Seed.ToString(CultureInfo.InvariantCulture),
            [StoredSettings.PathsKey] = Invariant(PathReplicates),
            [StoredSettings.MaxEventsKey] = MaxEvents is { } limit ? Invariant(limit) : StoredSettings.NoLimit,
            [ManifestFields.ShardArgument] = Shard.ToString(),
        };
        if (Size is { } size) arguments[StoredSettings.SizeKey] = Invariant(size);
        // Recorded only when given, so that folders written before the option existed still agree.
        if (ValidationReplicates is { } sample) arguments[StoredSettings.ValidationKey] = Invariant(sample);
        if (CovariancePairs is { } pairs) arguments[ManifestFields.CovariancePairsArgument] = pairs;
        // Recorded whenever it shapes the result (the grouping of draws and the decomposition's cells in readout-state.parquet).
        if (Model.Network.Variability.Any) arguments[ManifestFields.ReplicatesPerDrawArgument] = Invariant((long)ReplicatesPerDraw);
        if (Switching is { } cores && cores != "none")
        {
            arguments[ManifestFields.SwitchingArgument] = cores;
            if (SwitchingSource is { } source) arguments[ManifestFields.SwitchingSourceArgument] = source;
        }
        if (PartitionNoise) arguments[ManifestFields.PartitionArgument] = "halves";
        return arguments;
    }

    /// <summary>The settings two parts of one run must share (see <see cref="RunSettings"/>).</summary>
    public RunSettings Settings(int blockSize) => new(ModelSha256, ToArguments(), blockSize);

    /// <summary>The ensemble's options for the method chosen.</summary>
    public EnsembleOptions EnsembleOptions(Stochastic.SimulationMethod method) => new()
    {
        Grid = Grid,
        Replicates = Replicates,
        Seed = Seed,
        Method = method,
        Simulator = new Stochastic.SimulatorOptions(Epsilon: Epsilon, MaxEvents: MaxEvents ?? long.MaxValue) { Modes = SwitchingCores },
        Threads = Threads,
        PathReplicates = PathReplicates,
        Shard = Shard,
        CovariancePairs = CovariancePairs is { } pairs ? SpeciesPair.Parse(pairs, Model.Network) : null,
        ReplicatesPerDraw = ReplicatesPerDraw,
    };

    private static string Invariant(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    private static string Invariant(long value) => value.ToString(CultureInfo.InvariantCulture);
}

/// <summary>
/// The settings a stored run recorded, read back once and typed; each is null when the manifest does not
/// record it. A recorded value that does not read is a damaged or edited manifest: refused, never guessed.
/// </summary>
public sealed record StoredSettings
{
    internal const string Until = "until", Every = "every", ReplicatesKey = "replicates", MethodKey = "method",
        EpsilonKey = "epsilon", SeedKey = "seed", PathsKey = "paths", MaxEventsKey = "max_events", SizeKey = "size",
        ValidationKey = "validation_replicates", NoLimit = "none";

    /// <summary>The stored grid.</summary>
    public TimeGrid? Grid { get; init; }

    /// <summary>The stored replicates.</summary>
    public long? Replicates { get; init; }

    /// <summary>The stored seed.</summary>
    public ulong? Seed { get; init; }

    /// <summary>The method asked for.</summary>
    public string? MethodRequested { get; init; }

    /// <summary>The method the stored blocks were made with (auto may have fallen back to the direct method).</summary>
    public Stochastic.SimulationMethod? MethodUsed { get; init; }

    /// <summary>Why that method was used, as recorded.</summary>
    public string? MethodReason { get; init; }

    /// <summary>The stored ε.</summary>
    public double? Epsilon { get; init; }

    /// <summary>The stored event limit; <see cref="long.MaxValue"/> stands for "none".</summary>
    public long? MaxEvents { get; init; }

    /// <summary>The stored number of path replicates.</summary>
    public long? PathReplicates { get; init; }

    /// <summary>The stored shard.</summary>
    public Shard? Shard { get; init; }

    /// <summary>The stored validation sample size.</summary>
    public long? ValidationReplicates { get; init; }

    /// <summary>The stored <c>--covariance-pairs</c> text, or null when the run used the default pairs.</summary>
    public string? CovariancePairs { get; init; }

    /// <summary>The stored group size of the nested design, when the run recorded one.</summary>
    public int? ReplicatesPerDraw { get; init; }

    /// <summary>The stored cores whose modes the run followed, or null when it followed none.</summary>
    public string? Switching { get; init; }

    /// <summary>Where the stored cores came from ("option" or "steady-states").</summary>
    public string? SwitchingSource { get; init; }

    /// <summary>Whether the stored run had the control ensemble of <c>--partition-noise</c>.</summary>
    public bool PartitionNoise { get; init; }

    /// <summary>Reads the settings a run folder's manifest records.</summary>
    /// <exception cref="RunFolderException">A recorded value does not read.</exception>
    public static StoredSettings Read(StoredRun stored)
    {
        ArgumentNullException.ThrowIfNull(stored);
        var arguments = stored.Manifest.Arguments;
        T? Get<T>(string key, Func<string, T> read) where T : struct
        {
            if (!arguments.TryGetValue(key, out var text)) return null;
            try
            {
                return read(text);
            }
            catch (Exception e) when (e is FormatException or OverflowException or ArgumentException)
            {
                throw new RunFolderException($"The manifest of '{stored.Folder}' records {key} '{text}', which is not a valid value; it was edited or damaged. Rerun the run into a new folder.", stored.Folder, e);
            }
        }
        static long Whole(string t) => long.Parse(t, NumberStyles.None, CultureInfo.InvariantCulture);
        static double Real(string t) => double.Parse(t, NumberStyles.Float, CultureInfo.InvariantCulture);
        return new StoredSettings
        {
            Grid = stored.Grid,
            Replicates = Get(ReplicatesKey, Whole),
            Seed = Get(SeedKey, t => ulong.Parse(t, NumberStyles.None, CultureInfo.InvariantCulture)),
            MethodRequested = arguments.TryGetValue(MethodKey, out var m) ? (MethodChoice.Names.Contains(m) ? m
                : throw new RunFolderException($"The manifest of '{stored.Folder}' records method '{m}', which is not a method name; it was edited or damaged.", stored.Folder)) : null,
            MethodUsed = MethodChoice.FromManifest(stored.Manifest.Method),
            MethodReason = stored.Manifest.ExtraText(ManifestFields.MethodReason),
            Epsilon = Get(EpsilonKey, Real),
            MaxEvents = Get(MaxEventsKey, t => t == NoLimit ? long.MaxValue : Whole(t)),
            PathReplicates = Get(PathsKey, Whole),
            Shard = arguments.TryGetValue(ManifestFields.ShardArgument, out var s)
                ? (Ensembles.Shard.TryParse(s, out var shard, out _) ? shard
                    : throw new RunFolderException($"The manifest of '{stored.Folder}' records shard '{s}', which is not a valid shard; it was edited or damaged.", stored.Folder))
                : null,
            ValidationReplicates = Get(ValidationKey, Whole),
            CovariancePairs = arguments.GetValueOrDefault(ManifestFields.CovariancePairsArgument),
            ReplicatesPerDraw = Get(ManifestFields.ReplicatesPerDrawArgument, t => checked((int)Whole(t))),
            Switching = arguments.GetValueOrDefault(ManifestFields.SwitchingArgument),
            SwitchingSource = arguments.GetValueOrDefault(ManifestFields.SwitchingSourceArgument),
            PartitionNoise = arguments.ContainsKey(ManifestFields.PartitionArgument),
        };
    }
}
