using System.Diagnostics;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>The exact replicates run beside a tau-leaping ensemble, reduced to their moments per cell.</summary>
/// <param name="Replicates">n, replicates run (always the sample's first n, 0 … n − 1).</param>
/// <param name="Moments">Per grid point k and count quantity q at [k·Q + q].</param>
/// <param name="WallTime">What running them cost, wall-clock.</param>
public sealed record ExactSample(long Replicates, IReadOnlyList<CellMoments> Moments, TimeSpan WallTime);

/// <summary>
/// Runs the validation sample of a tau-leaping run (docs/methods.md, "The validation sample"): replicates
/// of the exact direct method from streams of their own, as many as the sizing rule allows.
/// </summary>
/// <remarks>
/// <para>Streams: sample replicate k draws from <see cref="ReplicateStreams.For"/>(s, k) with the sample seed
/// s = SplitMix64(seed ⊕ <see cref="StreamTag"/>), the streams of another run seed, so it never reuses a
/// main replicate's stream, and its content depends on the run seed and n alone: threads do not change it.</para>
/// <para>Sizing: the target is n* = min(R, <see cref="TargetReplicates"/>) (R the run's replicates). The
/// sample runs in rounds of one block of <see cref="BlockSize"/> replicates per thread, every block of a
/// round finished before the next starts, so the replicates done are always 0 … n − 1; before each round
/// after the first it stops if its time has reached <see cref="CostShare"/> of the main run's or
/// <see cref="LeastBudget"/>, whichever is longer. So it costs at most about 10% (or 1 s) plus one round,
/// and at least one round (8 replicates per thread, or R if fewer). Since n then depends on the machine's
/// speed, n is recorded, and a fixed n (<c>--validation-replicates</c>) runs without the time rule and
/// reproduces a recorded sample bit for bit.</para>
/// </remarks>
public static class ValidationSample
{
    /// <summary>Most exact replicates the sample runs: enough for ±~0.1·CV on the mean at 99% family-wise.</summary>
    public const long TargetReplicates = 1024;

    /// <summary>Replicates per block of the sample.</summary>
    public const int BlockSize = 8;

    /// <summary>Share of the main run's wall time the sample may take (checked between rounds).</summary>
    public const double CostShare = 0.10;

    /// <summary>The sample may always take this long, however short the main run: a second buys ~10^7 exact events.</summary>
    public static readonly TimeSpan LeastBudget = TimeSpan.FromSeconds(1);

    /// <summary>Mixed into the run seed to give the sample's seed ("validate" in ASCII).</summary>
    public const ulong StreamTag = 0x76616C6964617465;

    /// <summary>The sample's run seed, derived from the run's.</summary>
    public static ulong SeedFor(ulong runSeed)
    {
        var state = runSeed ^ StreamTag;
        return Xoshiro256StarStar.SplitMix64(ref state);
    }

    /// <summary>
    /// Runs the sample for the tau-leaping run <paramref name="main"/> whose ensemble took <paramref name="mainWallTime"/>;
    /// <paramref name="replicates"/>, when given, runs exactly that many (a stored sample's size) without the time rule.
    /// </summary>
    /// <exception cref="EnsembleFailureException">An exact replicate failed.</exception>
    public static ExactSample Run(ReactionNetwork network, EnsembleOptions main, TimeSpan mainWallTime, long? replicates = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(main);
        var clock = Stopwatch.StartNew();
        var target = replicates ?? Math.Min(main.Replicates, TargetReplicates);
        var options = new EnsembleOptions
        {
            Grid = main.Grid,
            Replicates = target,
            Seed = SeedFor(main.Seed),
            Method = SimulationMethod.Direct,
            Simulator = main.Simulator,
            Threads = main.Threads,
            BlockSize = BlockSize,
        };
        var blocks = options.TotalBlocks;
        var perRound = Math.Max(1, main.Threads);
        var budget = mainWallTime * CostShare > LeastBudget ? mainWallTime * CostShare : LeastBudget;
        EnsembleResult? done = null;
        for (long first = 0; first < blocks; first += perRound)
        {
            if (cancel.IsCancellationRequested) break;
            if (replicates is null && done is not null && clock.Elapsed >= budget) break;
            var end = Math.Min(blocks, first + perRound);
            var skip = new HashSet<long>();
            for (long b = 0; b < blocks; b++) if (b < first || b >= end) skip.Add(b);
            var round = EnsembleRunner.Run(network, options with { SkipBlocks = skip }, cancel: cancel);
            if (round.Interrupted) break;
            done = done is null ? round : EnsembleResult.Combine(done, round);
        }
        var q = Quantity.Of(network).Count(x => x.IsCount);
        var moments = new CellMoments[main.Grid.Count * q];
        for (var k = 0; k < main.Grid.Count; k++)
            for (var c = 0; c < q; c++)
                moments[k * q + c] = done is null ? CellMoments.Of(new CountHistogram()) : CellMoments.Of(done.Histogram(k, c));
        return new ExactSample(done?.ReplicatesFinished ?? 0, moments, clock.Elapsed);
    }
}
