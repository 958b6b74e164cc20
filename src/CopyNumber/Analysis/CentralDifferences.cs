using CopyNumber.Kinetics;

namespace CopyNumber.Analysis;

/// <summary>
/// Central differences where the compiler gives no exact derivative. The step ε^(1/3)·max(|x|, 1)
/// balances the truncation error (∝ h²) against round-off (∝ ε/h), leaving about 10⁻¹¹ relative error
/// for smooth functions (common practice; Press et al. 2007, Numerical Recipes, 3rd ed., §5.7).
/// </summary>
internal static class CentralDifferences
{
    /// <summary>ε^(1/3) for doubles.</summary>
    public static readonly double RelativeStep = Math.Cbrt(2.220446049250313e-16);

    /// <summary>The step for coordinate value <paramref name="x"/>.</summary>
    public static double Step(double x) => RelativeStep * Math.Max(Math.Abs(x), 1.0);

    /// <summary>∂law/∂x_i at <paramref name="x"/> into <paramref name="gradient"/>; <paramref name="x"/> is restored.</summary>
    public static void Gradient(StateLaw law, double[] x, double[] parameters, double[] gradient)
    {
        for (var i = 0; i < x.Length; i++)
        {
            var centre = x[i];
            var h = Step(centre);
            x[i] = centre + h;
            var plus = law(x, parameters);
            x[i] = centre - h;
            var minus = law(x, parameters);
            x[i] = centre;
            gradient[i] = (plus - minus) / (2 * h);
        }
    }
}
