using System.Numerics;
using CopyNumber.Analysis.Oscillation;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>The rate equations' oscillation: limit cycles, stable foci, and none.</summary>
public sealed class CycleDetectionTests(ITestOutputHelper output)
{
    /// <summary>
    /// Brusselator just past its Hopf point B_c = 1 + A² (Prigogine & Lefever 1968): the cycle is born with the
    /// frequency of the critical eigenvalues ±iA, so its period approaches 2π/A as B ↓ B_c (Hopf's theorem; the
    /// period's correction is of order B − B_c, quoted from memory). Checked at two distances: the error is
    /// small and shrinks towards the Hopf point.
    /// </summary>
    [Theory]
    [InlineData(1.0)]
    [InlineData(2.0)]
    public void BrusselatorPeriodApproachesTwoPiOverA(double a)
    {
        var critical = 1 + a * a;
        var errors = new List<double>();
        foreach (var distance in new[] { 0.2, 0.05 })
        {
            var b = critical + distance;
            var result = CycleDetection.Detect(OscillationModels.Brusselator(a, b, x0: a * 1.05, y0: b / a), 4000);
            output.WriteLine($"A = {a}, B = {b}: {result.Kind}, T = {result.Period:G8}, 2π/A = {2 * Math.PI / a:G8}; multipliers {string.Join(", ", result.FloquetMultipliers)}");
            Assert.Equal(OscillationKind.LimitCycle, result.Kind);
            errors.Add(Math.Abs(result.Period * a / (2 * Math.PI) - 1));
        }
        Assert.True(errors[1] < 0.02, $"period {errors[1]:P2} from 2π/A at B − B_c = 0.05");
        Assert.True(errors[1] < errors[0], $"the period does not approach 2π/A: errors {errors[0]:G3} then {errors[1]:G3}");
    }

    /// <summary>
    /// The Floquet multipliers of the Brusselator's cycle just past Hopf: the trivial one is 1 (a check of the
    /// period and of the variational equations), the other is e^(−2σT) with σ = (B − B_c)/2 the real part of the
    /// eigenvalues at the unstable focus (the Hopf normal form's radial exponent is −2σ at leading order; quoted
    /// from memory), so it lies inside the unit circle: the cycle is orbitally stable.
    /// </summary>
    [Fact]
    public void BrusselatorCycleIsStableWithTheNormalFormMultiplier()
    {
        const double a = 1, b = 2.05;
        var result = CycleDetection.Detect(OscillationModels.Brusselator(a, b, x0: 1.05, y0: b), 4000);
        Assert.Equal(OscillationKind.LimitCycle, result.Kind);
        Assert.Equal(2, result.FloquetMultipliers.Count);
        var trivial = result.FloquetMultipliers[0];
        Assert.True((trivial - 1).Magnitude < 1e-4, $"trivial multiplier {trivial}");
        var sigma = (b - 1 - a * a) / 2;
        var expected = Math.Exp(-2 * sigma * result.Period);
        var other = result.FloquetMultipliers[1];
        output.WriteLine($"non-trivial multiplier {other}, normal form {expected:G6}");
        Assert.True(Math.Abs(other.Imaginary) < 1e-9 && Math.Abs(other.Real / expected - 1) < 0.1, $"multiplier {other} against {expected:G6}");
        Assert.True(result.IsStableCycle);
    }

    /// <summary>
    /// Below the Hopf point the Brusselator spirals into the stable focus (A, B/A); the eigenvalues of
    /// [[B − 1, A²], [−B, −A²]] are computed here in closed form (trace and determinant of a 2 × 2 matrix).
    /// </summary>
    [Fact]
    public void BrusselatorBelowHopfIsAStableFocusWithTheClosedFormEigenvalues()
    {
        const double a = 1, b = 1.5;
        var result = CycleDetection.Detect(OscillationModels.Brusselator(a, b), 400);
        Assert.Equal(OscillationKind.DampedOscillation, result.Kind);
        var trace = b - 1 - a * a;
        var determinant = a * a;
        var expected = new Complex(trace / 2, Math.Sqrt(determinant - trace * trace / 4));
        var found = result.LeastDampedComplexPair!.Value;
        Assert.True((found - expected).Magnitude < 1e-6, $"{found} against {expected}");
        Assert.Equal(2 * Math.PI / expected.Imaginary, result.Period, 1e-6);
        Assert.Equal(1 / 0.25, result.DampingTime, 1e-6);
        Assert.Equal(a, result.SteadyState[0], 1e-6);
        Assert.Equal(b / a, result.SteadyState[1], 1e-6);
    }

    /// <summary>Two-stage expression has eigenvalues −1 and −0.2 (first-order network; common practice): no oscillation.</summary>
    [Fact]
    public void TwoStageExpressionDoesNotOscillate()
    {
        var result = CycleDetection.Detect(OscillationModels.TwoStage(), 200);
        Assert.Equal(OscillationKind.None, result.Kind);
        Assert.False(result.HasComplexEigenvalues);
        Assert.Equal(-0.2, result.SteadyEigenvalues[0].Real, 1e-9);
        Assert.Equal(-1, result.SteadyEigenvalues[1].Real, 1e-9);
    }

    /// <summary>
    /// The ring scenario (issue 17): a stable limit cycle with a period of about 36 and the protein ranging from
    /// tens to hundreds of copies, as the issue measured with `solve`. The trivial multiplier is 1 (a check of the
    /// period found from the peaks against the variational equations, which know nothing of peaks).
    /// </summary>
    [Fact]
    public void RingScenarioIsOnAStableLimitCycle()
    {
        var result = CycleDetection.Detect(OscillationModels.Ring(), 800);
        foreach (var r in result.Ranges) output.WriteLine($"{r.Species}: {r.Minimum:G4} to {r.Maximum:G4}");
        output.WriteLine($"T = {result.Period}, multipliers {string.Join(", ", result.FloquetMultipliers)}");
        Assert.Equal(OscillationKind.LimitCycle, result.Kind);
        Assert.InRange(result.Period, 30, 45);
        Assert.True((result.FloquetMultipliers[0] - 1).Magnitude < 1e-4);
        Assert.True(result.IsStableCycle);
        var protein = result.Ranges.Single(r => r.Species == "p1");
        Assert.InRange(protein.Minimum, 10, 60);
        Assert.InRange(protein.Maximum, 400, 800);
    }
}
