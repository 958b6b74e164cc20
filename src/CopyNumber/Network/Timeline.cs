using System.Runtime.CompilerServices;

namespace CopyNumber.Network;

/// <summary>
/// A network's schedule and a time grid merged into one sequence of segments, the single source of
/// "when" for the rate equations, the linear noise approximation and every simulator.
/// </summary>
/// <remarks>
/// <para>Coincidence rule: a change whose time lies within <see cref="CoincidenceTolerance"/>·Δ of a
/// grid time is at that grid time; its time is replaced by the grid time itself, so every consumer
/// afterwards compares times exactly and all agree. The tolerance 10⁻⁹·Δ is far above the round-off of
/// k·Δ (at most about k·Δ·1.1·10⁻¹⁶, below 10⁻¹⁰·Δ for grids of up to 10⁶ points) and of a change time
/// written as an expression (3 × 0.3 = 0.8999999999999999 against 0.9), and far below any spacing a
/// user means. Changes at or within the tolerance of 0 (or before it) act on the initial state; changes
/// later than T by more than the tolerance are never reached.</para>
/// <para>Grid and change at one instant: the grid records the state after the change (the recorded
/// path is right-continuous). Changes at one instant apply in file order
/// (<see cref="ScheduledChange.Order"/>).</para>
/// <para>Repeating changes (<see cref="ScheduledChange.Every"/>) are expanded here, and only here, into
/// one change per instance at Time + k·Every (k·Every computed by multiplication, not by summing, so
/// round-off does not accumulate), up to <see cref="ScheduledChange.Until"/> (inclusive within
/// 10⁻⁹·Every) and T; each instance then follows the coincidence rule like any other change.</para>
/// <para>Segments: segment s starts at <see cref="Segment.Start"/>, where its changes
/// [<see cref="Segment.FirstChange"/>, <see cref="Segment.EndChange"/>) apply first (segment 0: the
/// changes acting at 0), and runs to <see cref="Segment.End"/>, the next change instant or T; it records
/// the grid points at times in [Start, End), and the last segment also T.</para>
/// Immutable; built once per network and grid (<see cref="Of"/> caches it) and shared by threads.
/// </remarks>
public sealed class Timeline
{
    /// <summary>A change time within this fraction of the grid spacing Δ of a grid time is at that grid time.</summary>
    public const double CoincidenceTolerance = 1e-9;

    /// <summary>The most instances one repeating change may have on one grid; more is refused as a mistake of the period.</summary>
    public const long MaxRepetitions = 1_000_000;

    private static readonly ConditionalWeakTable<ReactionNetwork, ConditionalWeakTable<TimeGrid, Timeline>> Cache = new();

    private readonly ScheduledChange[] _changes;
    private readonly Segment[] _segments;

    private Timeline(TimeGrid grid, ScheduledChange[] changes, Segment[] segments)
    {
        Grid = grid;
        _changes = changes;
        _segments = segments;
    }

    /// <summary>The recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>
    /// The changes that take effect, in the order they apply, each with its effective time (0 for those
    /// acting on the initial state, the grid time for those that coincide with one).
    /// </summary>
    public ReadOnlySpan<ScheduledChange> Changes => _changes;

    /// <summary>The segments, in time order; there is always at least one.</summary>
    public ReadOnlySpan<Segment> Segments => _segments;

