using CopyNumber.Analysis;
using CopyNumber.Network;
using CopyNumber.Runs;
using CopyNumber.Runs.Scans;
using CopyNumber.Storage;
using CopyNumber.Tests.Storage;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Scans;

public class ScanErrorRateTests(ITestOutputHelper output)
{
    // Immigration–death, 0 -> X (λ), X -> 0 (μ = 1), from X = 0: the network is linear, so the rate equation
    // is the exact mean and the law at every time is Poisson with mean λ(1 − e^(−t)) (Bailey 1964, The
    // Elements of Stochastic Processes, §7.5; quoted from memory). At λ ≥ 4 the stationary CV 1/√λ ≤ 0.5 and
    // P(0) = e^(−λ) ≤ 0.018 < 5%, and the law is unimodal: every verdict other than 'adequate' is false.
    // λ = 4 puts the CV exactly at its threshold at stationarity, the hardest case for the noise verdict.
    private const string ImmigrationDeath = "# illustrative\nspecies\n  X = 0\nparameters\n  lambda = 4\nreactions\n  make: 0 -> X mass lambda\n  decay: X -> 0 mass 1\n";

    [Fact]
    public void Over_many_seeds_a_map_where_the_rate_equations_are_exact_carries_a_false_verdict_at_most_at_the_stated_rate()
    {
        const int maps = 60;
        const int points = 4;
        var model = ScanHelpers.Load(ImmigrationDeath);
        var grid = new TimeGrid(8, 1);
        var kinds = new[] { VerdictKind.MeanShifted, VerdictKind.NoiseDominated, VerdictKind.Multimodal, VerdictKind.ExtinctionProne };
        var falseMaps = kinds.ToDictionary(k => k, _ => 0);
        var falseMapsUncorrected = kinds.ToDictionary(k => k, _ => 0);
        using var scratch = new ScratchFolder();
        for (var m = 0; m < maps; m++)
        {
            var request = ScanHelpers.Request(model, scratch.File($"map-{m}"), seed: 1000 + (ulong)m, replicates: 100, grid, null, "lambda=4,6,9,14");
            var uncorrected = new HashSet<VerdictKind>();
            var outcome = ScanRunner.Execute(request, (folder, perPoint) =>
            {
                // The same folder judged at α per point (no rule over the map), for the comparison.
                foreach (var v in ScanHelpers.ContrastOnly(folder, ContrastThresholds.Default).Quantities.SelectMany(q => q.Verdicts)) uncorrected.Add(v.Kind);
                return ScanHelpers.ContrastOnly(folder, perPoint);
            });
            Assert.Equal(StopReason.Finished, outcome.StopReason);
            Assert.Equal(points, outcome.Cells.Count);
            foreach (var kind in kinds)
            {
                var column = ScanCells.VerdictOrder.ToList().IndexOf(kind);
                if (outcome.Cells.Any(c => c.Flags[column] == 1)) falseMaps[kind]++;
                if (uncorrected.Contains(kind)) falseMapsUncorrected[kind]++;
            }
        }
        foreach (var kind in kinds)
            output.WriteLine($"{QuantityVerdict.LabelOf(kind)}: {falseMaps[kind]} of {maps} maps at α/{points} per point, {falseMapsUncorrected[kind]} at α per point");
        // The rule promises ≤ α = 1% per verdict kind and quantity over a map. Fail when the count c of false maps has
        // P(Binomial(60, 0.01) ≥ c) ≤ 0.001, i.e. c ≥ 5: a rule calibrated at 1% fails this with chance ≤ 0.1%.
        foreach (var kind in kinds)
            Assert.True(falseMaps[kind] < 5, $"{QuantityVerdict.LabelOf(kind)}: {falseMaps[kind]} of {maps} maps carry a false verdict");
    }

    [Fact]
    public void Each_point_is_judged_at_the_maps_rate_divided_by_its_points()
    {
        var map = ContrastThresholds.Default with { FalseAlarmRate = 0.02 };
        Assert.Equal(0.02 / 50, ScanErrorRate.PerPoint(map, 50).FalseAlarmRate, 15);
        Assert.Equal(map.RelativeDeviation, ScanErrorRate.PerPoint(map, 50).RelativeDeviation);
    }
}
