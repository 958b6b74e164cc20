using MathNet.Numerics.LinearAlgebra;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The chemical master equation of a network whose states form a finite chain 0 … S (state s moves to
/// s + 1 at rate up(s) and to s − 1 at rate down(s)), solved exactly in two independent ways so the
/// reference used against the simulators is itself checked.
/// </summary>
internal sealed class BirthDeathChain
{
    private readonly double[] _up;
    private readonly double[] _down;

    public BirthDeathChain(int lastState, Func<int, double> up, Func<int, double> down)
    {
        _up = Enumerable.Range(0, lastState + 1).Select(s => s < lastState ? up(s) : 0.0).ToArray();
        _down = Enumerable.Range(0, lastState + 1).Select(s => s > 0 ? down(s) : 0.0).ToArray();
    }

    public int States => _up.Length;

    /// <summary>
    /// p(t) from p(0) = δ_start by uniformisation (Jensen 1953, Skand. Aktuarietidskr. 36:87; quoted from
    /// memory): with Λ ≥ every exit rate and P = I + Q/Λ, p(t) = Σ_k e^(−Λt)(Λt)^k/k! · p(0)P^k,
    /// summed until the Poisson weights left are below 10⁻¹⁵.
    /// </summary>
    public double[] ByUniformisation(int start, double t)
    {
        var n = States;
        var rate = Enumerable.Range(0, n).Max(s => _up[s] + _down[s]) * 1.05 + 1e-12;
        var v = new double[n];
        v[start] = 1;
        var result = new double[n];
        var weight = Math.Exp(-rate * t);
        var used = 0.0;
        for (var k = 0; used < 1 - 1e-15 && k < 100_000; k++)
        {
            for (var s = 0; s < n; s++) result[s] += weight * v[s];
            used += weight;
            var next = new double[n];
            for (var s = 0; s < n; s++)
            {
                var stay = 1 - (_up[s] + _down[s]) / rate;
                next[s] += v[s] * stay;
                if (s + 1 < n) next[s + 1] += v[s] * _up[s] / rate;
                if (s > 0) next[s - 1] += v[s] * _down[s] / rate;
            }
            v = next;
            weight *= rate * t / (k + 1);
        }
        return result;
    }

    /// <summary>
    /// p(t) by the spectral decomposition of the generator made symmetric through detailed balance: a
    /// birth–death chain is reversible with π_(s+1)/π_s = up(s)/down(s+1), and D^(1/2)QD^(−1/2) with
    /// D = diag(π) is symmetric (Kelly 1979, Reversibility and Stochastic Networks, Wiley; quoted from memory).
    /// </summary>
    public double[] BySpectralDecomposition(int start, double t)
    {
        var n = States;
        var logPi = new double[n];
        for (var s = 1; s < n; s++) logPi[s] = logPi[s - 1] + Math.Log(_up[s - 1] / _down[s]);
        var root = logPi.Select(l => Math.Exp(0.5 * (l - logPi.Max()))).ToArray();
        var symmetric = Matrix<double>.Build.Dense(n, n);
        for (var s = 0; s < n; s++)
        {
            symmetric[s, s] = -(_up[s] + _down[s]);
            if (s + 1 < n)
            {
                // S_ij = sqrt(π_i) Q_ij / sqrt(π_j)
                var value = root[s] * _up[s] / root[s + 1];
                symmetric[s, s + 1] = value;
                symmetric[s + 1, s] = value;
            }
        }
        var evd = symmetric.Evd(Symmetricity.Symmetric);
        var u = evd.EigenVectors;
        var lambda = evd.EigenValues.Select(c => c.Real).ToArray();
        // p_j(t) = Σ_k (1/√π_start) U_start,k e^(λ_k t) U_j,k √π_j
        var result = new double[n];
        for (var j = 0; j < n; j++)
        {
            var sum = 0.0;
            for (var k = 0; k < n; k++) sum += u[start, k] * Math.Exp(lambda[k] * t) * u[j, k];
            result[j] = sum * root[j] / root[start];
        }
        return result;
    }
}
