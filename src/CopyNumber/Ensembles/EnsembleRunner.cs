using System.Diagnostics;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>
/// Runs replicates of one network in parallel on CPU threads and accumulates, as they finish, an exact
/// histogram per grid time and count quantity. Memory grows with grid × quantities × threads, never with
/// the number of replicates.
/// </summary>
/// <remarks>
/// <para>Reproducibility: replicate r draws from <see cref="ReplicateStreams.For"/>(seed, r), so its path
/// does not depend on which thread runs it. Histograms add exactly, real-valued readouts are combined in
/// the fixed tree of <see cref="MomentTree"/>, and paths are handed over in replicate order, so
/// summaries are byte-identical for any thread count, and a run split into an interrupted part and its
/// resumption, or into shards, combines into exactly the unsplit run.</para>
/// <para>Replicates are run in blocks (<see cref="EnsembleOptions.BlockSize"/>); a block reaches the
/// summaries only whole. On cancellation workers stop at the next replicate, or inside a replicate at
/// its next grid point; a worker still inside a replicate after <see cref="AbandonAfter"/> is left to
/// finish on its own (its block is dropped), so the run returns promptly even when a single replicate
/// is long.</para>
/// </remarks>
public static class EnsembleRunner
{
    /// <summary>How long after a cancellation the runner waits for workers before leaving them behind.</summary>
    public static readonly TimeSpan AbandonAfter = TimeSpan.FromMilliseconds(500);

