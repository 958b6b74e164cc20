using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Ensembles;

/// <summary>
/// The memory pre-check counts the network's simulators as well as the grid: a large network on a tiny
/// grid is refused with a message naming its size and the limit. The sizes are upper estimates of the
/// arrays the simulators build (EnsembleMemory.SimulatorBytesFor), checked here against the structure
/// counted independently: linear in the network (common practice for sparse storage).
/// </summary>
public sealed class NetworkMemoryEstimateTests
{
    private static ReactionNetwork Star(int channels) => LargeNetworkMemoryTests.Star(channels);

    private static EnsembleOptions TinyGrid(int threads) =>
        new() { Grid = new TimeGrid(until: 1, every: 1), Replicates = 256, Seed = 1, Threads = threads };

    [Fact]
    public void The_simulator_estimate_is_linear_in_the_network()
    {
        var small = EnsembleMemory.SimulatorBytesFor(Star(2_000));
        var large = EnsembleMemory.SimulatorBytesFor(Star(20_000));
        // Ten times the reactions: ten times the memory, up to the fixed per-species part, where a stored
        // dependency graph would have grown a hundredfold.
        Assert.InRange(large, 9.9 * small, 10.1 * small);
        // At least the update records really built: one of 32 bytes per reader of S.
        Assert.True(large >= 32L * 20_000, $"{large} bytes");
    }

    [Fact]
    public void A_network_too_large_for_the_memory_is_refused_with_its_size()
    {
        var memory = EnsembleMemory.For(Star(20_000), TinyGrid(threads: 2));
        Assert.Equal(memory.SimulatorBytes, EnsembleMemory.SimulatorBytesFor(Star(20_000)));
        Assert.True(memory.PerThreadBytes >= memory.SimulatorBytes);
        // The grid alone (one quantity, two times) needs well under 1 MB; the simulators do not fit in 2 MB.
        var problem = memory.Problem(availableBytes: 2L << 20);
        Assert.NotNull(problem);
        Assert.Contains("network is too large", problem);
        Assert.Contains("2 threads", problem);
        Assert.Contains($"about {EnsembleMemory.Describe(2L << 20)} is available", problem);
        Assert.Null(memory.Problem(availableBytes: 1L << 30));
    }
}
