using CopyNumber.Deterministic;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// Empirical orders of the coefficient tables with fixed steps: a method of order p has global error
/// C·h^p, a local (one-step) error and embedded estimate of order q has C·h^(q+1), so halving h divides
/// them by 2^p or 2^(q+1) (Hairer, Nørsett &amp; Wanner, Solving ODEs I, Sect. II.3; H&amp;W II, Sect. IV.7).
/// Expected orders: Dormand–Prince 5, estimate 4, dense output 4 (Dormand &amp; Prince 1980; H&amp;W I,
/// Sect. II.5–6); Rodas4 4, estimate 3, dense output 3 (H&amp;W II, Sect. IV.7).
/// </summary>
public class StepperOrderTests(ITestOutputHelper output)
{
    // atol = 1, rtol = 0 makes the scaled error norm the raw error (one component).
    private static readonly SolverOptions RawError = new(RelativeTolerance: 0, AbsoluteTolerance: 1);

    private static OdeStepper NewStepper(bool stiff, IOdeSystem system) => stiff
        ? new RosenbrockRodas4(system, RawError, new OdeStatistics())
        : new DormandPrince54(system, RawError, new OdeStatistics());

    private static void Start(OdeStepper stepper, IOdeSystem system, double t0, double y0)
    {
        var f = new double[1];
        system.Derivative(t0, [y0], f);
        stepper.Start(t0, [y0], f);
    }

    private static double GlobalError(bool stiff, IOdeSystem system, Func<double, double> exact, double y0, double end, int steps)
    {
        var stepper = NewStepper(stiff, system);
        Start(stepper, system, 0, y0);
        for (var k = 1; k <= steps; k++)
        {
            stepper.Attempt(end * k / steps);
            stepper.Accept();
        }
        return Math.Abs(stepper.State[0] - exact(end));
    }

    private double ObservedOrder(string what, Func<int, double> errorWithHalvings)
    {
        var coarse = errorWithHalvings(0);
        var fine = errorWithHalvings(1);
        var order = Math.Log2(coarse / fine);
        output.WriteLine($"{what}: {coarse:G3} -> {fine:G3}, order {order:F2}");
        return order;
    }

    [Fact]
    public void DormandPrinceGlobalErrorHasOrderFive()
    {
        var system = new Modulated();
        var observed = ObservedOrder("global, y' = y cos t, Dormand–Prince",
            halvings => GlobalError(false, system, Modulated.Exact, 1, 2.5, 64 << halvings));
        Assert.InRange(observed, 4.7, 5.5);
    }

    [Fact]
    public void Rodas4GlobalErrorHasOrderFour()
    {
        var dimer = new Dimerisation(0.5);
        var observed = ObservedOrder("global, dimerisation, Rodas4",
            halvings => GlobalError(true, dimer, t => dimer.Exact(1, t), 1, 4, 64 << halvings));
        Assert.InRange(observed, 3.7, 4.5);
    }

    [Fact]
    public void RosenbrockTimeDerivativeTermsKeepOrderFour()
    {
        // A non-autonomous problem exercises the h·d_i·∂f/∂t terms; a wrong d_i drops the order.
        var system = new DrivenRelaxation();
        var observed = ObservedOrder("global, driven relaxation, Rodas4",
            halvings => GlobalError(true, system, DrivenRelaxation.Exact, 1, 2, 8 << halvings));
        Assert.InRange(observed, 3.7, 4.5);
    }

    [Theory]
    [InlineData(false, 4)]
    [InlineData(true, 3)]
    public void EmbeddedEstimateHasItsOrder(bool stiff, int estimateOrder)
    {
        // The estimate is y − ŷ with ŷ of order q: on one step it behaves like C·h^(q+1).
        var dimer = new Dimerisation(0.5);
        var observed = ObservedOrder($"estimate, stiff={stiff}", halvings =>
        {
            var stepper = NewStepper(stiff, dimer);
            Start(stepper, dimer, 0, 1);
            return stepper.Attempt(0.025 / (1 << halvings));
        });
        Assert.InRange(observed, estimateOrder + 1 - 0.3, estimateOrder + 1 + 0.5);
    }

    [Theory]
    [InlineData(false, 4)]
    [InlineData(true, 3)]
    public void DenseOutputHasItsOrder(bool stiff, int denseOrder)
    {
        // One step from the exact value; the interpolant at θ = 0.37 has local error C·h^(order+1).
        var dimer = new Dimerisation(0.5);
        var observed = ObservedOrder($"dense output, stiff={stiff}", halvings =>
        {
            var h = 0.025 / (1 << halvings);
            var stepper = NewStepper(stiff, dimer);
            Start(stepper, dimer, 0, 1);
            stepper.Attempt(h);
            stepper.Accept();
            var y = new double[1];
            stepper.Interpolate(0.37 * h, y);
            return Math.Abs(y[0] - dimer.Exact(1, 0.37 * h));
        });
        Assert.InRange(observed, denseOrder + 1 - 0.3, denseOrder + 1 + 0.5);
    }
}
