using CopyNumber.Network;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// The species a verdict may treat as 0/1 from the model alone: the two-state species of
/// <see cref="TwoStateSpecies"/> (one rule for the verdicts and the transition count), less those whose
/// confining law involves a species the schedule changes, since a scheduled change can break the law and
/// the verdict speaks for every replicate.
/// </summary>
public static class ZeroOneSpecies
{
    /// <summary>Species name → the law that bounds it, written out.</summary>
    public static IReadOnlyDictionary<string, string> Of(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var twoState = TwoStateSpecies.Of(network);
        var scheduled = network.Schedule.Where(c => c.Target == ScheduleTarget.Species).Select(c => c.TargetIndex).ToHashSet();
        var result = new Dictionary<string, string>();
        for (var s = 0; s < twoState.Count; s++)
        {
            var law = twoState.Laws[s];
            if (law.Species.Any(scheduled.Contains)) continue;
            result.Add(network.Species[twoState.Species[s]], law.Describe(network.Species));
        }
        return result;
    }
}
