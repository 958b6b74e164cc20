using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>The selection and queue structures against brute force (common practice).</summary>
public sealed class SelectionStructureTests
{
    [Fact]
    public void SumTreeAndLinearWalkPickTheReactionWhoseIntervalHoldsThePoint()
    {
        const int m = 100;
        var rng = new Xoshiro256StarStar(42);
        var tree = SumTreeSelection.Create(m);
        var linear = LinearSelection.Create(m);
        var values = new double[m];
        for (var round = 0; round < 200; round++)
        {
            for (var change = 0; change < 10; change++)
            {
                var j = (int)(rng.NextUInt64() % m);
                values[j] = rng.NextDouble() < 0.3 ? 0.0 : rng.NextDouble() * 10;
                tree.Set(j, values[j]);
                linear.Set(j, values[j]);
            }
            linear.Resum();
            var total = values.Sum();
            Assert.Equal(total, tree.Total, 9);
            Assert.Equal(total, linear.Total, 9);
            for (var draw = 0; draw < 20; draw++)
            {
                var point = rng.NextDouble() * total;
                var expected = 0;
                var cumulative = values[0];
                while (!(point < cumulative) || values[expected] == 0) cumulative += values[++expected];
                Assert.Equal(expected, tree.Select(point));
                Assert.Equal(expected, linear.Select(point));
            }
            // Points at the very top of the range never land on a reaction that cannot fire.
            Assert.True(values[tree.Select(Math.BitDecrement(total))] > 0);
            Assert.True(values[linear.Select(Math.BitDecrement(total))] > 0);
        }
    }

    [Fact]
    public void IndexedPriorityQueueAlwaysTopsTheSmallestKey()
    {
        const int n = 37;
        var rng = new Xoshiro256StarStar(7);
        var keys = Enumerable.Range(0, n).Select(_ => rng.NextExponential()).ToArray();
        var queue = new IndexedPriorityQueue(n);
        queue.Build(keys);
        for (var step = 0; step < 5_000; step++)
        {
            var min = keys.Min();
            Assert.Equal(min, queue.TopKey);
            Assert.Equal(min, keys[queue.Top]);
            var item = (int)(rng.NextUInt64() % n);
            keys[item] = rng.NextDouble() < 0.1 ? double.PositiveInfinity : rng.NextExponential() * 3;
            queue.Update(item, keys[item]);
            Assert.Equal(keys[item], queue.Key(item));
        }
    }

    [Fact]
    public void CompositionRejectionPicksReactionsInProportionToTheirPropensities()
    {
        // The selection is random (rejection within a group), so its frequencies are tested: after many
        // updates that move reactions between groups (values spread over 2^-20 … 2^20, some 0), 200 000
        // selections must follow a_j/a0 by Pearson's chi-square test (Pearson 1900), the exact
        // composition–rejection distribution (Slepoy, Thompson & Plimpton 2008, J. Chem. Phys. 128:205101).
        const int m = 40;
        var rng = new Xoshiro256StarStar(2008);
        var selection = CompositionRejection.Create(m);
        var values = new double[m];
        for (var change = 0; change < 5_000; change++)
        {
            var j = (int)(rng.NextUInt64() % m);
            values[j] = rng.NextDouble() < 0.2 ? 0.0 : Math.Pow(2, 40 * rng.NextDouble() - 20);
            selection.Set(j, values[j]);
        }
        selection.Resum();
        var total = values.Sum();
        Assert.Equal(total, selection.Total, 9);
        const int draws = 200_000;
        var hits = new long[m];
        for (var draw = 0; draw < draws; draw++)
        {
            var j = selection.Select(rng.NextDouble() * selection.Total, ref rng);
            Assert.True(values[j] > 0, $"reaction {j} with propensity 0 was selected");
            hits[j]++;
        }
        // One sample per draw (the index), so the goodness-of-fit test of SamplingChecks applies to it.
        var samples = new List<long>(draws);
        for (var j = 0; j < m; j++) for (var h = 0; h < hits[j]; h++) samples.Add(j);
        SamplingChecks.FollowsDistribution(samples, k => values[k] / total, "composition-rejection selection");
    }
}
