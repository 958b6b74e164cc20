using CopyNumber.Network;

namespace CopyNumber.Reports;

/// <summary>
/// The instants at which a network's schedule changes something, as drawn on every time axis. They are read from
/// <see cref="Timeline"/>, the one implementation of the schedule (repetitions expanded, coincidence with grid times
/// applied), never derived again here: a segment after the first starts at a change instant.
/// </summary>
internal static class ScheduleMarks
{
    public static double[] Of(ReactionNetwork network, TimeGrid grid)
    {
        var segments = Timeline.Of(network, grid).Segments;
        var times = new double[Math.Max(0, segments.Length - 1)];
        for (int s = 1; s < segments.Length; s++) times[s - 1] = segments[s].Start;
        return times;
    }
}
