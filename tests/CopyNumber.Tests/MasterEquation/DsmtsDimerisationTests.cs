using CopyNumber.MasterEquation;
using CopyNumber.Network;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// The dimerisation cases 00030–00032 of the Discrete Stochastic Models Test Suite (Evans, Gillespie &amp;
/// Wilkinson 2008, Bioinformatics 24:285), read in place from ../shared/sbml-test-cases through
/// <see cref="DsmtsSuite"/>: the master equation's means and standard deviations of P and P2 at every
/// published time against the published values, which are given to six decimals. 00032 resets P and P2
/// at t = 25 by the schedule, so it also checks that species changes map the law exactly.
/// </summary>
public sealed class DsmtsDimerisationTests
{
    [Theory]
    [InlineData(30)]
    [InlineData(31)]
    [InlineData(32)]
    public void MeansAndStandardDeviationsMatchThePublishedValues(int number)
    {
        var expected = DsmtsSuite.Load(number);
        var network = DsmtsSuite.Network(number);
        var grid = new TimeGrid(until: expected.Times[^1], every: expected.Times[1] - expected.Times[0]);
        var solution = FiniteStateProjection.Solve(network, grid, new ExactOptions(1e-10));
        foreach (var species in new[] { "P", "P2" })
        {
            var column = Array.IndexOf(expected.Columns, species);
            var q = network.SpeciesIndex(species);
            for (var r = 0; r < expected.Times.Length; r++)
            {
                var g = (int)Math.Round(expected.Times[r] / grid.Every);
                Assert.Equal(expected.Times[r], grid[g], 9);
                var law = solution.Law(g, q);
                // Six published decimals round by at most 5e-7; 2e-6 leaves room for the solver's 1e-10 bound times the counts.
                Assert.True(Math.Abs(law.Mean - expected.Mean[r, column]) < 2e-6, $"case {number}, {species} at t = {expected.Times[r]}: mean {law.Mean} against {expected.Mean[r, column]}");
                Assert.True(Math.Abs(Math.Sqrt(law.Variance) - expected.Sd[r, column]) < 2e-6, $"case {number}, {species} at t = {expected.Times[r]}: SD {Math.Sqrt(law.Variance)} against {expected.Sd[r, column]}");
            }
        }
    }
}
