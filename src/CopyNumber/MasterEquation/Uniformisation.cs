namespace CopyNumber.MasterEquation;

/// <summary>
/// The action of the matrix exponential on a probability vector by uniformisation (Jensen 1953,
/// Skand. Aktuarietidskr. 36:87): with Λ ≥ max a₀ and the substochastic matrix P = I + A/Λ,
/// e^{Ah}p = Σₙ e^{−Λh}(Λh)ⁿ/n! · Pⁿp. Every term is nonnegative, so cutting the series at N loses
/// exactly the mass Σ_{n&gt;N} w_n‖Pⁿp‖₁ ≤ 1 − Σ_{n≤N} w_n: the truncation error in the 1-norm is
/// bounded rigorously by the Poisson tail, and the truncated result stays below the true one entry by
/// entry (which keeps the projection bound 1 − Σp rigorous). N is the smallest index whose tail is
/// below the tolerance asked for.
/// </summary>
/// <remarks>
/// Stiffness rule: the work is about Λh + 6√(Λh) products, so a step is limited to Λh ≤
/// <see cref="LargestStepProducts"/> (which also keeps e^{−Λh} far above the smallest double); a stiff
/// network (a large Λ against the time span) costs about Λ·T products in all, which
/// <see cref="FiniteStateProjection"/> reports. Λ is the largest exit rate over the current projection
/// only, never over the whole lattice. The same pass accumulates the time integral of the probability
/// of each state over the step, ∫₀ʰ p(s) ds = Σₙ (1 − F_n)/Λ · Pⁿp with F_n the Poisson distribution
/// function, which says how much probability each boundary state sent out of the projection.
/// The product y = P·v runs on all cores (rows split into chunks, one <c>Parallel.For</c> per product),
/// and the per-row loop allocates nothing.
/// </remarks>
public sealed class Uniformisation
{
    /// <summary>The largest Λh of one step (products per step ≈ this plus its tail).</summary>
    public const double LargestStepProducts = 400;

    private readonly Generator _generator;
    private readonly ParallelOptions _parallel;
    private readonly double[] _scaled;
    private readonly double[] _diagonal;
    private readonly Action<int> _chunkBody;
    private double[] _current = [];
    private double[] _next = [];
    private double[] _result = [];
    private double[] _occupancy = [];
    private double _weight, _occupancyWeight;

    /// <summary>A propagator for <paramref name="generator"/>, using up to the given parallelism.</summary>
    public Uniformisation(Generator generator, ParallelOptions parallel)
    {
        ArgumentNullException.ThrowIfNull(generator);
        _generator = generator;
        _parallel = parallel;
        Rate = generator.LargestExitRate;
        _scaled = new double[generator.Rate.Length];
        _diagonal = new double[generator.States];
        if (Rate > 0)
        {
            for (var e = 0; e < _scaled.Length; e++) _scaled[e] = generator.Rate[e] / Rate;
            for (var k = 0; k < _diagonal.Length; k++) _diagonal[k] = 1 - generator.Exit[k] / Rate;
        }
        _chunkBody = RunChunk;
    }

    /// <summary>Λ, per unit time.</summary>
    public double Rate { get; }

    /// <summary>Sparse products done so far.</summary>
    public long Products { get; private set; }

    /// <summary>The longest step this propagator takes in one go.</summary>
    public double LongestStep => Rate > 0 ? LargestStepProducts / Rate : double.PositiveInfinity;

    /// <summary>
    /// Advances <paramref name="start"/> by <paramref name="h"/> (≤ <see cref="LongestStep"/>) into
    /// <paramref name="result"/>, and writes each state's time-integrated probability over the step into
    /// <paramref name="occupancy"/>. Returns the Poisson tail cut off, the bound on the 1-norm error of the step.
    /// </summary>
    public double Advance(double[] start, double h, double tailTolerance, double[] result, double[] occupancy)
    {
        var n = _generator.States;
        if (Rate == 0 || h == 0)
        {
            Array.Copy(start, result, n);
            for (var k = 0; k < n; k++) occupancy[k] = start[k] * h;
            return 0;
        }
        var lambda = Rate * h;
        if (lambda > LargestStepProducts * (1 + 1e-12)) throw new ArgumentOutOfRangeException(nameof(h), "the step is longer than the propagator's longest step");
        var tolerance = Math.Max(tailTolerance, 1e-14);
        if (_current.Length < n) { _current = new double[n]; _next = new double[n]; }
        Array.Copy(start, _current, n);
        _result = result;
        _occupancy = occupancy;

        var w = Math.Exp(-lambda);
        var cumulative = w;
        for (var k = 0; k < n; k++)
        {
            result[k] = w * start[k];
            occupancy[k] = (1 - cumulative) / Rate * start[k];
        }
        // Beyond λ + 60√λ + 60 the tail is far below any tolerance a double can express.
        var cap = (int)Math.Ceiling(lambda + 60 * Math.Sqrt(lambda) + 60);
        for (var term = 1; term <= cap && 1 - cumulative > tolerance; term++)
        {
            w *= lambda / term;
            cumulative += w;
            _weight = w;
            _occupancyWeight = Math.Max(0, 1 - cumulative) / Rate;
            Product();
            (_current, _next) = (_next, _current);
        }
        return Math.Max(0, 1 - cumulative);
    }

    private void Product()
    {
        Products++;
        var chunks = Generator.Chunks(_generator.States);
        if (chunks == 1) RunChunk(0);
        else Parallel.For(0, chunks, _parallel, _chunkBody);
    }

    private void RunChunk(int chunk)
    {
        var (from, to) = Generator.ChunkRange(chunk, _generator.States);
        var rowStart = _generator.RowStart;
        var source = _generator.Source;
        var scaled = _scaled;
        var diagonal = _diagonal;
        var v = _current;
        var y = _next;
        var result = _result;
        var occupancy = _occupancy;
        var w = _weight;
        var c = _occupancyWeight;
        for (var k = from; k < to; k++)
        {
            var sum = diagonal[k] * v[k];
            for (var e = rowStart[k]; e < rowStart[k + 1]; e++) sum += scaled[e] * v[source[e]];
            y[k] = sum;
            result[k] += w * sum;
            occupancy[k] += c * sum;
        }
    }
}
