using CopyNumber.Network;
using CopyNumber.Stochastic.Locality;

namespace CopyNumber.Stochastic;

/// <summary>Creates the simulator for a method.</summary>
public static class SimulatorFactory
{
    /// <summary>
    /// Above this many reactions the direct method (and tau-leaping's exact steps) select the next reaction
    /// from a sum tree in O(log M) instead of walking the M propensities.
    /// </summary>
    public const int LinearSelectionLimit = 64;

    /// <summary>
    /// Composition–rejection runs on the packed, renumbered layout (<see cref="PackedCompositionRejection"/>)
    /// wherever it applies, unless COPYNUMBER_GENERAL_LOOP is 1: the same diagnostic switch that sends the
    /// direct method to its general loop, so a whole run can be timed on the reference (the same bits).
    /// </summary>
    private static bool PackedLayoutWanted => DirectMethod<LinearSelection>.CompiledLoopWanted;

    /// <summary>
    /// A simulator for <paramref name="network"/>, with all its buffers allocated. Use one per thread.
    /// </summary>
    /// <exception cref="ArgumentOutOfRangeException">An option is out of range (the message says which and why).</exception>
    public static IStochasticSimulator Create(SimulationMethod method, ReactionNetwork network, SimulatorOptions options)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate();
        var large = network.Stoichiometry.ReactionCount > LinearSelectionLimit;
        RequireMethod(method, network);
        return method switch
        {
            SimulationMethod.Direct when network.TimeDependence.Any => new ThinnedDirectMethod(network, options),
            SimulationMethod.Direct when large => new DirectMethod<SumTreeSelection>(network, options),
            SimulationMethod.Direct => new DirectMethod<LinearSelection>(network, options),
            SimulationMethod.NextReaction => new NextReactionMethod(network, options),
            // The packed layout does not follow modes at the events (switching statistics): with cores, the reference runs.
            SimulationMethod.CompositionRejection when PackedLayoutWanted && options.Modes.Count == 0 && PackedCompositionRejection.RefusalFor(network) is null =>
                new PackedCompositionRejection(network, options),
            SimulationMethod.CompositionRejection => new DirectMethod<CompositionRejection>(network, options),
            SimulationMethod.TauLeap when large => new TauLeaping<SumTreeSelection>(network, options),
            SimulationMethod.TauLeap => new TauLeaping<LinearSelection>(network, options),
            _ => throw new ArgumentOutOfRangeException(nameof(method), method, "unknown simulation method"),
        };
    }

    /// <summary>
    /// Throws <see cref="UnsupportedModelException"/> when <paramref name="method"/> cannot carry out
    /// <paramref name="network"/>: laws that read time (or the volume of a growing cell) for the next reaction
    /// method and composition-rejection, a cell cycle for tau-leaping. Called before a run writes anything.
    /// </summary>
    public static void RequireMethod(SimulationMethod method, ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (network.Cycle is not null && method == SimulationMethod.TauLeap)
            throw new UnsupportedModelException(ModelSupport.CycleProblems(network, "tau-leaping"));
        if (network.TimeDependence.Any && method is SimulationMethod.NextReaction or SimulationMethod.CompositionRejection)
            throw new UnsupportedModelException(ModelSupport.TimeProblems(network,
                method == SimulationMethod.NextReaction ? "the next reaction method" : "composition-rejection"));
    }
}
