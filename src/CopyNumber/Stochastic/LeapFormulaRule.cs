namespace CopyNumber.Stochastic;

/// <summary>
/// Which formula a tau-leap uses (docs/methods.md, "Tau-leaping: the relaxation rule"). The leap size τ
/// comes from the leap condition of Cao, Gillespie &amp; Petzold (2006, J. Chem. Phys. 124:044109) and the
/// run's stops; ρ is Gershgorin's bound on |λ| over the eigenvalues of the drift's Jacobian
/// J = N·∂a/∂x (<see cref="PropensityJacobian"/>), ρ₊ its bound on the largest growth rate.
/// </summary>
/// <remarks>
/// <para>1. τ·ρ ≤ θ: the explicit (Euler) leap of Gillespie (2001, J. Chem. Phys. 115:1716). For a linear
/// mode of rate d its stationary variance is 2b/(d(2 − dτ)) against the true b/d: the relative error
/// dτ/(2 − dτ) ≤ θ/(2 − θ) (0.1% at the default θ = 0.002). Its mean of a growing mode of rate λ is multiplied per
/// leap by 1 + λτ instead of e^(λτ): a relative bias of about −λ²τ/2 ≥ −λθ/2 per unit time.</para>
/// <para>2. τ·ρ &gt; θ: the relaxation bound would force τ below the leap condition's — the fast modes
/// of a stiff network, or a slow network recorded rarely — so instead of shortening the leap the
/// trapezoidal leap of Cao &amp; Petzold (2005, J. Comput. Phys. 206:395; quoted from memory) is taken
/// at the same τ (<see cref="TrapezoidalLeap"/>): its stationary mean and covariance are exact on
/// linear networks at every τ, and its mean bias is second order.</para>
/// <para>3. Either way the leap is also capped at τ·ρ₊ ≤ 1 when some mode may grow (ρ₊ &gt; 0), keeping
/// I − τJ/2 far from singular; the leap condition alone usually keeps τ well below that.</para>
/// </remarks>
internal static class LeapFormulaRule
{
    /// <summary>θ unless told otherwise: an explicit leap's stationary variance error ≤ θ/(2 − θ) ≈ 0.1%.</summary>
    public const double DefaultRelaxation = 0.002;

    /// <summary>The largest leap any formula may take when a mode may grow at rate up to <paramref name="growth"/>.</summary>
    public static double GrowthCap(double growth) => growth > 0.0 ? 1.0 / growth : double.PositiveInfinity;

    /// <summary>True when a leap of size <paramref name="tau"/> must use the trapezoidal formula.</summary>
    public static bool UsesTrapezoid(double tau, double relaxationRate, double theta) => tau * relaxationRate > theta;
}
