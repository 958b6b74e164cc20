namespace CopyNumber.MasterEquation;

/// <summary>
/// The action of the matrix exponential on a vector by a Krylov subspace method with the a-posteriori error
/// estimate and step-size control of Sidje (1998, ACM Trans. Math. Softw. 24:130, Expokit's <c>expv</c>):
/// an Arnoldi basis V of dimension m = <see cref="BasisSize"/> of the generator A and the start vector, the
/// small exponential e^{τH} of the (m+2)-row augmented Hessenberg matrix (which adds the first correction
/// term, so the result uses m+1 basis vectors), and the local error estimated from the two trailing entries
/// of its first column (Sidje's rule: the smaller of the two terms when they decrease fast, their ratio
/// form otherwise). A step is accepted when the estimate is at most τ·(error per unit time); otherwise τ
/// shrinks by 0.9·(τ·tol/err)^{1/m} and the small exponential is recomputed (the basis is kept). The next
/// step starts from the same formula, so τ follows what the solution allows rather than 1/Λ.
/// </summary>
/// <remarks>
/// <para>The estimate is measured in the 1-norm (the norm of probability): the error vector's two terms are
/// multiples of v_{m+1} and A·v_{m+1}, whose 1-norms are computed outright. It is a well-established
/// a-posteriori estimate, not a proof: unlike uniformisation, a Krylov step can overshoot or produce small
/// negative entries, so the caller (<see cref="FiniteStateProjection"/>) clears negative entries (which only
/// moves the vector toward the nonnegative exact one) and widens the projection bound by twice the sum of
/// the estimates (see docs/methods.md).</para>
/// <para>Orthogonalisation is classical Gram–Schmidt applied twice ("twice is enough", Giraud, Langou &amp;
/// Rozložník 2005, Comput. Math. Appl. 50:1069), so each Arnoldi column costs four passes over the basis,
/// each split into the generator's fixed row chunks and run on all cores; partial dot products are
/// reduced in chunk order, so results do not depend on the thread count. One instance serves a whole solve:
/// its basis grows with the projection.</para>
/// </remarks>
public sealed class KrylovExponential
{
    /// <summary>m, the default Krylov basis size.</summary>
    public const int BasisSize = 60;

    /// <summary>q, the default orthogonalisation depth: each new basis vector is orthogonalised against the last q only.</summary>
    public const int OrthogonalisationDepth = 2;

    /// <summary>The basis size of this stepper.</summary>
    public int Size { get; }

    /// <summary>How many previous basis vectors each new one is orthogonalised against (the basis size: full orthogonalisation).</summary>
    public int Depth { get; }

    /// <summary>Sidje's safety factor γ on the step-size formula.</summary>
    private const double Safety = 0.9;

    private readonly ParallelOptions _parallel;
    private readonly double[][] _basis;
    private readonly double[,] _hessenberg;
    private readonly double[,] _exponential;
    private readonly double[] _coefficients;
    private double[] _partial = [];
    private double[] _product = [];
    private Generator? _generator;
    private int _columns;
    private int _first;

    /// <summary>A stepper that uses up to the given parallelism.</summary>
    public KrylovExponential(ParallelOptions parallel, int size = BasisSize, int depth = OrthogonalisationDepth)
    {
        _parallel = parallel;
        Size = Math.Max(2, size);
        Depth = Math.Clamp(depth, 1, Size);
        _basis = new double[Size + 1][];
        _hessenberg = new double[Size + 2, Size + 2];
        _exponential = new double[Size + 2, Size + 2];
        _coefficients = new double[Size + 1];
    }

    /// <summary>Sparse products A·v done so far.</summary>
    public long Products { get; private set; }

    /// <summary>Passes over one vector of the projection for orthogonalisation and combination (a dot product or an axpy each).</summary>
    public long VectorPasses { get; private set; }

    /// <summary>Steps accepted so far.</summary>
    public int Steps { get; private set; }

    /// <summary>Step sizes refused by the error estimate so far (each costs only a small exponential).</summary>
    public int Refusals { get; private set; }

