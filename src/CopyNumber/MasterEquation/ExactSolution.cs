using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.MasterEquation;

/// <summary>The law of one quantity at one grid time, from the master equation.</summary>
/// <param name="Distribution">For a count quantity, its marginal law on the projection, normalised (conditional on
/// the projection); null for a real-valued readout.</param>
/// <param name="Mean">The mean of the normalised law.</param>
/// <param name="Variance">The variance of the normalised law (no n − 1: there is no sample).</param>
/// <param name="MeanErrorBar">ε·max|x| over the projection: the error of the mean if the missing probability ε lay within the
/// projection's range. Not a rigorous bound (the master equation does not say where the missing mass lies); it is the
/// error bar <c>contrast</c> uses for an exact run.</param>
public sealed record ExactLaw(CountDistribution? Distribution, double Mean, double Variance, double MeanErrorBar);

/// <summary>
/// The master equation solved on a grid: per grid time, every quantity's law, the probability outside the
/// projection (a rigorous 1-norm bound on the error of the whole joint law), the part of it the time stepping
/// may have lost, and the projection's size.
/// </summary>
public sealed class ExactSolution
{
    internal ExactSolution(TimeGrid grid, IReadOnlyList<Quantity> quantities, ExactLaw[,] laws, double[] bound, double[] steppingError, int[] states,
        long products, double largestRate, int dimension, TimeSpan wallTime)
    {
        Grid = grid;
        Quantities = quantities;
        _laws = laws;
        Bound = bound;
        SteppingError = steppingError;
        States = states;
        Products = products;
        LargestRate = largestRate;
        Dimension = dimension;
        WallTime = wallTime;
    }

    private readonly ExactLaw[,] _laws;

    /// <summary>The grid.</summary>
    public TimeGrid Grid { get; }

    /// <summary>Species, then readouts (as in an ensemble).</summary>
    public IReadOnlyList<Quantity> Quantities { get; }

    /// <summary>The law of quantity <paramref name="quantity"/> at grid point <paramref name="gridIndex"/>.</summary>
    public ExactLaw Law(int gridIndex, int quantity) => _laws[gridIndex, quantity];

    /// <summary>
    /// Per grid time, a bound on ‖p_true − p‖₁, the error of every probability and of every marginal: 1 − Σp over the
    /// projection, plus twice the Krylov steps' error estimates so far. With uniformisation alone the projected,
    /// truncated solution lies below the true law state by state (Munsky &amp; Khammash 2006, Theorem 2.2;
    /// uniformisation's terms are nonnegative), so 1 − Σp is exactly that error and rigorous; a Krylov step's
    /// error e changes Σp by at most ‖e‖₁, hence the projection error 1 − Σp_projected ≤ 1 − Σp + ‖e‖₁ and the
    /// total ≤ 1 − Σp + 2‖e‖₁, rigorous as far as the Krylov estimate of ‖e‖₁ holds.
    /// </summary>
    public IReadOnlyList<double> Bound { get; }

    /// <summary>
    /// Per grid time, the time-stepping error so far: the Poisson tails cut by uniformisation (rigorous) plus the
    /// a-posteriori estimates of the Krylov steps (<see cref="KrylovError"/>, well established but not rigorous).
    /// </summary>
    public IReadOnlyList<double> SteppingError { get; }

    /// <summary>States in the projection at each grid time.</summary>
    public IReadOnlyList<int> States { get; }

    /// <summary>Sparse matrix–vector products done.</summary>
    public long Products { get; }

    /// <summary>The largest uniformisation rate Λ used, per unit time.</summary>
    public double LargestRate { get; }

    /// <summary>Stored coordinates per state (species less conservation laws).</summary>
    public int Dimension { get; }

    /// <summary>
    /// Per grid time, the joint law of the two species of <see cref="ExactOptions.Joint"/>: (first count, second count,
    /// probability) with positive probability, ordered by first then second count, normalised on the projection
    /// like the marginals; empty when no joint law was asked for.
    /// </summary>
    public IReadOnlyList<IReadOnlyList<(long First, long Second, double Probability)>> Joint { get; init; } = [];

    /// <summary>Steps refused because too much probability left the projection (each redone after growing it).</summary>
    public int RefusedSteps { get; init; }

    /// <summary>Krylov steps taken (0 when uniformisation did all the stepping).</summary>
    public int KrylovSteps { get; init; }

    /// <summary>The sum of the Krylov steps' a-posteriori error estimates (1-norm), included in <see cref="SteppingError"/>.</summary>
    public double KrylovError { get; init; }

    /// <summary>Wall-clock time of the solve.</summary>
    public TimeSpan WallTime { get; }
}
