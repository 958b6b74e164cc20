using CopyNumber.Network;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// The species a model bounds to {0, 1}: a conservation law lᵀx = T with every lⱼ ≥ 0 gives lᵢ·xᵢ ≤ T for
/// nonnegative counts, so xᵢ ∈ {0, 1} when T &lt; 2·lᵢ (a single gene copy in its states, g_off + g_on = 1).
/// A schedule that changes a species of the law can break it, so such laws are not used.
/// </summary>
public static class ZeroOneSpecies
{
    /// <summary>Species name → the law that bounds it, written out.</summary>
    public static IReadOnlyDictionary<string, string> Of(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var result = new Dictionary<string, string>();
        StoichiometricStructure structure;
        try
        {
            structure = StoichiometricStructure.Analyze(network.Stoichiometry, network.InitialCounts);
        }
        catch (OverflowException)
        {
            return result; // coefficients beyond 64 bits bound nothing to {0, 1}
        }
        var scheduled = network.Schedule.Where(c => c.Target == ScheduleTarget.Species).Select(c => c.TargetIndex).ToHashSet();
        foreach (var law in structure.ConservationLaws)
        {
            var l = law.Coefficients;
            if (l.Any(c => c < 0) || law.Species.Any(scheduled.Contains)) continue;
            foreach (var i in law.Species)
                if (law.Total < 2 * l[i]) result.TryAdd(network.Species[i], law.Describe(network.Species));
        }
        return result;
    }
}
