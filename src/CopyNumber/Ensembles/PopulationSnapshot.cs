using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>The settings of a population snapshot.</summary>
/// <param name="Replicates">Independent lineages (for a random cycle length, pairs of lineages: one per view).</param>
/// <param name="Seed">The run seed; the snapshot's streams derive from it (<see cref="PopulationSnapshot.SeedFor"/>).</param>
/// <param name="BurnIn">Divisions before the first sampled cycle.</param>
/// <param name="Cycles">Cycles sampled per lineage.</param>
/// <param name="Threads">Worker threads; the result does not depend on them.</param>
public sealed record SnapshotOptions(long Replicates, ulong Seed, int BurnIn, int Cycles, int Threads)
{
    /// <summary>Records per sampled cycle (stratified ages).</summary>
    public int AgesPerCycle { get; init; } = PopulationSnapshot.DefaultAgesPerCycle;

    /// <summary>The simulators' settings (event limit, runaway bound).</summary>
    public SimulatorOptions Simulator { get; init; } = new();
}

/// <summary>
/// The population snapshot of a model with a cell cycle (docs/methods.md "Growth and division"): the law of a
/// cell taken at random from a culture in balanced exponential growth, what flow cytometry sees, beside the
/// lineage's time average, what a mother machine sees.
/// </summary>
/// <remarks>
/// <para>Method: lineages simulated exactly (the direct method, thinned for the growing volume), each read at
/// <see cref="SnapshotOptions.AgesPerCycle"/> stratified uniform ages of each of its cycles after a burn-in of
/// <see cref="SnapshotOptions.BurnIn"/> divisions (<see cref="CycleSampler"/>). The lineage view weighs a record
/// in a cycle of length τ by τ (so the average is over time along the lineage). The population view needs the
/// lineage of a cell taken from the culture: its cycles follow the ancestral law 2e^(−Λτ) f(τ)
/// (<see cref="BalancedGrowth"/>), and a record at age a of a cycle of length τ weighs
/// <see cref="BalancedGrowth.SnapshotWeight"/> = Λτe^(Λ(τ − a)). For a fixed length the two lineages are one and
/// the same (the ancestral law of a fixed length is itself), so each record enters both views, with weights
/// 1 and 2 ln 2·2^(−a/T); for a gamma length each replicate runs two lineages, the mother machine's and the
/// ancestral one. The estimates are exact apart from the burn-in's remaining transient and sampling error.</para>
/// <para>Refused (<see cref="Problem"/>): a network without a cycle; timed changes or laws that read
/// <c>time</c> beyond the volume (a culture is not in balanced growth then); a length CV of 1 or more (the
/// weights' variance is infinite: E[w²] is finite only for Λθ &lt; 1, i.e. c &lt; 1).</para>
/// <para>Streams: replicate r draws from <see cref="ReplicateStreams.For"/>(s, r), s = <see cref="SeedFor"/>(seed),
/// the streams of another run seed; a varying parameter is drawn once per replicate from draw r of s. The ages
/// come from a stream seeded by the replicate's first draw. Replicates are added in order, so the result is the
/// same bits for any thread count.</para>
/// </remarks>
public static class PopulationSnapshot
{
    /// <summary>Divisions before the first sampled cycle when the user does not say.</summary>
    public const int DefaultBurnIn = 4;

    /// <summary>Records per sampled cycle.</summary>
    public const int DefaultAgesPerCycle = 8;

    /// <summary>Mixed into the run seed to give the snapshot's seed ("snapshot" in ASCII).</summary>
    public const ulong StreamTag = 0x736E617073686F74;

    private const int BlockSize = 16;

    /// <summary>The snapshot's run seed, derived from the run's.</summary>
    public static ulong SeedFor(ulong runSeed)
    {
        var state = runSeed ^ StreamTag;
        return Xoshiro256StarStar.SplitMix64(ref state);
    }

    /// <summary>Why <paramref name="network"/> has no population snapshot, or null when it has one.</summary>
    public static string? Problem(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (network.Cycle is not { } cycle) return "the population view needs a model with a 'cycle' section (cells that grow and divide)";
        if (network.Schedule.Count > 0)
            return "the population view needs a culture in balanced growth, and the model's timed changes make its conditions change with time; leave out --view population or the changes";
        if (ReadsTimeBeyondTheVolume(network) is { } law)
            return $"the population view needs a culture in balanced growth, and the law of reaction '{law}' reads 'time' beyond the cell's volume, so its conditions change with time";
        if (cycle.LengthCv >= 1)
            return $"the population view needs a cycle length CV below 1 (got {cycle.LengthCv:G6}): from CV 1 on, the weights of the population's records have infinite variance and no standard error would hold";
        return null;
    }

