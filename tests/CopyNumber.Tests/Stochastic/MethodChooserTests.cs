using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The --method auto rule (ours, docs/methods.md "Choosing a method") on small networks whose rate
/// equations have closed forms, so the copy numbers the rule acts on are known independently.
/// </summary>
public sealed class MethodChooserTests
{
    [Fact]
    public void HighCopyNumbersThroughoutChooseTauLeaping()
    {
        // Immigration–death started at its fixed point α/μ = 10^5 stays there: dx/dt = α − μx = 0
        // (common practice).
        Expect(TestNetworks.ImmigrationDeath(alpha: 1e5, mu: 1, x0: 100_000), SimulationMethod.TauLeap, "(fewest: 'X', 100,000), so tau-leaping");
    }

    [Fact]
    public void ASpeciesThatStartsLowChoosesTheDirectMethod()
    {
        // From X(0) = 0 immigration–death starts below any copy threshold.
        Expect(TestNetworks.ImmigrationDeath(alpha: 1e5, mu: 1, x0: 0), SimulationMethod.Direct, "'X' has as few as 0 copies");
    }

    [Fact]
    public void ASpeciesThatTheRateEquationsDrainChoosesTheDirectMethod()
    {
        // Pure death from 10^5 at rate 1: x(t) = 10^5·e^(−t), x(10) ≈ 4.54 (common practice), far below 1000
        // although the start is far above it.
        Expect(TestNetworks.BirthDeath(lambda: 0, mu: 1, x0: 100_000), SimulationMethod.Direct, "'X' has as few as 5 copies");
    }

    [Fact]
    public void AboveAThousandReactionsChooseCompositionRejection()
    {
        var builder = new TestNetwork().Species("X", 0);
        for (var j = 0; j <= MethodChooser.LargeNetwork; j++) builder.Mass($"in{j}", "", "X", "1");
        Expect(builder.Build(), SimulationMethod.CompositionRejection, "1,001 reactions");
    }

    [Fact]
    public void WithoutARateEquationSolutionTheChoiceIsExact()
    {
        var (method, reason) = MethodChooser.Choose(TestNetworks.ImmigrationDeath(1e5, 1, 100_000), rateEquations: null);
        Assert.Equal(SimulationMethod.Direct, method);
        Assert.Contains("could not be solved", reason);
    }

    /// <summary>The rule on a run to t = 10 with grid step 1 picks <paramref name="expected"/> and says <paramref name="why"/>.</summary>
    private static void Expect(ReactionNetwork network, SimulationMethod expected, string why)
    {
        var (method, reason) = MethodChooser.Choose(network, new TimeGrid(10, 1));
        Assert.Equal(expected, method);
        Assert.Contains(why, reason);
    }
}
