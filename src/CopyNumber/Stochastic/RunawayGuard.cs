using System.Runtime.CompilerServices;

namespace CopyNumber.Stochastic;

/// <summary>
/// Stops an exact replicate that cannot finish in any useful time, instead of letting it run for days: an
/// explosive network such as <c>X -> 2 X</c> without a decay fires ever faster, and a count that an exact
/// method changes one event at a time would need ~2^62 events to reach the overflow limit.
/// </summary>
/// <remarks>
/// Every 2^16 events, and only when the replicate has no event limit of its own, the projected number of
/// remaining events a0·(T − t) (the total propensity times the span left to the segment's end) is compared
/// with <see cref="EventBound"/> = 10^10, which is several minutes of one core at the fastest rates measured
/// in docs/performance.md. Checking so rarely costs one mask-and-branch per event. An explicit event
/// limit (--max-events) turns the guard off: the user has then said how much work a replicate may take.
/// </remarks>
internal static class RunawayGuard
{
    /// <summary>Projected remaining events above which an unlimited replicate is stopped.</summary>
    public const double EventBound = 1e10;

    private const long CheckMask = (1L << 16) - 1;

    /// <summary>True on the events where the projection is checked.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Due(long fired, long maxEvents) => (fired & CheckMask) == 0 && maxEvents == long.MaxValue;

    /// <summary>True when a0·(horizon − time) events are more than the bound.</summary>
    public static bool Exceeded(double total, double time, double horizon) => total * (horizon - time) > EventBound;
}
