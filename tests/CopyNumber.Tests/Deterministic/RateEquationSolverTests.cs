using CopyNumber.Deterministic;
using CopyNumber.Language;
using CopyNumber.Network;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

public class RateEquationSolverTests(ITestOutputHelper output)
{
    private static readonly SolverOptions Tight = new(RelativeTolerance: 1e-9, AbsoluteTolerance: 1e-9);

    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    [InlineData(SolverKind.Auto)]
    public void DimerisationInAVolumeFollowsTheSecondOrderRateLaw(SolverKind kind)
    {
        // 2 A -> 0 with macroscopic k in volume Ω: v = Ω·k·(x/Ω)² per the mass-action convention, so
        // dx/dt = −2k·x²/Ω and x(t) = x₀/(1 + 2k·x₀·t/Ω) (integrated second-order rate law; common practice).
        const double omega = 10, k = 0.01, x0 = 500;
        var net = new HandBuiltNetwork(omega);
        var a = net.Species("A", (long)x0);
        net.MassAction("dimerise", [(a, 2)], [], net.Parameter("k", k));
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(20, 0.5), Tight with { Kind = kind });
        var worst = 0.0;
        for (var p = 0; p < solution.Grid.Count; p++)
            worst = Math.Max(worst, Math.Abs(solution[p, 0] / (x0 / (1 + 2 * k * x0 * solution.Grid[p] / omega)) - 1));
        output.WriteLine($"{kind}: {solution.Statistics.Steps} steps, worst relative error {worst:G3}");
        Assert.True(worst < 1e-7, $"worst relative error {worst:G3}");
    }

    [Fact]
    public void ScheduleChangesApplyExactlyAtTheirTimes()
    {
        // A -> B with rate k·A. Changes: t = 2 (a grid point) A += 500; t = 3.3 (between grid points)
        // A = A/2; t = 5 (a grid point) k = 2k. Between changes A decays exponentially, so the exact
        // trajectory is piecewise A·e^(−k·Δt) (first-order kinetics; common practice); the readout A + B
        // is conserved by the reaction and jumps only with the changes.
        const double k = 0.3, a0 = 1000, b0 = 0;
        var net = new HandBuiltNetwork();
        var a = net.Species("A", (long)a0);
        var b = net.Species("B", (long)b0);
        var rate = net.Parameter("k", k);
        net.MassAction("convert", [(a, 1)], [(b, 1)], rate);
        net.Readout("total", (x, _) => x[a] + x[b]);
        net.ChangeSpecies(2, a, ScheduleOperation.Add, (_, _) => 500);
        net.ChangeSpecies(3.3, a, ScheduleOperation.Set, (x, _) => x[a] / 2);
        net.ChangeParameter(5, rate, (_, p) => 2 * p[rate]);
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(8, 0.5), Tight);

        var a2 = a0 * Math.Exp(-2 * k) + 500;
        var beforeHalving = a2 * Math.Exp(-1.3 * k);
        var a33 = beforeHalving / 2;
        var a5 = a33 * Math.Exp(-1.7 * k);
        double ExactA(double t) => t < 2 ? a0 * Math.Exp(-k * t)
            : t < 3.3 ? a2 * Math.Exp(-k * (t - 2))
            : t < 5 ? a33 * Math.Exp(-k * (t - 3.3))
            : a5 * Math.Exp(-2 * k * (t - 5));
        double ExactTotal(double t) => a0 + b0 + (t >= 2 ? 500 : 0) - (t >= 3.3 ? beforeHalving / 2 : 0);

        Assert.Equal(["A", "B", "total"], solution.Columns);
        for (var p = 0; p < solution.Grid.Count; p++)
        {
            var t = solution.Grid[p];
            Assert.True(Math.Abs(solution[p, a] / ExactA(t) - 1) < 1e-7, $"A({t}) = {solution[p, a]}, exact {ExactA(t)}");
            Assert.True(Math.Abs(solution[p, 2] / ExactTotal(t) - 1) < 1e-7, $"total({t}) = {solution[p, 2]}, exact {ExactTotal(t)}");
        }
        // The change at t = 2 is in force when t = 2 is recorded.
        Assert.True(Math.Abs(solution[4, a] - a2) < 1e-6 * a2, $"A(2) = {solution[4, a]}, after the change {a2}");
    }

    [Fact]
    public void ChangesAtTheStartAndAtTheEndAreRecorded()
    {
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        net.ChangeSpecies(0, a, ScheduleOperation.Set, (_, _) => 50);
        net.ChangeSpecies(1, a, ScheduleOperation.Add, (_, _) => 7);
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(1, 0.5), Tight);
        Assert.Equal(50.0, solution[0, a]);
        // First-order decay from 50 for one time unit, then +7 at the final time.
        Assert.True(Math.Abs(solution[2, a] - (50 * Math.Exp(-1) + 7)) < 1e-6, $"A(1) = {solution[2, a]}");
    }

    [Fact]
    public void GridPointRoundedJustBelowAChangeSeesTheChange()
    {
        // 3·0.3 = 0.8999999999999999 in binary floating point, below a change written at 0.9.
        var grid = new TimeGrid(3, 0.3);
        Assert.True(grid[3] < 0.9);
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        net.ChangeSpecies(0.9, a, ScheduleOperation.Add, (_, _) => 100);
        var solution = RateEquationSolver.Solve(net.Build(), grid, Tight);
        // First-order decay to t = 0.9, then +100.
        Assert.True(Math.Abs(solution[3, a] - (100 * Math.Exp(-0.9) + 100)) < 1e-6, $"A(0.9) = {solution[3, a]}");
    }

    [Fact]
    public void ChangesAnUlpApartNeedNoStepBetweenThem()
    {
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        net.ChangeSpecies(1, a, ScheduleOperation.Add, (_, _) => 10);
        net.ChangeSpecies(Math.BitIncrement(1.0), a, ScheduleOperation.Add, (_, _) => 20);
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(2, 1), Tight);
        // First-order decay with +30 at t = 1 (common practice).
        var exact = (100 * Math.Exp(-1) + 30) * Math.Exp(-1);
        Assert.True(Math.Abs(solution[2, a] - exact) < 1e-6, $"A(2) = {solution[2, a]}, exact {exact}");
    }

    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    public void RateLawWithDerivativeFollowsLogisticGrowth(SolverKind kind)
    {
        // 0 -> A at v = r·A·(1 − A/K): logistic growth, A(t) = K/(1 + (K/A₀ − 1)e^(−rt)) (Verhulst 1838).
        const double r = 0.8, capacity = 1000, a0 = 10;
        var net = new HandBuiltNetwork();
        var a = net.Species("A", (long)a0);
        net.Rate("grow", [], [(a, 1)], (x, _) => r * x[a] * (1 - x[a] / capacity), (a, (x, _) => r * (1 - 2 * x[a] / capacity)));
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(15, 0.25), Tight with { Kind = kind });
        for (var p = 0; p < solution.Grid.Count; p++)
        {
            var exact = capacity / (1 + (capacity / a0 - 1) * Math.Exp(-r * solution.Grid[p]));
            Assert.True(Math.Abs(solution[p, a] / exact - 1) < 1e-7, $"A({solution.Grid[p]}) = {solution[p, a]}, exact {exact}");
        }
        if (kind == SolverKind.Stiff) Assert.True(solution.Statistics.JacobianEvaluations > 0);
    }

    [Fact]
    public void RobertsonAsAReactionNetworkIsStiffAndMatchesTheReference()
    {
        // Robertson's kinetics (Robertson 1966) as reactions in volume Ω = 10⁶ with 10⁶ copies of A:
        // A -> B (0.04), B + C -> A + C (10⁴), 2 B -> B + C (3·10⁷); concentrations x/Ω obey the
        // Robertson equations. Reference at t = 40 from Hairer & Wanner, Solving ODEs II, Sect. IV.1
        // (quoted from memory: 0.7158, 9.185e-6, 0.2842), compared at relative 1e-3.
        const double omega = 1e6;
        var net = new HandBuiltNetwork(omega);
        var a = net.Species("A", (long)omega);
        var b = net.Species("B", 0);
        var c = net.Species("C", 0);
        net.MassAction("r1", [(a, 1)], [(b, 1)], net.Parameter("k1", 0.04));
        net.MassAction("r2", [(b, 1), (c, 1)], [(a, 1), (c, 1)], net.Parameter("k2", 1e4));
        net.MassAction("r3", [(b, 2)], [(b, 1), (c, 1)], net.Parameter("k3", 3e7));
        var solution = RateEquationSolver.Solve(net.Build(), new TimeGrid(40, 1),
            new SolverOptions(RelativeTolerance: 1e-6, AbsoluteTolerance: 1e-6));
        double[] reference = [0.7158, 9.185e-6, 0.2842];
        var last = solution.Grid.Count - 1;
        for (var i = 0; i < 3; i++)
            Assert.True(Math.Abs(solution[last, i] / omega / reference[i] - 1) < 1e-3, $"{solution.Columns[i]}(40) = {solution[last, i]}");
        output.WriteLine($"Robertson network: {solution.Statistics.Steps} steps, {solution.Statistics.MethodsUsed}");
        Assert.True(solution.Statistics.StiffSwitches >= 1);
    }

    [Fact]
    public void NonFiniteScheduledValueStopsWithTimeAndSpecies()
    {
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        net.ChangeSpecies(3, a, ScheduleOperation.Set, (x, _) => Math.Log(x[a] - 1000));
        var failure = Assert.Throws<SolverFailureException>(() => RateEquationSolver.Solve(net.Build(), new TimeGrid(5, 1), Tight));
        Assert.Equal(3.0, failure.Time);
        Assert.Equal("species A", failure.ComponentName);
        Assert.Contains("t = 3", failure.Message);
        Assert.Contains("non-finite", failure.Message);
    }

    [Fact]
    public void ScheduledChangeMayNotMakeACountNegative()
    {
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        net.ChangeSpecies(1, a, ScheduleOperation.Subtract, (_, _) => 60); // 100·e^(−1) ≈ 36.8 < 60
        var failure = Assert.Throws<SolverFailureException>(() => RateEquationSolver.Solve(net.Build(), new TimeGrid(2, 1), Tight));
        Assert.Equal(1.0, failure.Time);
        Assert.Contains("negative", failure.Message);
        Assert.Contains("species A", failure.Message);
    }

    [Fact]
    public void InfiniteRateStopsWithTimeAndSpecies()
    {
        // v = 1/(A − 100) is infinite at the initial state A = 100.
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 100);
        net.Rate("pole", [], [(a, 1)], (x, _) => 1 / (x[a] - 100), (a, (x, _) => -1 / ((x[a] - 100) * (x[a] - 100))));
        var failure = Assert.Throws<SolverFailureException>(() => RateEquationSolver.Solve(net.Build(), new TimeGrid(1, 0.5), Tight));
        Assert.Equal(0.0, failure.Time);
        Assert.Equal("species A", failure.ComponentName);
    }

    [Fact]
    public void UnusableOptionsAreRejectedWithAMessage()
    {
        var net = new HandBuiltNetwork();
        var a = net.Species("A", 1);
        net.MassAction("decay", [(a, 1)], [], net.Parameter("k", 1));
        var error = Assert.Throws<ArgumentException>(() =>
            RateEquationSolver.Solve(net.Build(), new TimeGrid(1, 0.5), new SolverOptions(RelativeTolerance: 2)));
        Assert.Contains("relative tolerance", error.Message);
    }
}
