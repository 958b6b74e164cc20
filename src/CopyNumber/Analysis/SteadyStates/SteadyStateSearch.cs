using CopyNumber.Deterministic;
using CopyNumber.Network;
using CopyNumber.Randomness;
using MathNet.Numerics.LinearAlgebra;

namespace CopyNumber.Analysis.SteadyStates;

/// <summary>One steady state of the rate equations, in copies, with the eigenvalues that decide its stability.</summary>
/// <param name="State">x* with N·v(x*) ≈ 0, one value per species.</param>
/// <param name="LargestRealPart">The largest real part of the Jacobian's eigenvalues on the stoichiometric subspace (per model time unit).</param>
public sealed record SteadyState(IReadOnlyList<double> State, double LargestRealPart)
{
    /// <summary>Stable: every eigenvalue on the stoichiometric subspace has a negative real part.</summary>
    public bool Stable => LargestRealPart < 0;
}

/// <summary>What the search found.</summary>
/// <param name="Stable">Distinct stable steady states, ordered by the first species' value.</param>
/// <param name="Starts">Starting points integrated.</param>
/// <param name="Unsettled">Starts whose trajectory had not settled at the longest horizon (a limit cycle, a slow drift, or growth without bound); never counted as steady states.</param>
public sealed record SteadyStateSearchResult(IReadOnlyList<SteadyState> Stable, int Starts, int Unsettled)
{
    /// <summary>Two or more stable steady states: deterministic bistability (or multistability).</summary>
    public bool Multistable => Stable.Count >= 2;
}

/// <summary>
/// The stable steady states of a network's rate equations dx/dt = N·v(x), with the parameters at t = 0
/// and without its schedule or triggered changes, found from several starting points in the initial
/// state's stoichiometric class (x₀ + range N, so conservation laws keep their totals): the initial state,
/// multiples of a scale along the diagonal, and seeded uniform draws in a box. From each start the equations
/// are integrated over doubling horizons until the state stops moving, the end point is polished by Newton
/// steps with the exact Jacobian (least squares, since J is singular along the conservation laws), and it is
/// kept when the eigenvalues of the Jacobian restricted to range N (Qᵀ·J·Q, Q an orthonormal basis of range N
/// from the singular value decomposition; J maps into range N, which is invariant) all have negative real parts
/// (Lyapunov's indirect method; common practice). Unstable steady states are not reached by forward
/// integration, so they are not counted; trajectories that do not settle (limit cycles) are counted apart.
/// </summary>
public static class SteadyStateSearch
{
    /// <summary>Seeded draws besides the initial state and the diagonal points.</summary>
    public const int RandomStarts = 12;

    /// <summary>Two end points closer than this (relative to max(1, |x|∞)) are one steady state.</summary>
    public const double SameStateWithin = 1e-4;

    /// <summary>Searches; see the type's remarks.</summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="seed">Seed of the random starts.</param>
    /// <param name="scale">Copies that bound the box of starts (each species drawn in [0, 2·scale]); null for max(10, 2·max x₀, the largest value on the trajectory from x₀).</param>
    public static SteadyStateSearchResult Find(ReactionNetwork network, ulong seed = 1, double? scale = null)
    {
        ArgumentNullException.ThrowIfNull(network);
        var s = network.Species.Count;
        var x0 = network.InitialAmounts.ToArray();
        var n = Matrix<double>.Build.Dense(s, network.Stoichiometry.ReactionCount, (i, j) => network.Stoichiometry[i, j]);
        var basis = RangeBasis(n);
        var starts = new List<double[]> { x0 };
        var first = Settle(network, x0, out _);
        var box = scale ?? Math.Max(10, Math.Max(2 * x0.DefaultIfEmpty(0).Max(), first?.Max() ?? 0));
        foreach (var f in new[] { 0.0, 0.1, 0.5, 1.0, 2.0 })
            starts.Add(Project(Enumerable.Repeat(f * box, s).ToArray(), x0, basis));
        var random = ReplicateStreams.For(seed, long.MinValue + 1);
        for (var k = 0; k < RandomStarts; k++)
            starts.Add(Project(Enumerable.Range(0, s).Select(_ => 2 * box * random.NextDouble()).ToArray(), x0, basis));

        var found = new List<SteadyState>();
        var unsettled = 0;
        var tried = 0;
        foreach (var start in starts)
        {
            if (start.Any(v => v < 0 || !double.IsFinite(v))) continue; // outside the class's nonnegative part
            tried++;
            var end = ReferenceEquals(start, x0) ? first : Settle(network, start, out _);
            if (end is null) { unsettled++; continue; }
            Polish(network, end);
            var largest = LargestRealPart(network, end, basis);
            if (!(largest < 0)) continue;
            var scaleOf = Math.Max(1, end.Max(Math.Abs));
            if (found.Any(f => f.State.Select((v, i) => Math.Abs(v - end[i])).Max() <= SameStateWithin * scaleOf)) continue;
            found.Add(new SteadyState(end, largest));
        }
        return new SteadyStateSearchResult(found.OrderBy(f => f.State.Count > 0 ? f.State[0] : 0).ToArray(), tried, unsettled);
    }

