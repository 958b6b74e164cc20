using CopyNumber.Analysis;
using CopyNumber.Deterministic;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Analysis;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Network;

/// <summary>
/// One timeline for every consumer: a schedule change that lands on a grid time computed differently
/// (0.9 against 3 × 0.3 = 0.8999999999999999, 5/3 against 5 × (1/3)) is at that grid time for the rate
/// equations, the expansion and every simulator alike. The models are deterministic (nothing can fire),
/// so every description must give exactly the same numbers: common practice.
/// </summary>
public sealed class TimelineTests
{
    /// <summary>Grid spacing, the schedule time as written in the model, and the grid index it lands on.</summary>
    public static TheoryData<double, string, int> Coincidences => new()
    {
        { 0.3, "0.9", 3 },            // 3 × 0.3 = 0.8999999999999999 < 0.9
        { 0.3, "1.8", 6 },            // 6 × 0.3 = 1.7999999999999998 < 1.8
        { 0.1, "0.7", 7 },            // 7 × 0.1 = 0.7000000000000001 > 0.7
        { 0.1, "0.3 + 1e-12", 3 },    // a hair after the grid time, well inside 10⁻⁹·Δ
        { 1.0 / 3, "5/3", 5 },        // 5 × (1/3) = 1.6666666666666665 < 5/3 = 1.6666666666666667
        { 1.0 / 3, "1", 3 },          // 3 × (1/3) = 1 exactly
    };

    private static ReactionNetwork StepModel(string at) => AnalysisModels.Compile(
        $"species\n  X = 0\nparameters\n  k = 0\nreactions\n  decay: X -> 0 mass k\nchanges\n  X = 100  at time {at}\n");

    [Theory]
    [MemberData(nameof(Coincidences))]
    public void A_change_at_a_grid_time_is_snapped_onto_it_and_recorded_after(double every, string at, int point)
    {
        var grid = new TimeGrid(3, every);
        var timeline = Timeline.Of(StepModel(at), grid);
        Assert.Equal(grid[point], timeline.Changes[0].Time);
        var segments = timeline.Segments.ToArray();
        Assert.Equal(2, segments.Length);
        Assert.Equal((0, point), (segments[0].FirstPoint, segments[0].EndPoint));
        Assert.Equal((point, grid.Count), (segments[1].FirstPoint, segments[1].EndPoint));
        Assert.Equal((0, 1), (segments[1].FirstChange, segments[1].EndChange));
    }

    [Fact]
    public void A_change_near_but_not_at_a_grid_time_keeps_its_time()
    {
        // 10⁻⁶·Δ away is a real instant between grid points (the tolerance is 10⁻⁹·Δ).
        var grid = new TimeGrid(3, 0.3);
        Assert.Equal(0.9 + 3e-7, Timeline.EffectiveTime(0.9 + 3e-7, grid));
        Assert.Equal(0.0, Timeline.EffectiveTime(1e-12, grid));
        Assert.Equal(3.0, Timeline.EffectiveTime(3 + 1e-12, grid));
        Assert.Null(Timeline.EffectiveTime(3 + 1e-6, grid));
    }

    [Theory]
    [MemberData(nameof(Coincidences))]
    public void Every_simulator_records_the_change_at_its_grid_time(double every, string at, int point)
    {
        var network = StepModel(at);
        var grid = new TimeGrid(3, every);
        foreach (var method in new[] { SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.CompositionRejection, SimulationMethod.TauLeap })
        {
            var samples = GridSamples.Run(network, method, grid, replicates: 2, seed: 3);
            for (var r = 0; r < 2; r++)
                for (var k = 0; k < grid.Count; k++)
                    Assert.True(samples.At(r, k, 0) == (k < point ? 0 : 100), $"{method}: X = {samples.At(r, k, 0)} at t = {grid[k]:R} (change at {at})");
        }
    }

