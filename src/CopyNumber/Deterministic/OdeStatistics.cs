namespace CopyNumber.Deterministic;

/// <summary>Work counters of one integration (summed over all segments between schedule events).</summary>
public sealed class OdeStatistics
{
    private readonly List<string> _methods = new();

    /// <summary>Accepted steps, both methods.</summary>
    public int Steps { get; internal set; }

    /// <summary>Accepted steps of Dormand–Prince 5(4).</summary>
    public int ExplicitSteps { get; internal set; }

    /// <summary>Accepted steps of Rodas4.</summary>
    public int StiffSteps { get; internal set; }

    /// <summary>Rejected steps (error estimate above tolerance, or a non-finite trial), both methods.</summary>
    public int RejectedSteps { get; internal set; }

    /// <summary>Evaluations of f(t, y).</summary>
    public int FunctionEvaluations { get; internal set; }

    /// <summary>Evaluations of the Jacobian.</summary>
    public int JacobianEvaluations { get; internal set; }

    /// <summary>LU decompositions of I/(hγ) − J.</summary>
    public int LuDecompositions { get; internal set; }

    /// <summary>Switches from the explicit to the stiff method (Auto only).</summary>
    public int StiffSwitches { get; internal set; }

    /// <summary>Switches from the stiff back to the explicit method (Auto only).</summary>
    public int NonStiffSwitches { get; internal set; }

    /// <summary>True when Dormand–Prince's stiffness test fired, whether or not a switch followed.</summary>
    public bool StiffnessDetected { get; internal set; }

    /// <summary>The methods used, in order of first use, comma-separated (e.g. "Dormand–Prince 5(4), Rodas4").</summary>
    public string MethodsUsed => string.Join(", ", _methods);

    internal void NoteMethod(string name)
    {
        if (!_methods.Contains(name)) _methods.Add(name);
    }
}
