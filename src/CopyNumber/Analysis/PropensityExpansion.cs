using CopyNumber.Kinetics;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// The stochastic propensities extended to a real-valued state and expanded to second order about it,
/// as the mean correction needs them. Mass action: a_j(x) = c_j·∏ ff(x_i, ν_i) with the real falling
/// factorial ff(x, ν) = x(x − 1)…(x − ν + 1), differentiated analytically. A rate law is its own
/// macroscopic rate (a = v): its first derivatives are the compiler's exact ones, its second
/// derivatives central differences of those. One instance per integration; not thread-safe.
/// </summary>
internal sealed class PropensityExpansion
{
    private readonly RateEquations _rateEquations;
    private readonly (int Species, long Order)[][] _reactants;
    private readonly bool[] _isRateLaw;
    private readonly int[] _rateLawSpecies;
    private readonly int[][] _support;
    private readonly double[][,] _hessian;
    private readonly double[,] _dvdxPlus, _dvdxMinus, _dvdxCentre;
    private readonly double[] _shifted;

    public PropensityExpansion(ReactionNetwork network)
    {
        _rateEquations = network.RateEquations;
        var m = network.Propensities.Count;
        var s = network.Species.Count;
        _reactants = Enumerable.Range(0, m).Select(j => network.Propensities.Reactants(j).ToArray()).ToArray();
        _isRateLaw = Enumerable.Range(0, m).Select(j => network.Propensities.Form(j) == PropensityForm.RateLaw).ToArray();
        var read = new List<int>[m];
        for (var j = 0; j < m; j++) read[j] = [];
        for (var i = 0; i < s; i++)
            foreach (var j in network.Dependencies.Readers(i))
                read[j].Add(i);
        // A mass-action propensity depends on its reactants only; a rate law on the species it reads.
        _support = Enumerable.Range(0, m)
            .Select(j => _isRateLaw[j] ? read[j].Distinct().Order().ToArray() : _reactants[j].Select(r => r.Species).Distinct().Order().ToArray())
            .ToArray();
        _hessian = _support.Select(k => new double[k.Length, k.Length]).ToArray();
        _rateLawSpecies = Enumerable.Range(0, m).Where(j => _isRateLaw[j]).SelectMany(j => _support[j]).Distinct().Order().ToArray();
        _dvdxPlus = new double[m, s];
        _dvdxMinus = new double[m, s];
        _dvdxCentre = new double[m, s];
        _shifted = new double[s];
    }

    /// <summary>The species reaction <paramref name="reaction"/>'s propensity depends on (increasing); rows and columns of its Hessian.</summary>
    public ReadOnlySpan<int> Support(int reaction) => _support[reaction];

    /// <summary>∂²a_j/∂x_k∂x_l over <see cref="Support"/> × <see cref="Support"/>, as of the last <see cref="Expand"/>.</summary>
    public double[,] Hessian(int reaction) => _hessian[reaction];

    /// <summary>
    /// At state <paramref name="x"/> with macroscopic rates <paramref name="v"/> already evaluated there,
    /// fills the excess a_j − v_j, the gradient ∂a_j/∂x_k (reactions × species, every entry) and the
    /// Hessians (<see cref="Hessian"/>).
    /// </summary>
    public void Expand(double[] x, double[] v, double[] constants, double[] parameters, double[] excess, double[,] gradient)
    {
        Array.Clear(gradient);
        if (_rateLawSpecies.Length > 0) _rateEquations.RateJacobian(x, constants, parameters, _dvdxCentre);
        for (var j = 0; j < _reactants.Length; j++)
        {
            if (_isRateLaw[j])
            {
                excess[j] = 0.0;
                foreach (var k in _support[j]) gradient[j, k] = _dvdxCentre[j, k];
                continue;
            }
            excess[j] = MassAction(j, x, constants[j], gradient) - v[j];
        }
        if (_rateLawSpecies.Length > 0) RateLawHessians(x, constants, parameters);
    }

