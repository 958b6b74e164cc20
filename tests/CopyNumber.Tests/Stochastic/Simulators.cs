using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>The simulators under test, made as the engine makes them.</summary>
internal static class Simulators
{
    public static readonly TheoryData<SimulationMethod> AllMethods = new()
    {
        SimulationMethod.Direct,
        SimulationMethod.NextReaction,
        SimulationMethod.TauLeap,
        SimulationMethod.CompositionRejection,
    };

    public static readonly TheoryData<SimulationMethod> ExactMethods = new()
    {
        SimulationMethod.Direct,
        SimulationMethod.NextReaction,
        SimulationMethod.CompositionRejection,
    };

    public static IStochasticSimulator Create(SimulationMethod method, ReactionNetwork network, SimulatorOptions options) =>
        SimulatorFactory.Create(method, network, options);
}