    /// <summary>Runs the ensemble; returns what finished, also when <paramref name="cancel"/> fires.</summary>
    /// <param name="network">The compiled network, shared by the workers.</param>
    /// <param name="options">Grid, replicates, seed, method, threads, blocks to run.</param>
    /// <param name="paths">Where the paths of the first <see cref="EnsembleOptions.PathReplicates"/> replicates go, or null.</param>
    /// <param name="monitor">Live counters, or null.</param>
    /// <param name="cancel">Stops the run at the next replicate (or grid point); the finished blocks are returned.</param>
    /// <param name="checkpoints">Receives consistent snapshots while the run goes on (see <see cref="ICheckpointSink"/>), or null.</param>
    /// <exception cref="ArgumentOutOfRangeException">An option is out of range.</exception>
    /// <exception cref="EnsembleFailureException">A replicate failed (e.g. a rate law went negative); the other workers stopped, and the exception holds the blocks finished.</exception>
    public static EnsembleResult Run(
        ReactionNetwork network,
        EnsembleOptions options,
        IPathSink? paths = null,
        EnsembleMonitor? monitor = null,
        CancellationToken cancel = default,
        ICheckpointSink? checkpoints = null)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Replicates < 1) throw new ArgumentOutOfRangeException(nameof(options), "at least one replicate is needed");
        if (options.Threads < 1) throw new ArgumentOutOfRangeException(nameof(options), "at least one thread is needed");
        if (options.BlockSize < 1) throw new ArgumentOutOfRangeException(nameof(options), "a block holds at least one replicate");
        var totalBlocks = options.TotalBlocks;
        if (!options.Shard.IsValid || options.Shard.Count > totalBlocks)
            throw new ArgumentOutOfRangeException(nameof(options), $"shard {options.Shard} cannot be formed from {totalBlocks} blocks");
        monitor ??= new EnsembleMonitor();
        var clock = Stopwatch.StartNew();
        var quantities = Quantity.Of(network);
        var countQuantities = quantities.Count(q => q.IsCount);
        var realQuantities = quantities.Count - countQuantities;
        var grid = options.Grid;
        var (first, end) = options.Shard.Blocks(totalBlocks);
        var skip = options.SkipBlocks;
        bool Runs(long b) => b >= first && b < end && !skip.Contains(b);
        var toRun = end - first - skip.Count(b => b >= first && b < end);

        var pairs = options.CovariancePairs ?? SpeciesPair.Default(network);
        var varies = network.Variability.Any;
        if (varies && !EnsembleOptions.FitsBlock(options.ReplicatesPerDraw, options.BlockSize))
            throw new ArgumentOutOfRangeException(nameof(options),
                $"{options.ReplicatesPerDraw} replicates per draw: a draw's group must hold at least 2 replicates and twice the group must divide the block of {options.BlockSize}");
        var replicatesPerDraw = varies ? options.ReplicatesPerDraw : 0;
        // The noise decomposition's estimators are cells of the same tree, after the readouts and pairs, so that shards,
        // merges, checkpoints and resumed runs carry them with no mechanism of their own.
        var noiseOffset = realQuantities + pairs.Count;
        var treeStride = noiseOffset + (varies ? NoiseDecomposition.CellsPerPoint(quantities.Count) : 0);
        var tree = new MomentTree(totalBlocks, grid.Count * treeStride);
        var sequencer = new BlockSequencer(grid.Count, countQuantities, realQuantities, options.BlockSize, paths, options.PathReplicates, first, Runs, options.Threads);
        var workers = new Worker[(int)Math.Clamp(toRun, 1, options.Threads)];
        var position = first - 1;
        var failures = new List<(long Replicate, Exception Cause)>();
        var stop = CancellationTokenSource.CreateLinkedTokenSource(cancel);
        var exited = new CountdownEvent(workers.Length);
        var checkpointing = 0;

        // The result over the blocks the workers have finished so far; the caller holds every worker's
        // lock (or the workers are gone), so histograms, tree, counters and block lists agree.
        EnsembleResult Summarise(MomentTree moments)
        {
            // Exact merge: histograms add, so the order of workers does not matter.
            var histograms = new CountHistogram[grid.Count * countQuantities];
            for (var h = 0; h < histograms.Length; h++)
            {
                histograms[h] = new CountHistogram();
                foreach (var worker in workers) histograms[h].Merge(worker.Histograms[h]);
            }
            // The result holds the blocks run here; skipped blocks are someone else's (an earlier run's).
            var finished = workers.SelectMany(w => w.FinishedBlocks).Order().ToArray();
            return new EnsembleResult(
                grid, quantities, histograms, moments,
                workers.Sum(w => w.Replicates), workers.Sum(w => w.Events), workers.Sum(w => w.StoppedEarly),
                finished, options.BlockSize, options.Replicates, options.Shard, finished.Length < toRun, clock.Elapsed,
                SwitchingAccumulator.Combine(workers.Select(w => w.Switching).ToArray()), pairs, replicatesPerDraw)
            {
                ModeSwitching = ModeSwitchingAccumulator.Combine(workers.Select(w => w.Modes).ToArray()),
            };
        }

        // A checkpoint is taken between blocks with every worker held, so it is one consistent state;
        // one worker takes it (the others carry on once it is taken) and writes it on its own time.
        void CheckpointIfDue()
        {
            if (checkpoints is null || stop.IsCancellationRequested || !checkpoints.IsDue) return;
            if (Interlocked.CompareExchange(ref checkpointing, 1, 0) != 0) return;
            try
            {
                EnsembleResult snapshot;
                var held = 0;
                try
                {
                    foreach (var worker in workers)
                    {
                        Monitor.Enter(worker);
                        held++;
                    }
                    sequencer.WritePending();
                    var copy = new MomentTree(totalBlocks, tree.Cells);
                    lock (tree) copy.AddCopiesOf(tree);
                    snapshot = Summarise(copy);
                    checkpoints.Seal();
                }
                finally
                {
                    for (var w = 0; w < held; w++) Monitor.Exit(workers[w]);
                }
                checkpoints.Save(snapshot);
            }
            finally
            {
                Volatile.Write(ref checkpointing, 0);
            }
        }

        void Work(Worker worker)
        {
            try
            {
                while (!stop.IsCancellationRequested)
                {
                    long index;
                    do index = Interlocked.Increment(ref position);
                    while (index < end && skip.Contains(index));
                    if (index >= end) break;
                    var block = sequencer.Rent();
                    if (!worker.RunBlock(block, index, options)) break;
                    MomentAccumulator[]? leaf = null;
                    if (treeStride > 0)
                    {
                        lock (tree) leaf = tree.RentLeaf();
                        BlockMoments(block, grid.Count, realQuantities, pairs, treeStride, leaf);
                        if (varies) NoiseDecomposition.AddBlock(block, replicatesPerDraw, quantities.Count, leaf, noiseOffset, treeStride);
                    }
                    lock (worker)
                    {
                        // Finishing a block is one step with respect to abandonment: histograms, moments,
                        // the list of finished blocks and the paths all take it, or none does.
                        if (worker.Abandoned) break;
                        worker.Accumulate(block, index);
                        if (leaf is not null) lock (tree) tree.AddBlock(index, leaf);
                        sequencer.Submit(block);
                    }
                    monitor.AddBlock(index);
                    CheckpointIfDue();
                    sequencer.WaitForRoom(stop.Token);
                }
                if (worker.Failure is { } failure)
                {
                    lock (failures) failures.Add(failure);
                    stop.Cancel();
                }
            }
            catch (Exception e)
            {
                lock (failures) failures.Add((-1, e));
                stop.Cancel();
            }
            finally
            {
                lock (worker) worker.Exited = true;
                exited.Signal();
            }
        }

        for (var w = 0; w < workers.Length; w++)
            workers[w] = new Worker(network, options, countQuantities, monitor, stop.Token);
        foreach (var worker in workers)
            new Thread(() => Work(worker)) { IsBackground = true, Name = "copynumber-ensemble" }.Start();
        WaitHandle.WaitAny([exited.WaitHandle, stop.Token.WaitHandle]);
        if (!exited.IsSet) exited.Wait(AbandonAfter);
        var abandoned = false;
        foreach (var worker in workers)
        {
            lock (worker)
            {
                if (worker.Exited) continue;
                worker.Abandoned = true;
                abandoned = true;
            }
        }
        sequencer.Flush();
        // A worker left behind still holds the token source and may rent leaves from the tree, so both
        // stay with it: the source is not disposed and the result gets a copy of the tree.
        if (abandoned)
        {
            var copy = new MomentTree(totalBlocks, tree.Cells);
            lock (tree) copy.AddCopiesOf(tree);
            tree = copy;
        }
        else
        {
            stop.Dispose();
            exited.Dispose();
        }

        // Workers left behind touch nothing shared once abandoned, and the others have exited.
        var result = Summarise(tree);
        List<(long Replicate, Exception Cause)> failed;
        lock (failures) failed = failures.ToList();
        if (failed.Count == 0) return result;
        // Report the earliest replicate that failed, so a rerun points at the same one when it can.
        var (replicate, cause) = failed.OrderBy(f => f.Replicate < 0 ? long.MaxValue : f.Replicate).First();
        throw new EnsembleFailureException(replicate, cause, result);
    }

    /// <summary>
    /// Each replicate's real readouts, then each species pair's sum x + y (exact: counts below 2^53), added in replicate
    /// order: the leaf of the moment tree for this block.
    /// </summary>
    private static void BlockMoments(ReplicateBlock block, int gridPoints, int realQuantities, IReadOnlyList<SpeciesPair> pairs, int stride, MomentAccumulator[] leaf)
    {
        for (var slot = 0; slot < block.Length; slot++)
        {
            var points = block.RecordedPoints[slot];
            var baseIndex = (long)slot * gridPoints * realQuantities;
            var counts = block.CountsOf(slot);
            for (var k = 0; k < points; k++)
            {
                for (var q = 0; q < realQuantities; q++)
                    leaf[k * stride + q].Add(block.Reals[baseIndex + k * realQuantities + q]);
                var row = k * block.CountStride;
                for (var p = 0; p < pairs.Count; p++)
                    leaf[k * stride + realQuantities + p].Add((double)counts[row + pairs[p].First] + counts[row + pairs[p].Second]);
            }
        }
    }

    /// <summary>One thread's simulator, observer, histograms and counters.</summary>
    private sealed class Worker
    {
        private readonly IStochasticSimulator _simulator;
        private readonly BlockObserver _observer;
        private readonly EnsembleMonitor _monitor;
        private readonly TimeGrid _grid;
        private long _pendingEvents;
        private long _pendingStoppedEarly;

        public Worker(ReactionNetwork network, EnsembleOptions options, int countQuantities, EnsembleMonitor monitor, CancellationToken cancel)
        {
            // The runaway bound is the run's: a replicate may take its share of the run-wide event bound.
            var runaway = Math.Min(options.Simulator.RunawayEvents, RunawayGuard.BoundFor(options.Replicates));
            _simulator = SimulatorFactory.Create(options.Method, network, options.Simulator with { RunawayEvents = runaway });
            _observer = new BlockObserver(network, cancel);
            _network = network;
            if (network.Variability.Any) _drawn = new double[network.Parameters.Count];
            _monitor = monitor;
            _grid = options.Grid;
            Cancel = cancel;
            Switching = new SwitchingAccumulator(network, options.Grid.Until);
            Modes = new ModeSwitchingAccumulator(options.Simulator.Modes, options.Grid.Until);
            Histograms = new CountHistogram[options.Grid.Count * countQuantities];
            for (var h = 0; h < Histograms.Length; h++) Histograms[h] = new CountHistogram();
        }

        private readonly ReactionNetwork _network;
        private readonly double[]? _drawn;   // the current draw's parameter values, when some parameter varies
        private long _draw = -1;

        // Draw d's parameters, from the stream keyed to d alone, for the replicates of its group.
        private void UseDraw(long draw, ulong seed)
        {
            if (draw == _draw) return;
            for (var p = 0; p < _drawn!.Length; p++) _drawn[p] = _network.InitialParameterValues[p];
            _network.Variability.Draw(seed, draw, _drawn);
            _simulator.StartFrom(_drawn);
            _draw = draw;
        }

        public CancellationToken Cancel { get; }
        public CountHistogram[] Histograms { get; }
        public SwitchingAccumulator Switching { get; }
        public ModeSwitchingAccumulator Modes { get; }
        public List<long> FinishedBlocks { get; } = [];
        public long Replicates { get; private set; }
        public long Events { get; private set; }
        public long StoppedEarly { get; private set; }
        public (long Replicate, Exception Cause)? Failure { get; private set; }

        /// <summary>Set (under the worker's lock) once the thread has left its loop.</summary>
        public bool Exited { get; set; }

        /// <summary>Set (under the worker's lock) when the run returned without this worker; it must then touch nothing shared.</summary>
        public bool Abandoned { get; set; }

        /// <summary>Runs every replicate of a block; false when cancelled or failed part-way (the block is then dropped).</summary>
        public bool RunBlock(ReplicateBlock block, long index, EnsembleOptions options)
        {
            block.Index = index;
            block.FirstReplicate = index * options.BlockSize;
            block.Length = (int)Math.Min(options.BlockSize, options.Replicates - block.FirstReplicate);
            _pendingEvents = 0;
            _pendingStoppedEarly = 0;
            Switching.StartBlock();
            Modes.StartBlock();
            for (var slot = 0; slot < block.Length; slot++)
            {
                if (Cancel.IsCancellationRequested) return false;
                var replicate = block.FirstReplicate + slot;
                if (_drawn is not null) UseDraw(replicate / options.ReplicatesPerDraw, options.Seed);
                var rng = ReplicateStreams.For(options.Seed, replicate);
                _observer.Begin(block, slot);
                ReplicateResult result;
                try
                {
                    result = _simulator.Run(ref rng, _grid, _observer);
                }
                catch (ReplicateAbandoned)
                {
                    return false;
                }
                catch (Exception e)
                {
                    Failure = (replicate, e);
                    return false;
                }
                _pendingEvents += result.Events;
                if (result.HitEventLimit) _pendingStoppedEarly++;
                Switching.AddReplicate(result);
                Modes.AddReplicate(result);
                _monitor.AddReplicate(result.Events);
            }
            return true;
        }

        public void Accumulate(ReplicateBlock block, long index)
        {
            var stride = block.CountStride;
            for (var slot = 0; slot < block.Length; slot++)
            {
                var counts = block.CountsOf(slot);
                var points = block.RecordedPoints[slot];
                for (var k = 0; k < points; k++)
                    for (var q = 0; q < stride; q++)
                        Histograms[k * stride + q].Add(counts[k * stride + q]);
            }
            Replicates += block.Length;
            Events += _pendingEvents;
            StoppedEarly += _pendingStoppedEarly;
            Switching.CommitBlock();
            Modes.CommitBlock();
            FinishedBlocks.Add(index);
        }
    }
}
