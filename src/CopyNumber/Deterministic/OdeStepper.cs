namespace CopyNumber.Deterministic;

/// <summary>
/// One adaptive one-step method as the driver in <see cref="OdeIntegrator"/> uses it: try a step to a
/// given time, then accept it (and interpolate inside it) or discard it. Working arrays are allocated
/// once, so stepping allocates nothing.
/// </summary>
internal abstract class OdeStepper
{
    protected OdeStepper(IOdeSystem system, SolverOptions options, OdeStatistics statistics)
    {
        System = system;
        Statistics = statistics;
        RelativeTolerance = options.RelativeTolerance;
        AbsoluteTolerance = options.AbsoluteTolerance;
        var n = system.Dimension;
        State = new double[n];
        Slope = new double[n];
    }

    /// <summary>The method's name as reported in <see cref="OdeStatistics.MethodsUsed"/>.</summary>
    public abstract string Name { get; }

    /// <summary>Order of the propagated solution (for the starting step).</summary>
    public abstract int Order { get; }

    /// <summary>The step-size controller tuned to this method's error estimate.</summary>
    public abstract StepSizeController Controller { get; }

    protected IOdeSystem System { get; }
    protected OdeStatistics Statistics { get; }
    protected double RelativeTolerance { get; }
    protected double AbsoluteTolerance { get; }

    /// <summary>Time of the current (last accepted) point.</summary>
    public double Time { get; protected set; }

    /// <summary>Time of the previous accepted point; dense output covers [PreviousTime, Time].</summary>
    public double PreviousTime { get; protected set; }

    /// <summary>y at <see cref="Time"/>.</summary>
    public double[] State { get; protected set; }

    /// <summary>f(Time, State).</summary>
    public double[] Slope { get; protected set; }

    /// <summary>Starts at (t, y) with f(t, y) already known; copies both.</summary>
    public virtual void Start(double t, double[] y, double[] f)
    {
        Time = t;
        PreviousTime = t;
        Array.Copy(y, State, y.Length);
        Array.Copy(f, Slope, f.Length);
        Controller.Reset();
    }

    /// <summary>Computes a trial step from <see cref="Time"/> to <paramref name="tNew"/>; returns its scaled error (+∞ when not finite).</summary>
    public abstract double Attempt(double tNew);

    /// <summary>Commits the last trial step; <see cref="Time"/> becomes its end.</summary>
    public abstract void Accept();

    /// <summary>The solution at <paramref name="t"/> in [<see cref="PreviousTime"/>, <see cref="Time"/>] from the last accepted step.</summary>
    public abstract void Interpolate(double t, double[] into);

    /// <summary>θ = (t − PreviousTime)/h of <paramref name="t"/> inside the last accepted step.</summary>
    protected double StepFraction(double t)
    {
        var h = Time - PreviousTime;
        return h > 0 ? (t - PreviousTime) / h : 1.0;
    }

    /// <summary>The component that dominated the last trial's error (or is non-finite), for failure messages.</summary>
    public abstract int WorstComponent();
}
