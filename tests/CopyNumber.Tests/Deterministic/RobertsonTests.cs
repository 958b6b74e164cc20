using CopyNumber.Deterministic;

namespace CopyNumber.Tests.Deterministic;

public class RobertsonTests
{
    // Reference solution at t = 40 from Hairer & Wanner, Solving ODEs II (Sect. IV.1, Robertson's problem),
    // quoted from memory to four digits: compared at relative 1e-3.
    private static readonly double[] AtForty = [0.7158, 9.185e-6, 0.2842];

    private static double[] SolveToForty(SolverKind kind, out OdeStatistics statistics)
    {
        var options = new SolverOptions(kind, RelativeTolerance: 1e-6, AbsoluteTolerance: 1e-12);
        return OdeIntegrator.Integrate(new RobertsonSystem(), 0, [1, 0, 0], [40.0], options, out statistics)[0];
    }

    [Fact]
    public void StiffSolverMatchesReferenceInFewSteps()
    {
        var y = SolveToForty(SolverKind.Stiff, out var statistics);
        for (var i = 0; i < 3; i++)
            Assert.True(Math.Abs(y[i] / AtForty[i] - 1) < 1e-3, $"y{i + 1}(40) = {y[i]}, reference {AtForty[i]}");
        // An L-stable method steps through the stiff phase at accuracy-limited sizes (H&W II, Sect. IV.7);
        // an explicit method would need tens of thousands of steps here (stability limit h·|λ| ≲ 3.3, |λ| ~ 10³–10⁴).
        Assert.True(statistics.Steps < 500, $"{statistics.Steps} steps");
        Assert.Equal(0, statistics.StiffSwitches);
        Assert.Equal("Rodas4", statistics.MethodsUsed);
    }

    [Fact]
    public void StiffSolverKeepsTheLinearInvariant()
    {
        // y₁ + y₂ + y₃ is constant: wᵀf = 0 for w = (1, 1, 1), hence wᵀJ = 0, and every Rosenbrock stage
        // E·u_i = f(…) + Σ(c_ij/h)u_j then gives wᵀu_i = 0, so the method conserves it up to round-off (the
        // Rosenbrock analogue of Hairer, Lubich & Wanner, Geometric Numerical Integration, Thm. IV.1.5 for
        // Runge–Kutta methods; common practice).
        var y = SolveToForty(SolverKind.Stiff, out _);
        Assert.True(Math.Abs(y[0] + y[1] + y[2] - 1) < 1e-12, $"sum = {y[0] + y[1] + y[2]:R}");
    }

    [Fact]
    public void AutoDetectsStiffnessAndSwitches()
    {
        var y = SolveToForty(SolverKind.Auto, out var statistics);
        for (var i = 0; i < 3; i++)
            Assert.True(Math.Abs(y[i] / AtForty[i] - 1) < 1e-3, $"y{i + 1}(40) = {y[i]}, reference {AtForty[i]}");
        Assert.True(statistics.StiffnessDetected);
        Assert.True(statistics.StiffSwitches >= 1);
        Assert.Equal("Dormand–Prince 5(4), Rodas4", statistics.MethodsUsed);
        Assert.True(statistics.StiffSteps > 0 && statistics.ExplicitSteps > 0);
        Assert.True(statistics.Steps < 1000, $"{statistics.Steps} steps");
    }

    [Fact]
    public void ExplicitSolverRunsOutOfStepsAndSaysWhy()
    {
        var options = new SolverOptions(SolverKind.Explicit, MaxSteps: 2000);
        var failure = Assert.Throws<SolverFailureException>(() =>
            OdeIntegrator.Integrate(new RobertsonSystem(), 0, [1, 0, 0], [40.0], options, out _));
        Assert.Contains("more than 2000 steps", failure.Message);
        Assert.Contains("stiff", failure.Message);
        Assert.True(failure.Time > 0 && failure.Time < 40);
    }
}
