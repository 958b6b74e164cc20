using System.Numerics;
using CopyNumber.Ensembles;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// The fixed combination tree of the real readouts' moments: any order of adding blocks, and any split
/// of them into parts combined later, gives the same bits; the stored nodes are the maximal complete
/// aligned ranges; and the combined moments agree with exact rational arithmetic to the accuracy of
/// pairwise combination (Higham 1993, SIAM J. Sci. Comput. 14:783, error growing like log n).
/// </summary>
public class MomentTreeTests
{
    private const int Cells = 3;

    [Fact]
    public void Any_order_of_adding_blocks_and_any_split_into_parts_give_the_same_bits()
    {
        var random = new Random(7);
        const int blocks = 37;
        var leaves = Enumerable.Range(0, blocks).Select(_ => Leaf(random)).ToArray();
        var reference = Summarised(blocks, Enumerable.Range(0, blocks), leaves);
        for (var trial = 0; trial < 25; trial++)
        {
            var order = Enumerable.Range(0, blocks).OrderBy(_ => random.Next()).ToArray();
            AssertSameBits(reference, Summarised(blocks, order, leaves));

            // Two parts over a random partition of the blocks, combined afterwards.
            var inFirst = order.Take(random.Next(blocks + 1)).ToHashSet();
            var first = Tree(blocks, order.Where(inFirst.Contains), leaves);
            var second = Tree(blocks, order.Where(b => !inFirst.Contains(b)), leaves);
            var combined = new MomentTree(blocks, Cells);
            combined.AddCopiesOf(second);
            combined.AddCopiesOf(first);
            Assert.Single(combined.Nodes);
            AssertSameBits(reference, combined.Summarise());
        }
    }

    [Theory]
    [InlineData(16, "0-9,12,14,15")]
    [InlineData(13, "12")]
    [InlineData(13, "0-12")]
    [InlineData(13, "1,3-7,9-12")]
    [InlineData(1, "0")]
    [InlineData(100, "0-62,64,66-99")]
    public void The_stored_nodes_are_the_maximal_complete_aligned_ranges(long blocks, string finished)
    {
        var set = BlockRanges.Parse(finished);
        var random = new Random(3);
        var tree = Tree(blocks, set.OrderBy(_ => random.Next()), set.ToDictionary(b => b, _ => Leaf(random)));
        // Independently: range [i·2^l, (i+1)·2^l) ∩ [0, B) is stored when all its blocks are finished and
        // its parent's range is not (or it is the root); its level is the lowest that covers the same blocks.
        var expected = new List<(long First, long End)>();
        var height = 0;
        while ((1L << height) < blocks) height++;
        bool Complete(int level, long index) => Blocks(level, index, blocks).All(set.Contains);
        for (var level = 0; level <= height; level++)
        {
            for (var index = 0L; (index << level) < blocks; index++)
            {
                if (!Complete(level, index) || (level < height && Complete(level + 1, index >> 1))) continue;
                var range = (index << level, Math.Min(blocks, (index + 1) << level));
                if (!expected.Contains(range)) expected.Add(range);
            }
        }
        Assert.Equal(expected.Order().ToArray(), tree.Nodes.Select(n => (n.FirstBlock, n.EndBlock)).ToArray());
    }

    [Fact]
    public void The_combined_mean_and_variance_agree_with_exact_rational_arithmetic()
    {
        var random = new Random(11);
        const int blocks = 50;
        var values = new List<double>[Cells];
        for (var c = 0; c < Cells; c++) values[c] = [];
        var leaves = new MomentAccumulator[blocks][];
        for (var b = 0; b < blocks; b++)
        {
            leaves[b] = Enumerable.Range(0, Cells).Select(_ => new MomentAccumulator()).ToArray();
            for (var r = 0; r < 64; r++)
            {
                for (var c = 0; c < Cells; c++)
                {
                    // A large offset with a small spread is where naive sums of squares lose every digit.
                    var x = 1e6 * (c + 1) + random.NextDouble() * Math.Pow(10, -c);
                    leaves[b][c].Add(x);
                    values[c].Add(x);
                }
            }
        }
        var total = Summarised(blocks, Enumerable.Range(0, blocks).Reverse(), leaves);
        for (var c = 0; c < Cells; c++)
        {
            var (mean, variance) = ExactMoments(values[c]);
            var n = values[c].Count;
            Assert.Equal(n, total[c].Count);
            // Error bounds of Chan, Golub & LeVeque (1983), pairwise updating, quoted from memory: about
            // u·log2(n) for the mean of positive data and u·κ·log2(n) for the variance, with unit roundoff
            // u = 2^-53 and condition number κ = ‖x‖/√S = √(1 + n·mean²/S), S = (n − 1)·variance. A
            // factor 10 covers the constants those bounds leave out.
            var u = Math.Pow(2, -53);
            var log = Math.Log2(n);
            var kappa = Math.Sqrt(1 + n * mean * mean / ((n - 1) * variance));
            Assert.True(Math.Abs(total[c].Mean - mean) <= 10 * u * log * Math.Abs(mean), $"cell {c}: mean {total[c].Mean} vs exact {mean}");
            Assert.True(Math.Abs(total[c].Variance - variance) <= 10 * u * kappa * log * variance, $"cell {c}: variance {total[c].Variance} vs exact {variance} (κ = {kappa:E2})");
        }
    }

