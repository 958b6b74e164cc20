using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>Schedule changes happen exactly at their times, and the dynamics after them are the right ones.</summary>
public sealed class ScheduleTests
{
    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void SettingASpeciesTakesEffectExactlyAtItsTime(SimulationMethod method)
    {
        // Nothing can fire (the only reaction, a decay, has rate 0), so X is 0 before t = 5 and 100 from
        // t = 5 on; a change at a grid time is in the state recorded there (docs/conventions.md). The
        // grid step 2⁻¹⁰ makes 5 and 5 − 2⁻¹⁰ exact grid times.
        var network = new TestNetwork().Species("X", 0).Parameter("k", 0)
            .Mass("decay", "X", "", "k")
            .At(5, "X", ScheduleOperation.Set, 100).Build();
        var grid = new TimeGrid(until: 10, every: 1.0 / 1024);
        var samples = GridSamples.Run(network, method, grid, replicates: 3, seed: 5);
        var at5 = samples.IndexOf(5);
        Assert.Equal(5 - 1.0 / 1024, grid[at5 - 1]);
        for (var r = 0; r < 3; r++)
        {
            for (var k = 0; k < at5; k++) Assert.Equal(0, samples.At(r, k, 0));
            for (var k = at5; k < grid.Count; k++) Assert.Equal(100, samples.At(r, k, 0));
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void ChangesAtOneTimeApplyInFileOrderAndMayReadTheState(SimulationMethod method)
    {
        // At t = 1: X += 7, then X −= 2, then Y = 2·X (reads the X the earlier lines produced).
        var network = new TestNetwork().Species("X", 3).Species("Y", 0)
            .At(1, "X", ScheduleOperation.Add, 7)
            .At(1, "X", ScheduleOperation.Subtract, 2)
            .At(1, "Y", ScheduleOperation.Set, (counts, _) => 2 * counts[0]).Build();
        var grid = new TimeGrid(until: 2, every: 0.5);
        var samples = GridSamples.Run(network, method, grid, replicates: 1, seed: 1);
        Assert.Equal(3, samples.At(0, samples.IndexOf(0.5), 0));
        Assert.Equal(0, samples.At(0, samples.IndexOf(0.5), 1));
        Assert.Equal(8, samples.At(0, samples.IndexOf(1), 0));
        Assert.Equal(16, samples.At(0, samples.IndexOf(1), 1));
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void SwitchingOnADecayRateStartsABinomialPureDeath(SimulationMethod method) =>
        // k = 0 until t = 1: for the next reaction method this is the a_old = 0 case of Gibson & Bruck.
        PureDeathWithRateChange(method, n: 50, before: 0.0, after: 0.7, seed: 17);

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void ChangingADecayRateMidRunRescalesCorrectly(SimulationMethod method) =>
        // For the next reaction method this exercises τ_new = (a_old/a_new)(τ_old − t) + t.
        PureDeathWithRateChange(method, n: 40, before: 0.2, after: 1.5, seed: 23);

    /// <summary>
    /// Pure death X → 0 at rate k·x with k set from <paramref name="before"/> to <paramref name="after"/> at
    /// t = 1: each molecule survives to t with probability e^(−∫k), so X(t) is binomial(n, e^(−∫k))
    /// (Bailey 1964, The Elements of Stochastic Processes, the pure death process; quoted from memory).
    /// </summary>
    private static void PureDeathWithRateChange(SimulationMethod method, long n, double before, double after, ulong seed)
    {
        var network = new TestNetwork().Species("X", n).Parameter("k", before)
            .Mass("decay", "X", "", "k")
            .At(1, "k", ScheduleOperation.Set, after).Build();
        var grid = new TimeGrid(until: 2.5, every: 0.5);
        var samples = GridSamples.Run(network, method, grid, replicates: 10_000, seed: seed);
        foreach (var t in new[] { 0.5, 1.0, 1.5, 2.5 })
        {
            var survival = Math.Exp(-before * Math.Min(t, 1) - after * Math.Max(t - 1, 0));
            var column = samples.Column(samples.IndexOf(t), 0);
            if (survival == 1) Assert.All(column, x => Assert.Equal(n, x));
            else SamplingChecks.FollowsDistribution(column, SamplingChecks.Binomial(survival, n), $"{method}, t = {t}");
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void EmptyingASpeciesRestartsImmigrationDeathFromZero(SimulationMethod method)
    {
        // Immigration–death (α = 6, μ = 1); X is set to 0 at t = 4. From then on X(t) is Poisson with mean
        // α/μ·(1 − e^(−μ(t−4))) (Bailey 1964; quoted from memory) — which needs the death propensity
        // recomputed at the change (for the next reaction method: a falls to 0 and its time is parked).
        const double alpha = 6, mu = 1;
        var network = new TestNetwork().Species("X", 0).Parameter("alpha", alpha).Parameter("mu", mu)
            .Mass("immigration", "", "X", "alpha").Mass("death", "X", "", "mu")
            .At(4, "X", ScheduleOperation.Set, 0).Build();
        var grid = new TimeGrid(until: 5, every: 0.25);
        var samples = GridSamples.Run(network, method, grid, replicates: 10_000, seed: 4);
        Assert.All(samples.Column(samples.IndexOf(4), 0), x => Assert.Equal(0, x));
        foreach (var t in new[] { 4.25, 5.0 })
        {
            var lambda = alpha / mu * (1 - Math.Exp(-mu * (t - 4)));
            SamplingChecks.FollowsDistribution(samples.Column(samples.IndexOf(t), 0), SamplingChecks.Poisson(lambda), $"{method}, t = {t}");
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void AScheduleThatMakesACountNegativeStopsTheRunWithItsTimeAndSpecies(SimulationMethod method)
    {
        var network = new TestNetwork().Species("repressor", 4)
            .At(2.5, "repressor", ScheduleOperation.Subtract, 10).Build();
        var simulator = Simulators.Create(method, network, new SimulatorOptions());
        var rng = ReplicateStreams.For(1, 0);
        var failure = Assert.Throws<SimulationFailureException>(() => simulator.Run(ref rng, new TimeGrid(5, 1), new GridSamples(new TimeGrid(5, 1), 1, 1)));
        Assert.Contains("repressor", failure.Message);
        Assert.Contains("2.5", failure.Message);
        Assert.Equal(2.5, failure.Time);
    }
}
