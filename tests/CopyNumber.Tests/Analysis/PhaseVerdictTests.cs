using CopyNumber.Analysis;
using CopyNumber.Analysis.Phases;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// Verdicts per phase of the schedule: a model strictly linear before a change and strongly nonlinear after it.
/// <para>
/// Before t = 30 the model is immigration–death (0 → A at k, A → 0 at d·A) from A = 0: its law at every time is Poisson
/// with the rate equations' mean k/d·(1 − e^{−dt}) (Jahnke &amp; Huisinga 2007, J. Math. Biol. 54:1), so any verdict other than
/// "adequate" in that phase is a false alarm. At t = 30 the loss stops and pairwise annihilation 2A → 0 starts (propensity
/// c·A(A − 1), rate equation dA/dt = k − 2c·A²): the stationary mean of the master equation lies above the rate equations'
/// √(k/2c). The test computes that stationary law exactly (the generator on 0…N solved for its null vector, N far beyond any
/// mass) and checks the second phase's verdict "mean shifted" and its size against it.
/// </para>
/// </summary>
public sealed class PhaseVerdictTests(ITestOutputHelper output)
{
    private const double K = 12, D = 1, C = 5, Change = 30, Until = 60, Every = 0.5;

    private static readonly string Model =
        "# illustrative: linear, then pairwise annihilation\nspecies\n  A = 0\nparameters\n" +
        $"  k = {K}\n  d = {D}\n  c = 0\nreactions\n  make: 0 -> A mass k\n  loss: A -> 0 mass d\n  pair: 2 A -> 0 mass c\n" +
        $"changes\n  d = 0  at time {Change}\n  c = {C}  at time {Change}\n";

    private static ReactionNetwork Load(string text) => ModelLoader.LoadText(text, "phases.cnet").Model!.Network;

    /// <summary>The exact stationary mean of 0 → A (k), 2A → 0 (c·n(n − 1)): the null vector of the generator on 0…N.</summary>
    private static double ExactStationaryMean(int n = 80)
    {
        var q = Matrix<double>.Build.Dense(n + 1, n + 1);
        for (var i = 0; i <= n; i++)
        {
            if (i < n) q[i, i + 1] += K;
            if (i >= 2) q[i, i - 2] += C * i * (i - 1);
            var outflow = 0.0;
            for (var j = 0; j <= n; j++) outflow += j == i ? 0 : q[i, j];
            q[i, i] = -outflow;
        }
        // πᵀQ = 0 with Σπ = 1: replace one balance equation by the normalisation.
        var a = q.Transpose();
        for (var j = 0; j <= n; j++) a[n, j] = 1;
        var b = Vector<double>.Build.Dense(n + 1);
        b[n] = 1;
        var pi = a.Solve(b);
        Assert.True(pi[n] < 1e-30, $"the truncation at {n} holds mass {pi[n]}");
        var mean = 0.0;
        for (var i = 0; i <= n; i++) mean += i * pi[i];
        return mean;
    }

    private static QuantityContrast Contrast1(ReactionNetwork network, TimeGrid grid, double[] rateEquations, int replicates, ulong seed)
    {
        var ensemble = EnsembleRunner.Run(network, new EnsembleOptions
        {
            Grid = grid, Replicates = replicates, Seed = seed, Threads = 1, Method = SimulationMethod.Direct,
        });
        var points = new List<ContrastPoint>(grid.Count);
        for (var k = 0; k < grid.Count; k++)
        {
            var histogram = ensemble.Histogram(k, 0);
            points.Add(ContrastPoint.FromHistogram(grid[k], DistributionSummary.From(histogram), histogram, rateEquations[k]));
        }
        return Contrast.Analyze("A", points, phases: ModelPhase.Of(Timeline.Of(network, grid)));
    }

    private static double[] RateEquations(ReactionNetwork network, TimeGrid grid)
    {
        var solution = RateEquationSolver.Solve(network, grid, new SolverOptions());
        return Enumerable.Range(0, grid.Count).Select(k => solution.Values[k, 0]).ToArray();
    }

