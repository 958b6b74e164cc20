namespace CopyNumber.Tests.Kinetics;

/// <summary>
/// Central finite differences, f'(x) ≈ (f(x+h) − f(x−h))/2h (common practice), with their error bound
/// used as the test tolerance.
/// </summary>
internal static class FiniteDifference
{
    /// <summary>Step relative to the magnitude of the coordinate.</summary>
    public const double RelativeStep = 1e-4;

    private const double MachineEpsilon = 2.220446049250313e-16; // 2^-52

    /// <summary>∂f/∂x_i at x by central differences, with the step it used.</summary>
    public static (double Derivative, double Step) Partial(Func<double[], double> f, double[] x, int i)
    {
        var h = RelativeStep * Math.Max(1.0, Math.Abs(x[i]));
        var plus = (double[])x.Clone();
        var minus = (double[])x.Clone();
        plus[i] += h;
        minus[i] -= h;
        return ((f(plus) - f(minus)) / (2 * h), h);
    }

    /// <summary>
    /// The error bound of a central difference with step h: truncation h²·|f‴|/6 plus rounding 4ε·|f|/h,
    /// doubled for slack. |f‴| is taken as at most <paramref name="relativeThirdDerivative"/>·max(1, |f|),
    /// which holds at the smooth test points used (third derivatives within two orders of |f|).
    /// </summary>
    public static double Tolerance(double h, double valueMagnitude, double relativeThirdDerivative)
    {
        var scale = Math.Max(1, valueMagnitude);
        return 2 * (h * h * relativeThirdDerivative * scale / 6 + 4 * MachineEpsilon * scale / h);
    }

    /// <summary>Asserts <paramref name="exact"/> matches the central difference of f in coordinate i.</summary>
    public static void AssertMatches(double exact, Func<double[], double> f, double[] x, int i, double relativeThirdDerivative = 100)
    {
        var (estimate, h) = Partial(f, x, i);
        var tolerance = Tolerance(h, Math.Abs(f(x)), relativeThirdDerivative);
        Assert.True(Math.Abs(exact - estimate) <= tolerance,
            $"∂/∂x{i}: exact {exact:R}, central difference {estimate:R} (step {h:R}, tolerance {tolerance:R})");
    }
}
