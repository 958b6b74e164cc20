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
    private double[,]? _rateJacobian;
    private double[]? _clipped;         // the state with negative round-off set to 0, for UnusableRate   // reactions × species, made at the first Jacobian: only stiff steps need it

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

    /// <summary>
    /// The first reaction whose rate law gives a negative, NaN or infinite value at <paramref name="y"/>, or -1.
    /// The laws are read at the state with negative counts set to 0, so round-off just below zero (states are not
    /// clipped) is never blamed on a law: only a law that is negative for a non-negative state is reported.
    /// </summary>
    internal int UnusableRate(double[] y, out double value)
    {
        var clipped = _clipped ??= new double[y.Length];
        for (var i = 0; i < y.Length; i++) clipped[i] = Math.Max(y[i], 0);
        _network.RateEquations.Rates(clipped, _constants, _parameters, _rates);
        for (var j = 0; j < _rates.Length; j++)
            if (!Kinetics.UnusableRate.IsUsable(_rates[j]))
            {
                value = _rates[j];
                return j;
            }
        value = 0;
        return -1;
    }

    /// <summary>The species name.</summary>
    public string ComponentName(int index) => $"species {_network.Species[index]}";
}
