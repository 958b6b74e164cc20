using CopyNumber.Deterministic;
using CopyNumber.Network;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

/// <summary>State-triggered changes in the rate equations: crossings located on the dense output.</summary>
public class StateTriggerRateEquationTests(ITestOutputHelper output)
{
    private static ReactionNetwork Load(string text) => ModelLoader.LoadText(text, "trigger.cnet").Model!.Network;

    /// <summary>
    /// Exponential decay X' = −kX from X0, reset to X = X0 whenever X &lt; X0/2 (a counter C counts the
    /// resets): X halves in k⁻¹ ln 2, so the n-th reset is at exactly τ_n = n·k⁻¹ ln 2 and in between
    /// X(t) = X0·exp(−k(t − τ_n)) (first-order kinetics, common practice; the event times derived here).
    /// Each grid point's X gives the time of the last reset, t + ln(X/X0)/k, compared with τ_n; the error
    /// of located event times accumulates over the resets, so this checks every one of them.
    /// </summary>
    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    [InlineData(SolverKind.Auto)]
    public void ADecayResetAtHalfItsStartResetsEveryHalfLife(SolverKind kind)
    {
        const double k = 0.3, x0 = 100;
        var network = Load($"species\n  X = {x0}\n  C = 0\nreactions\n  decay: X -> 0  mass {k}\nchanges\n  X = {x0}, C = C + 1  whenever X < {x0 / 2}\n");
        var halfLife = Math.Log(2) / k;
        var grid = new TimeGrid(until: 20, every: 0.01);
        var solution = RateEquationSolver.Solve(network, grid, new SolverOptions(kind, RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-12));
        var worst = 0.0;
        var checkedPoints = 0;
        for (var p = 0; p < grid.Count; p++)
        {
            var t = grid[p];
            var n = Math.Floor(t / halfLife);
            // Within 10⁻⁶ of a reset the grid point may fall on either side of it: left out.
            if (Math.Abs(t - n * halfLife) < 1e-6 || Math.Abs(t - (n + 1) * halfLife) < 1e-6) continue;
            Assert.True(Math.Abs(solution[p, 1] - n) < 1e-9, $"{n} resets by t = {t}, but C = {solution[p, 1]}");
            var lastReset = t + Math.Log(solution[p, 0] / x0) / k;
            worst = Math.Max(worst, Math.Abs(lastReset - n * halfLife));
            checkedPoints++;
        }
        output.WriteLine($"{kind}: {solution.Statistics.Steps} steps, worst reset-time error {worst:G3} over {checkedPoints} points, {solution[grid.Count - 1, 1]} resets");
        Assert.True(Math.Abs(solution[grid.Count - 1, 1] - Math.Floor(20 / halfLife)) < 1e-9, $"C = {solution[grid.Count - 1, 1]} at the end");
        Assert.True(worst < 1e-7, $"worst reset-time error {worst:G3}");
    }

    [Fact]
    public void TriggersThatTurnTrueTogetherApplyInFileOrderAndATimedChangeCanSetOneOff()
    {
        // X' = 1 (immigration). At X = 2.75 (t = 2.75, between grid points) both lines turn true: A = 5, then A = 2A = 10; B's
        // condition A == 10 turns true in the next round: B = 11. At t = 5 a timed change sets Y = 1,
        // which turns Y > 0 true at once: Z = 7 from t = 5 on.
        var network = Load("species\n  X = 0\n  A = 0\n  B = 0\n  Y = 0\n  Z = 0\nreactions\n  inflow: 0 -> X  mass 1\nchanges\n" +
                           "  A = 5  whenever X >= 2.75\n  A = 2 * A  whenever X >= 2.75\n  B = A + 1  whenever A == 10\n" +
                           "  Y = 1  at time 5\n  Z = 7  whenever Y > 0\n");
        var grid = new TimeGrid(until: 8, every: 0.5);
        var solution = RateEquationSolver.Solve(network, grid, new SolverOptions(RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-12));
        for (var p = 0; p < grid.Count; p++)
        {
            var t = grid[p];
            Assert.Equal(t > 2.75 ? 10 : 0, solution[p, 1]);
            Assert.Equal(t > 2.75 ? 11 : 0, solution[p, 2]);
            Assert.Equal(t >= 5 ? 7 : 0, solution[p, 4]);
        }
    }
}
