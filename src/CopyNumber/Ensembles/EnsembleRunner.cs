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
/// Reproducibility: replicate r draws from <see cref="ReplicateStreams.For"/>(seed, r), so its path does
/// not depend on which thread runs it. Histograms add exactly, so summaries are byte-identical for any
/// thread count. Real-valued readouts (moments only) and paths are merged in block order by a
/// sequencer, which makes them thread-count independent too.
/// </remarks>
public static class EnsembleRunner
{
    /// <summary>Runs the ensemble; returns what finished, also when <paramref name="cancel"/> fires.</summary>
    /// <exception cref="SimulationFailureException">A replicate failed (e.g. a rate law went negative); other workers stop.</exception>
    public static EnsembleResult Run(
        ReactionNetwork network,
        EnsembleOptions options,
        IPathSink? paths = null,
        EnsembleMonitor? monitor = null,
        CancellationToken cancel = default)
    {
        if (options.Replicates < 1) throw new ArgumentOutOfRangeException(nameof(options), "at least one replicate is needed");
        if (options.Threads < 1) throw new ArgumentOutOfRangeException(nameof(options), "at least one thread is needed");
        monitor ??= new EnsembleMonitor();
        var clock = Stopwatch.StartNew();
        var quantities = Quantity.Of(network);
        var countQuantities = quantities.Count(q => q.IsCount);
        var realQuantities = quantities.Count - countQuantities;
        var grid = options.Grid;
        var blockSize = options.BlockSize;
        var blocks = (options.Replicates + blockSize - 1) / blockSize;
        var needsSequencer = realQuantities > 0 || (paths is not null && options.PathReplicates > 0);
        var sequencer = new BlockSequencer(grid.Count, realQuantities, paths, options.PathReplicates, options.SkipBlocks, options.Threads);

        var workers = new Worker[Math.Min(options.Threads, (int)Math.Min(int.MaxValue, blocks))];
        var nextBlock = -1L;
        var failure = (Exception?)null;
        using var stop = CancellationTokenSource.CreateLinkedTokenSource(cancel);

        void Work(Worker worker)
        {
            try
            {
                while (!stop.IsCancellationRequested)
                {
                    var index = Interlocked.Increment(ref nextBlock);
                    if (index >= blocks) break;
                    if (options.SkipBlocks.Contains(index)) continue;
                    var block = needsSequencer ? sequencer.Rent(blockSize, countQuantities) : worker.Block;
                    if (!worker.RunBlock(block, index, options, stop.Token))
                    {
                        if (needsSequencer) sequencer.Return(block);
                        break;
                    }
                    worker.Accumulate(block);
                    lock (worker) worker.FinishedBlocks.Add(index);
                    if (needsSequencer) sequencer.Submit(block, stop.Token);
                }
            }
            catch (Exception e)
            {
                Interlocked.CompareExchange(ref failure, e, null);
                stop.Cancel();
            }
        }

        for (var w = 0; w < workers.Length; w++)
            workers[w] = new Worker(network, options, grid, countQuantities, realQuantities, blockSize, monitor);
        var threads = workers.Select(w => new Thread(() => Work(w)) { IsBackground = true, Name = "copynumber-ensemble" }).ToArray();
        foreach (var t in threads) t.Start();
        foreach (var t in threads) t.Join();
        if (failure is not null) throw failure is SimulationFailureException ? failure : new AggregateException(failure);
        sequencer.Flush();

        // Exact merge: histograms add, so the order of workers does not matter.
        var histograms = new CountHistogram[grid.Count * countQuantities];
        for (var h = 0; h < histograms.Length; h++)
        {
            histograms[h] = new CountHistogram();
            foreach (var worker in workers) histograms[h].Merge(worker.Histograms[h]);
        }
        var finished = workers.SelectMany(w => w.FinishedBlocks).Concat(options.SkipBlocks).Order().ToArray();
        var replicatesFinished = workers.Sum(w => w.Replicates);
        var interrupted = workers.Sum(w => w.FinishedBlocks.Count) + options.SkipBlocks.Count < blocks;
        return new EnsembleResult(
            grid, quantities, histograms, sequencer.Moments,
            replicatesFinished, workers.Sum(w => w.Events), workers.Sum(w => w.StoppedEarly),
            finished, interrupted, clock.Elapsed);
    }

    /// <summary>One thread's simulator, observer, histograms and counters.</summary>
    private sealed class Worker
    {
        private readonly IStochasticSimulator _simulator;
        private readonly BlockObserver _observer;
        private readonly EnsembleMonitor _monitor;
        private readonly ulong _seed;
        private readonly long _replicates;

        public Worker(ReactionNetwork network, EnsembleOptions options, TimeGrid grid, int countQuantities, int realQuantities, int blockSize, EnsembleMonitor monitor)
        {
            _simulator = SimulatorFactory.Create(options.Method, network, options.Simulator);
            _observer = new BlockObserver(network);
            _monitor = monitor;
            _seed = options.Seed;
            _replicates = options.Replicates;
            Grid = grid;
            Block = new ReplicateBlock(blockSize, grid.Count, countQuantities, realQuantities);
            Histograms = new CountHistogram[grid.Count * countQuantities];
            for (var h = 0; h < Histograms.Length; h++) Histograms[h] = new CountHistogram();
        }

        public TimeGrid Grid { get; }
        public ReplicateBlock Block { get; }
        public CountHistogram[] Histograms { get; }
        public List<long> FinishedBlocks { get; } = [];
        public long Replicates { get; private set; }
        public long Events { get; private set; }
        public long StoppedEarly { get; private set; }

        private long _pendingEvents;
        private long _pendingStoppedEarly;

        /// <summary>Runs every replicate of a block; false when cancelled part-way (the block is then dropped).</summary>
        public bool RunBlock(ReplicateBlock block, long index, EnsembleOptions options, CancellationToken cancel)
        {
            block.Index = index;
            block.FirstReplicate = index * options.BlockSize;
            block.Length = (int)Math.Min(options.BlockSize, _replicates - block.FirstReplicate);
            _pendingEvents = 0;
            _pendingStoppedEarly = 0;
            for (var slot = 0; slot < block.Length; slot++)
            {
                if (cancel.IsCancellationRequested) return false;
                var rng = ReplicateStreams.For(_seed, block.FirstReplicate + slot);
                _observer.Begin(block, slot);
                var result = _simulator.Run(ref rng, Grid, _observer);
                _pendingEvents += result.Events;
                if (result.HitEventLimit) _pendingStoppedEarly++;
                _monitor.AddReplicate(result.Events);
            }
            return true;
        }

        public void Accumulate(ReplicateBlock block)
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
        }
    }
}