    [Fact]
    public void Linear_before_the_change_adequate_after_it_mean_shifted_by_the_exact_amount()
    {
        var network = Load(Model);
        var grid = new TimeGrid(Until, Every);
        var re = RateEquations(network, grid);
        var exact = ExactStationaryMean();
        var deterministic = Math.Sqrt(K / (2 * C)); // the rate equations' stationary point
        var shift = (exact - deterministic) / deterministic;
        output.WriteLine($"exact stationary mean {exact:G6} against the rate equations' {deterministic:G6}: {shift:P2}");
        Assert.True(shift > 0.10, $"the exact shift {shift:P2} must clear the 5% threshold by far for the verdict to be certain");
        Assert.Equal(deterministic, re[^1], 4);

        var contrast = Contrast1(network, grid, re, 2000, 7);
        Assert.Equal(2, contrast.Phases.Count);
        var (before, after) = (contrast.Phases[0], contrast.Phases[1]);
        foreach (var p in contrast.Phases)
            foreach (var v in p.Contrast.Verdicts) output.WriteLine($"phase {p.Phase.Index} {p.Phase.Span}: {v.Label}: {v.Sentence}");
        Assert.Equal([VerdictKind.Adequate], before.Contrast.Verdicts.Select(v => v.Kind));
        Assert.Contains(VerdictKind.MeanShifted, after.Contrast.Verdicts.Select(v => v.Kind));
        Assert.Equal(0.005, after.FalseAlarmRate, 12); // α = 1% shared over two phases

        // The measured shift at the final time agrees with the exact stationary one within 4 standard errors
        // (the relaxation after the change, rate ≈ 4c·φ ≈ 22 per time unit, is long over by t = 60).
        var final = after.Contrast.Deviations[^1];
        var standardError = final.RelativeHalfWidth / ContrastThresholds.Default.Z;
        Assert.InRange(final.Relative, shift - 4 * standardError, shift + 4 * standardError);
    }

    [Fact]
    public void Linear_phase_false_alarm_rate_is_measured_over_many_seeds()
    {
        // Over 100 seeds of 400 replicates, count runs whose first (exactly linear) phase gets anything but "adequate".
        // Its rate is at most α/2 per verdict (four verdicts can fire there); we fail when the count reaches the
        // smallest c with P(Binomial(100, 0.01) ≥ c) ≤ 0.001 (common practice: an exact binomial test), as
        // VerdictCalibrationTests does for the whole-run verdicts.
        const int seeds = 100;
        var network = Load(Model);
        var grid = new TimeGrid(Until, Every);
        var re = RateEquations(network, grid);
        var alarms = new int[seeds];
        Parallel.For(0, seeds, new ParallelOptions { MaxDegreeOfParallelism = 2 }, s =>
        {
            var first = Contrast1(network, grid, re, 400, (ulong)(5000 + s)).Phases[0];
            alarms[s] = first.Contrast.Verdicts.Any(v => v.Kind != VerdictKind.Adequate) ? 1 : 0;
        });
        var count = alarms.Sum();
        var law = new Binomial(0.01, seeds);
        var critical = 0;
        while (1 - law.CumulativeDistribution(critical - 1) > 0.001) critical++;
        output.WriteLine($"linear phase: {count} of {seeds} runs with a verdict other than adequate (fail at {critical})");
        Assert.True(count < critical, $"{count} false alarms in {seeds} runs");
    }

    [Fact]
    public void The_phase_cut_follows_the_timelines_coincidence_rule()
    {
        // Grid 0, 0.3, …, 1.5: its point 3 is 3 × 0.3 = 0.8999999999999999. A change written at 0.9 is at that grid time
        // (Timeline: within 10⁻⁹·Δ), and the grid records the state after it, so point 3 opens the second phase. A change at
        // 1.05 falls between points 3 and 4: point 4 opens the third. Two changes between points 4 and 5 (1.25, 1.27) leave
        // a segment that records nothing, and it is no phase.
        var grid = new TimeGrid(1.5, 0.3);
        Assert.NotEqual(0.9, grid[3]);
        var network = Load("species\n  X = 0\nparameters\n  k = 1\nreactions\n  make: 0 -> X mass k\nchanges\n" +
            "  k = 2  at time 3 * 0.3\n  k = 3  at time 1.05\n  k = 4  at time 1.25\n  k = 5  at time 1.27\n");
        var phases = ModelPhase.Of(Timeline.Of(network, grid));
        Assert.Equal([(0, 3), (3, 4), (4, 5), (5, 6)], phases.Select(p => (p.FirstPoint, p.EndPoint)));
        Assert.Equal([0, 0.9, 1.05, 1.27], phases.Select(p => p.Start), new ToleranceComparer(1e-12));
        Assert.Equal([0.9, 1.05, 1.25, 1.5], phases.Select(p => p.End), new ToleranceComparer(1e-12));
        Assert.Equal("[1.27, 1.5]", phases[^1].Span);
        Assert.Equal("[0, 0.9)", phases[0].Span);
        Assert.Equal([0, 1, 2, 3], phases.Select(p => p.Index));
        // A change acting on the initial state is no cut.
        Assert.Single(ModelPhase.Of(Timeline.Of(Load("species\n  X = 0\nparameters\n  k = 1\nreactions\n  make: 0 -> X mass k\nchanges\n  k = 2  at time 0\n"), grid)));
    }

    private sealed class ToleranceComparer(double tolerance) : IEqualityComparer<double>
    {
        public bool Equals(double x, double y) => Math.Abs(x - y) <= tolerance;

        public int GetHashCode(double obj) => 0;
    }
}
