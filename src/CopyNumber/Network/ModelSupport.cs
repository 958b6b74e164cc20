using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// What each kind of consumer of a compiled network cannot carry out yet, said before anything runs: the
/// one place that decides which models a method refuses, so every simulator and solver refuses the same
/// way (<see cref="UnsupportedModelException"/>, exit code 2 on the command line).
/// </summary>
public static class ModelSupport
{
    /// <summary>Why the stochastic simulators cannot run <paramref name="network"/>; empty when they can.</summary>
    /// <remarks>
    /// Stochastic runs need whole initial counts: a count is an integer, and rounding a declared amount
    /// would silently run another model. The simulators carry out state-triggered changes.
    /// </remarks>
    public static IReadOnlyList<Diagnostic> SimulationProblems(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var problems = new List<Diagnostic>();
        for (var i = 0; i < network.Species.Count; i++)
        {
            var amount = network.InitialAmounts[i];
            if (amount == Math.Floor(amount)) continue;
            problems.Add(At(network, network.SpeciesPositions.Count > i ? network.SpeciesPositions[i] : new SourcePosition(1, 1),
                $"species '{network.Species[i]}' starts at {amount.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}, not a whole number of molecules; " +
                "stochastic runs need whole initial counts (a non-integer amount is for 'solve' and the expansions only)"));
        }
        return problems;
    }

    /// <summary>
    /// Why the methods on whole counts that do not carry out state-triggered changes (the master equation)
    /// cannot take <paramref name="network"/>: the simulators' problems and every trigger; empty when they can.
    /// </summary>
    public static IReadOnlyList<Diagnostic> StochasticProblems(ReactionNetwork network) =>
        [.. TriggerProblems(network), .. TimeProblems(network, "the master equation"), .. BurstProblems(network), .. SimulationProblems(network)];

    /// <summary>
    /// Why <paramref name="method"/> cannot take <paramref name="network"/>'s cell cycle (growth, gene doubling,
    /// division); empty without a cycle. The direct method carries a cycle out exactly (V(t) by thinning,
    /// divisions as stops), the next reaction method and composition-rejection when no propensity depends on
    /// the volume, the rate equations and the expansions as the mean cell; the master equation, tau-leaping
    /// and SBML export do not.
    /// </summary>
    public static IReadOnlyList<Diagnostic> CycleProblems(ReactionNetwork network, string method)
    {
        ArgumentNullException.ThrowIfNull(network);
        return network.Cycle is { } cycle ? [At(network, cycle.Position, CycleRefusal(method))] : [];
    }

    /// <summary>The one sentence that refuses a cell cycle for <paramref name="method"/>.</summary>
    public static string CycleRefusal(string method) =>
        $"the model declares a cell cycle (growth and division), which {method} does not carry out; " +
        "the direct method does (exactly), and the rate equations as the mean cell";

    // A geometric burst jumps to infinitely many states at once; the projection's generator has no row for that.
    private static List<Diagnostic> BurstProblems(ReactionNetwork network) =>
        network.Bursts.All.Take(1).Select(b => At(network, new SourcePosition(1, 1),
            $"reaction '{network.Reactions[b.Reaction].Name}' makes a burst of random size, which the master equation does not carry out; " +
            "the stochastic simulators, the rate equations and the linear noise approximation do")).ToList();

    /// <summary>
    /// Why <paramref name="method"/>, a method that keeps propensities fixed between events, cannot take
    /// <paramref name="network"/>: its laws that read <c>time</c>; empty when none does. The direct method
    /// (exact, by thinning: <c>Stochastic/ThinnedDirectMethod.cs</c>), tau-leaping and the rate equations take them.
    /// </summary>
    public static IReadOnlyList<Diagnostic> TimeProblems(ReactionNetwork network, string method) =>
        network.Cycle is not null ? CycleProblems(network, method) : network.TimeDependence.Reactions.Take(1).Select(j => At(network, new SourcePosition(1, 1),
            $"reaction '{network.Reactions[j].Name}' has a rate law that reads time, which {method} does not carry out; " +
            "the direct method (exact, by thinning) and tau-leaping do")).ToList();

    /// <summary>
    /// Why the rate equations, the linear noise approximation and the corrected mean cannot integrate
    /// <paramref name="network"/>; empty when they can. The rate equations carry out state-triggered
    /// changes; the expansions stop at the first one and say so (<c>SystemSizeExpansionSolution.StoppedAt</c>).
    /// </summary>
    public static IReadOnlyList<Diagnostic> RateEquationProblems(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        return [];
    }

    /// <summary>Throws <see cref="UnsupportedModelException"/> when the stochastic simulators cannot run <paramref name="network"/>.</summary>
    public static void RequireSimulation(ReactionNetwork network) => Require(SimulationProblems(network));

    /// <summary>Throws <see cref="UnsupportedModelException"/> when the master equation cannot take <paramref name="network"/> (see <see cref="StochasticProblems"/>).</summary>
    public static void RequireStochastic(ReactionNetwork network) => Require(StochasticProblems(network));

    /// <summary>Throws <see cref="UnsupportedModelException"/> when the rate equations cannot integrate <paramref name="network"/>.</summary>
    public static void RequireRateEquations(ReactionNetwork network) => Require(RateEquationProblems(network));

    private static void Require(IReadOnlyList<Diagnostic> problems)
    {
        if (problems.Count > 0) throw new UnsupportedModelException(problems);
    }

    // Never ignored silently: a method that does not carry triggers out refuses the model.
    private static List<Diagnostic> TriggerProblems(ReactionNetwork network) =>
        network.Triggers.Select(t => At(network, t.Position,
            $"state-triggered changes are not supported by this method ('{t.Text}' on line {t.Position.Line}); " +
            "the stochastic simulators carry them out")).ToList();

    private static Diagnostic At(ReactionNetwork network, SourcePosition position, string message) =>
        new(network.SourceFile, position, message, "");
}

/// <summary>A model that is valid but uses something the chosen method cannot carry out; exit code 2 on the command line.</summary>
public sealed class UnsupportedModelException(IReadOnlyList<Diagnostic> problems)
    : CopyNumberException(string.Join("\n", problems.Select(p => p.Format())), ErrorKind.BadInput)
{
    /// <summary>Each reason, as a diagnostic at the line that causes it.</summary>
    public IReadOnlyList<Diagnostic> Problems { get; } = problems;

    /// <inheritdoc/>
    public override IReadOnlyList<string> Lines => [.. Problems.Select(p => p.Format())];

    /// <inheritdoc/>
    public override bool LinesArePrefixed => true;
}
