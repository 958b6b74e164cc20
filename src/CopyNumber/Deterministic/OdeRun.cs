namespace CopyNumber.Deterministic;

/// <summary>Receives the solution at a requested output time; <paramref name="state"/> is only valid during the call.</summary>
/// <param name="index">Index of the output time in the span passed to <see cref="OdeRun.Advance"/>.</param>
/// <param name="time">The output time.</param>
/// <param name="state">y at that time.</param>
internal delegate void OutputSink(int index, double time, double[] state);

/// <summary>
/// One integration of one system, possibly over several segments separated by restarts (schedule
/// events): owns the steppers, the statistics, the method in use and the step budget. Output times are
/// served by dense output, so they never shorten a step; only a segment's end is hit exactly.
/// </summary>
internal sealed class OdeRun
{
    private const double MachineEpsilon = 2.220446049250313e-16;
    private readonly IOdeSystem _system;
    private readonly SolverOptions _options;
    private readonly StiffnessDetector _detector = new();
    private readonly double[] _slope, _yTrial, _fTrial, _output;
    private DormandPrince54? _explicit;
    private RosenbrockRodas4? _stiff;
    private bool _stiffMode;
    private int _attempts;

    public OdeRun(IOdeSystem system, SolverOptions options)
    {
        _system = system;
        _options = options;
        _stiffMode = options.Kind == SolverKind.Stiff;
        var n = system.Dimension;
        _slope = new double[n];
        _yTrial = new double[n];
        _fTrial = new double[n];
        _output = new double[n];
    }

    public OdeStatistics Statistics { get; } = new();

    private OdeStepper Current => _stiffMode
        ? _stiff ??= new RosenbrockRodas4(_system, _options, Statistics)
        : _explicit ??= new DormandPrince54(_system, _options, Statistics);

