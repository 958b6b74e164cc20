using CopyNumber.Network;

namespace CopyNumber.Deterministic;

/// <summary>
/// A network's rate equations dx/dt = N·v(x) (x in copy numbers, t in model time units) as an
/// <see cref="IOdeSystem"/>, with the exact Jacobian N·∂v/∂x. Holds its own parameter values and
/// mass-action constants, so schedule changes to parameters affect only this instance; not thread-safe,
/// one instance per integration.
/// </summary>
public sealed class RateEquationSystem : IOdeSystem
{
    private readonly ReactionNetwork _network;
    private readonly double[] _parameters;
    private readonly double[] _constants;
    private readonly double[] _rates;
    private double[,]? _rateJacobian;   // reactions × species, made at the first Jacobian: only stiff steps need it

    /// <summary>Creates the system with the network's initial parameter values.</summary>
    public RateEquationSystem(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        _network = network;
        _parameters = network.ParameterValuesWithTime();
        _constants = new double[network.RateEquations.ReactionCount];
        _rates = new double[network.RateEquations.ReactionCount];
        network.Propensities.ComputeConstants(_parameters, _constants);
    }

    /// <inheritdoc/>
    public int Dimension => _network.RateEquations.SpeciesCount;

    /// <summary>True unless a rate law reads <c>time</c>.</summary>
    public bool IsAutonomous => !_network.TimeDependence.Any;

    /// <summary>The parameter values in force, indexed like <see cref="ReactionNetwork.Parameters"/>; change them with <see cref="SetParameter"/>.</summary>
    public IReadOnlyList<double> ParameterValues => new ArraySegment<double>(_parameters, 0, _network.TimeSlot);

    /// <summary>The array the laws read as parameters (for evaluating readouts and schedule values); do not write to it.</summary>
    internal double[] ParameterArray => _parameters;

    /// <summary>Sets parameter <paramref name="index"/> and recomputes the mass-action constants.</summary>
    public void SetParameter(int index, double value)
    {
        _parameters[index] = value;
        _network.Propensities.ComputeConstants(_parameters, _constants);
    }

    /// <inheritdoc/>
    public void Derivative(double t, double[] y, double[] dydt)
    {
        _parameters[_network.TimeSlot] = t;
        _network.RateEquations.Derivative(y, _constants, _parameters, _rates, dydt);
    }

    /// <inheritdoc/>
    public void Jacobian(double t, double[] y, double[,] jacobian)
    {
        _parameters[_network.TimeSlot] = t;
        _network.RateEquations.Jacobian(y, _constants, _parameters,
            _rateJacobian ??= new double[_network.RateEquations.ReactionCount, _network.RateEquations.SpeciesCount], jacobian);
    }

    /// <summary>The species name.</summary>
    public string ComponentName(int index) => $"species {_network.Species[index]}";
}
