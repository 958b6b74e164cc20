using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>Runs that cannot go on stop with a message naming what, when and in which state; the event limit stops a replicate cleanly.</summary>
public sealed class SimulationFailureTests
{
    private static SimulationFailureException Failure(ReactionNetwork network, SimulationMethod method, double until = 10)
    {
        var simulator = Simulators.Create(method, network, new SimulatorOptions());
        var grid = new TimeGrid(until, 1);
        var rng = ReplicateStreams.For(99, 0);
        return Assert.Throws<SimulationFailureException>(() => simulator.Run(ref rng, grid, new GridSamples(grid, network.Species.Count, 1)));
    }

    public static TheoryData<SimulationMethod, double> BadValues()
    {
        var data = new TheoryData<SimulationMethod, double>();
        foreach (var method in new[] { SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.TauLeap, SimulationMethod.CompositionRejection })
            foreach (var value in new[] { -1.0, double.NaN, double.PositiveInfinity })
                data.Add(method, value);
        return data;
    }

    [Theory]
    [MemberData(nameof(BadValues))]
    public void AnUnusablePropensityNamesTheReactionTheTimeAndTheState(SimulationMethod method, double value)
    {
        // Becomes unusable once X reaches 3, so the failure happens mid-run, after some events.
        var network = new TestNetwork().Species("X", 0)
            .Mass("make", "", "X", "5")
            .Rate("leaky_export", "X", "", (counts, _) => counts[0] >= 3 ? value : 0.1 * counts[0], "X").Build();
        var failure = Failure(network, method);
        Assert.Contains("'leaky_export'", failure.Message);
        Assert.Contains("time", failure.Message);
        Assert.Contains("X=", failure.Message);
        Assert.True(failure.Time > 0);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void ANegativeMassActionConstantIsAnUnusablePropensity(SimulationMethod method)
    {
        var network = new TestNetwork().Species("X", 5).Parameter("k", -0.5)
            .Mass("decay", "X", "", "k").Build();
        var failure = Failure(network, method);
        Assert.Contains("'decay'", failure.Message);
        Assert.Contains("-2.5", failure.Message);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void ARateLawThatConsumesWhatIsNotThereStopsTheRun(SimulationMethod method)
    {
        // The law stays at 1 even when X = 0, so a firing would take X below 0.
        var network = new TestNetwork().Species("X", 2)
            .Rate("drain", "X", "", (_, _) => 1.0).Build();
        var failure = Failure(network, method, until: 1000);
        Assert.Contains("'drain'", failure.Message);
        Assert.Contains("'X' negative", failure.Message);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void TheEventLimitStopsTheReplicateWithoutRecordingFurther(SimulationMethod method)
    {
        // Immigration at rate 10 needs about 100 events to reach t = 10; the limit is 5.
        var network = new TestNetwork().Species("X", 0).Mass("immigration", "", "X", "10").Build();
        var grid = new TimeGrid(until: 10, every: 0.01);
        var samples = GridSamples.Run(network, method, grid, replicates: 20, seed: 3, new SimulatorOptions(MaxEvents: 5));
        Assert.Equal(20, samples.StoppedEarly);
        Assert.True(samples.Events <= 20 * 5);
        for (var r = 0; r < 20; r++)
        {
            var points = samples.RecordedPoints(r);
            Assert.InRange(points, 1, grid.Count - 1);
            Assert.True(samples.At(r, points - 1, 0) <= 5);
        }
    }

    [Fact]
    public void OptionsOutOfRangeAreRejectedWithAReason()
    {
        var network = TestNetworks.ImmigrationDeath(1, 1);
        var error = Assert.Throws<ArgumentOutOfRangeException>(() => SimulatorFactory.Create(SimulationMethod.TauLeap, network, new SimulatorOptions(Epsilon: 1.5)));
        Assert.Contains("epsilon", error.Message);
        Assert.Throws<ArgumentOutOfRangeException>(() => SimulatorFactory.Create(SimulationMethod.Direct, network, new SimulatorOptions(MaxEvents: -1)));
        Assert.Throws<ArgumentOutOfRangeException>(() => SimulatorFactory.Create(SimulationMethod.TauLeap, network, new SimulatorOptions(CriticalThreshold: -1)));
    }
}