    /// <summary>
    /// Integrates from (<paramref name="t0"/>, <paramref name="y"/>) to <paramref name="tEnd"/>, leaving the state at
    /// <paramref name="tEnd"/> in <paramref name="y"/>. <paramref name="outputTimes"/> must be sorted and lie in [t0, tEnd].
    /// </summary>
    /// <param name="t0">Start time.</param>
    /// <param name="y">The state at <paramref name="t0"/>; on return the state at the time reached.</param>
    /// <param name="tEnd">End time.</param>
    /// <param name="outputTimes">Times to serve to <paramref name="sink"/>, sorted, in [t0, tEnd].</param>
    /// <param name="sink">Receives the solution at each output time.</param>
    /// <param name="turnsTrue">
    /// Optional: whether a state makes a state-triggered change's condition turn true. After each accepted
    /// step whose end state does, the crossing is located by bisection on the step's dense output, down to
    /// round-off in t (so the time's error is the interpolant's, of the order of the tolerances); the
    /// integration stops there, with the state at the crossing in <paramref name="y"/> and only the output
    /// times before it served.
    /// </param>
    /// <returns>The time reached: <paramref name="tEnd"/>, or the crossing's time.</returns>
    public double Advance(double t0, double[] y, double tEnd, ReadOnlySpan<double> outputTimes, OutputSink sink, Func<double[], bool>? turnsTrue = null)
    {
        var next = 0;
        for (; next < outputTimes.Length && outputTimes[next] <= t0; next++) sink(next, outputTimes[next], y);
        if (!(tEnd > t0)) return t0;

        _system.Derivative(t0, y, _slope);
        Statistics.FunctionEvaluations++;
        for (var i = 0; i < y.Length; i++)
            if (!double.IsFinite(_slope[i]))
                throw new SolverFailureException(t0, _system.ComponentName(i), $"its rate of change is {_slope[i]}");

        if (tEnd - t0 <= 8 * MachineEpsilon * Math.Max(Math.Abs(t0), Math.Abs(tEnd)))
        {
            // A segment shorter than round-off in t (two schedule times a few ulps apart): one Euler
            // step is exact to working precision, and no adaptive step could be represented anyway.
            for (var i = 0; i < y.Length; i++) y[i] += (tEnd - t0) * _slope[i];
            for (; next < outputTimes.Length; next++) sink(next, outputTimes[next], y);
            return tEnd;
        }

        var stepper = Current;
        stepper.Start(t0, y, _slope);
        Statistics.NoteMethod(stepper.Name);
        _detector.Reset();
        var h = InitialStepSize.Choose(_system, t0, y, _slope, stepper.Order, tEnd - t0,
            _options.RelativeTolerance, _options.AbsoluteTolerance, _yTrial, _fTrial, Statistics);

        while (true)
        {
            var t = stepper.Time;
            _options.Cancel.ThrowIfCancellationRequested();
            if (_attempts >= _options.MaxSteps)
                throw new SolverFailureException(t, null, $"more than {_options.MaxSteps} steps were needed"
                    + (_options.Kind == SolverKind.Explicit ? "; the problem may be stiff (try the stiff or automatic solver)" : ""));
            var tNew = t + 1.01 * h >= tEnd ? tEnd : t + h;
            if (!(tNew - t > 4 * MachineEpsilon * Math.Abs(t)) || !(tNew > t))
                throw new SolverFailureException(t, _attempts > 0 ? _system.ComponentName(stepper.WorstComponent()) : null,
                    $"the step size fell to {tNew - t:G3}, below round-off; the solution may blow up or a rate may not be finite");
            _attempts++;
            var error = stepper.Attempt(tNew);
            if (!(error <= 1))
            {
                Statistics.RejectedSteps++;
                h = stepper.Controller.Rejected(tNew - t, error);
                continue;
            }

            stepper.Accept();
            Statistics.Steps++;
            if (_stiffMode) Statistics.StiffSteps++; else Statistics.ExplicitSteps++;
            // A crossing inside the step: outputs before it are served, the state at it is handed back.
            var crossing = turnsTrue is not null && turnsTrue(stepper.State) ? LocateCrossing(stepper, turnsTrue) : double.NaN;
            while (next < outputTimes.Length && (outputTimes[next] < crossing || double.IsNaN(crossing) && outputTimes[next] <= tNew))
            {
                if (outputTimes[next] == tNew) sink(next, tNew, stepper.State);
                else
                {
                    stepper.Interpolate(outputTimes[next], _output);
                    sink(next, outputTimes[next], _output);
                }
                next++;
            }
            if (!double.IsNaN(crossing))
            {
                if (crossing == tNew) Array.Copy(stepper.State, y, y.Length);
                else stepper.Interpolate(crossing, y);
                return crossing;
            }
            if (tNew == tEnd)
            {
                Array.Copy(stepper.State, y, y.Length);
                return tEnd;
            }
            h = stepper.Controller.Accepted(tNew - t, error);
            if (SwitchMethod(stepper, h)) stepper = Current;
        }
    }

    /// <summary>
    /// The earliest time in the last accepted step at which the dense output makes a condition turn true,
    /// by bisection between its start (false) and its end (true) until the bracket is a few ulps wide;
    /// the bracket's upper end, where the condition holds.
    /// </summary>
    private double LocateCrossing(OdeStepper stepper, Func<double[], bool> turnsTrue)
    {
        var low = stepper.PreviousTime;
        var high = stepper.Time;
        for (var i = 0; i < 200 && high - low > 4 * MachineEpsilon * Math.Max(1.0, Math.Abs(high)); i++)
        {
            var middle = low + (high - low) / 2;
            stepper.Interpolate(middle, _output);
            if (turnsTrue(_output)) high = middle;
            else low = middle;
        }
        return high;
    }

    /// <summary>Applies the stiffness tests after an accepted step; true when the method changed.</summary>
    private bool SwitchMethod(OdeStepper stepper, double nextStep)
    {
        if (!_stiffMode)
        {
            if (!_detector.AfterExplicitStep(((DormandPrince54)stepper).StiffnessQuotient)) return false;
            Statistics.StiffnessDetected = true;
            if (_options.Kind != SolverKind.Auto) return false;
            _stiffMode = true;
            Statistics.StiffSwitches++;
        }
        else
        {
            if (_options.Kind != SolverKind.Auto) return false;
            if (!_detector.AfterStiffStep(nextStep, ((RosenbrockRodas4)stepper).JacobianNorm)) return false;
            _stiffMode = false;
            Statistics.NonStiffSwitches++;
        }
        var successor = Current;
        successor.Start(stepper.Time, stepper.State, stepper.Slope);
        Statistics.NoteMethod(successor.Name);
        return true;
    }
}
