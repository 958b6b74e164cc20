using System.Numerics;
using CopyNumber.Deterministic;
using CopyNumber.Network;
using MathNet.Numerics.LinearAlgebra;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// Decides whether the rate equations oscillate: a limit cycle (peaks of constant height, period from the
/// peaks, stability from the Floquet multipliers), a damped oscillation into a stable focus (complex
/// eigenvalues of the Jacobian at the steady state reached), or neither. docs/methods-analysis.md, section 7.
/// </summary>
public static class CycleDetection
{
    /// <summary>Samples of the solution over the horizon; the peaks are refined between samples by a parabola.</summary>
    public const int Samples = 20_000;

    /// <summary>Two successive cycles whose peak-to-trough ranges differ by less than this fraction are one limit cycle.</summary>
    public const double CycleTolerance = 1e-3;

    /// <summary>A range below this fraction of the species' scale (max(1, peak)) is round-off on a steady state, not an oscillation.</summary>
    public const double FlatTolerance = 1e-6;

    /// <summary>Peaks needed in the second half of the horizon to call a cycle (three complete periods).</summary>
    public const int MinimumPeaks = 4;

    /// <summary>
    /// Integrates the rate equations from the initial amounts over [0, <paramref name="horizon"/>] and reads the second half.
    /// A model with timed or state-triggered changes is not autonomous, so no oscillation is judged (kind None, reason given).
    /// </summary>
    /// <param name="network">The compiled network.</param>
    /// <param name="horizon">How long to integrate, in model time units; the transient must fit in its first half.</param>
    /// <exception cref="SolverFailureException">The rate equations could not be integrated.</exception>
    public static RateEquationOscillation Detect(ReactionNetwork network, double horizon)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (!(horizon > 0 && double.IsFinite(horizon))) throw new AnalysisInputException($"the horizon of the cycle detection must be positive (got {horizon})");
        var neutral = network.Species.Count - Rank(network);
        if (network.Schedule.Count > 0 || network.Triggers.Count > 0)
            return None(network, "the model changes at set times or on conditions, so the rate equations are not autonomous and no oscillation is judged");

        var species = network.Species.Count;
        var start = network.InitialAmounts.ToArray();
        var samples = Sample(network, start, horizon, Samples);
        var from = Samples / 2;
        var reference = ReferenceSpecies(samples, species, from);
        var peaks = Peaks(samples[reference], from, horizon / Samples);
        if (peaks.Count >= MinimumPeaks)
        {
            // Again from the state at the fourth last peak, over its last three periods at SamplesPerPeriod points each,
            // so that peaks and troughs are read far below the tolerance whatever the horizon.
            var rough = (peaks[^1].Time - peaks[^4].Time) / 3;
            var at = Enumerable.Range(0, species).Select(i => samples[i][peaks[^4].Index]).ToArray();
            var fine = Sample(network, at, 3.2 * rough, (int)(3.2 * SamplesPerPeriod));
            var finePeaks = Peaks(fine[reference], 1, 3.2 * rough / (int)(3.2 * SamplesPerPeriod));
            if (finePeaks.Count >= 3)
            {
                var last = Range(fine[reference], finePeaks[^2].Index, finePeaks[^1].Index);
                var previous = Range(fine[reference], finePeaks[^3].Index, finePeaks[^2].Index);
                var change = Math.Abs(last - previous) / last;
                if (change < CycleTolerance)
                {
                    var period = (finePeaks[^1].Time - finePeaks[^3].Time) / 2;
                    var ranges = Enumerable.Range(0, species).Select(i =>
                    {
                        var (lo, hi) = Extremes(fine[i], finePeaks[^2].Index, finePeaks[^1].Index);
                        return new CycleRange(network.Species[i], lo, hi);
                    }).ToArray();
                    var onCycle = Enumerable.Range(0, species).Select(i => fine[i][finePeaks[^2].Index]).ToArray();
                    var multipliers = Floquet(network, onCycle, period);
                    return new RateEquationOscillation(OscillationKind.LimitCycle, period, ranges, multipliers, neutral, [], [], onCycle,
                        network.Species[reference],
                        string.Create(System.Globalization.CultureInfo.InvariantCulture, $"peaks of {network.Species[reference]} of constant height (successive cycles' ranges differ by {change:G2}, below {CycleTolerance:G2})"));
                }
            }
        }

