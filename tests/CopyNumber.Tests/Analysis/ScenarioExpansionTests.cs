using CopyNumber.Analysis;
using CopyNumber.Network;
using static CopyNumber.Tests.Analysis.AnalysisModels;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Analysis;

/// <summary>The expansion on the bundled scenarios: conservation laws, schedule jumps, readouts.</summary>
public sealed class ScenarioExpansionTests
{
    private static string Scenario(string name) => File.ReadAllText(Path.Combine(ScenariosFolder(), name));

    [Fact]
    public void RepressorDimerKeepsItsOperatorExactlyOne()
    {
        // O + OD = 1 in every replicate (lᵀN = 0, Heinrich & Schuster 1996, The Regulation of Cellular
        // Systems, ch. 2): the readout operator_copies has variance 0 and mean 1 in the LNA and the EMRE
        // although C is singular along l, and the covariance matrix stays symmetric positive semidefinite.
        var network = Compile(Scenario("repressor_dimer.cnet"));
        var grid = new TimeGrid(200, 20);
        var solution = EffectiveMesoscopicRateEquations.Solve(network, grid, Tight);
        var copies = solution.ColumnIndex("operator_copies");
        for (var k = 0; k < grid.Count; k++)
        {
            Assert.Equal(0.0, solution.Variance(k, copies), 1e-8);
            Assert.Equal(1.0, solution.CorrectedMean(k, copies), 1e-8);
            var c = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseOfArray(solution.Covariance(k));
            Assert.True(c.Evd().EigenValues.All(l => l.Real > -1e-8 * Math.Max(1, c.L2Norm())), $"t = {grid[k]}");
        }
        // The dimer forms by a second-order reaction: the first-order correction is not zero.
        Assert.NotEqual(0.0, solution.MeanCorrection(grid.Count - 1)[network.SpeciesIndex("R")]);
    }

    [Fact]
    public void HalvingTheProteinQuartersItsVariance()
    {
        // "protein = protein / 2  at time 100" maps every replicate's count x to x/2, so the variance becomes
        // Var/4, the covariance with mRNA halves, and the mean halves (Var(aX) = a²Var(X); common practice).
        var withDivision = Compile(Scenario("inducer_pulse.cnet"));
        var text = Scenario("inducer_pulse.cnet");
        var withoutDivision = Compile(text.Replace("protein = protein / 2     at time 100", ""));
        Assert.NotEqual(text, text.Replace("protein = protein / 2     at time 100", "")); // the division line is there to remove
        var grid = new TimeGrid(100, 10);
        var after = LinearNoiseApproximation.Solve(withDivision, grid, Tight);
        var before = LinearNoiseApproximation.Solve(withoutDivision, grid, Tight);
        var last = grid.Count - 1;
        var p = withDivision.SpeciesIndex("protein");
        var m = withDivision.SpeciesIndex("mrna");
        Assert.Equal(before.RateEquationValue(last, p) / 2, after.RateEquationValue(last, p), 1e-9 * before.RateEquationValue(last, p));
        Assert.Equal(before.Variance(last, p) / 4, after.Variance(last, p), 1e-9 * before.Variance(last, p));
        Assert.Equal(before.Covariance(last)[m, p] / 2, after.Covariance(last)[m, p], 1e-9 * Math.Abs(before.Covariance(last)[m, p]));
        Assert.Equal(before.Variance(last, m), after.Variance(last, m), 1e-9 * before.Variance(last, m));
        // Before the division both runs are the same: the inducer change at t = 50 moves no molecule.
        Assert.Equal(before.Variance(last - 1, p), after.Variance(last - 1, p), 1e-9 * before.Variance(last - 1, p));
    }
}
