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
    /// <param name="triggers">
    /// State-triggered changes (null: none): conditions take their starting values after the changes at 0,
    /// are evaluated after every change instant, and a crossing inside a segment stops the integration
    /// there (located on the dense output), applies the changes and restarts, as at a timed change.
    /// </param>
    /// <param name="stopAtTrigger">
    /// When true, the first triggered change is not applied: the integration ends at its time, and the
    /// time is returned (grid points from it on are not recorded). For the expansions, whose
    /// fluctuations a triggered jump would carry across by no rule of theirs.
    /// </param>
    /// <returns>+∞ when the integration covered the whole grid; the first trigger's time when it stopped there (<paramref name="stopAtTrigger"/>).</returns>
    public static double Run(OdeRun run, Timeline timeline, double[] y, Action<ScheduledChange> apply, Action<int, double[]> record,
        RealStateTriggers? triggers = null, bool stopAtTrigger = false)
    {
        var offset = 0;
        OutputSink sink = (index, _, state) => record(offset + index, state);
        var times = timeline.Grid.Times;
        Func<double[], bool>? turnsTrue = triggers is { Any: true } ? triggers.TurnsTrue : null;
        var first = true;
        foreach (var segment in timeline.Segments)
        {
            foreach (var change in timeline.Changes[segment.FirstChange..segment.EndChange]) apply(change);
            if (turnsTrue is not null)
            {
                if (first) triggers!.Start(y);
                else if (triggers!.TurnsTrue(y))
                {
                    if (stopAtTrigger) return segment.Start;
                    triggers.Fire(segment.Start, y);
                }
            }
            first = false;
            var point = segment.FirstPoint;
            var t = segment.Start;
            while (true)
            {
                offset = point;
                var reached = run.Advance(t, y, segment.End, times[point..segment.EndPoint], sink, turnsTrue);
                if (turnsTrue is null || !turnsTrue(y)) break;
                if (stopAtTrigger) return reached;
                triggers!.Fire(reached, y);
                while (point < segment.EndPoint && times[point] < reached) point++;
                t = reached;
            }
        }
        return double.PositiveInfinity;
    }
}
