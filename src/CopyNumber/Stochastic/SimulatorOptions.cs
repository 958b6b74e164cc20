namespace CopyNumber.Stochastic;

/// <summary>Settings shared by the stochastic simulators.</summary>
/// <param name="Epsilon">
/// Tau-leaping's error-control parameter ε (dimensionless, 0 &lt; ε &lt; 1): a leap may change each
/// propensity by about the fraction ε (Cao, Gillespie &amp; Petzold 2006). Ignored by the exact methods.
/// </param>
/// <param name="MaxEvents">
/// Most reaction firings one replicate may execute (≥ 0). A replicate that needs more stops early with
/// <see cref="ReplicateResult.HitEventLimit"/> set; the grid points after its last event are not recorded.
/// </param>
/// <param name="CriticalThreshold">
/// Tau-leaping's n_c (≥ 0): a reaction that can fire fewer than this many times before exhausting a
/// species it consumes is critical and fires at most once per leap (Cao, Gillespie &amp; Petzold 2005,
/// J. Chem. Phys. 123:054104). Ignored by the exact methods.
/// </param>
/// <param name="Relaxation">
/// Tau-leaping's relaxation bound θ (dimensionless, 0 &lt; θ &lt; 1): a leap of size τ uses the explicit
/// formula only while τ·ρ ≤ θ, ρ bounding the fastest relaxation or growth rate of the network's mean
/// drift; otherwise it uses the trapezoidal formula (<see cref="LeapFormulaRule"/>). On linear death the
/// explicit leap's stationary variance is then at most 2/(2 − θ) − 1 = θ/(2 − θ) too high. Ignored by
/// the exact methods.
/// </param>
public sealed record SimulatorOptions(double Epsilon = 0.03, long MaxEvents = long.MaxValue, int CriticalThreshold = 10, double Relaxation = LeapFormulaRule.DefaultRelaxation)
{
    /// <summary>
    /// Further events an exact replicate without an event limit may be projected to need before it is
    /// stopped as explosive (see docs/methods.md, "Runaway guard"); ensembles lower it to their share of a
    /// run-wide bound. Must be positive.
    /// </summary>
    public double RunawayEvents { get; init; } = RunawayGuard.EventBound;

    /// <summary>
    /// The species whose switching between a low and a high mode is followed at the events, with their
    /// cores (<see cref="Network.ModeCore"/>); empty for none, which costs the event loops nothing but a
    /// branch on a flag they already load.
    /// </summary>
    public IReadOnlyList<Network.ModeCore> Modes { get; init; } = [];

    /// <summary>Throws <see cref="ArgumentOutOfRangeException"/> with a readable message when a setting is out of range.</summary>
    public void Validate()
    {
        if (!(Epsilon > 0 && Epsilon < 1))
            throw new ArgumentOutOfRangeException(nameof(Epsilon), Epsilon, "the tau-leaping error parameter epsilon must lie strictly between 0 and 1");
        if (!(Relaxation > 0 && Relaxation < 1))
            throw new ArgumentOutOfRangeException(nameof(Relaxation), Relaxation, "the tau-leaping relaxation bound theta must lie strictly between 0 and 1");
        if (MaxEvents < 0)
            throw new ArgumentOutOfRangeException(nameof(MaxEvents), MaxEvents, "the event limit per replicate cannot be negative");
        if (CriticalThreshold < 0)
            throw new ArgumentOutOfRangeException(nameof(CriticalThreshold), CriticalThreshold, "the critical-reaction threshold cannot be negative");
        if (!(RunawayEvents > 0))
            throw new ArgumentOutOfRangeException(nameof(RunawayEvents), RunawayEvents, "the runaway bound must be a positive number of events");
    }
}
