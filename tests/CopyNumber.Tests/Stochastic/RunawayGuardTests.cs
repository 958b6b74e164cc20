using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The runaway projection (docs/methods.md, "Runaway guard") fed with total propensities a0(t) whose
/// further event counts are known in closed form, so the projection's value, not only its verdict, is checked.
/// </summary>
public sealed class RunawayGuardTests
{
    private static double Project(ref RunawayGuard guard, IEnumerable<(double Time, double Total)> checks, double horizon, out double growth)
    {
        var projected = 0.0;
        growth = 0.0;
        foreach (var (time, total) in checks) guard.Exceeded(total, time, horizon, out projected, out growth);
        return projected;
    }

    [Fact]
    public void Exponential_growth_of_a0_is_projected_as_the_Yule_process_expectation()
    {
        // a0(t) = λ·x0·e^(λt) for X -> 2X (Yule 1925): the expected events in (t, t + h] are x(t)·(e^(λh) − 1).
        var guard = new RunawayGuard(RunawayGuard.EventBound);
        var checks = Enumerable.Range(0, 11).Select(k => (k * 1.0, 10 * Math.Exp(k * 1.0)));
        var projected = Project(ref guard, checks, horizon: 20, out var growth);
        Assert.Equal(1.0, growth, 1e-12);
        // At t = 10 the history is 10 long and 10 remain: h = 10.
        Assert.Equal(10 * Math.Exp(10) * (Math.Exp(10) - 1), projected, 1e-6 * projected);
    }

    [Fact]
    public void Growth_is_not_extrapolated_further_ahead_than_it_was_observed()
    {
        // Same growth seen over 2 time units with 98 left: the projection is x·(e^2 − 1), not x·(e^98 − 1).
        var guard = new RunawayGuard(RunawayGuard.EventBound);
        var projected = Project(ref guard, [(0, 10), (1, 10 * Math.E), (2, 10 * Math.E * Math.E)], horizon: 100, out _);
        var a0 = 10 * Math.E * Math.E;
        Assert.Equal(Math.Max(a0 * 98, a0 * (Math.E * Math.E - 1)), projected, 1e-9 * projected);
    }

    [Fact]
    public void A_saturated_population_is_projected_linearly_once_the_recent_window_shows_no_growth()
    {
        // Logistic a0(t) = K/(1 + (K/a0(0) − 1)·e^(−t)) with K = 10^5 from 10 (common practice, the logistic
        // equation): by t = 60 the last half of the history shows a0 constant to 1e-15, so the projection is
        // a0·(T − t) and a 10^4-long run at 10^5 events per unit time (10^9 events) is not called explosive.
        const double k = 1e5;
        var guard = new RunawayGuard(2e9);
        var checks = Enumerable.Range(0, 61).Select(i => (i * 1.0, k / (1 + (k / 10 - 1) * Math.Exp(-i))));
        var projected = Project(ref guard, checks, horizon: 10_060, out var growth);
        Assert.True(growth < 1e-9, $"growth {growth}");
        Assert.Equal(k * 10_000, projected, 1e-6 * projected);
        Assert.False(guard.Exceeded(k, 61, 10_060, out _, out _));
    }

    [Fact]
    public void Stationary_fluctuations_are_never_projected_beyond_the_linear_projection_times_the_growth_seen()
    {
        // a0 jumping between 5 and 20 (a stationary low-copy process) over a long run: by construction the
        // projection is at most a0·(T − t)·a0(t)/a0(t0) (docs/methods.md), here at most 4× the linear one.
        var guard = new RunawayGuard(double.MaxValue);
        var rng = new Random(7);
        double time = 0, worst = 0;
        var first = 0.0;
        for (var i = 0; i < 2000; i++)
        {
            var total = rng.Next(2) == 0 ? 5.0 : 20.0;
            if (i == 0) first = total;
            guard.Exceeded(total, time, 1e6, out var projected, out _);
            worst = Math.Max(worst, projected / (total * (1e6 - time)) / Math.Max(1, total / first));
            time += rng.NextDouble() * 100;
        }
        Assert.InRange(worst, 1.0, 1.0 + 1e-12);
    }

    [Fact]
    public void A_check_at_an_earlier_time_starts_a_new_replicate()
    {
        var guard = new RunawayGuard(RunawayGuard.EventBound);
        Project(ref guard, [(0, 10), (5, 10 * Math.Exp(5))], horizon: 10, out var grown);
        Assert.Equal(1.0, grown, 1e-12);
        var projected = Project(ref guard, [(0, 10), (1, 10)], horizon: 10, out var growth);
        Assert.Equal(0.0, growth);
        Assert.Equal(10 * 9, projected, 1e-12);
    }

    [Theory]
    [InlineData(1, 1e10)]
    [InlineData(10, 1e10)]
    [InlineData(100, 1e9)]
    [InlineData(1_000_000, 1e8)]
    public void The_per_replicate_bound_is_the_run_bound_shared_among_replicates_within_limits(long replicates, double bound) =>
        Assert.Equal(bound, RunawayGuard.BoundFor(replicates));
}
