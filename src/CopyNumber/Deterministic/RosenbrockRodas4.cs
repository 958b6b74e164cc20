using MathNet.Numerics.Providers.LinearAlgebra;

namespace CopyNumber.Deterministic;

/// <summary>
/// Rodas4, the stiffly accurate L-stable Rosenbrock method of order 4 with an embedded order-3 estimate
/// (Hairer &amp; Wanner, Solving ODEs II, 2nd ed., Sect. IV.7, Table 7.3 / code RODAS), written in the
/// transformed variables u_i = Σ γ_ij k_j that need one LU decomposition of E = I/(hγ) − J per step:
/// E·u_i = f(t + c_i h, y + Σ a_ij u_j) + Σ (c_ij/h)·u_j + h·d_i·∂f/∂t. The last two stages sit at
/// t + h; the propagated y is the sixth stage point plus u₆ and u₆ itself is the error estimate.
/// The linear systems use MathNet.Numerics' LU factorisation (LAPACK GETRF/GETRS semantics) in place on
/// a column-major buffer, so a step allocates nothing. Dense output is RODAS' own continuous extension of
/// order 3, y(θ) = (1−θ)y₀ + θ(y₁ + (1−θ)(Σ d2_i u_i + θ Σ d3_i u_i)), built from the stage increments;
/// unlike a Hermite cubic through f₀ and f₁ it does not multiply the state error by the stiff
/// eigenvalues (f = λ(y − g) turns a 10⁻⁷ state error into a slope error 10⁻⁷·|λ|).
/// </summary>
internal sealed class RosenbrockRodas4 : OdeStepper
{
    private const double MachineEpsilon = 2.220446049250313e-16;
    private const double Gamma = 0.25;
    private const double C2 = 0.386, C3 = 0.21, C4 = 0.63;
    private const double D1 = 0.25, D2 = -0.1043, D3 = 0.1035, D4 = -0.3620000000000023e-01;
    private const double A21 = 0.1544000000000000e+01;
    private const double A31 = 0.9466785280815826e+00, A32 = 0.2557011698983284e+00;
    private const double A41 = 0.3314825187068521e+01, A42 = 0.2896124015972201e+01, A43 = 0.9986419139977817e+00;
    private const double A51 = 0.1221224509226641e+01, A52 = 0.6019134481288629e+01, A53 = 0.1253708332932087e+02, A54 = -0.6878860361058950e+00;
    private const double C21 = -0.5668800000000000e+01;
    private const double C31 = -0.2430093356833875e+01, C32 = -0.2063599157091915e+00;
    private const double C41 = -0.1073529058151375e+00, C42 = -0.9594562251023355e+01, C43 = -0.2047028614809616e+02;
    private const double C51 = 0.7496443313967647e+01, C52 = -0.1024680431464352e+02, C53 = -0.3399990352819905e+02, C54 = 0.1170890893206160e+02;
    private const double C61 = 0.8083246795921522e+01, C62 = -0.7981132988064893e+01, C63 = -0.3152159432874371e+02,
        C64 = 0.1631930543123136e+02, C65 = -0.6058818238834054e+01;

    // Dense-output weights d2_i, d3_i (i = 1..5) of RODAS (Hairer & Wanner's code, method 1).
    private const double E21 = 0.1012623508344586e+02, E22 = -0.7487995877610167e+01, E23 = -0.3480091861555747e+02,
        E24 = -0.7992771707568823e+01, E25 = 0.1025137723295662e+01;
    private const double E31 = -0.6762803392801253e+00, E32 = 0.6087714651680015e+01, E33 = 0.1643084320892478e+02,
        E34 = 0.2476722511418386e+02, E35 = -0.6594389125716872e+01;

    private readonly StepSizeController _controller = new(k: 4, minFactor: 0.2, maxFactor: 6.0);
    private readonly int _n;
    private readonly double[,] _jacobian;
    private readonly double[] _matrix; // E = I/(hγ) − J, column-major, overwritten by its LU factors
    private readonly int[] _pivots;
    private readonly double[] _dfdt, _u1, _u2, _u3, _u4, _u5, _u6, _stage, _dy, _shifted, _dense2, _dense3;
    private double[] _yNew, _yPrevious;
    private bool _jacobianCurrent;
    private double _factoredStep = double.NaN;
    private double _trialTime;

