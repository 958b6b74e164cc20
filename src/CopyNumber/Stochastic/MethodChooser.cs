using System.Globalization;
using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// The rule behind <c>--method auto</c> (docs/methods.md, "Choosing a method"): from the number of
/// reactions M, the initial counts and the magnitude of the rate-equation solution over the run.
/// </summary>
/// <remarks>
/// 1. M &gt; <see cref="LargeNetwork"/> reactions: composition–rejection, whose cost per event hardly
///    grows with M (docs/performance.md).
/// 2. Otherwise, when every species that some reaction changes starts with and, by the rate equations,
///    keeps at least <see cref="HighCopies"/> copies over the whole grid: tau-leaping. At ε = 0.03 a leap
///    may then change each propensity by ~30 molecules' worth, so a leap stands for many events; with
///    fewer copies most leaps would fall back to exact steps, and discreteness matters. Each leap is
///    explicit or trapezoidal by the relaxation rule (<see cref="LeapFormulaRule"/>); the reason says so.
/// 3. Otherwise the direct method, exact, the fastest for the small networks of most models.
/// The rate equations are a proxy for the ensemble mean; they say nothing about rare excursions, so the
/// high-copy condition is deliberately strict (the smallest value anywhere on the grid).
/// </remarks>
public static class MethodChooser
{
    /// <summary>Above this many reactions composition–rejection is chosen.</summary>
    public const int LargeNetwork = 1000;

    /// <summary>The fewest copies every changing species must keep for tau-leaping to be chosen.</summary>
    public const double HighCopies = 1000;

    /// <summary>
    /// Chooses a method, solving the rate equations on <paramref name="grid"/> when the rule needs them.
    /// When they cannot be solved the copy numbers are unknown and an exact method is chosen.
    /// </summary>
    public static (SimulationMethod Method, string Reason) Choose(ReactionNetwork network, TimeGrid grid)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        if (network.Stoichiometry.ReactionCount > LargeNetwork) return Choose(network, rateEquations: null);
        DeterministicSolution? solution;
        try
        {
            solution = RateEquationSolver.Solve(network, grid, new SolverOptions());
        }
        catch (SolverFailureException)
        {
            solution = null;
        }
        return Choose(network, solution);
    }

    /// <summary>Chooses a method given the rate-equation solution on the run's grid (null: not available).</summary>
    public static (SimulationMethod Method, string Reason) Choose(ReactionNetwork network, DeterministicSolution? rateEquations)
    {
        ArgumentNullException.ThrowIfNull(network);
        var m = network.Stoichiometry.ReactionCount;
        if (network.Cycle is not null)
            return (SimulationMethod.Direct, "auto: a cell that grows and divides, which only the direct method carries out exactly (docs/methods.md \"Growth and division\")");
        if (m > LargeNetwork && !network.TimeDependence.Any)
            return (SimulationMethod.CompositionRejection,
                $"auto: {Count(m)} reactions (more than {Count(LargeNetwork)}), so composition-rejection, whose cost per event hardly grows with the network");
        var reactions = $"{Count(m)} reaction{(m == 1 ? "" : "s")}";
        if (rateEquations is null)
            return (SimulationMethod.Direct, $"auto: {reactions}; the rate equations could not be solved to size the copy numbers, so the exact direct method");

        var (scarce, fewest) = FewestCopies(network, rateEquations);
        if (scarce < 0)
            return (SimulationMethod.Direct, $"auto: {reactions} and no species that changes, so the exact direct method");
        var name = network.Species[scarce];
        if (fewest >= HighCopies)
            return (SimulationMethod.TauLeap,
                $"auto: {reactions}, and every species that changes keeps at least {Count(HighCopies)} copies by the rate equations (fewest: '{name}', {Count(fewest)}), so tau-leaping; {LeapFormulas}");
        return (SimulationMethod.Direct,
            $"auto: {reactions}; '{name}' has as few as {Count(fewest)} copies by the rate equations (tau-leaping needs at least {Count(HighCopies)}), so the exact direct method");
    }

    /// <summary>The changing species with the smallest count, initial or on the grid, and that count; (−1, ∞) if none changes.</summary>
    private static (int Species, double Fewest) FewestCopies(ReactionNetwork network, DeterministicSolution solution)
    {
        var n = network.Stoichiometry;
        var changes = new bool[n.SpeciesCount];
        for (var j = 0; j < n.ReactionCount; j++)
            foreach (var i in n.ChangedSpecies(j)) changes[i] = true;
        var best = (Species: -1, Fewest: double.PositiveInfinity);
        for (var i = 0; i < n.SpeciesCount; i++)
        {
            if (!changes[i]) continue;
            // The solution's columns are the species, in network order, then the readouts.
            var fewest = (double)network.InitialCounts[i];
            for (var k = 0; k < solution.Grid.Count; k++) fewest = Math.Min(fewest, solution[k, i]);
            if (fewest < best.Fewest || best.Species < 0) best = (i, fewest);
        }
        return best;
    }

    /// <summary>
    /// How tau-leaping picks each leap's formula (<see cref="LeapFormulaRule"/>), for the reason text and
    /// so for manifest.json: the same words whether auto chose tau-leaping or the user did.
    /// </summary>
    public static string LeapFormulas { get; } =
        $"each leap explicit while tau times the drift Jacobian's fastest rate is at most theta = {LeapFormulaRule.DefaultRelaxation.ToString(CultureInfo.InvariantCulture)}, trapezoidal (Cao & Petzold 2005) beyond it";

    // A rate-equation value a rounding error below zero rounds to −0, which "N0" prints as "-0"; adding
    // +0.0 turns −0 into +0 (IEEE 754) and leaves every other value alone.
    private static string Count(double value) => (Math.Round(value) + 0.0).ToString("N0", CultureInfo.InvariantCulture);
}
