namespace CopyNumber.Deterministic;

/// <summary>
/// Decides when Auto mode changes method. Towards the stiff method: the test of Hairer's DOPRI5
/// (Hairer, Nørsett &amp; Wanner, Solving ODEs I, 2nd ed., Sect. IV.2 of vol. II, "Automatic stiffness
/// detection"): the quotient h·|λ| ≈ h·‖k₇ − k₆‖/‖y₁ − y₆‖ near the border of Dormand–Prince's stability
/// region (about −3.3 on the real axis) in 15 accepted steps, with 6 consecutive calm steps forgiving
/// earlier votes, means the step is limited by stability rather than accuracy. DOPRI5 votes above 3.25;
/// we vote above 3.0 because the PI controller holds a stability-limited step smoothly just inside the
/// border (h·|λ| ≈ 3.22 measured on a Prothero–Robinson component with λ = −10⁴), where 3.25 is never reached. Back to the explicit
/// method: when the stiff method's next step h satisfies h·‖J‖∞ ≤ 2 for 15 consecutive steps, explicit
/// stepping at that size would be stable (‖J‖∞ bounds the spectral radius), so stiffness has faded;
/// the margin below 3.3 and the vote count keep the two tests from chasing each other.
/// </summary>
internal sealed class StiffnessDetector
{
    private const double ExplicitStabilityBorder = 3.0;
    private const int StiffVotesNeeded = 15;
    private const int CalmStepsToForget = 6;
    private const double SafeExplicitStep = 2.0;
    private const int NonStiffVotesNeeded = 15;

    private int _stiffVotes;
    private int _calmSteps;
    private int _nonStiffVotes;

    /// <summary>Clears all votes (after a switch or a restart).</summary>
    public void Reset()
    {
        _stiffVotes = 0;
        _calmSteps = 0;
        _nonStiffVotes = 0;
    }

    /// <summary>Records an accepted explicit step's stiffness quotient; true when the problem is judged stiff.</summary>
    public bool AfterExplicitStep(double stiffnessQuotient)
    {
        if (stiffnessQuotient > ExplicitStabilityBorder)
        {
            _calmSteps = 0;
            if (++_stiffVotes >= StiffVotesNeeded) { Reset(); return true; }
        }
        else if (++_calmSteps >= CalmStepsToForget)
        {
            _stiffVotes = 0;
        }
        return false;
    }

    /// <summary>Records an accepted stiff step; true when the explicit method would now be stable at the proposed step.</summary>
    /// <param name="nextStep">The step the controller proposes next.</param>
    /// <param name="jacobianNorm">‖J‖∞ on the step just taken.</param>
    public bool AfterStiffStep(double nextStep, double jacobianNorm)
    {
        if (nextStep * jacobianNorm <= SafeExplicitStep)
        {
            if (++_nonStiffVotes >= NonStiffVotesNeeded) { Reset(); return true; }
        }
        else _nonStiffVotes = 0;
        return false;
    }
}