    public RosenbrockRodas4(IOdeSystem system, SolverOptions options, OdeStatistics statistics)
        : base(system, options, statistics)
    {
        _n = system.Dimension;
        RefuseBeyondMemory(_n);
        _jacobian = new double[_n, _n];
        _matrix = new double[_n * _n];
        _pivots = new int[_n];
        _dfdt = new double[_n]; _u1 = new double[_n]; _u2 = new double[_n]; _u3 = new double[_n];
        _u4 = new double[_n]; _u5 = new double[_n]; _u6 = new double[_n]; _stage = new double[_n];
        _dy = new double[_n]; _shifted = new double[_n]; _yNew = new double[_n];
        _yPrevious = new double[_n]; _dense2 = new double[_n]; _dense3 = new double[_n];
    }

    /// <summary>
    /// The stiff solver holds two dense n × n matrices (the Jacobian and its LU factors); for a large
    /// network they may not fit, which is said here with the numbers instead of an OutOfMemoryException.
    /// The rule of the ensemble's memory check: at most 80 % of the available memory.
    /// </summary>
    private static void RefuseBeyondMemory(int n)
    {
        var bytes = 2 * (Int128)n * n * sizeof(double);
        var available = GC.GetGCMemoryInfo().TotalAvailableMemoryBytes;
        if (bytes <= available / 5 * 4 && (long)n * n <= Array.MaxLength) return;
        throw new SolverFailureException(0, null,
            $"the rate equations became stiff, and the stiff solver needs two dense {n:N0} × {n:N0} matrices " +
            $"({(double)bytes / (1L << 30):0.0} GB), but about {available / (double)(1L << 30):0.0} GB is available");
    }

    public override string Name => "Rodas4";
    public override int Order => 4;
    public override StepSizeController Controller => _controller;

    /// <summary>‖J‖∞ at the start of the last step: an upper bound on the spectral radius, for switching back.</summary>
    public double JacobianNorm { get; private set; }

    public override void Start(double t, double[] y, double[] f)
    {
        base.Start(t, y, f);
        _jacobianCurrent = false;
    }

    public override double Attempt(double tNew)
    {
        var t = Time;
        var h = tNew - t;
        var y = State;
        var n = _n;
        if (!_jacobianCurrent) EvaluateJacobian(t, y);
        if (h != _factoredStep && !Factor(h)) { _trialTime = tNew; MarkSingular(); return double.PositiveInfinity; }

        for (var i = 0; i < n; i++) _u1[i] = Slope[i] + h * D1 * _dfdt[i];
        Solve(_u1);

        for (var i = 0; i < n; i++) _stage[i] = y[i] + A21 * _u1[i];
        System.Derivative(t + C2 * h, _stage, _dy);
        for (var i = 0; i < n; i++) _u2[i] = _dy[i] + h * D2 * _dfdt[i] + C21 / h * _u1[i];
        Solve(_u2);

        for (var i = 0; i < n; i++) _stage[i] = y[i] + A31 * _u1[i] + A32 * _u2[i];
        System.Derivative(t + C3 * h, _stage, _dy);
        for (var i = 0; i < n; i++) _u3[i] = _dy[i] + h * D3 * _dfdt[i] + (C31 * _u1[i] + C32 * _u2[i]) / h;
        Solve(_u3);

        for (var i = 0; i < n; i++) _stage[i] = y[i] + A41 * _u1[i] + A42 * _u2[i] + A43 * _u3[i];
        System.Derivative(t + C4 * h, _stage, _dy);
        for (var i = 0; i < n; i++) _u4[i] = _dy[i] + h * D4 * _dfdt[i] + (C41 * _u1[i] + C42 * _u2[i] + C43 * _u3[i]) / h;
        Solve(_u4);

        for (var i = 0; i < n; i++) _stage[i] = y[i] + A51 * _u1[i] + A52 * _u2[i] + A53 * _u3[i] + A54 * _u4[i];
        System.Derivative(tNew, _stage, _dy);
        for (var i = 0; i < n; i++) _u5[i] = _dy[i] + (C51 * _u1[i] + C52 * _u2[i] + C53 * _u3[i] + C54 * _u4[i]) / h;
        Solve(_u5);

        for (var i = 0; i < n; i++) _stage[i] += _u5[i];
        System.Derivative(tNew, _stage, _dy);
        for (var i = 0; i < n; i++) _u6[i] = _dy[i] + (C61 * _u1[i] + C62 * _u2[i] + C63 * _u3[i] + C64 * _u4[i] + C65 * _u5[i]) / h;
        Solve(_u6);
        Statistics.FunctionEvaluations += 5;

        for (var i = 0; i < n; i++) _yNew[i] = _stage[i] + _u6[i];
        _trialTime = tNew;
        return ErrorNorm.Scaled(_u6, y, _yNew, RelativeTolerance, AbsoluteTolerance);
    }

