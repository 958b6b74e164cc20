using CopyNumber.Deterministic;
using CopyNumber.Network;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The rate equations together with their variational equations, dx/dt = N·v(x), dΦ/dt = J(x)·Φ, Φ(0) = I,
/// with J the exact Jacobian N·∂v/∂x (<see cref="RateEquationSystem.Jacobian"/>). State: x, then Φ row by row.
/// Integrated over one period from a point on a cycle, Φ(T) is the monodromy matrix whose eigenvalues are the
/// cycle's Floquet multipliers.
/// </summary>
internal sealed class VariationalSystem : IOdeSystem
{
    private readonly RateEquationSystem _rates;
    private readonly int _species;
    private readonly double[] _x, _dx;
    private readonly double[,] _jacobian;

    public VariationalSystem(ReactionNetwork network)
    {
        _rates = new RateEquationSystem(network);
        _species = network.Species.Count;
        _x = new double[_species];
        _dx = new double[_species];
        _jacobian = new double[_species, _species];
    }

    public int Dimension => _species + _species * _species;

    public bool IsAutonomous => true;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        var s = _species;
        Array.Copy(y, _x, s);
        _rates.Derivative(t, _x, _dx);
        Array.Copy(_dx, dydt, s);
        _rates.Jacobian(t, _x, _jacobian);
        for (var i = 0; i < s; i++)
            for (var j = 0; j < s; j++)
            {
                var sum = 0.0;
                for (var k = 0; k < s; k++) sum += _jacobian[i, k] * y[s + k * s + j];
                dydt[s + i * s + j] = sum;
            }
    }

    // Only the explicit method is used on this system (CycleDetection asks for it), so no Jacobian of the
    // combined system is needed; a stiff cycle would need ∂(J·Φ)/∂x, the second derivatives of the rate laws.
    public void Jacobian(double t, double[] y, double[,] jacobian) =>
        throw new NotSupportedException("the variational equations are integrated by the explicit method only");

    public string ComponentName(int index) => index < _species ? _rates.ComponentName(index) : $"variational entry {index - _species}";
}
