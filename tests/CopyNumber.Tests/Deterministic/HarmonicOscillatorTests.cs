using CopyNumber.Deterministic;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// q'' = −ω²q over 100 periods: q = cos ωt, p = −ω sin ωt, energy (p² + ω²q²)/2 constant. Neither method is
/// symplectic, so the energy drifts; each accepted step changes the relative energy by at most about
/// 2× the accepted local error (δE/E ≈ 2δy/y), which the step control keeps below rtol, so the drift
/// is bounded by 2·steps·rtol (Hairer, Lubich &amp; Wanner, Geometric Numerical Integration, Sect. I.1 on
/// the linear energy drift of non-symplectic methods; common practice).
/// </summary>
public class HarmonicOscillatorTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(SolverKind.Explicit, 1e-9)]
    [InlineData(SolverKind.Stiff, 1e-7)]
    public void EnergyDriftStaysWithinTolerancePerStep(SolverKind kind, double tolerance)
    {
        const double omega = 3.0;
        const int periods = 100;
        var oscillator = new HarmonicOscillator(omega);
        var period = 2 * Math.PI / omega;
        var times = Enumerable.Range(1, periods).Select(k => k * period).ToArray();
        var options = new SolverOptions(kind, RelativeTolerance: tolerance, AbsoluteTolerance: 1e-3 * tolerance);
        double[] y0 = [1, 0];
        var y = OdeIntegrator.Integrate(oscillator, 0, y0, times, options, out var statistics);

        var e0 = oscillator.Energy(y0);
        var drift = times.Select((_, k) => Math.Abs(oscillator.Energy(y[k]) / e0 - 1)).Max();
        var bound = 2.0 * statistics.Steps * options.RelativeTolerance;
        output.WriteLine($"{kind}: {statistics.Steps} steps, max relative energy drift {drift:G3}, bound {bound:G3}, q(T) − 1 = {y[^1][0] - 1:G3}");
        Assert.True(drift < bound, $"drift {drift:G3} ≥ {bound:G3}");
        // After whole periods the exact state is again (1, 0); the phase error obeys the same per-step bound.
        Assert.True(Math.Abs(y[^1][0] - 1) < bound && Math.Abs(y[^1][1]) < omega * bound, $"end state ({y[^1][0]}, {y[^1][1]})");
    }
}
