using System.Runtime.CompilerServices;

namespace CopyNumber.Stochastic;

/// <summary>
/// Stops an exact replicate that cannot finish in any useful time, instead of letting it run for hours: an
/// explosive network such as <c>X -> 2 X</c> without a decay fires ever faster, and a count that an exact
/// method changes one event at a time would need ~2^62 events to reach the overflow limit.
/// </summary>
/// <remarks>
/// <para>Every 2^16 events, and only when the replicate has no event limit of its own, the number of events
/// still needed to reach the segment's end T is projected from the total propensity a0 at time t and its
/// observed growth, and compared with the replicate's bound (<see cref="BoundFor"/>). Checking so rarely
/// costs one mask-and-branch per event. An explicit event limit (--max-events) turns the guard off: the
/// user has then said how much work a replicate may take.</para>
/// <para>The projection (docs/methods.md, "Runaway guard"): with (t0, a0(t0)) the replicate's first check
/// with a0 &gt; 0 and (tw, a0(tw)) a recent one, the growth rate is
/// r = min(ln(a0(t)/a0(t0))/(t − t0), ln(a0(t)/a0(tw))/(t − tw)), the smaller of the whole history's and
/// the recent window's, so growth that has stopped (a saturating population) or was noise (a stationary
/// one) does not count. The remaining events are then
/// max(a0·(T − t), a0·(e^(r·h) − 1)/r) with h = min(T − t, t − t0): the exponential is never extrapolated
/// further ahead than growth has been observed, so the projection is at most a0·(T − t)·a0(t)/a0(t0), the
/// linear one times the growth already seen. For linear autocatalysis (a0 = λx, r = λ) it is the Yule
/// process's expected count of further events, x·(e^(λh) − 1) (Yule 1925). The window restarts at a check
/// once it covers at least half of the history, so it spans the last half to quarter of the replicate.</para>
/// <para>A check at an earlier time than the previous one begins a new replicate (the state is per
/// simulator and replicates restart at t = 0), so no simulator has to reset the guard.</para>
/// </remarks>
internal struct RunawayGuard
{
    /// <summary>Projected remaining events above which an unlimited replicate is stopped, when it is the run's only one.</summary>
    public const double EventBound = 1e10;

    /// <summary>
    /// Events a whole run may be projected to need (all replicates together, ~100 minutes of one core at the
    /// fastest rates of docs/performance.md) before its replicates are stopped as explosive.
    /// </summary>
    public const double RunEventBound = 1e11;

    /// <summary>The per-replicate bound never falls below this, however many replicates a run has.</summary>
    public const double LeastEventBound = 1e8;

    private const long CheckMask = (1L << 16) - 1;

    private readonly double _bound;
    private double _originTime;
    private double _originTotal;
    private double _windowTime;
    private double _windowTotal;
    private double _lastTime;

    /// <summary>A guard that stops a replicate projected to need more than <paramref name="bound"/> further events.</summary>
    public RunawayGuard(double bound)
    {
        _bound = bound;
        _lastTime = double.PositiveInfinity;
    }

    /// <summary>The bound this guard applies (events per replicate).</summary>
    public readonly double Bound => _bound;

    /// <summary>
    /// The per-replicate bound of a run of <paramref name="replicates"/>: <see cref="RunEventBound"/> shared
    /// among them, but never more than <see cref="EventBound"/> nor less than <see cref="LeastEventBound"/>.
    /// </summary>
    public static double BoundFor(long replicates) =>
        Math.Clamp(RunEventBound / Math.Max(1, replicates), LeastEventBound, EventBound);

    /// <summary>True on the events where the projection is checked.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Due(long fired, long maxEvents) => (fired & CheckMask) == 0 && maxEvents == long.MaxValue;

    /// <summary>
    /// Records a check at <paramref name="time"/> with total propensity <paramref name="total"/> (events per
    /// unit time) and returns true when the projected remaining events to <paramref name="horizon"/> exceed
    /// the bound; <paramref name="projected"/> and <paramref name="growth"/> (r, per unit time) say why.
    /// </summary>
    public bool Exceeded(double total, double time, double horizon, out double projected, out double growth)
    {
        if (time < _lastTime || _originTotal <= 0)
        {
            // A new replicate (or no propensity seen yet): this check is the origin of its history.
            _originTime = _windowTime = time;
            _originTotal = _windowTotal = total;
        }
        _lastTime = time;
        growth = 0.0;
        var left = Math.Max(0.0, horizon - time);
        projected = total * left;
        var history = time - _originTime;
        if (history > 0 && total > 0 && _originTotal > 0)
        {
            var whole = Math.Log(total / _originTotal) / history;
            var recent = time > _windowTime ? Math.Log(total / _windowTotal) / (time - _windowTime) : whole;
            growth = Math.Max(0.0, Math.Min(whole, recent));
            if (growth > 0)
            {
                var ahead = Math.Min(left, history);
                projected = Math.Max(projected, total * double.ExpM1(growth * ahead) / growth);
            }
            if (time - _windowTime >= history / 2)
            {
                _windowTime = time;
                _windowTotal = total;
            }
        }
        return projected > _bound;
    }
}
