using CopyNumber.Network;

namespace CopyNumber.Deterministic;

/// <summary>
/// Integrates an ODE system across a <see cref="Timeline"/>: segment by segment, applying each
/// segment's changes at its start and restarting the integrator there (a jump invalidates its step
/// history), recording the segment's grid points. Shared by the rate equations and the system-size
/// expansion, so both cut time exactly where the simulators do.
/// </summary>
internal static class TimelineIntegration
{
    /// <param name="run">The integration (its statistics accumulate over the segments).</param>
    /// <param name="timeline">Segments, changes and grid.</param>
    /// <param name="y">The state, advanced in place; holds the state at T on return.</param>
    /// <param name="apply">Applies one change to <paramref name="y"/> (or to the system's parameters).</param>
    /// <param name="record">Records grid point k from the state handed over (valid during the call only).</param>
    public static void Run(OdeRun run, Timeline timeline, double[] y, Action<ScheduledChange> apply, Action<int, double[]> record)
    {
        var offset = 0;
        OutputSink sink = (index, _, state) => record(offset + index, state);
        var times = timeline.Grid.Times;
        foreach (var segment in timeline.Segments)
        {
            foreach (var change in timeline.Changes[segment.FirstChange..segment.EndChange]) apply(change);
            offset = segment.FirstPoint;
            run.Advance(segment.Start, y, segment.End, times[segment.FirstPoint..segment.EndPoint], sink);
        }
    }
}
