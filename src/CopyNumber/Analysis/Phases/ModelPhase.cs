using CopyNumber.Analysis.Verdicts;
using CopyNumber.Network;

namespace CopyNumber.Analysis.Phases;

/// <summary>
/// One phase of a run: a stretch of the grid between two instants at which the schedule changes the model
/// (docs/methods-analysis.md, section 4, "Verdicts per phase"). The cut is the <see cref="Timeline"/>'s own,
/// so a grid time at a change instant belongs to the phase that starts there (the grid records the state
/// after the change, by the timeline's coincidence rule).
/// </summary>
/// <param name="Index">0 for the first phase, counting only phases that hold at least one grid time.</param>
/// <param name="Start">The change instant that opens the phase (0 for the first), model time units.</param>
/// <param name="End">The next change instant, or the final time T for the last phase.</param>
/// <param name="FirstPoint">The first grid index in the phase.</param>
/// <param name="EndPoint">One past the last grid index in the phase.</param>
/// <param name="IncludesEnd">True for the last phase, which also records the final time T.</param>
public sealed record ModelPhase(int Index, double Start, double End, int FirstPoint, int EndPoint, bool IncludesEnd)
{
    /// <summary>The phase's span as written in verdict tables: "[0, 50)", "[50, 100]".</summary>
    public string Span => $"[{VerdictText.Time(Start)}, {VerdictText.Time(End)}{(IncludesEnd ? "]" : ")")}";

    /// <summary>The number of grid times in the phase.</summary>
    public int Points => EndPoint - FirstPoint;

    /// <summary>
    /// The phases of <paramref name="timeline"/>: one per segment that records a grid time. A segment between two
    /// changes that fall between the same two grid times records nothing and is left out (nothing of it is observed).
    /// </summary>
    public static IReadOnlyList<ModelPhase> Of(Timeline timeline)
    {
        ArgumentNullException.ThrowIfNull(timeline);
        var phases = new List<ModelPhase>();
        var segments = timeline.Segments;
        for (var s = 0; s < segments.Length; s++)
            if (segments[s].EndPoint > segments[s].FirstPoint)
                phases.Add(new ModelPhase(phases.Count, segments[s].Start, segments[s].End, segments[s].FirstPoint, segments[s].EndPoint, s == segments.Length - 1));
        return phases;
    }

    /// <summary>
    /// The phases cut to the first <paramref name="available"/> grid times (a run whose replicates stopped early,
    /// verdicts that stop at a state-triggered change); phases with no grid time left are dropped.
    /// </summary>
    public static IReadOnlyList<ModelPhase> Within(IReadOnlyList<ModelPhase> phases, int available)
    {
        ArgumentNullException.ThrowIfNull(phases);
        return phases.Where(p => p.FirstPoint < available)
            .Select(p => p.EndPoint <= available ? p : p with { EndPoint = available })
            .ToArray();
    }
}
