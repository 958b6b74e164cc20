namespace CopyNumber.Ensembles;

/// <summary>
/// Each quantity's variance split by the law of total variance, Var X = E[Var(X | θ)] + Var(E[X | θ]), into
/// an intrinsic part (the noise of a cell with fixed parameters θ) and an extrinsic part (from θ varying
/// between cells; Swain, Elowitz &amp; Siggia 2002, PNAS 99:12795), estimated from a nested design: groups of
/// g replicates share one draw of θ (<see cref="Network.ParameterVariability"/>).
/// </summary>
/// <remarks>
/// Estimator (ours, by the method of moments): consecutive groups are paired within a block (2i, 2i + 1). For
/// a pair with group means m_a, m_b and within-group sample variances s_a², s_b²:
/// w = (s_a² + s_b²)/2 is unbiased for the intrinsic part E[Var(X | θ)], and
/// z = (m_a − m_b)²/2 − w/g is unbiased for the extrinsic part Var(E[X | θ]) (since E[(m_a − m_b)²/2] =
/// Var(m) = Var(E[X | θ]) + E[Var(X | θ)]/g). Pairs are independent and identically distributed, so each
/// part's standard error is the sample SD of w or z over the P pairs divided by √P, with no assumption about
/// the shape of the laws. The extrinsic estimate can be negative by sampling error when the part is small.
/// Pairs are formed inside one block, and their estimators are cells of the run's own <see cref="MomentTree"/> (after
/// the readouts and species pairs), so the result does not depend on the thread count and shards, merges and resumed
/// runs carry it exactly like the readouts' moments.
/// </remarks>
public sealed class NoiseDecomposition
{
    private readonly MomentAccumulator[] _cells;

    internal NoiseDecomposition(int replicatesPerDraw, int gridPoints, IReadOnlyList<Quantity> quantities, MomentAccumulator[] cells)
    {
        ReplicatesPerDraw = replicatesPerDraw;
        GridPoints = gridPoints;
        Quantities = quantities;
        _cells = cells;
    }

    /// <summary>g, the replicates that share one draw of the varying parameters.</summary>
    public int ReplicatesPerDraw { get; }

    /// <summary>Grid points covered.</summary>
    public int GridPoints { get; }

    /// <summary>The quantities, in the order of <see cref="EnsembleResult.Quantities"/>.</summary>
    public IReadOnlyList<Quantity> Quantities { get; }

    /// <summary>The number of pairs of groups behind the estimates at grid point <paramref name="point"/> and quantity <paramref name="quantity"/>.</summary>
    public long Pairs(int point, int quantity) => Intrinsic(point, quantity).Count;

    /// <summary>The intrinsic part's estimator w over the pairs (mean: the estimate; <see cref="MomentAccumulator.StandardError"/>: its SE).</summary>
    public MomentAccumulator Intrinsic(int point, int quantity) => _cells[Cell(point, quantity) * 2];

    /// <summary>The extrinsic part's estimator z over the pairs.</summary>
    public MomentAccumulator Extrinsic(int point, int quantity) => _cells[Cell(point, quantity) * 2 + 1];

    /// <summary>The ensemble mean of decomposition quantity <paramref name="quantity"/> (counts first, then real ones) at grid point <paramref name="point"/>, for the squared CVs.</summary>
    public static double MeanOf(EnsembleResult result, int point, int quantity)
    {
        ArgumentNullException.ThrowIfNull(result);
        if (quantity >= result.CountQuantities.Count) return result.Moments(point, quantity - result.CountQuantities.Count).Mean;
        var histogram = result.Histogram(point, quantity);
        return histogram.IsEmpty ? double.NaN : DistributionSummary.From(histogram).Mean;
    }

    private int Cell(int point, int quantity) => point * Quantities.Count + quantity;

    /// <summary>The cells a grid point gives the decomposition in the run's moment tree: two per quantity (w, z).</summary>
    internal static int CellsPerPoint(int quantities) => quantities * 2;

    /// <summary>
    /// The names of one grid point's cells, in tree order after the readouts and species pairs: "X/intrinsic" and
    /// "X/extrinsic" per quantity (counts first, then real ones), as readout-state.parquet stores them.
    /// </summary>
    internal static IEnumerable<string> CellNames(IEnumerable<Quantity> orderedQuantities) =>
        orderedQuantities.SelectMany(q => new[] { q.Name + "/intrinsic", q.Name + "/extrinsic" });

    /// <summary>
    /// The decomposition held in a summarised moment tree: cells <paramref name="offset"/> + 2q and + 2q + 1 of each grid
    /// point's <paramref name="stride"/> cells (see <see cref="AddBlock"/>).
    /// </summary>
    internal static NoiseDecomposition FromTree(int replicatesPerDraw, int gridPoints, IReadOnlyList<Quantity> orderedQuantities, MomentAccumulator[] summary, int offset, int stride)
    {
        var cells = new MomentAccumulator[gridPoints * CellsPerPoint(orderedQuantities.Count)];
        for (var k = 0; k < gridPoints; k++)
            for (var c = 0; c < CellsPerPoint(orderedQuantities.Count); c++)
                cells[k * CellsPerPoint(orderedQuantities.Count) + c] = summary[k * stride + offset + c];
        return new NoiseDecomposition(replicatesPerDraw, gridPoints, orderedQuantities, cells);
    }

    /// <summary>
    /// Adds a finished block's pairs of groups to <paramref name="leaf"/>, the block's leaf of the run's moment tree, whose
    /// grid points have <paramref name="stride"/> cells each, the decomposition's from <paramref name="offset"/>. Count
    /// quantities come first in the block's layout, then real ones; the decomposition indexes them in that combined order.
    /// </summary>
    internal static void AddBlock(ReplicateBlock block, int groupSize, int quantities, MomentAccumulator[] leaf, int offset, int stride)
    {
        var points = int.MaxValue;
        for (var slot = 0; slot < block.Length; slot++) points = Math.Min(points, block.RecordedPoints[slot]);
        var pairSize = 2 * groupSize;
        for (var start = 0; start + pairSize <= block.Length; start += pairSize)
            for (var k = 0; k < points; k++)
                for (var q = 0; q < quantities; q++)
                {
                    var (ma, va) = GroupMoments(block, start, groupSize, k, q);
                    var (mb, vb) = GroupMoments(block, start + groupSize, groupSize, k, q);
                    var w = (va + vb) / 2;
                    var z = (ma - mb) * (ma - mb) / 2 - w / groupSize;
                    var cell = k * stride + offset + q * 2;
                    leaf[cell].Add(w);
                    leaf[cell + 1].Add(z);
                }
    }

    // Mean and sample variance (divisor g − 1) of one group at one grid point and quantity, two-pass.
    private static (double Mean, double Variance) GroupMoments(ReplicateBlock block, int first, int size, int point, int quantity)
    {
        var sum = 0.0;
        for (var s = first; s < first + size; s++) sum += Value(block, s, point, quantity);
        var mean = sum / size;
        var squares = 0.0;
        for (var s = first; s < first + size; s++)
        {
            var d = Value(block, s, point, quantity) - mean;
            squares += d * d;
        }
        return (mean, squares / (size - 1));
    }

    private static double Value(ReplicateBlock block, int slot, int point, int quantity) =>
        quantity < block.CountStride
            ? block.CountsOf(slot)[point * block.CountStride + quantity]
            : block.Reals[((long)slot * block.GridPoints + point) * block.RealStride + quantity - block.CountStride];
}
