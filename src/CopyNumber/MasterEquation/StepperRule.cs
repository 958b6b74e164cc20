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
/// is measured from the steps it has taken in this solve. Rule: uniformisation while Λ·Δ is below the cost of
/// one Krylov step (it is then cheaper whatever Krylov does, and its bound is rigorous); Krylov otherwise, unless
/// its measured cost per unit time already exceeds Λ·(1 + 6/√(Λ·Δ)), the cost rate of uniformisation on
/// the same stretch. The choice depends only on counts, never on wall time, so a solve is reproducible.
/// </summary>
public sealed class StepperRule
{
    /// <summary>Vector passes (a dot product or an axpy over the projection) counted as one sparse product.</summary>
    public const double PassesPerProduct = 7;

    /// <summary>The cost of one Krylov step of basis size m: m + 1 products and about 4·m(m+1)/2 + 3m vector passes.</summary>
    public static double KrylovStepCost { get; } = KrylovExponential.BasisSize + 1 + (2.0 * KrylovExponential.BasisSize * (KrylovExponential.BasisSize + 1) + 3 * KrylovExponential.BasisSize) / PassesPerProduct;

    private readonly Stepping _stepping;
    private double _krylovWork;
    private double _krylovTime;

    /// <summary>A rule for the given setting.</summary>
    public StepperRule(Stepping stepping) => _stepping = stepping;

    /// <summary>True when the stretch of length <paramref name="span"/> at uniformisation rate <paramref name="rate"/> should be stepped by Krylov.</summary>
    public bool UseKrylov(double rate, double span)
    {
        if (_stepping != Stepping.Automatic) return _stepping == Stepping.Krylov;
        var products = rate * span;
        if (products < KrylovStepCost) return false;
        if (_krylovTime <= 0) return true;
        return _krylovWork / _krylovTime < rate * (1 + 6 / Math.Sqrt(products));
    }

    /// <summary>Records the work (product equivalents) Krylov spent on a stretch of time <paramref name="time"/>.</summary>
    public void RecordKrylov(double work, double time)
    {
        _krylovWork += work;
        _krylovTime += time;
    }
}