    /// <summary>w_j = ½·Σ_kl ∂²a_j/∂x_k∂x_l·C_kl for the symmetric matrix <paramref name="covariance"/>, from the last <see cref="Expand"/>.</summary>
    public void Curvature(double[,] covariance, double[] curvature)
    {
        for (var j = 0; j < _support.Length; j++)
        {
            var support = _support[j];
            var h = _hessian[j];
            var w = 0.0;
            for (var a = 0; a < support.Length; a++)
                for (var b = 0; b < support.Length; b++)
                    w += h[a, b] * covariance[support[a], support[b]];
            curvature[j] = 0.5 * w;
        }
    }

    // a = c·∏_r g_r with g_r = ff(x_{s_r}, ν_r); the product rule gives the first and second derivatives.
    private double MassAction(int j, double[] x, double c, double[,] gradient)
    {
        var reactants = _reactants[j];
        var support = _support[j];
        var hessian = _hessian[j];
        Array.Clear(hessian);
        var n = reactants.Length;
        Span<double> g = stackalloc double[n], g1 = stackalloc double[n], g2 = stackalloc double[n];
        Span<int> at = stackalloc int[n];
        for (var r = 0; r < n; r++)
        {
            FallingFactorial(x[reactants[r].Species], reactants[r].Order, out g[r], out g1[r], out g2[r]);
            at[r] = Array.IndexOf(support, reactants[r].Species);
        }

        var a = c;
        for (var r = 0; r < n; r++) a *= g[r];
        for (var r = 0; r < n; r++)
        {
            var first = c * g1[r];
            var second = c * g2[r];
            for (var q = 0; q < n; q++)
                if (q != r) { first *= g[q]; second *= g[q]; }
            gradient[j, reactants[r].Species] += first;
            hessian[at[r], at[r]] += second;
            for (var q = 0; q < n; q++)
            {
                if (q == r) continue;
                var cross = c * g1[r] * g1[q];
                for (var p = 0; p < n; p++)
                    if (p != r && p != q) cross *= g[p];
                hessian[at[r], at[q]] += cross;
            }
        }
        return a;
    }

    /// <summary>ff(x, ν) = ∏_{q&lt;ν} (x − q) and its first two derivatives in x, for real x.</summary>
    internal static void FallingFactorial(double x, long order, out double value, out double first, out double second)
    {
        value = 1.0; first = 0.0; second = 0.0;
        for (var q = 0L; q < order; q++)
        {
            var u = x - q;
            second = second * u + 2 * first;
            first = first * u + value;
            value *= u;
        }
    }

    // H_j,kl = ∂/∂x_l (∂v_j/∂x_k): the outer derivative by central differences of the exact inner one,
    // or by second-order one-sided differences where x_l − h < 0 ≤ x_l, so that a law such as x^n with a
    // non-integer n is never read at a negative count. The result is symmetrised.
    private void RateLawHessians(double[] x, double[] constants, double[] parameters)
    {
        for (var j = 0; j < _reactants.Length; j++)
            if (_isRateLaw[j]) Array.Clear(_hessian[j]);
        Array.Copy(x, _shifted, x.Length);
        foreach (var l in _rateLawSpecies)
        {
            var h = CentralDifferences.Step(x[l]);
            var oneSided = x[l] >= 0 && x[l] - h < 0;
            _shifted[l] = x[l] + h;
            _rateEquations.RateJacobian(_shifted, constants, parameters, _dvdxPlus);
            _shifted[l] = oneSided ? x[l] + 2 * h : x[l] - h;
            _rateEquations.RateJacobian(_shifted, constants, parameters, _dvdxMinus);
            _shifted[l] = x[l];
            for (var j = 0; j < _reactants.Length; j++)
            {
                if (!_isRateLaw[j]) continue;
                var support = _support[j];
                var b = Array.IndexOf(support, l);
                if (b < 0) continue;
                for (var a = 0; a < support.Length; a++)
                {
                    var k = support[a];
                    var derivative = oneSided
                        ? (-3 * _dvdxCentre[j, k] + 4 * _dvdxPlus[j, k] - _dvdxMinus[j, k]) / (2 * h)
                        : (_dvdxPlus[j, k] - _dvdxMinus[j, k]) / (2 * h);
                    _hessian[j][a, b] += 0.5 * derivative;
                    _hessian[j][b, a] += 0.5 * derivative;
                }
            }
        }
    }
}
