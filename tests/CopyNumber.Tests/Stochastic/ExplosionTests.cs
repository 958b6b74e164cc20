using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Runs that would overflow a 64-bit count or never finish stop with a message that names the reaction and
/// says what to do. The limits are our own conventions (docs/methods.md): counts stay at or below 2^62, well
/// inside the int64 range of ±(2^63 − 1) (common practice: two's-complement 64-bit integers), and an exact
/// replicate without an event limit may not be projected to need more than 10^10 further events.
/// </summary>
public sealed class ExplosionTests
{
    private static SimulationFailureException Failure(ReactionNetwork network, SimulationMethod method, double until, SimulatorOptions? options = null)
    {
        var simulator = Simulators.Create(method, network, options ?? new SimulatorOptions());
        var grid = new TimeGrid(until, until / 10);
        var rng = ReplicateStreams.For(62, 0);
        return Assert.Throws<SimulationFailureException>(() => simulator.Run(ref rng, grid, new GridSamples(grid, network.Species.Count, 1)));
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void AFiringThatWouldPassTwoToThe62StopsTheRunNamingTheReaction(SimulationMethod method)
    {
        // Each firing adds 3·10^18 copies: the first leaves X = 3·10^18 < 2^62 ≈ 4.61·10^18, the second would
        // pass the limit (and the third would wrap a signed 64-bit count). About 10 firings are due by t = 10.
        var network = new TestNetwork().Species("X", 0).Mass("flood", "", "3000000000000000000 X", "1").Build();
        var failure = Failure(network, method, until: 10);
        Assert.Contains("'flood'", failure.Message);
        Assert.Contains("'X'", failure.Message);
        Assert.Contains("2^62", failure.Message);
        Assert.Contains("--max-events", failure.Message);
        // A leap fails at the time it starts from, which may be 0; an exact method at its second firing.
        Assert.InRange(failure.Time, 0, 10);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void UnboundedGrowthStopsWithAnExplanationInsteadOfRunningForever(SimulationMethod method)
    {
        // X → 2X at rate λx with no decay (a Yule process): E[X(t)] = x0·e^(λt) (Yule 1925, Phil. Trans.
        // R. Soc. B 213:21), astronomically many copies by t = 10^5, so the run could never finish. At the
        // start a0·T = 10^4 · 10^5 = 10^9 events are projected, below the bound; the exact methods must let X
        // grow about tenfold (~10^5 events) before the projection passes 10^10. Tau-leaping grows X by ~ε per
        // leap and within ~10^3 leaps meets the Poisson sampler's or the count's limit.
        var network = TestNetworks.BirthDeath(lambda: 1, mu: 0, x0: 10_000);
        var failure = Failure(network, method, until: 100_000);
        Assert.Contains("explosive", failure.Message);
        Assert.Contains("'birth'", failure.Message);
        Assert.Contains("--max-events", failure.Message);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void WithAnEventLimitUnboundedGrowthStopsCleanlyAtTheLimit(SimulationMethod method)
    {
        // The same Yule process with --max-events 10^5: no failure, the replicate is counted as stopped early.
        var network = TestNetworks.BirthDeath(lambda: 1, mu: 0, x0: 10_000);
        var grid = new TimeGrid(until: 100_000, every: 10_000);
        var samples = GridSamples.Run(network, method, grid, replicates: 2, seed: 25, new SimulatorOptions(MaxEvents: 100_000));
        Assert.Equal(2, samples.StoppedEarly);
        Assert.True(samples.Events <= 2 * 100_000);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void PropensitiesThatAddPastTheLargestDoubleStopTheRun(SimulationMethod method)
    {
        // Each propensity is finite (10^308) but their sum is +∞ in IEEE 754 double arithmetic (largest
        // finite value ≈ 1.8·10^308; IEEE 754-2008), so no waiting time can be drawn.
        var network = new TestNetwork().Species("X", 0)
            .Mass("a", "", "X", "1e308").Mass("b", "", "X", "1e308").Build();
        var failure = Failure(network, method, until: 1);
        Assert.Contains("explosive", failure.Message);
        Assert.Contains("--max-events", failure.Message);
    }
}
