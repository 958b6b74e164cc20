using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// The sample paths an oscillation is read from, recorded automatically when the rate equations oscillate or
/// their steady state's linearisation has complex eigenvalues (docs/methods-analysis.md, section 7): the first
/// <see cref="MaximumReplicates"/> replicates of the run's seed, by the direct method, on their own grid of
/// <see cref="PointsPerPeriod"/> points per period whatever the run's grid, over a horizon long enough for the
/// spectrum's window. Paths are held per species as [replicate][point] after the discarded transient.
/// </summary>
/// <param name="Step">Time between recorded points, in model time units.</param>
/// <param name="Discarded">The transient left out before the first point kept, in model time units.</param>
/// <param name="Paths">[species][replicate][point] copy numbers from <paramref name="Discarded"/> on.</param>
/// <param name="Seed">The seed the sample was simulated with (the run's).</param>
public sealed record OscillationSample(double Step, double Discarded, double[][][] Paths, ulong Seed)
{
    /// <summary>At most this many replicates are recorded (the first of the run).</summary>
    public const int MaximumReplicates = 200;

    /// <summary>Recorded points per period (≥ 20 asked by the issue; 40 leaves the spectrum's peak far below the Nyquist frequency).</summary>
    public const int PointsPerPeriod = 40;

    /// <summary>The spectrum's window covers at least this many periods and this many damping or relaxation times.</summary>
    public const double WindowPeriods = 8, WindowDampingTimes = 8;

    /// <summary>Fewer points than this per replicate after the transient give no oscillation analysis.</summary>
    public const int MinimumPoints = 64;

    /// <summary>The replicates recorded.</summary>
    public int Replicates => Paths.Length == 0 ? 0 : Paths[0].Length;

    /// <summary>The length of each kept path, in model time units.</summary>
    public double Window => Paths.Length == 0 || Paths[0].Length == 0 ? 0 : (Paths[0][0].Length - 1) * Step;

    /// <summary>True when <paramref name="rateEquations"/> call for a sample: a limit cycle, or complex eigenvalues at the steady state.</summary>
    public static bool Wanted(RateEquationOscillation rateEquations) =>
        rateEquations.Kind == OscillationKind.LimitCycle || rateEquations.HasComplexEigenvalues;

    /// <summary>
    /// Records the sample. Step = T/<see cref="PointsPerPeriod"/> with T the cycle's period or 2π/|Im λ|; transient discarded:
    /// max(2T, 3 relaxation times) (relaxation time T/|ln μ| for a cycle with largest non-trivial multiplier μ, 1/|Re λ| for a
    /// focus); horizon: max(<paramref name="until"/>, transient + max(<see cref="WindowPeriods"/>·T, <see cref="WindowDampingTimes"/> relaxation times)).
    /// </summary>
    /// <exception cref="AnalysisInputException">The rate equations neither oscillate nor have complex eigenvalues.</exception>
    public static OscillationSample Record(ReactionNetwork network, RateEquationOscillation rateEquations, double until, long replicates, ulong seed, int threads, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(rateEquations);
        if (!Wanted(rateEquations)) throw new AnalysisInputException("the rate equations neither oscillate nor have complex eigenvalues: no oscillation sample is recorded");
        var (period, relaxation) = Scales(rateEquations);
        var step = period / PointsPerPeriod;
        var discard = Math.Max(2 * period, 3 * relaxation);
        var horizon = Math.Max(until, discard + Math.Max(WindowPeriods * period, WindowDampingTimes * relaxation));
        return Record(network, step, discard, horizon, (int)Math.Min(replicates, MaximumReplicates), seed, threads, cancel);
    }

    /// <summary>
    /// Records <paramref name="count"/> replicates (seeded by <paramref name="seed"/>, direct method) every <paramref name="step"/> over
    /// [0, <paramref name="horizon"/>] (rounded up to whole steps), keeping the points after <paramref name="discard"/>; for callers that
    /// choose the sampling themselves (the false-alarm measurement samples networks that need no sample).
    /// </summary>
    public static OscillationSample Record(ReactionNetwork network, double step, double discard, double horizon, int count, ulong seed, int threads, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (!(step > 0 && discard >= 0 && horizon > discard + step && count >= 1))
            throw new AnalysisInputException($"an oscillation sample needs step > 0, 0 ≤ transient < horizon and at least one replicate (got step {step}, transient {discard}, horizon {horizon}, {count} replicates)");
        var points = (long)Math.Ceiling(horizon / step);
        horizon = points * step;
        var species = network.Species.Count;
        var skip = (int)Math.Round(discard / step);
        var kept = (int)points + 1 - skip;
        var paths = Enumerable.Range(0, species).Select(_ => new double[count][]).ToArray();
        var sink = new Collector(paths, skip, kept);
        var options = new EnsembleOptions
        {
            Grid = new TimeGrid(horizon, step), Replicates = count, Seed = seed, Method = SimulationMethod.Direct,
            Threads = Math.Max(1, threads), PathReplicates = count,
        };
        EnsembleRunner.Run(network, options, sink, cancel: cancel);
        // Replicates that stopped early (none are expected without an event limit) are left out.
        var complete = Enumerable.Range(0, count).Where(r => paths[0][r] is not null).ToArray();
        var kept3 = paths.Select(s => complete.Select(r => s[r]).ToArray()).ToArray();
        return new OscillationSample(step, skip * step, kept3, seed);
    }

    /// <summary>The period and the relaxation time that set the sample's step, transient and window.</summary>
    public static (double Period, double Relaxation) Scales(RateEquationOscillation o)
    {
        if (o.Kind == OscillationKind.LimitCycle)
        {
            var mu = o.LargestNontrivialMultiplier;
            var relaxation = mu is > 0 and < 1 ? o.Period / -Math.Log(mu) : o.Period;
            return (o.Period, relaxation);
        }
        var pair = o.LeastDampedComplexPair ?? throw new AnalysisInputException("no complex eigenvalue to set the sample's period");
        return (2 * Math.PI / pair.Imaginary, pair.Real < 0 ? -1 / pair.Real : 2 * Math.PI / pair.Imaginary);
    }

    private sealed class Collector(double[][][] paths, int skip, int kept) : IPathSink
    {
        public void Write(long replicate, ReadOnlySpan<long> counts, int stride, int recordedPoints)
        {
            if (recordedPoints < skip + kept) return;
            for (var i = 0; i < paths.Length; i++)
            {
                var path = new double[kept];
                for (var k = 0; k < kept; k++) path[k] = counts[(skip + k) * stride + i];
                paths[i][replicate] = path;
            }
        }
    }
}