    /// <summary>
    /// Takes one step from <paramref name="start"/> under <paramref name="generator"/>, of length at most
    /// <paramref name="longest"/>, starting its step-size search from <paramref name="suggested"/> (NaN: Sidje's
    /// initial formula), with the local error at most <paramref name="errorPerTime"/> per unit time (1-norm).
    /// Writes the result into <paramref name="result"/> and returns the step taken, its error estimate and the
    /// step suggested for the next call.
    /// </summary>
    public (double Step, double Error, double Suggested) Step(Generator generator, double[] start, double longest, double suggested, double errorPerTime, double[] result)
    {
        ArgumentNullException.ThrowIfNull(generator);
        var n = generator.States;
        Bind(generator);
        var beta = Math.Sqrt(Dot(start, start, n));
        if (beta == 0 || generator.LargestExitRate == 0)
        {
            Array.Copy(start, result, n);
            return (longest, 0, longest);
        }
        var norm = 2 * generator.LargestExitRate; // ‖A‖₁ ≤ 2·max a₀: each column holds −a₀ and outflows summing to at most a₀
        Array.Clear(_hessenberg);
        for (var k = 0; k < n; k++) _basis[0][k] = start[k] / beta;
        var m = Size;
        var basisUsed = m;
        var augmented = true;
        for (var j = 0; j < m; j++)
        {
            Multiply(_basis[j], _basis[j + 1], n);
            // Full orthogonalisation is done twice; an incomplete one (against the last few vectors) once, as in IOM.
            for (var pass = 0; pass < (Depth >= Size ? 2 : 1); pass++) Orthogonalise(j, n);
            var s = Math.Sqrt(Dot(_basis[j + 1], _basis[j + 1], n));
            if (s <= 1e-12 * norm)
            {
                // A happy breakdown: the basis spans an invariant subspace and e^{τH} is exact for every τ.
                basisUsed = j + 1;
                augmented = false;
                break;
            }
            _hessenberg[j + 1, j] = s;
            Scale(_basis[j + 1], 1 / s, n);
        }
        double vNorm = 0, avNorm = 0;
        if (augmented)
        {
            _hessenberg[m + 1, m] = 1;
            Multiply(_basis[m], _product, n);
            vNorm = Norm1(_basis[m], n);
            avNorm = Norm1(_product, n);
        }

        var tau = Math.Min(longest, double.IsNaN(suggested) ? InitialStep(m, norm, beta, errorPerTime) : suggested);
        var columns = augmented ? basisUsed + 1 : basisUsed;
        var (error, exponent) = Estimate(tau, basisUsed, augmented, beta, vNorm, avNorm);
        while (error > tau * errorPerTime)
        {
            Refusals++;
            if (Refusals > 1_000_000) throw new MasterEquationException("the Krylov step-size control does not converge; ask for a larger --tolerance");
            tau = Round(Safety * tau * Math.Pow(tau * errorPerTime / error, exponent));
            (error, exponent) = Estimate(tau, basisUsed, augmented, beta, vNorm, avNorm);
        }
        for (var i = 0; i < columns; i++) _coefficients[i] = beta * _exponential[i, 0];
        // Sidje's formula grows τ by (τ·tol/err)^{1/m}, under 1.1 for m = 60 unless the estimate is a thousandth of its
        // allowance, so τ stays near its first value although the basis would carry a much longer step. The basis is
        // already paid for and a longer step costs only small exponentials, so τ doubles while the estimate allows it.
        var extended = false;
        while (augmented && tau < longest)
        {
            var longer = Math.Min(longest, 2 * tau);
            var (longerError, longerExponent) = Estimate(longer, basisUsed, augmented, beta, vNorm, avNorm);
            if (longerError > longer * errorPerTime) break;
            (tau, error, exponent, extended) = (longer, longerError, longerExponent, true);
            for (var i = 0; i < columns; i++) _coefficients[i] = beta * _exponential[i, 0];
        }
        Combine(columns, result, n);
        Steps++;
        var next = extended ? 2 * tau
            : error > 0 ? Round(Safety * tau * Math.Min(10, Math.Pow(tau * errorPerTime / error, exponent))) : 10 * tau;
        return (tau, error, augmented ? next : double.PositiveInfinity);
    }

    /// <summary>
    /// e^{τH} into the scratch exponential and the local error estimate of a step of length <paramref name="tau"/>
    /// (Sidje's rule: the smaller of the two trailing terms when they decrease fast, their ratio form otherwise),
    /// with the exponent of τ the step-size formula uses.
    /// </summary>
    private (double Error, double Exponent) Estimate(double tau, int basisUsed, bool augmented, double beta, double vNorm, double avNorm)
    {
        var m = Size;
        SmallMatrixExponential.Compute(_hessenberg, augmented ? basisUsed + 2 : basisUsed, tau, _exponential);
        if (!augmented) return (0, 1.0 / m);
        var phi1 = beta * Math.Abs(_exponential[m, 0]) * vNorm;
        var phi2 = beta * Math.Abs(_exponential[m + 1, 0]) * avNorm;
        if (phi1 > 10 * phi2) return (phi2, 1.0 / m);
        if (phi1 > phi2) return (phi1 * phi2 / (phi1 - phi2), 1.0 / m);
        return (phi1, 1.0 / (m - 1));
    }