    /// <summary>
    /// The first reaction whose law changes with <c>time</c> at a fixed age of the cycle (so at a fixed volume),
    /// tried numerically at the initial counts plus 3 (so no law is zero for want of molecules) at two pairs of
    /// times one and seven mean cycles apart; null when there is none.
    /// </summary>
    private static string? ReadsTimeBeyondTheVolume(ReactionNetwork network)
    {
        var cycle = network.Cycle!;
        var counts = network.InitialCounts.Select(c => c + 3).ToArray();
        var constants = new double[network.Reactions.Count];
        double Value(int j, double time, double age)
        {
            var parameters = network.ParameterValuesWithTime(time);
            parameters[cycle.BirthSlot] = time - age;
            parameters[cycle.LengthSlot] = cycle.MeanLength;
            network.Propensities.ComputeConstants(parameters, constants);
            return network.Propensities.Evaluate(j, counts, constants, parameters);
        }
        foreach (var j in network.TimeDependence.Reactions)
        {
            foreach (var (age, later) in new[] { (0.3183, 1.0), (0.7071, 7.0) })
            {
                var (a, b) = (Value(j, 0.5 * cycle.MeanLength, age * cycle.MeanLength), Value(j, (0.5 + later) * cycle.MeanLength, age * cycle.MeanLength));
                if (Math.Abs(a - b) > 1e-9 * Math.Max(Math.Abs(a), Math.Abs(b))) return network.Reactions[j].Name;
            }
        }
        return null;
    }

    /// <summary>Cycles sampled per lineage for a run until <paramref name="until"/>: the whole mean cycles it spans, less the burn-in.</summary>
    public static int CyclesFor(CellCycle cycle, double until, int burnIn)
    {
        ArgumentNullException.ThrowIfNull(cycle);
        return (int)Math.Min(int.MaxValue, Math.Floor(until / cycle.MeanLength * (1 + 1e-9))) - burnIn;
    }

    /// <summary>Runs the snapshot.</summary>
    /// <exception cref="ArgumentException">The network has no snapshot (<see cref="Problem"/>) or an option is out of range.</exception>
    /// <exception cref="SimulationFailureException">A lineage failed or reached the event limit; the message names it.</exception>
    /// <exception cref="OperationCanceledException"><paramref name="cancel"/> was set.</exception>
    public static SnapshotResult Run(ReactionNetwork network, SnapshotOptions options, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(options);
        if (Problem(network) is { } problem) throw new ArgumentException(problem, nameof(network));
        if (options.Replicates < 2 || options.BurnIn < 0 || options.Cycles < 1 || options.AgesPerCycle < 1 || options.Threads < 1)
            throw new ArgumentOutOfRangeException(nameof(options), "the snapshot needs at least 2 replicates, a burn-in of 0 or more divisions, 1 or more cycles, ages and threads");
        var cycle = network.Cycle!;
        var growth = BalancedGrowth.GrowthRate(cycle);
        var seed = SeedFor(options.Seed);
        var species = network.Species.Count;
        var sums = new SnapshotSums(options.Replicates, species);
        var blocks = (options.Replicates + BlockSize - 1) / BlockSize;
        var perRound = 4L * options.Threads;
        var workers = new System.Collections.Concurrent.ConcurrentBag<Lineages>();
        for (long first = 0; first < blocks; first += perRound)
        {
            cancel.ThrowIfCancellationRequested();
            var end = Math.Min(blocks, first + perRound);
            var done = new ReplicateRecords[(end - first) * BlockSize];
            Parallel.For(first, end, new ParallelOptions { MaxDegreeOfParallelism = options.Threads, CancellationToken = cancel }, block =>
            {
                if (!workers.TryTake(out var worker)) worker = new Lineages(network, options, growth, seed);
                for (var r = block * BlockSize; r < Math.Min(options.Replicates, (block + 1) * BlockSize); r++)
                    done[r - first * BlockSize] = worker.Run(r);
                workers.Add(worker);
            });
            for (var r = first * BlockSize; r < Math.Min(options.Replicates, end * BlockSize); r++) sums.Add(r, done[r - first * BlockSize]);
        }
        var laws = new List<(SnapshotLaw, SnapshotLaw)>();
        var meanDifference = new List<Estimate>();
        var varianceDifference = new List<Estimate>();
        for (var s = 0; s < species; s++)
        {
            var (lineage, population) = (sums.Law(network.Species[s], s, CellView.Lineage), sums.Law(network.Species[s], s, CellView.Population));
            laws.Add((lineage, population));
            var (mean, variance) = sums.Difference(s, lineage.Mean.Value, population.Mean.Value, lineage.Variance.Value, population.Variance.Value);
            meanDifference.Add(mean);
            varianceDifference.Add(variance);
        }
        return new SnapshotResult
        {
            Species = laws,
            MeanDifference = meanDifference,
            VarianceDifference = varianceDifference,
            Settling = Enumerable.Range(0, species).Select(sums.Settling).ToArray(),
            Replicates = options.Replicates,
            BurnIn = options.BurnIn,
            Cycles = options.Cycles,
            AgesPerCycle = options.AgesPerCycle,
            GrowthRate = growth,
            Seed = seed,
        };
    }

