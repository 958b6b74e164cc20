using System.Numerics;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>What the rate equations do after their transient, as <see cref="CycleDetection"/> reads it.</summary>
public enum OscillationKind
{
    /// <summary>No oscillation: the solution settles without ringing (real eigenvalues at the steady state), or the detection could not decide.</summary>
    None,
    /// <summary>The solution spirals into a stable focus: complex eigenvalues with negative real parts at the steady state.</summary>
    DampedOscillation,
    /// <summary>The solution runs on a periodic orbit of constant amplitude (a limit cycle).</summary>
    LimitCycle,
}

/// <summary>The range one species covers along the rate equations' cycle.</summary>
/// <param name="Species">The species name.</param>
/// <param name="Minimum">The trough, in copies.</param>
/// <param name="Maximum">The peak, in copies.</param>
public sealed record CycleRange(string Species, double Minimum, double Maximum)
{
    /// <summary>Half the peak-to-trough range, in copies (the amplitude of a sinusoid of that range).</summary>
    public double Amplitude => (Maximum - Minimum) / 2;
}

/// <summary>
/// The rate equations' oscillation: the kind, the period, the range of every species along one period,
/// the cycle's Floquet multipliers and the eigenvalues of the Jacobian at the steady state where there is one.
/// docs/methods-analysis.md, section 7, states the rules.
/// </summary>
/// <param name="Kind">Limit cycle, damped oscillation to a stable focus, or none.</param>
/// <param name="Period">The period in model time units: of the cycle (between successive peaks) for a limit cycle,
/// 2π/|Im λ| of the least damped complex pair for a focus; NaN for none.</param>
/// <param name="Ranges">For a limit cycle, each species' trough and peak along the last detected period; empty otherwise.</param>
/// <param name="FloquetMultipliers">For a limit cycle, the eigenvalues of the monodromy matrix (the variational
/// equations' solution over one period with the exact Jacobian), sorted by distance from 1, the trivial multiplier first; empty otherwise.</param>
/// <param name="NeutralDirections">How many multipliers besides the trivial one are 1 by construction (one per conservation law).</param>
/// <param name="SteadyEigenvalues">The Jacobian's eigenvalues at the steady state the solution reached (empty for a limit cycle), in 1/time.</param>
/// <param name="SteadyState">The steady state reached, in copies (empty for a limit cycle).</param>
/// <param name="CycleStart">A point on the cycle (at the reference species' peak), in copies; empty otherwise.</param>
/// <param name="ReferenceSpecies">The species whose peaks define the period.</param>
/// <param name="Reason">Why the kind was decided, in words.</param>
public sealed record RateEquationOscillation(
    OscillationKind Kind,
    double Period,
    IReadOnlyList<CycleRange> Ranges,
    IReadOnlyList<Complex> FloquetMultipliers,
    int NeutralDirections,
    IReadOnlyList<Complex> SteadyEigenvalues,
    IReadOnlyList<double> SteadyState,
    IReadOnlyList<double> CycleStart,
    string ReferenceSpecies,
    string Reason)
{
    /// <summary>The largest modulus among the non-trivial, non-neutral Floquet multipliers; NaN without a cycle or without such multipliers.</summary>
    public double LargestNontrivialMultiplier =>
        FloquetMultipliers.Count > 1 + NeutralDirections ? FloquetMultipliers.Skip(1 + NeutralDirections).Max(m => m.Magnitude) : double.NaN;

    /// <summary>True for a limit cycle whose non-trivial multipliers all lie inside the unit circle (an orbitally stable cycle).</summary>
    public bool IsStableCycle => Kind == OscillationKind.LimitCycle && !(LargestNontrivialMultiplier >= 1);

    /// <summary>For a focus, 1/|Re λ| of the least damped complex pair (the time an oscillation's amplitude falls by e); NaN otherwise.</summary>
    public double DampingTime => LeastDampedComplexPair is { } l ? -1 / l.Real : double.NaN;

    /// <summary>True when the steady state's linearisation has a complex pair, i.e. the steady state can ring.</summary>
    public bool HasComplexEigenvalues => LeastDampedComplexPair is not null;

    /// <summary>The complex eigenvalue (positive imaginary part) with the largest real part; null when every eigenvalue is real.</summary>
    public Complex? LeastDampedComplexPair =>
        SteadyEigenvalues.Where(l => l.Imaginary > ComplexTolerance * Math.Max(1, l.Magnitude)).OrderByDescending(l => l.Real).Select(l => (Complex?)l).FirstOrDefault();

    /// <summary>Below this relative imaginary part an eigenvalue is read as real (round-off of the eigen-solver).</summary>
    public const double ComplexTolerance = 1e-9;
}
