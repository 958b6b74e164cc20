using CopyNumber.Deterministic;
using MathNet.Numerics.LinearAlgebra;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// dy/dt = A·y has the exact solution y(t) = exp(tA)·y₀, computed here independently of the integrators:
/// by scaling and squaring of a truncated Taylor series (Moler &amp; Van Loan 2003, "Nineteen dubious ways to
/// compute the exponential of a matrix, twenty-five years later", SIAM Review 45:3, methods 1 and 3) for a
/// non-symmetric A, and by the eigen-decomposition exp(tA) = V·diag(e^(tλ))·Vᵀ for a symmetric A (ibid., method 14).
/// </summary>
public class LinearSystemTests(ITestOutputHelper output)
{
    // Eigenvalues −0.5 ± 2i and −1: a damped rotation coupled to a decay, not stiff.
    private static readonly double[,] Rotation = { { -0.5, 2, 0 }, { -2, -0.5, 0 }, { 0.3, 0.1, -1 } };
    private static readonly double[] RotationStart = [1, 0.5, -0.25];

    private static Matrix<double> TaylorExponential(Matrix<double> a)
    {
        var squarings = Math.Max(0, (int)Math.Ceiling(Math.Log2(a.InfinityNorm() / 0.25)));
        var scaled = a / Math.Pow(2, squarings);
        var term = Matrix<double>.Build.DenseIdentity(a.RowCount);
        var sum = term.Clone();
        for (var k = 1; k <= 24; k++) // ‖A/2^s‖ ≤ 1/4: the remainder is below 4^-25/25!
        {
            term = term * scaled / k;
            sum += term;
        }
        for (var s = 0; s < squarings; s++) sum *= sum;
        return sum;
    }

    private static Matrix<double> SymmetricExponential(Matrix<double> a, double t)
    {
        var evd = a.Evd(Symmetricity.Symmetric);
        var v = evd.EigenVectors;
        var d = Matrix<double>.Build.DenseOfDiagonalVector(evd.EigenValues.Map(l => Math.Exp(t * l.Real)));
        return v * d * v.Transpose();
    }

    /// <summary>
    /// Largest ‖y − exact‖∞ / (rtol·‖exact‖∞ + atol) over the output times: a norm-wise relative error,
    /// since single components of a rotation pass through zero.
    /// </summary>
    private static double WorstScaledError(double[][] y, Func<double, Vector<double>> exact, double[] times, SolverOptions options)
    {
        var worst = 0.0;
        for (var k = 0; k < times.Length; k++)
        {
            var e = exact(times[k]);
            var difference = (Vector<double>.Build.DenseOfArray(y[k]) - e).InfinityNorm();
            worst = Math.Max(worst, difference / (options.RelativeTolerance * e.InfinityNorm() + options.AbsoluteTolerance));
        }
        return worst;
    }

    [Theory]
    [InlineData(SolverKind.Explicit)]
    [InlineData(SolverKind.Stiff)]
    [InlineData(SolverKind.Auto)]
    public void RotatingDecayMatchesMatrixExponential(SolverKind kind)
    {
        var a = Matrix<double>.Build.DenseOfArray(Rotation);
        var y0 = Vector<double>.Build.DenseOfArray(RotationStart);
        var times = Enumerable.Range(1, 40).Select(k => 0.25 * k).ToArray(); // to t = 10, ~3 turns
        var options = new SolverOptions(kind, RelativeTolerance: 1e-8, AbsoluteTolerance: 1e-12);
        var y = OdeIntegrator.Integrate(new LinearSystem(Rotation), 0, RotationStart, times, options, out var statistics);
        // Global errors of tolerance-proportional codes stay within a small multiple of the local
        // tolerance on such short, contracting problems (H&W I, Sect. II.4; common practice): allow 10×.
        var worst = WorstScaledError(y, t => TaylorExponential(a * t) * y0, times, options);
        output.WriteLine($"{kind}: worst {worst:G3} × tolerance, {statistics.Steps} steps");
        Assert.True(worst < 10, $"worst error = {worst:G3} × tolerance");
    }

    [Theory]
    [InlineData(SolverKind.Stiff, 500)]
    [InlineData(SolverKind.Auto, 500)]
    public void StiffSymmetricSystemMatchesEigenDecomposition(SolverKind kind, int stepBound)
    {
        // A = Q·diag(−1, −30, −2·10³, −10⁵)·Qᵀ with Q the Householder reflection of (1, 2, 2, 1)/√10.
        var u = Vector<double>.Build.DenseOfArray([1, 2, 2, 1]) / Math.Sqrt(10);
        var q = Matrix<double>.Build.DenseIdentity(4) - 2 * u.OuterProduct(u);
        var a = q * Matrix<double>.Build.DenseOfDiagonalArray([-1, -30, -2e3, -1e5]) * q.Transpose();
        var y0 = Vector<double>.Build.DenseOfArray([1, -1, 2, 0.5]);
        var times = Enumerable.Range(1, 20).Select(k => 0.1 * k).ToArray();
        var options = new SolverOptions(kind, RelativeTolerance: 1e-7, AbsoluteTolerance: 1e-10);
        var y = OdeIntegrator.Integrate(new LinearSystem(a.ToArray()), 0, y0.ToArray(), times, options, out var statistics);
        var worst = WorstScaledError(y, t => SymmetricExponential(a, t) * y0, times, options);
        output.WriteLine($"{kind}: worst {worst:G3} × tolerance, {statistics.Steps} steps, {statistics.MethodsUsed}");
        Assert.True(worst < 10, $"worst error = {worst:G3} × tolerance");
        // With |λ|max = 10⁵ an explicit method needs ≥ 2·10⁵/3.3 ≈ 6·10⁴ steps on [0, 2]; a stiff one far fewer.
        Assert.True(statistics.Steps < stepBound, $"{statistics.Steps} steps");
    }
}