        var end = Enumerable.Range(0, species).Select(i => samples[i][Samples]).ToArray();
        if (!Settled(samples, Samples - Samples / 10))
            return new RateEquationOscillation(OscillationKind.None, double.NaN, [], [], neutral, [], [], [], network.Species[reference],
                peaks.Count >= MinimumPeaks ? "peaks whose height still changes at the end of the horizon (neither a settled cycle nor a steady state)"
                : "no steady state and no cycle within the horizon");
        var eigenvalues = Eigenvalues(network, end);
        var focus = eigenvalues.Where(l => l.Imaginary > RateEquationOscillation.ComplexTolerance * Math.Max(1, l.Magnitude)).OrderByDescending(l => l.Real).FirstOrDefault();
        var stable = eigenvalues.All(l => l.Real < 0 || l.Magnitude <= 1e-12);
        if (focus != default && stable && focus.Real < 0)
            return new RateEquationOscillation(OscillationKind.DampedOscillation, 2 * Math.PI / focus.Imaginary, [], [], neutral, eigenvalues, end, [],
                network.Species[reference], string.Create(System.Globalization.CultureInfo.InvariantCulture, $"a stable focus: the Jacobian at the steady state has the complex pair {focus.Real:G3} ± {focus.Imaginary:G3}i"));
        return new RateEquationOscillation(OscillationKind.None, double.NaN, [], [], neutral, eigenvalues, end, [], network.Species[reference],
            focus == default ? "a steady state whose linearisation has only real eigenvalues" : "a steady state that is not a stable focus");
    }

    /// <summary>How many times the run's length the detection integrates (the transient must fit in the first half).</summary>
    public const double HorizonFactor = 4;

    /// <summary>
    /// Detects the rate equations' oscillation over <see cref="HorizonFactor"/> times <paramref name="until"/>; a failure of the
    /// integration gives kind None with the failure as its reason (the oscillation is then not judged).
    /// </summary>
    public static RateEquationOscillation DetectForRun(ReactionNetwork network, double until)
    {
        try
        {
            return Detect(network, HorizonFactor * until);
        }
        catch (Exception e) when (e is SolverFailureException or ArithmeticException or AnalysisInputException)
        {
            return new RateEquationOscillation(OscillationKind.None, double.NaN, [], [], 0, [], [], [], "", $"not judged: {e.Message}");
        }
    }

    /// <summary>The Jacobian's eigenvalues at <paramref name="state"/> (copies), in 1/time, sorted by decreasing real part.</summary>
    public static IReadOnlyList<Complex> Eigenvalues(ReactionNetwork network, IReadOnlyList<double> state)
    {
        var jacobian = Jacobian(network, state);
        return Matrix<double>.Build.DenseOfArray(jacobian).Evd().EigenValues.OrderByDescending(l => l.Real).ThenByDescending(l => l.Imaginary).ToArray();
    }

    /// <summary>The exact Jacobian N·∂v/∂x at <paramref name="state"/> (copies), with the network's initial parameters.</summary>
    public static double[,] Jacobian(ReactionNetwork network, IReadOnlyList<double> state)
    {
        var system = new RateEquationSystem(network);
        var n = network.Species.Count;
        var jacobian = new double[n, n];
        system.Jacobian(0, state.ToArray(), jacobian);
        return jacobian;
    }

    private static RateEquationOscillation None(ReactionNetwork network, string reason) =>
        new(OscillationKind.None, double.NaN, [], [], 0, [], [], [], network.Species.Count > 0 ? network.Species[0] : "", reason);

    private static int Rank(ReactionNetwork network)
    {
        var n = network.Stoichiometry;
        if (n.ReactionCount == 0) return 0;
        var dense = n.ToDense();
        var matrix = Matrix<double>.Build.Dense(n.SpeciesCount, n.ReactionCount, (i, j) => dense[i, j]);
        return matrix.Rank();
    }

    /// <summary>Points on a period at which the last cycles are sampled again (peaks and troughs refined between them by a parabola).</summary>
    public const int SamplesPerPeriod = 400;

    // The rate equations from `start` over [0, duration], sampled at count + 1 equally spaced times: [species][time].
    private static double[][] Sample(ReactionNetwork network, double[] start, double duration, int count)
    {
        var species = start.Length;
        var samples = Enumerable.Range(0, species).Select(_ => new double[count + 1]).ToArray();
        var times = Enumerable.Range(0, count + 1).Select(k => k * duration / count).ToArray();
        var run = new OdeRun(new RateEquationSystem(network), new SolverOptions(SolverKind.Auto, RelativeTolerance: 1e-9, AbsoluteTolerance: 1e-9));
        var y = start.ToArray();
        run.Advance(0, y, duration, times, (k, _, state) => { for (var i = 0; i < species; i++) samples[i][k] = state[i]; });
        return samples;
    }

    // Every species' range over the tail is round-off on its scale: a steady state.
    private static bool Settled(double[][] samples, int from)
    {
        foreach (var x in samples)
        {
            var (lo, hi) = MinMax(x, from, x.Length - 1);
            if (hi - lo > 1e-6 * Math.Max(1, Math.Abs(hi))) return false;
        }
        return true;
    }

    // The species that moves most, relative to its size, over the second half: its peaks define the period.
    private static int ReferenceSpecies(double[][] samples, int species, int from)
    {
        var best = 0;
        var bestSpread = -1.0;
        for (var i = 0; i < species; i++)
        {
            var (lo, hi) = MinMax(samples[i], from, samples[i].Length - 1);
            var spread = (hi - lo) / Math.Max(1, Math.Abs(hi));
            if (spread > bestSpread) { bestSpread = spread; best = i; }
        }
        return best;
    }

    private readonly record struct Peak(int Index, double Time);

    // Strict local maxima after `from`, standing out by more than round-off, refined by the parabola through three samples.
    private static List<Peak> Peaks(double[] x, int from, double step)
    {
        var (lo, hi) = MinMax(x, from, x.Length - 1);
        var peaks = new List<Peak>();
        if (hi - lo <= FlatTolerance * Math.Max(1, Math.Abs(hi))) return peaks;
        for (var k = Math.Max(from, 1); k < x.Length - 1; k++)
        {
            if (!(x[k] > x[k - 1] && x[k] >= x[k + 1])) continue;
            var curvature = x[k - 1] - 2 * x[k] + x[k + 1];
            var offset = curvature < 0 ? 0.5 * (x[k - 1] - x[k + 1]) / curvature : 0;
            peaks.Add(new Peak(k, (k + offset) * step));
        }
        return peaks;
    }

    private static double Range(double[] x, int from, int to)
    {
        var (lo, hi) = Extremes(x, from, to);
        return hi - lo;
    }

    // Trough and peak over [from, to], each refined by the parabola through its sample and the two neighbours.
    private static (double Min, double Max) Extremes(double[] x, int from, int to)
    {
        int kMin = from, kMax = from;
        for (var k = from; k <= to; k++) { if (x[k] < x[kMin]) kMin = k; if (x[k] > x[kMax]) kMax = k; }
        return (Vertex(x, kMin), Vertex(x, kMax));
    }

    private static double Vertex(double[] x, int k)
    {
        if (k == 0 || k == x.Length - 1) return x[k];
        var curvature = x[k - 1] - 2 * x[k] + x[k + 1];
        return curvature == 0 ? x[k] : x[k] - (x[k + 1] - x[k - 1]) * (x[k + 1] - x[k - 1]) / (8 * curvature);
    }

    private static (double Min, double Max) MinMax(double[] x, int from, int to)
    {
        double lo = double.PositiveInfinity, hi = double.NegativeInfinity;
        for (var k = from; k <= to; k++) { lo = Math.Min(lo, x[k]); hi = Math.Max(hi, x[k]); }
        return (lo, hi);
    }

    // Monodromy matrix Φ(T) from the variational equations along one period, by Dormand–Prince at tight tolerances.
    private static Complex[] Floquet(ReactionNetwork network, double[] start, double period)
    {
        var system = new VariationalSystem(network);
        var s = start.Length;
        var y = new double[system.Dimension];
        Array.Copy(start, y, s);
        for (var i = 0; i < s; i++) y[s + i * s + i] = 1;
        var run = new OdeRun(system, new SolverOptions(SolverKind.Explicit, RelativeTolerance: 1e-10, AbsoluteTolerance: 1e-10));
        run.Advance(0, y, period, ReadOnlySpan<double>.Empty, (_, _, _) => { });
        var monodromy = Matrix<double>.Build.Dense(s, s, (i, j) => y[s + i * s + j]);
        return monodromy.Evd().EigenValues.OrderBy(m => (m - 1).Magnitude).ToArray();
    }

}