    /// <summary>Sidje's initial step: (1/‖A‖)·(c_m·tol / (4β‖A‖))^{1/m}, c_m = ((m+1)/e)^{m+1}·√(2π(m+1)).</summary>
    private static double InitialStep(int m, double norm, double beta, double errorPerTime)
    {
        var logFactor = (m + 1) * Math.Log((m + 1) / Math.E) + 0.5 * Math.Log(2 * Math.PI * (m + 1));
        return Round(Math.Exp((logFactor + Math.Log(errorPerTime) - Math.Log(4 * beta * norm)) / m) / norm);
    }

    /// <summary>Two significant digits, rounded up (Expokit's rounding of step sizes).</summary>
    private static double Round(double tau)
    {
        if (!(tau > 0) || double.IsInfinity(tau)) return tau;
        var s = Math.Pow(10, Math.Floor(Math.Log10(tau)) - 1);
        return Math.Ceiling(tau / s) * s;
    }

    private void Bind(Generator generator)
    {
        var n = generator.States;
        _generator = generator;
        if (_product.Length < n)
        {
            var capacity = Math.Max(n, 2 * _product.Length);
            for (var i = 0; i < _basis.Length; i++) _basis[i] = new double[capacity];
            _product = new double[capacity];
        }
        _partial = _partial.Length >= Generator.Chunks(n) * (Size + 1) ? _partial : new double[Generator.Chunks(n) * (Size + 1)];
    }

    /// <summary>y = A·x: the diagonal −a₀ plus the incoming transitions of each row.</summary>
    private void Multiply(double[] x, double[] y, int n)
    {
        Products++;
        var g = _generator!;
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            var rowStart = g.RowStart;
            var source = g.Source;
            var rate = g.Rate;
            var exit = g.Exit;
            for (var k = from; k < to; k++)
            {
                var sum = -exit[k] * x[k];
                for (var e = rowStart[k]; e < rowStart[k + 1]; e++) sum += rate[e] * x[source[e]];
                y[k] = sum;
            }
        });
    }

    /// <summary>One classical Gram–Schmidt pass of column j+1 against columns j−Depth+1..j, adding the coefficients to H.</summary>
    private void Orthogonalise(int j, int n)
    {
        _first = Math.Max(0, j + 1 - Depth);
        _columns = j + 1;
        var target = _basis[j + 1];
        var chunks = Generator.Chunks(n);
        VectorPasses += 2L * (_columns - _first);
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            for (var i = _first; i < _columns; i++)
            {
                var v = _basis[i];
                var s = 0.0;
                for (var k = from; k < to; k++) s += v[k] * target[k];
                _partial[chunk * (Size + 1) + i] = s;
            }
        });
        for (var i = _first; i < _columns; i++)
        {
            var s = 0.0;
            for (var c = 0; c < chunks; c++) s += _partial[c * (Size + 1) + i];
            _coefficients[i] = s;
            _hessenberg[i, j] += s;
        }
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            for (var i = _first; i < _columns; i++)
            {
                var v = _basis[i];
                var c = _coefficients[i];
                for (var k = from; k < to; k++) target[k] -= c * v[k];
            }
        });
    }

    /// <summary>result = Σ_i coefficient_i · v_i over the first <paramref name="columns"/> basis vectors.</summary>
    private void Combine(int columns, double[] result, int n)
    {
        VectorPasses += columns;
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            for (var k = from; k < to; k++) result[k] = 0;
            for (var i = 0; i < columns; i++)
            {
                var v = _basis[i];
                var c = _coefficients[i];
                for (var k = from; k < to; k++) result[k] += c * v[k];
            }
        });
    }

    private double Dot(double[] x, double[] y, int n)
    {
        VectorPasses++;
        var chunks = Generator.Chunks(n);
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            var s = 0.0;
            for (var k = from; k < to; k++) s += x[k] * y[k];
            _partial[chunk * (Size + 1)] = s;
        });
        var sum = 0.0;
        for (var c = 0; c < chunks; c++) sum += _partial[c * (Size + 1)];
        return sum;
    }

    private static double Norm1(double[] x, int n)
    {
        var s = 0.0;
        for (var k = 0; k < n; k++) s += Math.Abs(x[k]);
        return s;
    }

    private void Scale(double[] x, double factor, int n)
    {
        VectorPasses++;
        For(n, chunk =>
        {
            var (from, to) = Generator.ChunkRange(chunk, n);
            for (var k = from; k < to; k++) x[k] *= factor;
        });
    }

    private void For(int n, Action<int> body)
    {
        var chunks = Generator.Chunks(n);
        if (chunks == 1) body(0);
        else Parallel.For(0, chunks, _parallel, body);
    }
}