    [Theory]
    [MemberData(nameof(Coincidences))]
    public void The_rate_equations_and_the_expansion_record_the_change_at_its_grid_time(double every, string at, int point)
    {
        var network = StepModel(at);
        var grid = new TimeGrid(3, every);
        var rateEquations = RateEquationSolver.Solve(network, grid, AnalysisModels.Tight);
        var lna = LinearNoiseApproximation.Solve(network, grid, AnalysisModels.Tight);
        var emre = EffectiveMesoscopicRateEquations.Solve(network, grid, AnalysisModels.Tight);
        for (var k = 0; k < grid.Count; k++)
        {
            var expected = k < point ? 0.0 : 100.0;
            Assert.Equal(expected, rateEquations[k, 0]);
            Assert.Equal(expected, lna.RateEquationValue(k, 0));
            Assert.Equal(expected, emre.CorrectedMean(k, 0));
        }
    }

    private const string ReadoutModel =
        "species\n  A = 100\nparameters\n  K = 1\n  k = 0\nreactions\n  decay: A -> 0 mass k\nchanges\n  K = 10  at time 2\nreadouts\n  scaled = A / K\n";

    [Fact]
    public void The_ensemble_evaluates_readouts_with_the_parameters_in_force()
    {
        // Nothing fires: scaled = 100/1 before t = 2 and 100/10 from t = 2 on, in every replicate.
        var network = AnalysisModels.Compile(ReadoutModel);
        var grid = new TimeGrid(3, 0.5);
        var result = EnsembleRunner.Run(network, new EnsembleOptions { Grid = grid, Replicates = 10, Seed = 1, Threads = 1 });
        var scaled = result.RealQuantities.ToList().FindIndex(q => q.Name == "scaled");
        for (var k = 0; k < grid.Count; k++)
        {
            var moments = result.Moments(k, scaled);
            Assert.Equal(grid[k] < 2 ? 100.0 : 10.0, moments.Mean);
            Assert.Equal(0.0, moments.Variance);
        }
    }

    [Fact]
    public void The_rate_equations_LNA_and_corrected_mean_evaluate_readouts_with_the_parameters_in_force()
    {
        // Immigration–death (α = 100, μ = 1) started at its fixed point 100: φ = 100 and the LNA variance
        // of A is 100·(1 − e^(−2t)) (van Kampen 2007, Stochastic Processes in Physics and Chemistry, 3rd ed., the linear noise approximation;
        // exact for a linear network; quoted from memory). The readout A/K has mean φ/K and variance
        // Var(A)/K², with K = 1 before t = 2 and 10 from t = 2; the first-order correction of a linear network
        // is 0, so the corrected mean is φ/K too.
        var network = AnalysisModels.Compile(
            "species\n  A = 100\nparameters\n  K = 1\nreactions\n  make: 0 -> A mass 100\n  decay: A -> 0 mass 1\nchanges\n  K = 10  at time 2\nreadouts\n  scaled = A / K\n");
        var grid = new TimeGrid(3, 0.3);
        var rateEquations = RateEquationSolver.Solve(network, grid, AnalysisModels.Tight);
        var lna = LinearNoiseApproximation.Solve(network, grid, AnalysisModels.Tight);
        var emre = EffectiveMesoscopicRateEquations.Solve(network, grid, AnalysisModels.Tight);
        var column = rateEquations.ColumnIndex("scaled");
        for (var k = 0; k < grid.Count; k++)
        {
            var t = grid[k];
            var scale = t < 2 ? 1.0 : 10.0;
            Assert.Equal(100 / scale, rateEquations[k, column], 1e-6);
            Assert.Equal(100 / scale, lna.RateEquationValue(k, column), 1e-6);
            Assert.Equal(100 * (1 - Math.Exp(-2 * t)) / (scale * scale), lna.Variance(k, column), 1e-6);
            Assert.Equal(100 / scale, emre.RateEquationValue(k, column), 1e-6);
            Assert.Equal(100 / scale, emre.CorrectedMean(k, column), 1e-6);
            Assert.Equal(100 * (1 - Math.Exp(-2 * t)) / (scale * scale), emre.Variance(k, column), 1e-6);
        }
    }
}
