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
    /// Per grid time, 1 − Σp over the projection: since the projected, truncated solution lies below the true
    /// law state by state (Munsky &amp; Khammash 2006, Theorem 2.2; uniformisation's terms are nonnegative), this
    /// is exactly ‖p_true − p‖₁, a rigorous bound on the error of every probability and of every marginal.
    /// </summary>
    public IReadOnlyList<double> Bound { get; }

    /// <summary>Per grid time, the sum of the Poisson tails cut so far: the part of <see cref="Bound"/> the time stepping may account for.</summary>
    public IReadOnlyList<double> SteppingError { get; }

    /// <summary>States in the projection at each grid time.</summary>
    public IReadOnlyList<int> States { get; }

    /// <summary>Sparse matrix–vector products done.</summary>
    public long Products { get; }

    /// <summary>The largest uniformisation rate Λ used, per unit time.</summary>
    public double LargestRate { get; }

    /// <summary>Stored coordinates per state (species less conservation laws).</summary>
    public int Dimension { get; }

    /// <summary>Wall-clock time of the solve.</summary>
    public TimeSpan WallTime { get; }
}