    public override void Accept()
    {
        for (var i = 0; i < _n; i++)
        {
            _dense2[i] = E21 * _u1[i] + E22 * _u2[i] + E23 * _u3[i] + E24 * _u4[i] + E25 * _u5[i];
            _dense3[i] = E31 * _u1[i] + E32 * _u2[i] + E33 * _u3[i] + E34 * _u4[i] + E35 * _u5[i];
        }
        (_yPrevious, State, _yNew) = (State, _yNew, _yPrevious);
        PreviousTime = Time;
        Time = _trialTime;
        // f at the new point is the next step's f₀.
        System.Derivative(Time, State, Slope);
        Statistics.FunctionEvaluations++;
        _jacobianCurrent = false;
    }

    public override void Interpolate(double t, double[] into)
    {
        var theta = StepFraction(t);
        var theta1 = 1.0 - theta;
        for (var i = 0; i < into.Length; i++)
            into[i] = theta1 * _yPrevious[i] + theta * (State[i] + theta1 * (_dense2[i] + theta * _dense3[i]));
    }

    public override int WorstComponent() =>
        ErrorNorm.WorstComponent(_u6, State, _yNew, RelativeTolerance, AbsoluteTolerance);

    private void EvaluateJacobian(double t, double[] y)
    {
        System.Jacobian(t, y, _jacobian);
        Statistics.JacobianEvaluations++;
        var norm = 0.0;
        for (var i = 0; i < _n; i++)
        {
            var row = 0.0;
            for (var j = 0; j < _n; j++) row += Math.Abs(_jacobian[i, j]);
            norm = Math.Max(norm, row);
        }
        JacobianNorm = norm;
        if (System.IsAutonomous) Array.Clear(_dfdt);
        else
        {
            // Forward difference for ∂f/∂t with the increment of RODAS: sqrt(ε·max(1e-5, |t|)).
            var delta = Math.Sqrt(MachineEpsilon * Math.Max(1e-5, Math.Abs(t)));
            System.Derivative(t + delta, y, _shifted);
            Statistics.FunctionEvaluations++;
            for (var i = 0; i < _n; i++) _dfdt[i] = (_shifted[i] - Slope[i]) / delta;
        }
        _jacobianCurrent = true;
        _factoredStep = double.NaN;
    }

    private bool Factor(double h)
    {
        var diagonal = 1.0 / (h * Gamma);
        for (var j = 0; j < _n; j++)
            for (var i = 0; i < _n; i++)
                _matrix[i + j * _n] = (i == j ? diagonal : 0.0) - _jacobian[i, j];
        LinearAlgebraControl.Provider.LUFactor(_matrix, _n, _pivots);
        Statistics.LuDecompositions++;
        _factoredStep = h;
        for (var i = 0; i < _n; i++)
        {
            var pivot = _matrix[i + i * _n];
            if (pivot == 0 || !double.IsFinite(pivot)) { _factoredStep = double.NaN; return false; }
        }
        return true;
    }

    private void Solve(double[] rightHandSide) =>
        LinearAlgebraControl.Provider.LUSolveFactored(1, _matrix, _n, _pivots, rightHandSide);

    private void MarkSingular()
    {
        // A singular E leaves no trial; point the diagnosis at the current state.
        Array.Copy(State, _yNew, _n);
        Array.Fill(_u6, double.PositiveInfinity);
    }
}
