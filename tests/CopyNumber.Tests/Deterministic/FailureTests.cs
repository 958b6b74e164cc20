using CopyNumber.Deterministic;

namespace CopyNumber.Tests.Deterministic;

public class FailureTests
{
    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    public void BlowUpStopsWithTimeAndComponent(SolverKind kind)
    {
        // y' = y², y(0) = 1 has y = 1/(1 − t): no solution past t = 1.
        var failure = Assert.Throws<SolverFailureException>(() =>
            OdeIntegrator.Integrate(new BlowUp(), 0, [1], [2.0], new SolverOptions(kind), out _));
        // The numerical solution may run a hair past the singularity before the step size collapses.
        Assert.InRange(failure.Time, 0.99, 1.01);
        Assert.Equal("component 0", failure.ComponentName);
        Assert.Contains("below round-off", failure.Message);
    }

    [Fact]
    public void BadArgumentsGetMessages()
    {
        var options = new SolverOptions();
        var decreasing = Assert.Throws<ArgumentException>(() =>
            OdeIntegrator.Integrate(new Modulated(), 0, [1], [1.0, 0.5], options, out _));
        Assert.Contains("nondecreasing", decreasing.Message);
        var before = Assert.Throws<ArgumentException>(() =>
            OdeIntegrator.Integrate(new Modulated(), 1, [1], [0.5], options, out _));
        Assert.Contains("at or after the start", before.Message);
        var size = Assert.Throws<ArgumentException>(() =>
            OdeIntegrator.Integrate(new Modulated(), 0, [1, 2], [1.0], options, out _));
        Assert.Contains("2 components", size.Message);
        var nan = Assert.Throws<ArgumentException>(() =>
            OdeIntegrator.Integrate(new Modulated(), 0, [double.NaN], [1.0], options, out _));
        Assert.Contains("not finite", nan.Message);
    }

    [Fact]
    public void OptionsAreChecked()
    {
        Assert.Null(new SolverOptions().Check());
        Assert.Contains("relative tolerance", new SolverOptions(RelativeTolerance: -1).Check());
        Assert.Contains("absolute tolerance", new SolverOptions(AbsoluteTolerance: double.NaN).Check());
        Assert.Contains("both be 0", new SolverOptions(RelativeTolerance: 0, AbsoluteTolerance: 0).Check());
        Assert.Contains("step limit", new SolverOptions(MaxSteps: 0).Check());
        Assert.Throws<ArgumentException>(() =>
            OdeIntegrator.Integrate(new Modulated(), 0, [1], [1.0], new SolverOptions(MaxSteps: -3), out _));
    }
}