    /// <summary>One thread's simulator and sampler; runs a replicate's lineage(s) into its records.</summary>
    private sealed class Lineages(ReactionNetwork network, SnapshotOptions options, double growth, ulong seed)
    {
        private readonly ExactSimulation _simulator = (ExactSimulation)SimulatorFactory.Create(SimulationMethod.Direct, network, options.Simulator);
        private readonly CycleSampler _sampler = new(options.BurnIn, options.Cycles, options.AgesPerCycle);
        private readonly double[]? _drawn = network.Variability.Any ? new double[network.Parameters.Count] : null;
        private readonly double _ancestral = BalancedGrowth.AncestralScale(network.Cycle!);

        public ReplicateRecords Run(long replicate)
        {
            var records = new ReplicateRecords(network.Species.Count);
            if (_drawn is not null)
            {
                for (var p = 0; p < _drawn.Length; p++) _drawn[p] = network.InitialParameterValues[p];
                network.Variability.Draw(seed, replicate, _drawn);
                _simulator.StartFrom(_drawn);
            }
            var rng = ReplicateStreams.For(seed, replicate);
            var agesSeed = rng.NextUInt64();
            if (network.Cycle!.LengthCv == 0)
            {
                Lineage(ref rng, agesSeed, 1.0, new Both(records, growth, options.Cycles), replicate);
                return records;
            }
            // A random length: the mother machine's lineage (weight τ: time along it), then the ancestral one.
            Lineage(ref rng, agesSeed, 1.0, new One(records, CellView.Lineage, (_, length) => length, options.Cycles), replicate);
            Lineage(ref rng, rng.NextUInt64(), _ancestral, new One(records, CellView.Population, (age, length) => BalancedGrowth.SnapshotWeight(growth, age, length), options.Cycles), replicate);
            return records;
        }

        private void Lineage(ref Xoshiro256StarStar rng, ulong agesSeed, double scale, ICycleRecord sink, long replicate)
        {
            ReplicateResult result;
            try
            {
                result = _simulator.RunLineage(ref rng, _sampler, agesSeed, scale, sink);
            }
            catch (SimulationFailureException e)
            {
                throw new SimulationFailureException($"population snapshot, lineage {replicate}: {e.Message}", e.Time);
            }
            if (result.HitEventLimit)
                throw new SimulationFailureException($"population snapshot, lineage {replicate}: reached the event limit before its last sampled cycle", double.NaN);
        }
    }

    // A fixed length: one lineage is both the mother machine's and the ancestral one.
    // Which half of the sampled cycles a record is from, for the settling check; null for a single cycle.
    private static bool? Half(int cycle, int cycles) => cycles >= 2 ? cycle >= cycles / 2 : null;

    private sealed class Both(ReplicateRecords records, double growth, int cycles) : ICycleRecord
    {
        public void Record(int cycle, double age, double length, long[] counts)
        {
            records.Add(CellView.Lineage, counts, 1.0, null);
            records.Add(CellView.Population, counts, BalancedGrowth.SnapshotWeight(growth, age, length), Half(cycle, cycles));
        }
    }

    private sealed class One(ReplicateRecords records, CellView view, Func<double, double, double> weight, int cycles) : ICycleRecord
    {
        public void Record(int cycle, double age, double length, long[] counts) => records.Add(view, counts, weight(age, length), Half(cycle, cycles));
    }
}
