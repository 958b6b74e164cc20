using CopyNumber.Network;
using CopyNumber.Stochastic;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// State-triggered changes (<c>whenever</c>) in the stochastic simulators, against closed forms derived
/// here and the rules of docs/network-language.md. The Discrete Stochastic Models Test Suite's case with a
/// count-triggered reset (00033) is checked with the rest of the suite in <see cref="DsmtsTests"/>.
/// </summary>
public sealed class StateTriggerTests
{
    private static ReactionNetwork Load(string text) =>
        ModelLoader.LoadText(text, "trigger.cnet").Model!.Network;

    /// <summary>
    /// A birth process at rate λ reset to 0 whenever X ≥ N: every birth adds one and the reset takes N to 0
    /// at once, so X(t) = B(t) mod N with B(t) ~ Poisson(λt), the number of births by t (derived here:
    /// the reset removes exactly N each time, and the births are a Poisson process whatever X is, since
    /// their propensity does not read X). Hence P(X(t) = k) = Σ_m Poisson(k + mN; λt), tested by Pearson's
    /// χ² (<see cref="SamplingChecks.FollowsDistribution"/>). Tau-leaping is exact for this birth process
    /// (a constant propensity makes the leap's Poisson count exact), so any error is the trigger's: a leap
    /// that carried X past N would lose the overshoot at the reset.
    /// </summary>
    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void ABirthProcessResetAtNIsThePoissonCountModuloN(SimulationMethod method)
    {
        const int n = 200;
        const double lambda = 1000;
        var network = Load($"species\n  X = 0\nreactions\n  birth: 0 -> X  mass {lambda}\nchanges\n  X = 0  whenever X >= {n}\n");
        // A fine grid keeps tau-leaping's leaps short, so most leap while X is far from N.
        var grid = new TimeGrid(until: 1, every: 0.01);
        var samples = GridSamples.Run(network, method, grid, replicates: 4000, seed: 1212);
        foreach (var time in new[] { 0.13, 0.5, 1.0 })
        {
            var column = samples.Column(samples.IndexOf(time), 0);
            Assert.All(column, x => Assert.InRange(x, 0, n - 1));
            SamplingChecks.FollowsDistribution(column, k => ModuloPoisson(k, n, lambda * time), $"{method}, X at t = {time}");
        }
    }

    /// <summary>P(B mod N = k) for B ~ Poisson(mean).</summary>
    private static double ModuloPoisson(long k, int n, double mean)
    {
        var p = 0.0;
        for (var b = k; b < mean + 40 * Math.Sqrt(mean) + 40; b += n) p += Poisson.PMF(mean, (int)b);
        return p;
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void TriggersThatTurnTrueTogetherApplyInFileOrderAndCascadeAtOnce(SimulationMethod method)
    {
        // At the birth that makes X = 3 both lines turn true: in file order A = 5, then A = 2·A = 10 (the
        // other order would give 5). Their change makes B's condition (A == 10) turn true in the next
        // round, at the same instant: B = A + 1 = 11. X keeps growing; nothing turns true again.
        var network = Load("species\n  X = 0\n  A = 0\n  B = 0\nreactions\n  birth: 0 -> X  mass 2\nchanges\n" +
                           "  A = 5  whenever X >= 3\n  A = 2 * A  whenever X >= 3\n  B = A + 1  whenever A == 10\n");
        var grid = new TimeGrid(until: 30, every: 0.5);
        var samples = GridSamples.Run(network, method, grid, replicates: 200, seed: 7);
        for (var r = 0; r < samples.Replicates; r++)
            for (var k = 0; k < grid.Count; k++)
            {
                var x = samples.At(r, k, 0);
                Assert.Equal(x >= 3 ? 10 : 0, samples.At(r, k, 1));
                Assert.Equal(x >= 3 ? 11 : 0, samples.At(r, k, 2));
            }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void AConditionThatHoldsAtTheStartFiresOnlyAfterItHasBeenFalse(SimulationMethod method)
    {
        // X starts at 5, so X ≥ 3 holds at the start: by the rule (SBML's initialValue = true) it does
        // not fire then. A pure death never returns to 3 once below it, so it never turns from false to
        // true and Y stays 0 in every replicate (under the other reading, firing at the start, Y = 1).
        var network = Load("species\n  X = 5\n  Y = 0\nreactions\n  death: X -> 0  mass 0.5\nchanges\n  Y = Y + 1  whenever X >= 3\n");
        var grid = new TimeGrid(until: 20, every: 0.25);
        var samples = GridSamples.Run(network, method, grid, replicates: 100, seed: 9);
        for (var r = 0; r < samples.Replicates; r++)
            for (var k = 0; k < grid.Count; k++) Assert.Equal(0, samples.At(r, k, 1));
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void TriggersThatSetEachOtherOffWithoutEndStopTheRunWithAMessage(SimulationMethod method)
    {
        var network = Load("species\n  X = 0\n  B = 0\nreactions\n  birth: 0 -> X  mass 1\nchanges\n" +
                           "  B = 1  whenever X >= 1 and B == 0\n  B = 0  whenever B == 1\n");
        var error = Assert.Throws<SimulationFailureException>(() => GridSamples.Run(network, method, new TimeGrid(until: 100, every: 1), replicates: 1, seed: 3));
        Assert.Contains("kept setting each other off", error.Message);
        Assert.Contains("line", error.Message);
    }

    [Fact]
    public void TheMasterEquationStillRefusesATrigger()
    {
        var network = Load("species\n  X = 0\nreactions\n  birth: 0 -> X  mass 1\nchanges\n  X = 0  whenever X >= 5\n");
        Assert.Empty(ModelSupport.SimulationProblems(network));
        var problem = Assert.Single(ModelSupport.StochasticProblems(network));
        Assert.Contains("state-triggered changes are not supported by this method", problem.Message);
    }
}