    /// <summary>The timeline of <paramref name="network"/>'s schedule on <paramref name="grid"/>, built once per pair.</summary>
    public static Timeline Of(ReactionNetwork network, TimeGrid grid)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        return Cache.GetValue(network, _ => new ConditionalWeakTable<TimeGrid, Timeline>()).GetValue(grid, g => Build(network.Schedule, g));
    }

    private static readonly ConditionalWeakTable<ReactionNetwork, ConditionalWeakTable<TimeGrid, Timeline>> MeanCellCache = new();

    /// <summary>
    /// The timeline the rate equations and the expansions integrate across: <see cref="Of"/>, and for a
    /// network with a cell cycle also the mean cell's divisions and gene doublings (<see cref="CellCycle.MeanCellChanges"/>).
    /// </summary>
    public static Timeline ForRateEquations(ReactionNetwork network, TimeGrid grid)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(grid);
        if (network.Cycle is not { } cycle) return Of(network, grid);
        return MeanCellCache.GetValue(network, _ => new ConditionalWeakTable<TimeGrid, Timeline>())
            .GetValue(grid, g => Build([.. network.Schedule, .. cycle.MeanCellChanges(network)], g));
    }

    /// <summary>Builds the timeline of <paramref name="schedule"/> (sorted by time, file order within a time) on <paramref name="grid"/>.</summary>
    public static Timeline Build(IReadOnlyList<ScheduledChange> schedule, TimeGrid grid)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        ArgumentNullException.ThrowIfNull(grid);
        var changes = new List<ScheduledChange>(schedule.Count);
        foreach (var change in schedule)
        {
            if (change.Every is not { } every)
            {
                Add(change, change.Time);
                continue;
            }
            var last = Math.Min(change.Until + CoincidenceTolerance * every, grid.Until + CoincidenceTolerance * grid.Every);
            var count = last < change.Time ? 0 : Math.Floor((last - change.Time) / every) + 1;
            if (count > MaxRepetitions)
                throw new ArgumentException(
                    $"the repeating change of '{change.TargetName}' every {every:G6} would happen {count:G3} times before the final time {grid.Until:G6}; at most {MaxRepetitions:N0} are allowed",
                    nameof(schedule));
            var instance = change with { Every = null };
            for (var k = 0L; k < (long)count; k++)
            {
                var time = change.Time + k * every;
                if (time > last) break;
                Add(instance, time);
            }
        }
        // Snapping is monotone, so the order by time (file order within a time) survives; a stable sort
        // by time, then file order, also merges the instances of repeating changes.
        var ordered = changes.OrderBy(c => c.Time).ThenBy(c => c.Order).ToArray();

        var segments = new List<Segment>();
        var next = 0;
        var start = 0.0;
        var point = 0;
        while (true)
        {
            var first = next;
            while (next < ordered.Length && ordered[next].Time <= start) next++;
            var end = next < ordered.Length ? ordered[next].Time : grid.Until;
            var last = next == ordered.Length;
            var stop = point;
            while (stop < grid.Count && (grid[stop] < end || (last && grid[stop] <= end))) stop++;
            segments.Add(new Segment(start, end, point, stop, first, next));
            point = stop;
            if (last) break;
            start = end;
        }
        return new Timeline(grid, ordered, segments.ToArray());

        void Add(ScheduledChange change, double written)
        {
            if (EffectiveTime(written, grid) is not { } at) return;
            changes.Add(at == change.Time ? change : change with { Time = at });
        }
    }

    /// <summary>
    /// When a change written for <paramref name="time"/> takes effect on <paramref name="grid"/>: 0 for
    /// times at or before 0, the grid time it coincides with, the time itself, or null past the end.
    /// </summary>
    public static double? EffectiveTime(double time, TimeGrid grid)
    {
        ArgumentNullException.ThrowIfNull(grid);
        var tolerance = CoincidenceTolerance * grid.Every;
        if (time <= tolerance) return 0.0;
        if (time > grid.Until + tolerance) return null;
        var nearest = Nearest(time, grid);
        return Math.Abs(grid[nearest] - time) <= tolerance ? grid[nearest] : time;
    }

    private static int Nearest(double time, TimeGrid grid)
    {
        var k = (int)Math.Clamp(Math.Round(time / grid.Every), 0, grid.Count - 1);
        // The last point may be T rather than k·Δ: look at the neighbours too.
        var best = k;
        for (var j = Math.Max(0, k - 1); j <= Math.Min(grid.Count - 1, k + 1); j++)
            if (Math.Abs(grid[j] - time) < Math.Abs(grid[best] - time)) best = j;
        if (Math.Abs(grid[grid.Count - 1] - time) < Math.Abs(grid[best] - time)) best = grid.Count - 1;
        return best;
    }

    /// <summary>One stretch of the timeline between change instants.</summary>
    /// <param name="Start">Start time; the segment's changes apply here, before anything is recorded.</param>
    /// <param name="End">End time: the next change instant, or T for the last segment.</param>
    /// <param name="FirstPoint">First grid index recorded in this segment.</param>
    /// <param name="EndPoint">One past the last grid index recorded in this segment.</param>
    /// <param name="FirstChange">First index into <see cref="Changes"/> applied at <paramref name="Start"/>.</param>
    /// <param name="EndChange">One past the last change applied at <paramref name="Start"/>.</param>
    public readonly record struct Segment(double Start, double End, int FirstPoint, int EndPoint, int FirstChange, int EndChange);
}
