using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Resilience;

/// <summary>Cancelling an ensemble through the library: blocks are kept whole or dropped, and a long replicate does not hold the run.</summary>
public class CancellationTests
{
    [Fact]
    public void A_replicate_that_runs_long_between_grid_points_is_left_behind_and_the_run_returns()
    {
        // Two states flipping 10^9 times per time unit, recorded only at 0 and 1000: one replicate needs
        // about 2·10^12 events before its next grid point, far more than the event limit of 10^8 that
        // bounds how long the left-behind thread keeps running. The limit must outlast the cancellation
        // (100 ms) plus EnsembleRunner.AbandonAfter (500 ms) at any event rate this engine reaches: 10^8
        // events take over 1 s even at 80 M events/s (2·10^7 took under 0.6 s on a quiet machine at
        // 35–40 M events/s, so the replicate finished before the runner gave up on it, and the test failed).
        var model = ModelLoader.LoadText("species\n  A = 1\n  B = 0\nreactions\n  there: A -> B mass 1e9\n  back: B -> A mass 1e9\n", "flip.cnet").Model!;
        var options = new EnsembleOptions
        {
            Grid = new TimeGrid(1000, 1000),
            Replicates = 10,
            Seed = 1,
            Threads = 1,
            Simulator = new SimulatorOptions(MaxEvents: 100_000_000),
        };
        var monitor = new EnsembleMonitor();
        // The cancellation comes from a thread of its own: a CancellationTokenSource timer runs on the thread
        // pool, which the parallel test suite can starve for seconds, long enough for three replicates to reach
        // the event limit before the cancellation arrived (seen once in a full run under load).
        using var cancel = new CancellationTokenSource();
        var canceller = new Thread(() =>
        {
            Thread.Sleep(100);
            cancel.Cancel();
        }) { IsBackground = true };
        canceller.Start();
        var result = EnsembleRunner.Run(model.Network, options, monitor: monitor, cancel: cancel.Token);
        canceller.Join();
        // Had the runner waited for the replicate, it would have counted it done before returning.
        Assert.Equal(0, monitor.ReplicatesDone);
        Assert.True(result.Interrupted);
        Assert.Equal(0, result.ReplicatesFinished);
        Assert.Empty(result.FinishedBlocks);
        Assert.True(result.Histogram(0, 0).IsEmpty);
    }

    [Fact]
    public void Blocks_finished_before_the_cancellation_are_kept_whole_and_the_rest_are_dropped()
    {
        var model = ModelLoader.LoadText("species\n  X = 0\nreactions\n  make: 0 -> X mass 5\n  lose: X -> 0 mass 1\nreadouts\n  half = X / 2\n", "id.cnet").Model!;
        var options = new EnsembleOptions { Grid = new TimeGrid(2, 0.5), Replicates = 1000, Seed = 2, Threads = 2 };
        using var cancel = new CancellationTokenSource();
        var monitor = new EnsembleMonitor { BlockFinished = _ => cancel.Cancel() };
        var result = EnsembleRunner.Run(model.Network, options, monitor: monitor, cancel: cancel.Token);
        Assert.True(result.Interrupted);
        Assert.InRange(result.FinishedBlocks.Count, 1, 2); // the block that cancelled, and perhaps the other thread's
        Assert.Equal(result.FinishedBlocks.Count * 64, result.ReplicatesFinished);
        // Every replicate of a kept block is in every histogram and in the real readout's moments.
        for (var k = 0; k < options.Grid.Count; k++)
        {
            Assert.Equal(result.ReplicatesFinished, result.Histogram(k, 0).Total);
            Assert.Equal(result.ReplicatesFinished, result.Moments(k, 0).Count);
        }
    }
}
