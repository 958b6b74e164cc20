using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// A readout g(x) expanded about a real-valued state: gradient and (for a non-count readout) Hessian.
/// A count readout is an integer combination of species, affine in x, so its gradient is the exact
/// difference g(x + e_i) − g(x) and its Hessian is zero. Any other readout is differentiated by central
/// differences (<see cref="CentralDifferences"/> for the gradient; step ε^(1/4)·max(|x_i|, 1) for the Hessian).
/// </summary>
internal static class ReadoutLinearisation
{
    private static readonly double HessianStep = Math.Pow(2.220446049250313e-16, 0.25);

    /// <summary>∂g/∂x_i at <paramref name="x"/> into <paramref name="gradient"/>.</summary>
    public static void Gradient(Readout readout, double[] x, double[] parameters, double[] gradient)
    {
        var shifted = (double[])x.Clone();
        if (readout.IsCount)
        {
            var centre = readout.OnState(x, parameters);
            for (var i = 0; i < x.Length; i++)
            {
                shifted[i] = x[i] + 1.0;
                gradient[i] = readout.OnState(shifted, parameters) - centre;
                shifted[i] = x[i];
            }
            return;
        }
        CentralDifferences.Gradient(readout.OnState, shifted, parameters, gradient);
    }

    /// <summary>½·Σ_kl ∂²g/∂x_k∂x_l·C_kl at <paramref name="x"/>; exactly 0 for a count readout.</summary>
    public static double Curvature(Readout readout, double[] x, double[] parameters, double[,] covariance)
    {
        if (readout.IsCount) return 0.0;
        var n = x.Length;
        var shifted = (double[])x.Clone();
        var h = new double[n];
        for (var i = 0; i < n; i++) h[i] = HessianStep * Math.Max(Math.Abs(x[i]), 1.0);
        double Shifted(int k, double sk, int l, double sl)
        {
            shifted[k] += sk * h[k];
            shifted[l] += sl * h[l];
            var value = readout.OnState(shifted, parameters);
            shifted[k] = x[k];
            shifted[l] = x[l];
            return value;
        }
        var total = 0.0;
        for (var k = 0; k < n; k++)
            for (var l = k; l < n; l++)
            {
                if (covariance[k, l] == 0) continue;
                var second = (Shifted(k, 1, l, 1) - Shifted(k, 1, l, -1) - Shifted(k, -1, l, 1) + Shifted(k, -1, l, -1)) / (4 * h[k] * h[l]);
                total += (k == l ? 1.0 : 2.0) * second * covariance[k, l];
            }
        return 0.5 * total;
    }
}
