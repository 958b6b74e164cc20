using CopyNumber.Deterministic;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// Outputs between steps come from dense output (Dormand–Prince's continuous extension, H&amp;W I, Sect.
/// II.6; RODAS' continuous extension, H&amp;W II, Sect. IV.7), so they are as accurate as the step points and never change the steps.
/// Reference: y' = y·cos t has y = e^(sin t).
/// </summary>
public class DenseOutputTests(ITestOutputHelper output)
{
    private static readonly double[] ManyTimes =
        Enumerable.Range(1, 997).Select(k => 10.0 * k / 997 + 1e-3 * Math.Sin(k)).Append(10.0).ToArray();

    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    public void OffStepOutputsAreAccurateAndDoNotForceSteps(SolverKind kind)
    {
        var options = new SolverOptions(kind, RelativeTolerance: 1e-8, AbsoluteTolerance: 1e-12);
        var few = OdeIntegrator.Integrate(new Modulated(), 0, [1], [10.0], options, out var fewStatistics);
        var many = OdeIntegrator.Integrate(new Modulated(), 0, [1], ManyTimes, options, out var manyStatistics);

        // The final value is hit exactly by both runs, with identical steps.
        Assert.Equal(fewStatistics.Steps, manyStatistics.Steps);
        Assert.Equal(fewStatistics.FunctionEvaluations, manyStatistics.FunctionEvaluations);
        Assert.Equal(few[0][0], many[^1][0]);
        Assert.True(manyStatistics.Steps < ManyTimes.Length, $"{manyStatistics.Steps} steps for {ManyTimes.Length} outputs");

        var worst = 0.0;
        for (var k = 0; k < ManyTimes.Length; k++)
        {
            var exact = Modulated.Exact(ManyTimes[k]);
            worst = Math.Max(worst, Math.Abs(many[k][0] - exact) / (options.RelativeTolerance * exact));
        }
        output.WriteLine($"{kind}: {manyStatistics.Steps} steps, worst dense-output error {worst:G3} × rtol");
        // Same multiple-of-tolerance allowance as at step points (common practice).
        Assert.True(worst < 10, $"worst error {worst:G3} × rtol");
    }

    [Fact]
    public void OutputAtTheStartReturnsTheInitialState()
    {
        var y = OdeIntegrator.Integrate(new Modulated(), 0, [1], [0.0, 0.0, 1.0], new SolverOptions(), out _);
        Assert.Equal(1.0, y[0][0]);
        Assert.Equal(1.0, y[1][0]);
        Assert.True(Math.Abs(y[2][0] - Modulated.Exact(1)) < 1e-5);
    }
}