    [Fact]
    public void A_moment_state_round_trips_exactly_and_impossible_states_are_refused()
    {
        var accumulator = new MomentAccumulator();
        foreach (var x in new[] { 0.1, 0.7, double.NaN, -3.25, 1e-300 }) accumulator.Add(x);
        var copy = MomentAccumulator.FromState(accumulator.State);
        Assert.Equal(accumulator.State, copy.State);
        var empty = new MomentAccumulator().State;
        Assert.Equal(empty, MomentAccumulator.FromState(empty).State);
        Assert.Throws<ArgumentException>(() => MomentAccumulator.FromState(empty with { Mean = 1 }));
        Assert.Throws<ArgumentException>(() => MomentAccumulator.FromState(accumulator.State with { SquaredDeviations = -1 }));
        Assert.Throws<ArgumentException>(() => MomentAccumulator.FromState(accumulator.State with { Count = -2 }));
        Assert.Throws<ArgumentException>(() => MomentAccumulator.FromState(accumulator.State with { Minimum = 5 }));
    }

    /// <summary>Mean and unbiased variance of doubles in exact rational arithmetic (each double is m·2^e exactly), rounded once.</summary>
    private static (double Mean, double Variance) ExactMoments(IReadOnlyList<double> values)
    {
        const int scale = 1100; // every double here is an integer multiple of 2^-1100
        var n = new BigInteger(values.Count);
        BigInteger sum = 0, squares = 0;
        foreach (var x in values)
        {
            var scaled = Scaled(x, scale);
            sum += scaled;
            squares += scaled * scaled;
        }
        // mean = sum / (n·2^s); variance = (n·Σx² − (Σx)²) / (n(n − 1)·2^(2s))
        var mean = Ratio(sum, n * BigInteger.Pow(2, scale));
        var variance = Ratio(n * squares - sum * sum, n * (n - 1) * BigInteger.Pow(2, 2 * scale));
        return (mean, variance);
    }

    private static BigInteger Scaled(double x, int scale)
    {
        var bits = BitConverter.DoubleToInt64Bits(x);
        var exponent = (int)((bits >> 52) & 0x7FF);
        var mantissa = bits & 0xFFFFFFFFFFFFFL;
        if (exponent == 0) exponent = 1;
        else mantissa |= 1L << 52;
        var value = new BigInteger(mantissa) << (exponent - 1075 + scale);
        return x < 0 ? -value : value;
    }

    private static double Ratio(BigInteger numerator, BigInteger denominator)
    {
        // 64 significant bits of the quotient are plenty for a comparison at 1e-15.
        var shift = (int)(denominator.GetBitLength() - numerator.GetBitLength()) + 64;
        var quotient = shift >= 0 ? (numerator << shift) / denominator : numerator / (denominator << -shift);
        return (double)quotient * Math.Pow(2, -shift);
    }

    private static MomentAccumulator[] Leaf(Random random)
    {
        var cells = Enumerable.Range(0, Cells).Select(_ => new MomentAccumulator()).ToArray();
        var replicates = random.Next(4) == 0 ? 0 : random.Next(1, 65); // some blocks record nothing at a cell
        for (var r = 0; r < replicates; r++)
            for (var c = 0; c < Cells; c++)
                cells[c].Add(random.Next(20) == 0 ? double.NaN : Math.Exp(random.NextDouble() * 10 - 5));
        return cells;
    }

    private static MomentTree Tree(long blocks, IEnumerable<long> order, IReadOnlyDictionary<long, MomentAccumulator[]> leaves)
    {
        var tree = new MomentTree(blocks, Cells);
        foreach (var b in order) tree.AddBlock(b, leaves[b].Select(c => MomentAccumulator.FromState(c.State)).ToArray());
        return tree;
    }

    private static MomentTree Tree(long blocks, IEnumerable<int> order, MomentAccumulator[][] leaves) =>
        Tree(blocks, order.Select(b => (long)b), leaves.Select((cells, b) => (cells, b)).ToDictionary(p => (long)p.b, p => p.cells));

    private static MomentAccumulator[] Summarised(long blocks, IEnumerable<int> order, MomentAccumulator[][] leaves) =>
        Tree(blocks, order, leaves).Summarise();

    private static IEnumerable<long> Blocks(int level, long index, long blocks)
    {
        for (var b = index << level; b < Math.Min(blocks, (index + 1) << level); b++) yield return b;
    }

    private static void AssertSameBits(MomentAccumulator[] expected, MomentAccumulator[] actual)
    {
        for (var c = 0; c < expected.Length; c++)
        {
            var (e, a) = (expected[c].State, actual[c].State);
            Assert.Equal(e.Count, a.Count);
            Assert.Equal(e.NonFiniteCount, a.NonFiniteCount);
            foreach (var (x, y) in new[] { (e.Mean, a.Mean), (e.SquaredDeviations, a.SquaredDeviations), (e.Minimum, a.Minimum), (e.Maximum, a.Maximum) })
                Assert.Equal(BitConverter.DoubleToInt64Bits(x), BitConverter.DoubleToInt64Bits(y));
        }
    }
}
