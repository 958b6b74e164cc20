namespace CopyNumber.Deterministic;

/// <summary>Which integrator the rate equations use.</summary>
public enum SolverKind
{
    /// <summary>Start with Dormand–Prince 5(4); switch to Rodas4 when stiffness is detected and back when it fades.</summary>
    Auto,
    /// <summary>Dormand–Prince 5(4) only (stiffness is only reported in <see cref="OdeStatistics.StiffnessDetected"/>).</summary>
    Explicit,
    /// <summary>The Rosenbrock method Rodas4 only.</summary>
    Stiff,
}

/// <summary>
/// Accuracy and effort settings of <see cref="OdeIntegrator"/> and <see cref="RateEquationSolver"/>. A step
/// is accepted when the root-mean-square over components of err_i / (AbsoluteTolerance + RelativeTolerance·max(|y_i|, |ŷ_i|))
/// (old and new value) is at most 1, so both tolerances are local (per step); global errors are typically a small multiple.
/// </summary>
/// <param name="Kind">The integrator to use.</param>
/// <param name="RelativeTolerance">Relative local error tolerance, dimensionless, 0 ≤ value &lt; 1.</param>
/// <param name="AbsoluteTolerance">Absolute local error tolerance, in units of y (copy numbers for the rate equations), ≥ 0.</param>
/// <param name="MaxSteps">Upper bound on attempted steps (accepted plus rejected) in one call, &gt; 0.</param>
public sealed record SolverOptions(
    SolverKind Kind = SolverKind.Auto,
    double RelativeTolerance = 1e-6,
    double AbsoluteTolerance = 1e-9,
    int MaxSteps = 1_000_000)
{
    /// <summary>
    /// Stops the integration at its next step with <see cref="OperationCanceledException"/> (a signal, a
    /// wall-clock limit); not a setting of the solution, so two options that differ only here solve alike.
    /// </summary>
    public CancellationToken Cancel { get; init; }

    /// <summary>
    /// Stop with <see cref="SolverFailureException"/> when a rate law is negative (or not finite) at a grid time, with
    /// the simulators' message for a negative propensity (<c>copynumber solve</c> sets it). Off by default: the rate
    /// equations have a meaning for a net law that changes sign, such as an SBML reversible reaction imported as one
    /// column (docs/sbml.md), which the SBML Test Suite's semantic cases use.
    /// </summary>
    public bool RefuseNegativeRates { get; init; }

    /// <summary>Null when the options are usable, otherwise a message saying what is wrong.</summary>
    public string? Check()
    {
        if (!Enum.IsDefined(Kind)) return $"unknown solver kind {(int)Kind}";
        if (!(RelativeTolerance >= 0 && RelativeTolerance < 1))
            return $"the relative tolerance must be at least 0 and below 1 (got {RelativeTolerance})";
        if (!(AbsoluteTolerance >= 0) || double.IsPositiveInfinity(AbsoluteTolerance))
            return $"the absolute tolerance must be finite and at least 0 (got {AbsoluteTolerance})";
        if (RelativeTolerance == 0 && AbsoluteTolerance == 0)
            return "the relative and absolute tolerances cannot both be 0";
        if (MaxSteps <= 0) return $"the step limit must be positive (got {MaxSteps})";
        return null;
    }
}
