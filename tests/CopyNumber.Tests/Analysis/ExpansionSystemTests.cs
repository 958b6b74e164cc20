using CopyNumber.Analysis;
using static CopyNumber.Tests.Analysis.AnalysisModels;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// The augmented system's Jacobian (analytic blocks plus differenced φ-columns), which the stiff solver
/// relies on, against an independent central difference of the whole right-hand side (common practice).
/// </summary>
public sealed class ExpansionSystemTests
{
    [Theory]
    [InlineData("repressor_dimer.cnet")]
    [InlineData("promoter_switch.cnet")]
    [InlineData("toggle_pair.cnet")]
    public void JacobianMatchesDifferencesOfTheRightHandSide(string scenario)
    {
        var network = Compile(File.ReadAllText(Path.Combine(ScenariosFolder(), scenario)));
        var system = new ExpansionSystem(network, withMeanCorrection: true);
        var n = system.Dimension;
        var s = system.SpeciesCount;
        // A state away from every symmetry: counts 3 + 2i, a positive definite C, a nonzero δ.
        var y = new double[n];
        for (var i = 0; i < s; i++) y[i] = 3 + 2 * i;
        var c = new double[s, s];
        for (var i = 0; i < s; i++)
            for (var j = 0; j < s; j++) c[i, j] = (i == j ? 4.0 + i : 0.0) + 0.3 / (1 + i + j);
        system.PackCovariance(c, y);
        for (var i = 0; i < s; i++) y[system.CorrectionOffset + i] = 0.1 * (i + 1);

        var analytic = new double[n, n];
        system.Jacobian(0, y, analytic);
        var plus = new double[n];
        var minus = new double[n];
        var shifted = (double[])y.Clone();
        for (var k = 0; k < n; k++)
        {
            var h = 1e-5 * Math.Max(Math.Abs(y[k]), 1);
            shifted[k] = y[k] + h;
            system.Derivative(0, shifted, plus);
            shifted[k] = y[k] - h;
            system.Derivative(0, shifted, minus);
            shifted[k] = y[k];
            for (var row = 0; row < n; row++)
            {
                var numeric = (plus[row] - minus[row]) / (2 * h);
                Assert.True(Math.Abs(numeric - analytic[row, k]) <= 1e-5 * Math.Max(1, Math.Abs(numeric)),
                    $"{scenario}: ∂f[{system.ComponentName(row)}]/∂y[{system.ComponentName(k)}] analytic {analytic[row, k]}, differenced {numeric}");
            }
        }
    }
}
