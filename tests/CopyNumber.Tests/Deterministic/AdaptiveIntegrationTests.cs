using CopyNumber.Deterministic;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

public class AdaptiveIntegrationTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    [InlineData(SolverKind.Auto)]
    public void DimerisationFollowsTheSecondOrderRateLaw(SolverKind kind)
    {
        // 2A → 0: A(t) = A₀/(1 + 2kA₀t) (integrated second-order rate law; common practice).
        var dimer = new Dimerisation(0.01);
        var times = Enumerable.Range(0, 51).Select(k => 0.2 * k).ToArray();
        var options = new SolverOptions(kind, RelativeTolerance: 1e-8, AbsoluteTolerance: 1e-10);
        var y = OdeIntegrator.Integrate(dimer, 0, [500], times, options, out var statistics);
        var worst = times.Select((t, k) => Math.Abs(y[k][0] / dimer.Exact(500, t) - 1)).Max();
        output.WriteLine($"{kind}: {statistics.Steps} steps, worst relative error {worst:G3}");
        Assert.True(worst < 10 * options.RelativeTolerance, $"worst relative error {worst:G3}");
    }

    [Fact]
    public void StiffSolverFollowsProtheroRobinsonWithoutResolvingLambda()
    {
        // Prothero & Robinson (1974, Math. Comp. 28:145): y' = λ(y − sin t) + cos t, y = sin t; λ = −10⁶.
        // Non-autonomous, so ∂f/∂t enters every stage. Explicit stepping would need ≥ 10⁶·10/3.3 steps.
        // Checked at the end point, which a step hits exactly: the stiffly accurate error estimate does not
        // see the driver sin t, so steps grow past its time scale and points between steps are not controlled.
        var options = new SolverOptions(SolverKind.Stiff, RelativeTolerance: 1e-6, AbsoluteTolerance: 1e-8);
        var y = OdeIntegrator.Integrate(new ProtheroRobinson(-1e6), 0, [0], [10.0], options, out var statistics);
        var error = Math.Abs(y[0][0] - Math.Sin(10));
        output.WriteLine($"Prothero–Robinson: {statistics.Steps} steps, error at t = 10: {error:G3}");
        // |y| ≤ 1: an absolute error of 10·(rtol + atol) is a few times the tolerance.
        Assert.True(error < 10 * (options.RelativeTolerance + options.AbsoluteTolerance), $"error {error:G3}");
        Assert.True(statistics.Steps < 1000, $"{statistics.Steps} steps");
    }

    [Fact]
    public void StiffDenseOutputDoesNotAmplifyByLambda()
    {
        // The same problem with the driver as an oscillator component (autonomous, like a fast equilibrium
        // slaved to slow species): every output between steps must match sin t. A Hermite cubic through
        // f = λ(y₁ − y₂) + y₃ would turn a 10⁻⁷ state error into a 0.1 slope error here.
        var times = Enumerable.Range(1, 100).Select(k => 0.1 * k).ToArray();
        var options = new SolverOptions(SolverKind.Stiff, RelativeTolerance: 1e-6, AbsoluteTolerance: 1e-8);
        var y = OdeIntegrator.Integrate(new SlavedProtheroRobinson(-1e6), 0, [0, 0, 1], times, options, out var statistics);
        var worst = times.Select((t, k) => Math.Abs(y[k][0] - Math.Sin(t))).Max();
        output.WriteLine($"slaved Prothero–Robinson: {statistics.Steps} steps, worst error {worst:G3}");
        Assert.True(worst < 10 * (options.RelativeTolerance + options.AbsoluteTolerance), $"worst error {worst:G3}");
        Assert.True(statistics.Steps < 1000, $"{statistics.Steps} steps");
    }

    [Fact]
    public void AutoSwitchesToStiffAndBackWhenStiffnessFades()
    {
        // Stiff while a₀e^(−5t)·h is large, non-stiff once a(t) has fallen below the accuracy-limited 1/h.
        var system = new FadingStiffness(1e4);
        var times = Enumerable.Range(1, 60).Select(k => 0.25 * k).ToArray();
        var options = new SolverOptions(SolverKind.Auto, RelativeTolerance: 1e-7, AbsoluteTolerance: 1e-12);
        var y = OdeIntegrator.Integrate(system, 0, [1, 1, 0], times, options, out var statistics);
        var worst = 0.0;
        for (var k = 0; k < times.Length; k++)
        {
            var exact = FadingStiffness.Exact(times[k]);
            for (var i = 0; i < 3; i++)
                worst = Math.Max(worst, Math.Abs(y[k][i] - exact[i]) / (options.RelativeTolerance + options.AbsoluteTolerance));
        }
        output.WriteLine($"fading stiffness: {statistics.Steps} steps ({statistics.ExplicitSteps} explicit, {statistics.StiffSteps} stiff), "
            + $"switches {statistics.StiffSwitches}/{statistics.NonStiffSwitches}, worst {worst:G3} × tolerance");
        Assert.True(statistics.StiffSwitches >= 1, "never switched to the stiff method");
        Assert.True(statistics.NonStiffSwitches >= 1, "never switched back");
        Assert.True(worst < 10, $"worst error {worst:G3} × tolerance");
    }
}