    /// <summary>
    /// Integrates over horizons 10, 20, 40, … up to 10⁶ model time units until two successive end points agree; null when
    /// they never do, or when from the horizon 1 280 on the stretch's movement has not halved over three doublings (an
    /// approach to a stable state shrinks it geometrically; a limit cycle or a drift does not).
    /// </summary>
    private static double[]? Settle(ReactionNetwork network, double[] start, out double horizon)
    {
        var system = new RateEquationSystem(network);
        var options = new SolverOptions(RelativeTolerance: 1e-9, AbsoluteTolerance: 1e-10, MaxSteps: 200_000);
        var y = (double[])start.Clone();
        var t = 0.0;
        var step = 10.0;
        var derivative = new double[y.Length];
        var movements = new List<double>();
        for (horizon = step; horizon <= 1e6; horizon *= 2)
        {
            double[] next;
            try
            {
                next = OdeIntegrator.Integrate(system, t, y, [horizon], options, out _)[0];
            }
            catch (SolverFailureException)
            {
                return null;
            }
            var scale = Math.Max(1, next.Max(Math.Abs));
            var moved = next.Select((v, i) => Math.Abs(v - y[i])).DefaultIfEmpty(0).Max();
            system.Derivative(horizon, next, derivative);
            var speed = derivative.Select(Math.Abs).DefaultIfEmpty(0).Max();
            // Settled: the state moved by less than 10⁻⁷ of its size over the last stretch and hardly moves now.
            if (moved <= 1e-7 * scale && speed * (horizon - t) <= 1e-6 * scale) return next;
            if (!double.IsFinite(scale) || scale > 1e15) return null;
            movements.Add(moved / scale);
            if (horizon >= 1280 && movements[^1] > 0.5 * movements[^4]) return null;
            y = next;
            t = horizon;
        }
        return null;
    }

    /// <summary>A few Newton steps x ← x − J⁺·f(x) with the exact Jacobian (least-squares solve by SVD).</summary>
    private static void Polish(ReactionNetwork network, double[] x)
    {
        var system = new RateEquationSystem(network);
        var f = new double[x.Length];
        var j = new double[x.Length, x.Length];
        for (var iteration = 0; iteration < 4; iteration++)
        {
            system.Derivative(0, x, f);
            system.Jacobian(0, x, j);
            var step = Matrix<double>.Build.DenseOfArray(j).Svd().Solve(Vector<double>.Build.DenseOfArray(f));
            var candidate = x.Select((v, i) => v - step[i]).ToArray();
            if (candidate.Any(v => v < -1e-9 || !double.IsFinite(v))) return;
            Array.Copy(candidate, x, x.Length);
        }
    }

    private static double LargestRealPart(ReactionNetwork network, double[] x, Matrix<double> basis)
    {
        if (basis.ColumnCount == 0) return double.NegativeInfinity; // nothing can move: trivially stable
        var j = new double[x.Length, x.Length];
        new RateEquationSystem(network).Jacobian(0, x, j);
        var reduced = basis.TransposeThisAndMultiply(Matrix<double>.Build.DenseOfArray(j)).Multiply(basis);
        return reduced.Evd().EigenValues.Select(e => e.Real).Max();
    }

    /// <summary>An orthonormal basis of range N (left singular vectors with singular values above round-off).</summary>
    private static Matrix<double> RangeBasis(Matrix<double> n)
    {
        if (n.ColumnCount == 0) return Matrix<double>.Build.Dense(n.RowCount, 0);
        var svd = n.Svd(computeVectors: true);
        var tolerance = Math.Max(n.RowCount, n.ColumnCount) * 1e-12 * (svd.S.Count > 0 ? svd.S[0] : 0);
        var rank = svd.S.Count(v => v > tolerance);
        return svd.U.SubMatrix(0, n.RowCount, 0, rank);
    }

    /// <summary>x₀ + Q·Qᵀ·(x − x₀): the point of the initial state's class nearest to x.</summary>
    private static double[] Project(double[] x, double[] x0, Matrix<double> basis)
    {
        var d = Vector<double>.Build.DenseOfEnumerable(x.Select((v, i) => v - x0[i]));
        var projected = basis * (basis.TransposeThisAndMultiply(d));
        return x0.Select((v, i) => v + projected[i]).ToArray();
    }
}
