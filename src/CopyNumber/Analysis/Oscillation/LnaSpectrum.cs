using System.Numerics;
using CopyNumber.Network;
using MathNet.Numerics.LinearAlgebra;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The linear noise approximation's power spectrum at a stable steady state x* (McKane &amp; Newman 2005, Phys. Rev.
/// Lett. 94:218102): the fluctuations obey dξ/dt = J·ξ + η with ⟨η(t)η(s)ᵀ⟩ = D·δ(t − s), D = N·diag(v(x*))·Nᵀ, so
/// S(ω) = (J − iω)⁻¹·D·(Jᵀ + iω)⁻¹, in copies² × time, two-sided: ∫ S(ω) dω/2π over all ω is the LNA's stationary
/// covariance (the Lyapunov equation's solution). A complex pair of J gives a peak near |Im λ| when the damping is
/// weak: the rate equations are quiet but noise makes the circuit ring (quasi-cycles).
/// </summary>
public sealed class LnaSpectrum
{
    private readonly Matrix<Complex> _jacobian;
    private readonly Matrix<Complex> _diffusion;

    /// <summary>The spectrum at <paramref name="steadyState"/> (copies) with the network's initial parameters.</summary>
    public LnaSpectrum(ReactionNetwork network, IReadOnlyList<double> steadyState)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(steadyState);
        var s = network.Species.Count;
        var x = steadyState.ToArray();
        var jacobian = CycleDetection.Jacobian(network, x);
        _jacobian = Matrix<Complex>.Build.Dense(s, s, (i, j) => jacobian[i, j]);
        var reactions = network.RateEquations.ReactionCount;
        var rates = new double[reactions];
        var constants = new double[reactions];
        var parameters = network.InitialParameterValues.ToArray();
        network.Propensities.ComputeConstants(parameters, constants);
        network.RateEquations.Rates(x, constants, parameters, rates);
        var n = network.Stoichiometry;
        // A rate round-off has pushed below zero makes no noise (as in the LNA's covariance, docs/methods-analysis.md §1).
        _diffusion = Matrix<Complex>.Build.Dense(s, s, (i, k) =>
        {
            var sum = 0.0;
            for (var j = 0; j < reactions; j++) sum += n[i, j] * Math.Max(rates[j], 0) * n[k, j];
            return sum;
        });
    }

    /// <summary>The full spectral matrix S(ω) at <paramref name="omega"/> radians per time unit.</summary>
    public Matrix<Complex> At(double omega)
    {
        var s = _jacobian.RowCount;
        var shift = Matrix<Complex>.Build.DiagonalIdentity(s) * new Complex(0, omega);
        var left = (_jacobian - shift).Inverse();
        var right = (_jacobian.Transpose() + shift).Inverse();
        return left * _diffusion * right;
    }

    /// <summary>S_ii(ω) of species <paramref name="species"/> at each frequency, copies² × time (real: the diagonal of a Hermitian matrix).</summary>
    public double[] Of(int species, IReadOnlyList<double> omegas)
    {
        ArgumentNullException.ThrowIfNull(omegas);
        return omegas.Select(w => At(w)[species, species].Real).ToArray();
    }

    /// <summary>The frequency of S_ii's highest point on a grid of <paramref name="points"/> frequencies over [0, <paramref name="upTo"/>].</summary>
    public double PeakFrequency(int species, double upTo, int points = 4000)
    {
        var best = 0.0;
        var bestPower = double.NegativeInfinity;
        for (var k = 0; k <= points; k++)
        {
            var w = upTo * k / points;
            var p = At(w)[species, species].Real;
            if (p > bestPower) { bestPower = p; best = w; }
        }
        return best;
    }
}
