using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>Pieces of tau-leaping checked against the formulas of its papers, and its invariants at high counts.</summary>
public sealed class TauLeapingTests
{
    [Fact]
    public void OrderFactorsAreThoseOfCaoGillespiePetzold2006()
    {
        // Cao, Gillespie & Petzold 2006 (J. Chem. Phys. 124:044109), the g_i rule: first order in the
        // species: g = HOR; homodimer: 2 + 1/(x−1); order 3 needing two: (3/2)(2 + 1/(x−1));
        // needing three: 3 + 1/(x−1) + 2/(x−2).
        const long x = 11;
        Assert.Equal(1.0, LeapStepSize.OrderFactor(x, 1, 1), 14);
        Assert.Equal(2.0, LeapStepSize.OrderFactor(x, 2, 1), 14);
        Assert.Equal(3.0, LeapStepSize.OrderFactor(x, 3, 1), 14);
        Assert.Equal(2 + 1.0 / (x - 1), LeapStepSize.OrderFactor(x, 2, 2), 14);
        Assert.Equal(1.5 * (2 + 1.0 / (x - 1)), LeapStepSize.OrderFactor(x, 3, 2), 14);
        Assert.Equal(3 + 1.0 / (x - 1) + 2.0 / (x - 2), LeapStepSize.OrderFactor(x, 3, 3), 14);
        // Too few molecules for the reaction: no relative bound, the step falls back to one molecule.
        Assert.Equal(double.PositiveInfinity, LeapStepSize.OrderFactor(1, 2, 2));
    }

    [Fact]
    public void FiringsLeftAreThoseOfCaoGillespiePetzold2005()
    {
        // Cao, Gillespie & Petzold 2005 (J. Chem. Phys. 123:054104): L_j = min over ν_ij < 0 of ⌊x_i/|ν_ij|⌋.
        var network = new TestNetwork().Species("A", 7).Species("B", 30).Species("C", 0)
            .Mass("pair", "2 A + B", "C", "1")      // consumes 2 A and 1 B: min(⌊7/2⌋, 30) = 3
            .Mass("make", "", "A", "1")             // consumes nothing
            .Mass("catalysed", "B + C", "B + 2 C", "1").Build(); // net gain of C, B unchanged
        var effects = new ReactionEffects(network, includeFired: false);
        var critical = new CriticalReactions(effects, threshold: 10);
        var counts = network.InitialCounts.ToArray();
        Assert.Equal(3, critical.FiringsLeft(0, counts));
        Assert.Equal(long.MaxValue, critical.FiringsLeft(1, counts));
        Assert.Equal(long.MaxValue, critical.FiringsLeft(2, counts));
        var a0c = critical.Classify(counts, [2.0, 1.0, 0.0]);
        Assert.Equal([true, false, false], critical.IsCritical);
        Assert.Equal(2.0, a0c);
    }

    [Fact]
    public void ConservationHoldsAtEveryGridPointWhileLeaping()
    {
        // A + B = n and P + 2D = P0 are exact invariants of the reactions' N (common practice: conservation
        // laws are left null vectors of N), so every leap of whole firings keeps them exactly.
        var grid = new TimeGrid(until: 2, every: 0.05);
        const long n = 100_000, p0 = 20_000;
        var isomers = GridSamples.Run(TestNetworks.Isomerisation(n, 0, 1.0, 0.5), SimulationMethod.TauLeap, grid, 50, seed: 11);
        var dimers = GridSamples.Run(TestNetworks.Dimerisation(p0, 1e-4, 0.5), SimulationMethod.TauLeap, grid, 50, seed: 12);
        for (var r = 0; r < 50; r++)
            for (var k = 0; k < grid.Count; k++)
            {
                Assert.Equal(n, isomers.At(r, k, 0) + isomers.At(r, k, 1));
                Assert.Equal(p0, dimers.At(r, k, 0) + 2 * dimers.At(r, k, 1));
            }
        Assert.True(isomers.Steps * 10 < isomers.Events, "the isomerisation run did not leap");
        Assert.True(dimers.Steps * 10 < dimers.Events, "the dimerisation run did not leap");
    }

    [Fact]
    public void CountsStayNonNegativeWhenLargeLeapsWouldOvershoot()
    {
        // A coarse ε makes leaps that, unchecked, would often overdraw X near extinction; rejected leaps
        // must keep every count ≥ 0 (GridSamples asserts that at every grid point).
        var network = new TestNetwork().Species("X", 5_000).Mass("decay", "X", "", "3").Mass("pairs", "2 X", "", "0.001").Build();
        var grid = new TimeGrid(until: 5, every: 0.01);
        var samples = GridSamples.Run(network, SimulationMethod.TauLeap, grid, 200, seed: 7, new SimulatorOptions(Epsilon: 0.5, CriticalThreshold: 0));
        Assert.True(samples.Steps < samples.Events);
    }
}
