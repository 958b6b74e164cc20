namespace CopyNumber.MasterEquation;

/// <summary>How the master equation is stepped in time.</summary>
public enum Stepping
{
    /// <summary>Per stretch between grid (or schedule) times, the stepper expected to cost less (see <see cref="StepperRule"/>).</summary>
    Automatic,

    /// <summary>Uniformisation only (Jensen 1953): a rigorous error bound, cost ≈ Λ·T sparse products.</summary>
    Uniformisation,

    /// <summary>The Krylov exponential only (Sidje 1998): an a-posteriori error estimate, cost set by the solution's smoothness.</summary>
    Krylov,
}

/// <summary>
/// The documented rule that picks the time stepper for each stretch [t, t'] between grid or schedule times.
/// Costs are counted in sparse-product equivalents: uniformisation needs about Λ·Δ + 6√(Λ·Δ) + 1 products
/// (Λ the uniformisation rate, Δ = t' − t), known beforehand; a Krylov step costs its m + 1 products plus its
/// orthogonalisation, counted as <see cref="PassesPerProduct"/> vector passes per product (a pass reads about
/// 16–24 bytes per state, a product of the master equation's generator about 140). The Krylov cost per unit time
/// is measured over the accepted steps of the last stretch it stepped. Rule: uniformisation while Λ·Δ is below the
/// cost of one Krylov step (it is then cheaper whatever Krylov does, and its bound is rigorous); Krylov otherwise,
/// unless its measured cost per unit time exceeds Λ·(1 + 6/√(Λ·Δ)), the cost rate of uniformisation on the same
/// stretch — and then Krylov is tried again after <see cref="RetryAfter"/> stretches. The choice depends only on
/// counts, never on wall time, so a solve is reproducible.
/// </summary>
public sealed class StepperRule
{
    /// <summary>Vector passes (a dot product or an axpy over the projection) counted as one sparse product.</summary>
    public const double PassesPerProduct = 7;

    /// <summary>
    /// The cost of one Krylov step of basis size m and orthogonalisation depth q: m + 1 products and about
    /// m·(2q + 2) + m + 1 vector passes (a dot product and an axpy per earlier vector, a norm and a scaling per
    /// column, and the final combination).
    /// </summary>
    public static double KrylovStepCost { get; } = KrylovExponential.BasisSize + 1
        + (KrylovExponential.BasisSize * (2.0 * KrylovExponential.OrthogonalisationDepth + 2) + KrylovExponential.BasisSize + 1) / PassesPerProduct;

    /// <summary>After this many stretches stepped by uniformisation, Krylov is tried again (the projection and Λ change).</summary>
    public const int RetryAfter = 8;

    private readonly Stepping _stepping;
    private double _work, _time;        // accepted Krylov steps of the current stretch
    private double _rate = double.NaN;  // product equivalents per unit time of the last stretch Krylov stepped
    private int _sinceKrylov;

    /// <summary>A rule for the given setting.</summary>
    public StepperRule(Stepping stepping) => _stepping = stepping;

    /// <summary>True when the stretch of length <paramref name="span"/> at uniformisation rate <paramref name="rate"/> should be stepped by Krylov.</summary>
    public bool UseKrylov(double rate, double span)
    {
        if (_time > 0) _rate = _work / _time;
        (_work, _time) = (0, 0);
        if (_stepping != Stepping.Automatic) return _stepping == Stepping.Krylov;
        var products = rate * span;
        var krylov = products >= KrylovStepCost
            && (double.IsNaN(_rate) || _sinceKrylov >= RetryAfter || _rate < rate * (1 + 6 / Math.Sqrt(products)));
        _sinceKrylov = krylov ? 0 : _sinceKrylov + 1;
        return krylov;
    }

    /// <summary>
    /// Records an accepted Krylov step: its work (product equivalents) and length. Steps refused because the
    /// projection had to grow are not counted, as uniformisation's cost estimate does not count its own.
    /// </summary>
    public void RecordKrylov(double work, double time)
    {
        _work += work;
        _time += time;
    }
}
