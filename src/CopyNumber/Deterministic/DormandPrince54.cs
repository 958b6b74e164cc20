namespace CopyNumber.Deterministic;

/// <summary>
/// The explicit Runge–Kutta pair of Dormand &amp; Prince (1980, J. Comput. Appl. Math. 6:19), order 5
/// propagated with an embedded order-4 error estimate, first-same-as-last, as in Hairer, Nørsett &amp;
/// Wanner (Solving ODEs I, 2nd ed., Sect. II.5, Table 5.2). Dense output is the order-4 continuous
/// extension given there (Sect. II.6) in Hairer's form y₀ + θ(r₁ + (1−θ)(r₂ + θ(r₃ + (1−θ)r₄))).
/// After every accepted step the stiffness quotient h·‖k₇ − k₆‖/‖y₁ − y₆‖ of H&amp;W (Sect. IV.2,
/// "Automatic stiffness detection") estimates h·|λ| for the dominant eigenvalue; it exceeds about 3.25
/// only near the border of the method's stability region.
/// </summary>
internal sealed class DormandPrince54 : OdeStepper
{
    private const double C2 = 1.0 / 5, C3 = 3.0 / 10, C4 = 4.0 / 5, C5 = 8.0 / 9;
    private const double A21 = 1.0 / 5;
    private const double A31 = 3.0 / 40, A32 = 9.0 / 40;
    private const double A41 = 44.0 / 45, A42 = -56.0 / 15, A43 = 32.0 / 9;
    private const double A51 = 19372.0 / 6561, A52 = -25360.0 / 2187, A53 = 64448.0 / 6561, A54 = -212.0 / 729;
    private const double A61 = 9017.0 / 3168, A62 = -355.0 / 33, A63 = 46732.0 / 5247, A64 = 49.0 / 176, A65 = -5103.0 / 18656;
    private const double A71 = 35.0 / 384, A73 = 500.0 / 1113, A74 = 125.0 / 192, A75 = -2187.0 / 6784, A76 = 11.0 / 84;
    // b − b̂: the difference of the order-5 and order-4 weights.
    private const double E1 = 71.0 / 57600, E3 = -71.0 / 16695, E4 = 71.0 / 1920, E5 = -17253.0 / 339200, E6 = 22.0 / 525, E7 = -1.0 / 40;
    // Dense-output weights of the fourth-order continuous extension.
    private const double D1 = -12715105075.0 / 11282082432, D3 = 87487479700.0 / 32700410799, D4 = -10690763975.0 / 1880347072,
        D5 = 701980252875.0 / 199316789632, D6 = -1453857185.0 / 822651844, D7 = 69997945.0 / 29380423;

    private readonly StepSizeController _controller = new(k: 5, minFactor: 0.2, maxFactor: 10.0);
    private readonly double[] _k2, _k3, _k4, _k5, _k6, _stage, _stage6, _error;
    private readonly double[] _r1, _r2, _r3, _r4, _r5;
    private double[] _k7, _yNew;
    private double _trialTime;

    public DormandPrince54(IOdeSystem system, SolverOptions options, OdeStatistics statistics)
        : base(system, options, statistics)
    {
        var n = system.Dimension;
        _k2 = new double[n]; _k3 = new double[n]; _k4 = new double[n]; _k5 = new double[n]; _k6 = new double[n];
        _k7 = new double[n]; _stage = new double[n]; _stage6 = new double[n]; _yNew = new double[n]; _error = new double[n];
        _r1 = new double[n]; _r2 = new double[n]; _r3 = new double[n]; _r4 = new double[n]; _r5 = new double[n];
    }

    public override string Name => "Dormand–Prince 5(4)";
    public override int Order => 5;
    public override StepSizeController Controller => _controller;

    /// <summary>h·|λ| estimated on the last accepted step (0 when the stages coincide).</summary>
    public double StiffnessQuotient { get; private set; }

    public override double Attempt(double tNew)
    {
        var t = Time;
        var h = tNew - t;
        var y = State;
        var k1 = Slope;
        var n = y.Length;
        var s = _stage;
        for (var i = 0; i < n; i++) s[i] = y[i] + h * A21 * k1[i];
        System.Derivative(t + C2 * h, s, _k2);
        for (var i = 0; i < n; i++) s[i] = y[i] + h * (A31 * k1[i] + A32 * _k2[i]);
        System.Derivative(t + C3 * h, s, _k3);
        for (var i = 0; i < n; i++) s[i] = y[i] + h * (A41 * k1[i] + A42 * _k2[i] + A43 * _k3[i]);
        System.Derivative(t + C4 * h, s, _k4);
        for (var i = 0; i < n; i++) s[i] = y[i] + h * (A51 * k1[i] + A52 * _k2[i] + A53 * _k3[i] + A54 * _k4[i]);
        System.Derivative(t + C5 * h, s, _k5);
        for (var i = 0; i < n; i++) _stage6[i] = y[i] + h * (A61 * k1[i] + A62 * _k2[i] + A63 * _k3[i] + A64 * _k4[i] + A65 * _k5[i]);
        System.Derivative(tNew, _stage6, _k6);
        for (var i = 0; i < n; i++) _yNew[i] = y[i] + h * (A71 * k1[i] + A73 * _k3[i] + A74 * _k4[i] + A75 * _k5[i] + A76 * _k6[i]);
        System.Derivative(tNew, _yNew, _k7);
        Statistics.FunctionEvaluations += 6;
        for (var i = 0; i < n; i++)
            _error[i] = h * (E1 * k1[i] + E3 * _k3[i] + E4 * _k4[i] + E5 * _k5[i] + E6 * _k6[i] + E7 * _k7[i]);
        _trialTime = tNew;
        return ErrorNorm.Scaled(_error, y, _yNew, RelativeTolerance, AbsoluteTolerance);
    }

    public override void Accept()
    {
        var h = _trialTime - Time;
        var y = State;
        var k1 = Slope;
        double stiffNumerator = 0, stiffDenominator = 0;
        for (var i = 0; i < y.Length; i++)
        {
            var difference = _yNew[i] - y[i];
            var slopeSpan = h * k1[i] - difference;
            _r1[i] = y[i];
            _r2[i] = difference;
            _r3[i] = slopeSpan;
            _r4[i] = difference - h * _k7[i] - slopeSpan;
            _r5[i] = h * (D1 * k1[i] + D3 * _k3[i] + D4 * _k4[i] + D5 * _k5[i] + D6 * _k6[i] + D7 * _k7[i]);
            var dk = _k7[i] - _k6[i];
            var dy = _yNew[i] - _stage6[i];
            stiffNumerator += dk * dk;
            stiffDenominator += dy * dy;
        }
        StiffnessQuotient = stiffDenominator > 0 ? h * Math.Sqrt(stiffNumerator / stiffDenominator) : 0.0;
        // First same as last: k₇ at the new point is the next step's k₁; swap buffers instead of copying.
        (State, _yNew) = (_yNew, State);
        (Slope, _k7) = (_k7, Slope);
        PreviousTime = Time;
        Time = _trialTime;
    }

    public override void Interpolate(double t, double[] into)
    {
        var theta = StepFraction(t);
        var theta1 = 1.0 - theta;
        for (var i = 0; i < into.Length; i++)
            into[i] = _r1[i] + theta * (_r2[i] + theta1 * (_r3[i] + theta * (_r4[i] + theta1 * _r5[i])));
    }

    public override int WorstComponent() =>
        ErrorNorm.WorstComponent(_error, State, _yNew, RelativeTolerance, AbsoluteTolerance);
}
